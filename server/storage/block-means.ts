/**
 * The 100 ms block means of a batch's three currents, stored beside its compressed samples
 * (`fast_batches.block_means`, about 90 bytes a batch) so history reads of long raw windows
 * need neither the samples nor their decompression. Blocks are aligned to the epoch (block k
 * covers [100k, 100k + 100) ms), as the chart decimation's; a block cut by the batch's start or
 * end holds only its part, with its sample count, so parts from adjacent batches merge exactly.
 *
 * Layout: m blocks as float32 means of current x (m), y (m), z (m), then uint16 counts (m), in
 * the machine's byte order (little-endian on every platform Node.js runs the server on).
 */
export const MEANS_BLOCK_MS = 100;

/** Block means of the first three channels of `samples` (`n` per channel, as in BatchInput). */
export function encodeBlockMeans(t0Ms: number, rateHz: number, n: number, samples: Float64Array): Uint8Array {
  const periodMs = 1000 / rateHz;
  const sums: number[][] = [[], [], []];
  const counts: number[] = [];
  let block = Number.NaN;
  for (let i = 0; i < n; i++) {
    const b = Math.floor((t0Ms + i * periodMs) / MEANS_BLOCK_MS);
    if (b !== block) {
      block = b;
      counts.push(0);
      for (const s of sums) s.push(0);
    }
    const k = counts.length - 1;
    counts[k]++;
    for (let c = 0; c < 3; c++) sums[c][k] += samples[c * n + i];
  }
  const m = counts.length;
  const out = new ArrayBuffer(m * 14);
  const means = new Float32Array(out, 0, 3 * m);
  for (let c = 0; c < 3; c++) for (let k = 0; k < m; k++) means[c * m + k] = sums[c][k] / counts[k];
  new Uint16Array(out, 12 * m, m).set(counts);
  return new Uint8Array(out);
}

/**
 * Calls `visit` for each stored block part in time order: the mean time of its samples (epoch
 * ms), their count and the three current means (A).
 */
export function forEachBlockMean(blob: Uint8Array, t0Ms: number, rateHz: number, visit: (tMs: number, n: number, x: number, y: number, z: number) => void): void {
  const m = blob.byteLength / 14;
  // A copy (not Buffer#slice, which is a view): typed-array views need an aligned buffer of their own.
  const buffer = new Uint8Array(blob).buffer;
  const means = new Float32Array(buffer, 0, 3 * m);
  const counts = new Uint16Array(buffer, 12 * m, m);
  const periodMs = 1000 / rateHz;
  let first = 0;
  for (let k = 0; k < m; k++) {
    const n = counts[k];
    visit(t0Ms + periodMs * (first + (n - 1) / 2), n, means[k], means[m + k], means[2 * m + k]);
    first += n;
  }
}
