/** Receives one block mean: mean sample time (epoch ms) and the three channel means. */
export type BlockSink = (tMs: number, x: number, y: number, z: number) => void;

/**
 * Turns evenly sampled three-channel data into means over fixed time blocks aligned to the
 * epoch (block k covers [k·blockMs, (k+1)·blockMs)). A block is emitted as soon as its last
 * sample has arrived, so a frame that ends on a block boundary adds no delay; a gap in the
 * data emits the partial block. Frames may have any length and rate.
 */
export class BlockDecimator {
  private block = Number.NaN;
  private n = 0;
  private sumT = 0;
  private sumX = 0;
  private sumY = 0;
  private sumZ = 0;

  /** @param blockMs block length, ms */
  constructor(private readonly blockMs: number) {}

  /**
   * Adds a frame whose first sample is at `t0Ms` (epoch ms), sampled at `rateHz`.
   * The three arrays have the same length.
   */
  push(t0Ms: number, rateHz: number, x: ArrayLike<number>, y: ArrayLike<number>, z: ArrayLike<number>, sink: BlockSink): void {
    const periodMs = 1000 / rateHz;
    // A sample closer than a millionth of a period to the block end counts as the last one.
    const slack = periodMs * 1e-6;
    for (let i = 0; i < x.length; i++) {
      const t = t0Ms + i * periodMs;
      const block = Math.floor(t / this.blockMs);
      if (block !== this.block) {
        this.flush(sink);
        this.block = block;
      }
      this.n++;
      this.sumT += t;
      this.sumX += x[i];
      this.sumY += y[i];
      this.sumZ += z[i];
      if (t + periodMs >= (block + 1) * this.blockMs - slack) this.flush(sink);
    }
  }

  /**
   * Adds `n` samples known only by their mean time (epoch ms) and channel means, all within
   * one block (a part of a finer aligned block). The block is emitted when a later block starts
   * or at `flush`.
   */
  pushMean(tMs: number, n: number, x: number, y: number, z: number, sink: BlockSink): void {
    const block = Math.floor(tMs / this.blockMs);
    if (block !== this.block) {
      this.flush(sink);
      this.block = block;
    }
    this.n += n;
    this.sumT += tMs * n;
    this.sumX += x * n;
    this.sumY += y * n;
    this.sumZ += z * n;
  }

  /** Emits the partly filled block, if any. */
  flush(sink: BlockSink): void {
    if (this.n > 0) sink(this.sumT / this.n, this.sumX / this.n, this.sumY / this.n, this.sumZ / this.n);
    this.block = Number.NaN;
    this.n = 0;
    this.sumT = this.sumX = this.sumY = this.sumZ = 0;
  }
}
