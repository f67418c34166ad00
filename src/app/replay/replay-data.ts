import type { FieldUncertainty } from '../../../shared/field/field-uncertainty';
import type { FieldState } from '../../../shared/field/field-vector';
import { directionFromAngles } from '../../../shared/field/field-vector';
import type { LivePrediction, PerAxis, PredictionStatus } from '../../../shared/live/live-state';
import { staleReason, weakFieldReason } from '../../../shared/live/prediction-status-text';
import type { ProfileRecord } from '../../../shared/profiles/profile-record';
import { RingBuffer } from '../charts/ring-buffer';
import { FAST, SLOW, appendChunks } from '../charts/telemetry-history';
import type { CoilReadings } from '../live/coil-strip';
import { resampleHistory } from '../prediction/prediction-series';
import type {
  HistoryAlarmLimits, HistoryCalibration, HistoryEvent, HistoryInForce, HistoryLevels, HistoryPredictionStatus, HistoryResponse, HistoryRun,
} from '../../../shared/history/history-api';

/** Columns of `ReplayData.sigma`: one standard deviation of |B|, θ, φ (NaN without one). */
const SIGMA = { magnitude: 0, theta: 1, phi: 2 } as const;

/** Points of the predicted-shape chart over a whole replay window. */
const PREDICTED_POINTS = 3000;

/**
 * A loaded window, fetched once and kept in typed arrays: the charts draw from the buffers
 * directly and the panels pick their values from them at the replay clock.
 */
export interface ReplayData {
  fromMs: number;
  toMs: number;
  resolutionMs: number;
  /** Field and currents, `FAST` columns; every returned sample. */
  fast: RingBuffer;
  /** σ of |B|, θ, φ at the same times as `fast`. */
  sigma: RingBuffer;
  /** Coil temperatures and flows, `SLOW` columns. */
  slow: RingBuffer;
  /** Times of the recorded predictions (no columns); each stands until the next. */
  predictionTimes: RingBuffer;
  /** The recorded predictions, with `status`: whether they applied, each change holding until the next. */
  prediction: HistoryResponse['prediction'];
  /** Level set, calibration, profile versions and alarm limits in force over the window. */
  inForce: HistoryInForce;
  /** (β − 1) and (TOF aspect − 1) in percent, `PREDICTED` columns, for the chart. */
  predicted: RingBuffer;
  events: HistoryEvent[];
  /** The run the window was loaded for; null for a time window. */
  run: HistoryRun | null;
}

/** What the panels show at one moment of the replay; null parts were not recorded near that moment. */
export interface ReplayMoment {
  timeMs: number;
  field: FieldState | null;
  fieldUncertainty: FieldUncertainty | null;
  coils: CoilReadings;
  /** The prediction shown live at that moment, as recorded. */
  prediction: LivePrediction | null;
  /** Whether it applied then, worded as Live worded it; null where that was not recorded. */
  predictionStatus: PredictionStatus | null;
  /** The versions in force at that moment (the levels and alarm limits: the window's first before any). */
  levels: HistoryLevels | null;
  alarmLimits: HistoryAlarmLimits | null;
  calibration: HistoryCalibration | null;
  profile: ProfileRecord | null;
}

/** Keeps a window's answer in typed arrays (one pass, no thinning). */
export function toReplayData(response: HistoryResponse): ReplayData {
  const { series, prediction } = response;
  const fast = new RingBuffer(Math.max(1, series.t.length), 6);
  const slow = new RingBuffer(Math.max(1, response.slow.t.length), 6);
  appendChunks({ fast, slow }, series, response.slow, 0);
  const sigma = new RingBuffer(Math.max(1, series.t.length), 3);
  const row = new Float64Array(3);
  for (let i = 0; i < series.t.length; i++) {
    row[SIGMA.magnitude] = series.sigmaBMagG[i] ?? Number.NaN;
    row[SIGMA.theta] = series.sigmaThetaDeg[i] ?? Number.NaN;
    row[SIGMA.phi] = series.sigmaPhiDeg[i] ?? Number.NaN;
    sigma.push(series.t[i], row);
  }
  const predictionTimes = new RingBuffer(Math.max(1, prediction.t.length), 0);
  for (const t of prediction.t) predictionTimes.push(t, []);
  const fromMs = Date.parse(response.from);
  const toMs = Date.parse(response.to);
  const points = resampleHistory(prediction, Math.max(1, (toMs - fromMs) / PREDICTED_POINTS), toMs + 1);
  const predicted = new RingBuffer(Math.max(1, points.length), 2);
  const gap: [number, number] = [Number.NaN, Number.NaN];
  // As on Live, the chart shows a gap where the prediction did not apply.
  for (const point of points) predicted.push(point.t, applied(prediction.status, point.t) ? point.values : gap);
  return { fromMs, toMs, resolutionMs: response.resolutionMs, fast, sigma, slow, predictionTimes, prediction, inForce: response.inForce, predicted, events: response.events, run: response.run };
}

/** Index of the last of ascending `times` at or before `timeMs`; −1 when none is. */
function lastAtOrBefore(times: readonly number[], timeMs: number): number {
  let lo = 0;
  let hi = times.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (times[mid] <= timeMs) lo = mid + 1;
    else hi = mid;
  }
  return lo - 1;
}

/** False only where a recorded status says the prediction did not apply. */
function applied(status: HistoryPredictionStatus, timeMs: number): boolean {
  const i = lastAtOrBefore(status.t, timeMs);
  return i < 0 || status.state[i] === 'applies';
}

/**
 * The recorded status at `timeMs`, worded as Live worded it then: a stale stretch's age grows
 * from the last frame's arrival, and a weak field names the recorded |B| at that moment
 * (`fieldG`) while it lies below the least orienting field, else the |B| of the change.
 */
export function statusAt(status: HistoryPredictionStatus, timeMs: number, fieldG: number | null): PredictionStatus | null {
  const i = lastAtOrBefore(status.t, timeMs);
  if (i < 0) return null;
  const state = status.state[i];
  const minFieldG = status.minFieldG[i];
  const lastFrameAtMs = status.lastFrameAtMs[i];
  if (state === 'stale' && lastFrameAtMs !== null) return { state, fieldG: status.fieldG[i], minFieldG, reason: staleReason(timeMs - lastFrameAtMs) };
  if (state === 'weak-field' && fieldG !== null && minFieldG !== null && fieldG < minFieldG) return { state, fieldG, minFieldG, reason: weakFieldReason(fieldG, minFieldG) };
  return { state, fieldG: status.fieldG[i], minFieldG, reason: status.reason[i] };
}

/** The entry of `versions` (ascending `t`) in force at `timeMs`, or the first when `orFirst` and none was yet. */
function inForceAt<T extends { t: number }>(versions: readonly T[], timeMs: number, orFirst = false): T | null {
  return versions[lastAtOrBefore(versions.map((v) => v.t), timeMs)] ?? (orFirst ? versions[0] ?? null : null);
}

/**
 * How long a sample stands for the moments after it, ms: a few sample spacings, at least 2 s
 * (the charts draw a gap at the same distance). Beyond that nothing was recorded and the
 * panels show no value rather than an old one.
 */
export function holdMs(resolutionMs: number): number {
  return Math.max(2000, 5 * resolutionMs);
}

/** The values in force at `timeMs`: the newest sample at or before it, if recent enough. */
export function momentAt(data: ReplayData, timeMs: number): ReplayMoment {
  const hold = holdMs(data.resolutionMs);
  const fastIndex = recentIndex(data.fast, timeMs, hold);
  const slowIndex = recentIndex(data.slow, timeMs, hold);
  const fast = (column: number) => (fastIndex < 0 ? Number.NaN : data.fast.valueAt(fastIndex, column));
  const slow = (column: number) => (slowIndex < 0 ? Number.NaN : data.slow.valueAt(slowIndex, column));
  return {
    timeMs,
    field: fastIndex < 0 ? null : fieldState(fast(FAST.bMag), orNull(fast(FAST.theta)), orNull(fast(FAST.phi))),
    fieldUncertainty: fastIndex < 0 ? null : uncertaintyAt(data.sigma, fastIndex),
    coils: {
      currents: perAxis(fast, FAST.currentX),
      temperatureC: perAxis(slow, SLOW.temperatureX),
      flowLpm: perAxis(slow, SLOW.flowX),
      setpoints: null,
      voltageV: null,
      waterSupplyC: null,
      waterReturnC: null,
    },
    prediction: predictionAt(data, data.predictionTimes.indexAtOrBefore(timeMs)),
    predictionStatus: statusAt(data.prediction.status, timeMs, fastIndex < 0 ? null : orNull(fast(FAST.bMag))),
    levels: inForceAt(data.inForce.levels, timeMs, true),
    alarmLimits: inForceAt(data.inForce.alarmLimits, timeMs, true),
    calibration: inForceAt(data.inForce.calibrations, timeMs),
    profile: inForceAt(data.inForce.profiles, timeMs)?.profile ?? null,
  };
}

/** Index of the newest sample at or before `timeMs` and no older than `hold`; −1 otherwise. */
function recentIndex(buffer: RingBuffer, timeMs: number, hold: number): number {
  const i = buffer.indexAtOrBefore(timeMs);
  return i >= 0 && timeMs - buffer.timeAt(i) <= hold ? i : -1;
}

function uncertaintyAt(sigma: RingBuffer, index: number): FieldUncertainty | null {
  const magnitudeGauss = sigma.valueAt(index, SIGMA.magnitude);
  if (Number.isNaN(magnitudeGauss)) return null;
  return { magnitudeGauss, thetaDeg: orNull(sigma.valueAt(index, SIGMA.theta)), phiDeg: orNull(sigma.valueAt(index, SIGMA.phi)) };
}

/** The `index`-th recorded prediction as the live state carried it. */
function predictionAt(data: ReplayData, index: number): LivePrediction | null {
  if (index < 0) return null;
  const p = data.prediction;
  return {
    stable: p.stable[index],
    reason: p.reason[index],
    fermiSurfaceAspect: p.fermiSurfaceAspect[index],
    cloudAspect: p.cloudAspect[index],
    tofAspect: p.tofAspect[index],
    tofMajorAngleDeg: p.tofMajorAngleDeg[index],
    collapseRatio: p.collapseRatio[index],
    epsDd: p.epsDd[index],
    profileId: p.profileId[index],
    thetaDeg: p.thetaDeg[index],
    phiDeg: p.phiDeg[index],
    computedAt: new Date(p.t[index]).toISOString(),
    camera: p.camera[index],
  };
}

function orNull(value: number): number | null {
  return Number.isFinite(value) ? value : null;
}

function perAxis(read: (column: number) => number, first: number): PerAxis<number> | null {
  const x = read(first);
  return Number.isNaN(x) ? null : { x, y: read(first + 1), z: read(first + 2) };
}

/** The field as the field panel takes it, rebuilt from the recorded |B|, θ and φ. */
function fieldState(magnitude: number, thetaDeg: number | null, phiDeg: number | null): FieldState {
  const unit = thetaDeg === null || phiDeg === null ? { x: 0, y: 0, z: 0 } : directionFromAngles(thetaDeg, phiDeg);
  return { vector: { x: magnitude * unit.x, y: magnitude * unit.y, z: magnitude * unit.z }, magnitude, thetaDeg, phiDeg };
}
