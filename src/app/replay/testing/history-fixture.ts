import type { HistoryAlarmLimits, HistoryEvent, HistoryLevels, HistoryResponse } from '../../../../shared/history/history-api';
import { composeChannelBands } from '../../../../shared/levels/channel-bands';
import type { LevelSet } from '../../../../shared/levels/level-set';
import type { ProfileRecord } from '../../../../shared/profiles/profile-record';

/** Start of the fixture window, Unix epoch ms. */
export const FIXTURE_FROM = Date.parse('2026-12-01T21:00:00Z');

/** A timeline event `ms` after the fixture's start. */
export function fixtureEvent(ms: number, kind: HistoryEvent['kind'], label: string): HistoryEvent {
  const t = FIXTURE_FROM + ms;
  return { at: new Date(t).toISOString(), t, kind, id: `${kind}-${ms}`, label, actor: null, detail: null };
}

const DAY_MS = 86_400_000;

/** Level set version `version` in force from `t`, its normal current band ±`normalA`. */
function levels(version: number, t: number, normalA: number): HistoryLevels {
  const band = (lo: number, hi: number) => ({ scale: [lo, hi] as [number, number], normal: [lo / 2, hi / 2] as [number, number] });
  const set: LevelSet = {
    bands: { current: { scale: [-25, 25], normal: [-normalA, normalA] }, voltage: band(-20, 20), temperature: band(0, 80), flow: band(0, 8), waterSupply: band(0, 40) },
    trips: { currentHighA: 22, temperatureHighC: 70, flowLowLpm: 1 },
    settings: { minOrientingFieldG: 0.5, maxTargetFieldG: 20, maxTargetCollapseRatio: 0.9 },
    windingsR20Ohm: { x: 0.1, y: 0.1, z: 0.1 },
  };
  const createdAt = new Date(t).toISOString();
  return { t, version, createdBy: 'lead@tiltwatch.example', reason: 'fixture', bands: composeChannelBands({ version, levels: set, createdBy: 'lead@tiltwatch.example', createdAt, reason: 'fixture' }, []) };
}

/** The alarm limits in force from `t`: a high alarm on the X current at `currentXHighA`. */
function alarmLimits(t: number, currentXHighA: number): HistoryAlarmLimits {
  return { t, changedId: 'current.x.H', changedBy: 'lead@tiltwatch.example', reason: 'fixture', limits: [{ id: 'current.x.H', channel: 'current.x', level: 'H', limit: currentXHighA }] };
}

const PROFILE: ProfileRecord = {
  id: 3, name: 'Lindqvist Hall 167Er, crossed trap', version: 2, active: true, createdBy: 'lead@tiltwatch.example', createdAt: new Date(FIXTURE_FROM - DAY_MS).toISOString(),
  reason: 'fixture', profile: { name: 'Lindqvist Hall 167Er, crossed trap', species: '167Er', atomNumber: 5e4, trapHz: [350, 80, 400], trapToCoilEulerDeg: [15, 0, 0], tofMs: [20], imaging: 'y' },
};

/**
 * A 60 s window as `GET /api/history` answers it: fast samples every 100 ms with θ rising 1° per
 * second from 10° (σθ 0.2°) and |B| 12.5 G, dropping to 0.3 G from 52 s to 58 s, a 10 s gap from
 * 30 s to 40 s, slow samples every second, a stable prediction in force from before the window
 * and a collapsed one from 20 s that did not apply (field too weak) from 52 s to 58 s; level set
 * v1 and calibration v1 in force from before the window, level set v2 from 20 s and calibration
 * v2 from 40 s, the X current's high alarm at 18 A from before the window and at 16 A from 45 s; an alarm, a note and a shot.
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
      bMagG: seconds.map((s) => (s >= 52 && s < 58 ? 0.3 : 12.5)),
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
      status: {
        t: [FIXTURE_FROM - DAY_MS, FIXTURE_FROM + 52_000, FIXTURE_FROM + 58_000],
        state: ['applies', 'weak-field', 'applies'],
        fieldG: [12.5, 0.3, 12.5],
        minFieldG: [0.5, 0.5, 0.5],
        reason: [null, '|B| = 0.30 G is below 0.50 G, too weak to orient the dipoles: the prediction does not apply.', null],
        lastFrameAtMs: [null, null, null],
      },
    },
    inForce: {
      levels: [levels(1, FIXTURE_FROM - DAY_MS, 15), levels(2, FIXTURE_FROM + 20_000, 18)],
      calibrations: [
        { t: FIXTURE_FROM - DAY_MS, id: 1, version: 1, label: 'Lindqvist Hall demo calibration', approvedBy: 'system' },
        { t: FIXTURE_FROM + 40_000, id: 4, version: 2, label: 'Vector-probe fit of probe-night.csv', approvedBy: 'lead@tiltwatch.example' },
      ],
      profiles: [{ t: FIXTURE_FROM - DAY_MS, profile: PROFILE }],
      alarmLimits: [alarmLimits(FIXTURE_FROM - DAY_MS, 18), alarmLimits(FIXTURE_FROM + 45_000, 16)],
    },
    events: [
      fixtureEvent(15_000, 'alarm', 'Alarm temperature.x.H (medium): raise, normal → unacknowledged'),
      fixtureEvent(45_000, 'note', 'Logbook: θ scan started'),
      fixtureEvent(48_000, 'step', 'Run 7 step 3: shot "θ 30°"'),
      fixtureEvent(50_000, 'shot', 'Shot shot-1 (θ 30°), run 7'),
    ],
    run: null,
  };
}
