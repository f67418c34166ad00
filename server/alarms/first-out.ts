/**
 * First-out grouping: one root fault (a cooling loss) raises a cascade of alarms — low flow,
 * then coil temperature high, then high-high. The first annunciated raise opens a group; every
 * other alarm raised within `windowMs` of it is grouped under it, so the operator sees one
 * root alarm with its consequences folded beneath instead of a flood.
 *
 * The window runs from the first raise (not from the latest one), so a long chain of faults
 * cannot keep one group open for ever.
 */
export const DEFAULT_FIRST_OUT_WINDOW_MS = 10_000;

export class FirstOutGrouper {
  private head: { id: string; at: number } | null = null;

  /** @param windowMs how long after the first raise later raises join its group, ms. */
  constructor(readonly windowMs: number = DEFAULT_FIRST_OUT_WINDOW_MS) {
    if (!(windowMs > 0)) throw new Error(`first-out window must be more than 0 ms, got ${windowMs}`);
  }

  /**
   * Registers an annunciated raise of `alarmId` at `atMs` (Unix epoch ms). Returns the id of
   * the first-out alarm it belongs under, or null when this raise is itself first out.
   */
  assign(alarmId: string, atMs: number): string | null {
    const head = this.head;
    if (head && atMs - head.at <= this.windowMs) return head.id === alarmId ? null : head.id;
    this.head = { id: alarmId, at: atMs };
    return null;
  }
}
