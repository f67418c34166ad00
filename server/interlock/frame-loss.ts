/**
 * Counts fast frames lost in a sliding window from their sequence numbers. A gap in `seq`
 * means frames were lost between the controller and the server; a lower `seq` than before
 * means the controller restarted and counts as no loss.
 */
export class FrameLossWindow {
  private lastSeq: number | null = null;
  /** Losses inside the window, oldest first: when the gap was seen (ms) and its size. */
  private readonly gaps: { at: number; lost: number }[] = [];

  /** @param windowMs length of the sliding window, ms. */
  constructor(readonly windowMs: number) {}

  /** Records a fast frame's `seq` seen at server time `atMs` (Unix epoch ms). */
  observe(seq: number, atMs: number): void {
    const last = this.lastSeq;
    this.lastSeq = seq;
    if (last === null || seq <= last) return;
    const lost = seq - last - 1;
    if (lost > 0) this.gaps.push({ at: atMs, lost });
  }

  /** Frames lost within (`nowMs` − window, `nowMs`]. */
  lostWithin(nowMs: number): number {
    while (this.gaps.length > 0 && this.gaps[0].at <= nowMs - this.windowMs) this.gaps.shift();
    let sum = 0;
    for (const g of this.gaps) sum += g.lost;
    return sum;
  }
}
