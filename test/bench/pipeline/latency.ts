/**
 * Publish → viewer latency of every frame: the first `live` message whose newest sample time
 * reaches the frame's last sample carries it; its arrival minus the frame's publish time is the
 * latency (both on the wall clock the processes share). A frame no message reached is missing.
 */
export interface Published {
  sentAt: number[];
  lastSampleMs: number[];
}

export interface Viewed {
  receivedAt: number[];
  liveTimeMs: number[];
}

export function frameLatencies(published: Published, viewed: Viewed): { latencies: number[]; missing: number } {
  // The newest sample time never goes back, so the first message reaching a time is found by bisection.
  const reach: number[] = [];
  let newest = -Infinity;
  for (const t of viewed.liveTimeMs) reach.push((newest = Math.max(newest, t)));
  const latencies: number[] = [];
  let missing = 0;
  for (let i = 0; i < published.sentAt.length; i++) {
    let lo = 0;
    let hi = reach.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (reach[mid] >= published.lastSampleMs[i]) hi = mid;
      else lo = mid + 1;
    }
    if (lo === reach.length) missing++;
    else latencies.push(viewed.receivedAt[lo] - published.sentAt[i]);
  }
  return { latencies, missing };
}
