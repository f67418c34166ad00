import type { HistoryEvent, HistoryResponse } from '../../../../shared/history/history-api';

/** Start of the fixture window, Unix epoch ms. */
export const FIXTURE_FROM = Date.parse('2026-12-01T21:00:00Z');

/** A timeline event `ms` after the fixture's start. */
export function fixtureEvent(ms: number, kind: HistoryEvent['kind'], label: string): HistoryEvent {
  const t = FIXTURE_FROM + ms;
  return { at: new Date(t).toISOString(), t, kind, id: `${kind}-${ms}`, label, actor: null, detail: null };
}

/**
 * A 60 s window as `GET /api/history` answers it: fast samples every 100 ms with θ rising 1° per
 * second from 10° (σθ 0.2°), a 10 s gap from 30 s to 40 s, slow samples every second, a stable
 * prediction in force from before the window and a collapsed one from 20 s, and an alarm, a note
 * and a shot.
 */
export function historyFixture(): HistoryResponse {
  const t: number[] = [];
  for (let ms = 0; ms <= 60_000; ms += 100) if (ms < 30_000 || ms >= 40_000) t.push(FIXTURE_FROM + ms);
  const seconds = t.map((x) => (x - FIXTURE_FROM) / 1000);
  const slowT = Array.from({ length: 61 }, (_, i) => FIXTURE_FROM + i * 1000);
  const camera = {
    imaging: 'y',
    tofMs: 20,
    inSituUm: { major: 3.93, minor: 3.3, majorAngleDeg: 0 },
    momentumPerUm: { major: 22.5, minor: 22.05, majorAngleDeg: 90 },
    tofUm: { major: 270, minor: 264.6, majorAngleDeg: 90 },
  };
  return {
    from: new Date(FIXTURE_FROM).toISOString(),
    to: new Date(FIXTURE_FROM + 60_000).toISOString(),
    resolutionMs: 100,
    source: 'raw',
    series: {
      t,
      currentA: { x: seconds.map((s) => 1 + s / 100), y: seconds.map(() => 2), z: seconds.map(() => 3) },
      bMagG: seconds.map(() => 12.5),
      thetaDeg: seconds.map((s) => 10 + s),
      phiDeg: seconds.map(() => 45),
      sigmaBMagG: seconds.map(() => 0.004),
      sigmaThetaDeg: seconds.map(() => 0.2),
      sigmaPhiDeg: seconds.map(() => 0.3),
    },
    slow: {
      t: slowT,
      temperatureC: { x: slowT.map((_, i) => 20 + i / 10), y: slowT.map(() => 21), z: slowT.map(() => 22) },
      flowLpm: { x: slowT.map(() => 3), y: slowT.map(() => 3.1), z: slowT.map(() => 3.2) },
    },
    prediction: {
      t: [FIXTURE_FROM - 5000, FIXTURE_FROM + 20_000],
      profileId: [3, 3],
      thetaDeg: [10, 30],
      phiDeg: [45, 45],
      stable: [true, false],
      reason: [null, 'no stable state: the energy has no minimum for this direction'],
      epsDd: [0.146, 0.146],
      fermiSurfaceAspect: [1.02, null],
      cloudAspect: [4.9, null],
      tofAspect: [1.019, null],
      tofMajorAngleDeg: [90, null],
      collapseRatio: [0.07, 1.12],
      camera: [camera, null],
    },
    events: [
      fixtureEvent(15_000, 'alarm', 'Alarm temperature.x.H (medium): raise, normal → unacknowledged'),
      fixtureEvent(45_000, 'note', 'Logbook: θ scan started'),
      fixtureEvent(50_000, 'shot', 'Shot shot-1 (θ 30°), run 7'),
    ],
    run: null,
  };
}
