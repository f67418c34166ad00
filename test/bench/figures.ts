/** One printed benchmark figure. Ratios are measured within the same run (shared, noisy machines). */
export interface Figure {
  name: string;
  value: number;
  unit: string;
  note?: string;
}

/** Value at quantile q (0…1) of an unsorted sample, by the nearest-rank method. */
export function quantile(values: readonly number[], q: number): number {
  if (values.length === 0) return Number.NaN;
  const sorted = [...values].sort((a, b) => a - b);
  const rank = Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1));
  return sorted[rank];
}

export function printFigures(title: string, figures: readonly Figure[]): void {
  console.log(`\n${title}`);
  const width = Math.max(...figures.map((f) => f.name.length));
  for (const f of figures) {
    const value = Number.isInteger(f.value) ? String(f.value) : f.value.toPrecision(4);
    console.log(`  ${f.name.padEnd(width)}  ${value} ${f.unit}${f.note ? `  (${f.note})` : ''}`);
  }
}
