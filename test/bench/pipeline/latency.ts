/**
 * Publish → viewer latency of every frame: the first `live` message carrying a chart point of
 * the frame (a point at or after its first sample time, `t0Ms`) carries it; its arrival minus
 * the frame's publish time is the latency (both on the wall clock the processes share). A frame
 * no message reached is missing. Chart points are 10 ms block means of the frames' own samples,
 * so they follow the data time of this level even where the live state's newest time (never
 * going back) still holds the level before's: each level's data time starts in the past and
 * runs `rate` times faster than the wall clock. Messages that arrived before the level's first
 * publish are left out.
 */
export interface Published {
  sentAt: number[];
  t0Ms: number[];
}

export interface Viewed {
  receivedAt: number[];
  newestPointMs: number[];
}

export function frameLatencies(published: Published, viewed: Viewed): { latencies: number[]; missing: number } {
  const first = viewed.receivedAt.findIndex((at) => at >= published.sentAt[0]);
  const receivedAt = first < 0 ? [] : viewed.receivedAt.slice(first);
  // The newest point time reached so far never goes back, so the first message reaching a time is found by bisection.
  const reach: number[] = [];
  let newest = -Infinity;
  for (const t of first < 0 ? [] : viewed.newestPointMs.slice(first)) reach.push((newest = Math.max(newest, t)));
  const latencies: number[] = [];
  let missing = 0;
  for (let i = 0; i < published.sentAt.length; i++) {
    let lo = 0;
    let hi = reach.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (reach[mid] >= published.t0Ms[i]) hi = mid;
      else lo = mid + 1;
    }
    if (lo === reach.length) missing++;
    else latencies.push(receivedAt[lo] - published.sentAt[i]);
  }
  return { latencies, missing };
}
