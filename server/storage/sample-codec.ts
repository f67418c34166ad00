/**
 * Packing of sample arrays into bytea: little-endian IEEE-754 float32, 4 bytes per sample.
 * float32 keeps about 7 significant digits, far finer than the controller's measurement
 * noise, at half the size of float64.
 */

/** Packs samples into little-endian float32 bytes. */
export function encodeSamples(values: readonly number[]): Uint8Array {
  const bytes = new Uint8Array(values.length * 4);
  const view = new DataView(bytes.buffer);
  for (let i = 0; i < values.length; i++) view.setFloat32(i * 4, values[i], true);
  return bytes;
}

/** Unpacks little-endian float32 bytes written by `encodeSamples`. */
export function decodeSamples(bytes: Uint8Array): Float64Array {
  if (bytes.byteLength % 4 !== 0) throw new Error(`sample blob of ${bytes.byteLength} bytes is not a whole number of float32 values`);
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const out = new Float64Array(bytes.byteLength / 4);
  for (let i = 0; i < out.length; i++) out[i] = view.getFloat32(i * 4, true);
  return out;
}
