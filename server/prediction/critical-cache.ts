/**
 * Critical dipolar strengths ε_dd,crit by trap shape and direction cell. ε_dd,crit depends
 * only on the trap anisotropies λ and the field direction (docs/physics.md §4.2), not on N or the
 * species, so profiles that differ only in atom number or species share entries. The oldest
 * entries go first once `capacity` is reached (a 1° grid has about 21,000 cells per shape).
 */
export class CriticalCache {
  private readonly entries = new Map<string, number>();

  constructor(private readonly capacity = 50_000) {}

  /** Cache name of a trap shape: λ_a = ω_a/ω̄ to 12 digits. */
  static shapeKey(lambda: readonly number[]): string {
    return lambda.map((l) => l.toPrecision(12)).join(',');
  }

  get(shapeKey: string, bucketKey: string): number | undefined {
    return this.entries.get(`${shapeKey}|${bucketKey}`);
  }

  set(shapeKey: string, bucketKey: string, epsDdCritical: number): void {
    const key = `${shapeKey}|${bucketKey}`;
    this.entries.delete(key);
    this.entries.set(key, epsDdCritical);
    if (this.entries.size > this.capacity) this.entries.delete(this.entries.keys().next().value as string);
  }

  get size(): number {
    return this.entries.size;
  }
}
