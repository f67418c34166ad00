import type { HistoryResponse } from '../history-api';

/** Start of the fixture window, Unix epoch ms. */
export const FIXTURE_FROM = Date.parse('2026-12-01T21:00:00Z');

/**
 * A 60 s window as `GET /api/history` answers it: fast samples every 100 ms with θ rising 1° per
 * second from 10°, a 10 s gap from 30 s to 40 s, slow samples every second, predictions at 0 s
 * and 20 s, and an alarm, a note and a shot.
 */
export function historyFixture(): HistoryResponse {
  const t: number[] = [];
  for (let ms = 0; ms <= 60_000; ms += 100) if (ms < 30_000 || ms >= 40_000) t.push(FIXTURE_FROM + ms);
  const seconds = t.map((x) => (x - FIXTURE_FROM) / 1000);
  const slowT = Array.from({ length: 61 }, (_, i) => FIXTURE_FROM + i * 1000);
  return {
    from: new Date(FIXTURE_FROM).toISOString(),
    to: new Date(FIXTURE_FROM + 60_000).toISOString(),
    resolutionMs: 100,
    series: {
      t,
      currentA: { x: seconds.map((s) => 1 + s / 100), y: seconds.map(() => 2), z: seconds.map(() => 3) },
      bMagG: seconds.map(() => 12.5),
      thetaDeg: seconds.map((s) => 10 + s),
      phiDeg: seconds.map(() => 45),
    },
    slow: {
      t: slowT,
      temperatureC: { x: slowT.map((_, i) => 20 + i / 10), y: slowT.map(() => 21), z: slowT.map(() => 22) },
      flowLpm: { x: slowT.map(() => 3), y: slowT.map(() => 3.1), z: slowT.map(() => 3.2) },
    },
    prediction: {
      t: [FIXTURE_FROM, FIXTURE_FROM + 20_000],
      fermiSurfaceAspect: [1.02, null],
      cloudAspect: [4.9, null],
      tofAspect: [1.019, null],
    },
    events: [
      { at: new Date(FIXTURE_FROM + 15_000).toISOString(), kind: 'alarm', message: 'X coil temperature high' },
      { at: new Date(FIXTURE_FROM + 45_000).toISOString(), kind: 'note', text: 'θ scan started' },
      { at: new Date(FIXTURE_FROM + 50_000).toISOString(), kind: 'shot', label: 'shot 1' },
    ],
  };
}
