/**
 * The pre-flight of a planned path: pure checks on values (the planned points with their
 * predictions, the coil data, the limits in force and the state of the apparatus), nothing
 * read from elsewhere. Each check reports its worst value along the path, its limit and a
 * sentence that says what it means. Supervisory: passing here never replaces the hardware
 * interlocks of the apparatus.
 */
import { COPPER_ALPHA_PER_K, resistanceAt } from '../../shared/apparatus/coil-model.js';
import type { ControllerParameters } from '../../shared/apparatus/coil-data.js';
import { steadyCoilTemperature } from '../../shared/apparatus/thermal-model.js';
import type { PerAxis } from '../../shared/live/live-state.js';
import type { PlannedPoint, PreflightCheck } from '../../shared/steering/steering-api.js';
import { AXES, type Axis } from '../../shared/telemetry/messages.js';

/** Limits the pre-flight compares against. */
export interface PreflightLimits {
  /** |I| alarm level of the coil currents, A (the supply's own limit is in the coil data). */
  currentAlarmA: number;
  /** Coil temperature alarm and trip levels, °C. */
  temperatureAlarmC: number;
  temperatureTripC: number;
  /** Largest |B| a plan may reach: the apparatus range or the lead's lower setting, G. */
  maxFieldG: number;
  /** Largest ε_dd/ε_dd,crit a plan may reach (set by a lead). */
  collapseRatioLimit: number;
}

/** The apparatus as it is now. */
export interface ApparatusNow {
  controllerOnline: boolean;
  /** A field is measured (telemetry arrives); the path starts from it. */
  reporting: boolean;
  interlockTripped: boolean;
  hardwareTripped: boolean;
  /** Cooling water supply temperature, °C (null: not measured yet). */
  waterSupplyC: number | null;
  /** Coolant flow per pair, L/min (null: not measured yet). */
  flowLpm: PerAxis<number> | null;
}

export interface PreflightInput {
  /** Every planned point in time order (segments joined), with the predictions filled in. */
  points: readonly PlannedPoint[];
  /** True when a prediction was asked for but no active sample profile exists. */
  noProfile?: boolean;
  coils: ControllerParameters;
  limits: PreflightLimits;
  now: ApparatusNow;
}

const round = (v: number, digits: number) => Number(v.toFixed(digits));

export function preflight(input: PreflightInput): PreflightCheck[] {
  return [
    controllerCheck(input.now),
    interlockCheck(input.now),
    magnitudeCheck(input),
    currentsCheck(input),
    rampRateCheck(input),
    temperatureCheck(input),
    collapseCheck(input),
  ];
}

function controllerCheck(now: ApparatusNow): PreflightCheck {
  const ok = now.controllerOnline && now.reporting;
  return {
    name: 'controller', ok, value: ok ? 1 : 0, limit: 1, unit: '',
    message: ok ? 'The controller is online and reporting; the path starts from the measured field.'
      : 'The controller is offline or sends no telemetry: there is no measured field to start from and nothing would take the setpoints.',
  };
}

function interlockCheck(now: ApparatusNow): PreflightCheck {
  const ok = !now.interlockTripped && !now.hardwareTripped;
  const why = now.hardwareTripped ? 'the controller\'s hardware trip is latched (reset at the controller only)' : 'the software interlock is tripped (reset it on Interlocks once the cause is cleared)';
  return {
    name: 'interlock', ok, value: ok ? 0 : 1, limit: 0, unit: '',
    message: ok ? 'Neither the software interlock nor the hardware trip chain is tripped.' : `Nothing can be steered: ${why}.`,
  };
}

function magnitudeCheck({ points, coils, limits }: PreflightInput): PreflightCheck {
  const worst = Math.max(0, ...points.map((p) => p.magnitudeG));
  const ok = worst <= limits.maxFieldG;
  const range = limits.maxFieldG < coils.maxFieldG ? `the lead's limit of ${limits.maxFieldG} G (the apparatus is rated for ${coils.maxFieldG} G)` : `the apparatus range of ${coils.maxFieldG} G`;
  return {
    name: 'field-magnitude', ok, value: round(worst, 3), limit: limits.maxFieldG, unit: 'G',
    message: ok ? `|B| stays at or below ${round(worst, 2)} G, within ${range}.` : `|B| would reach ${round(worst, 2)} G, beyond ${range}.`,
  };
}

/** Largest |I| per axis along the path. */
function peakCurrents(points: readonly PlannedPoint[]): PerAxis<number> {
  const peak = { x: 0, y: 0, z: 0 };
  for (const p of points) for (const a of AXES) peak[a] = Math.max(peak[a], Math.abs(p.currentsA[a]));
  return peak;
}

function currentsCheck({ points, coils, limits }: PreflightInput): PreflightCheck {
  const peak = peakCurrents(points);
  const axis = AXES.reduce((w, a) => (peak[a] > peak[w] ? a : w), 'x' as Axis);
  const limit = Math.min(coils.supply.currentLimitA, limits.currentAlarmA);
  const ok = peak[axis] <= limit;
  return {
    name: 'currents', ok, value: round(peak[axis], 3), limit, unit: 'A',
    message: ok ? `The largest current is ${round(peak[axis], 2)} A (pair ${axis}), below the alarm level of ${limits.currentAlarmA} A and the supply limit of ${coils.supply.currentLimitA} A.`
      : `Pair ${axis} would need ${round(peak[axis], 2)} A; the limit is ${limit} A (alarm level ${limits.currentAlarmA} A, supply limit ${coils.supply.currentLimitA} A).`,
  };
}

/**
 * Largest dI/dt a supply can drive: its slew limit, and L·dI/dt = V − R·I with V at the
 * compliance and R of a winding at the temperature alarm level (the warmest it should run).
 */
export function drivableRate(coils: ControllerParameters, axis: Axis, currentA: number, hotC: number): number {
  const coil = coils.coils[axis];
  const headroomV = coils.supply.complianceV - resistanceAt(coil.r20Ohm, hotC) * Math.abs(currentA);
  return Math.max(0, Math.min(coils.supply.slewLimitAPerS, headroomV / coil.inductanceH));
}

function rampRateCheck({ points, coils, limits }: PreflightInput): PreflightCheck {
  let worst = { ratio: 0, rate: 0, allowed: coils.supply.slewLimitAPerS, axis: 'x' as Axis };
  for (let i = 1; i < points.length; i++) {
    const dtS = (points[i].tMs - points[i - 1].tMs) / 1000;
    for (const a of AXES) {
      const delta = Math.abs(points[i].currentsA[a] - points[i - 1].currentsA[a]);
      if (delta < 1e-9) continue;
      const rate = dtS > 0 ? delta / dtS : Infinity;
      const peak = Math.max(Math.abs(points[i].currentsA[a]), Math.abs(points[i - 1].currentsA[a]));
      const allowed = drivableRate(coils, a, peak, limits.temperatureAlarmC);
      const ratio = allowed > 0 ? rate / allowed : Infinity;
      if (ratio > worst.ratio) worst = { ratio, rate, allowed, axis: a };
    }
  }
  const ok = worst.ratio <= 1;
  const rateText = Number.isFinite(worst.rate) ? `${round(worst.rate, 2)} A/s` : 'a step (no ramp time)';
  return {
    name: 'ramp-rate', ok, value: Number.isFinite(worst.rate) ? round(worst.rate, 3) : null, limit: round(worst.allowed, 3), unit: 'A/s',
    message: ok ? `The fastest change is ${rateText} (pair ${worst.axis}); the supply can drive ${round(worst.allowed, 1)} A/s there.`
      : `Pair ${worst.axis} would have to change at ${rateText}, but its supply can drive only ${round(worst.allowed, 1)} A/s there (slew limit ${coils.supply.slewLimitAPerS} A/s, ${coils.supply.complianceV} V across L and R): lengthen the ramp.`,
  };
}

function temperatureCheck({ points, coils, limits, now }: PreflightInput): PreflightCheck {
  const peak = peakCurrents(points);
  const supplyC = now.waterSupplyC ?? coils.waterSupplyC;
  let worst = { t: -Infinity, axis: 'x' as Axis };
  for (const a of AXES) {
    const coil = coils.coils[a];
    const flow = now.flowLpm ? Math.min(now.flowLpm[a], coil.nominalFlowLpm) : coil.nominalFlowLpm;
    const t = steadyCoilTemperature(peak[a], coil.r20Ohm, COPPER_ALPHA_PER_K, supplyC, flow, coil.conductanceWPerK);
    if (t > worst.t) worst = { t, axis: a };
  }
  const ok = worst.t < limits.temperatureAlarmC;
  const value = Number.isFinite(worst.t) ? round(worst.t, 2) : null;
  return {
    name: 'coil-temperature', ok, value, limit: limits.temperatureAlarmC, unit: '°C',
    message: ok ? `Held at its largest current, pair ${worst.axis} would settle at ${value} °C (water at ${round(supplyC, 1)} °C), below the alarm level of ${limits.temperatureAlarmC} °C and the trip at ${limits.temperatureTripC} °C.`
      : value === null ? `The cooling of pair ${worst.axis} cannot carry the heat at that current (no flow or thermal runaway).`
        : `Held at its largest current, pair ${worst.axis} would settle at ${value} °C, at or above the alarm level of ${limits.temperatureAlarmC} °C (trip at ${limits.temperatureTripC} °C).`,
  };
}

function collapseCheck({ points, limits, noProfile }: PreflightInput): PreflightCheck {
  const limit = limits.collapseRatioLimit;
  if (noProfile) {
    return { name: 'collapse-ratio', ok: false, value: null, limit, unit: '', message: 'No sample profile is active, so the collapse ratio cannot be predicted: activate one on Sample profiles.' };
  }
  const withField = points.filter((p) => p.thetaDeg !== null);
  const unknown = withField.some((p) => p.collapseRatio === null);
  const worst = Math.max(0, ...withField.map((p) => p.collapseRatio ?? 0));
  const ok = !unknown && worst <= limit;
  return {
    name: 'collapse-ratio', ok, value: unknown ? null : round(worst, 4), limit, unit: '',
    message: unknown ? 'The collapse ratio could not be predicted for every point of the path (the model found no stable gas or failed there).'
      : ok ? `The predicted ε_dd/ε_dd,crit stays at or below ${round(worst, 3)}, under the limit of ${limit} set by the lead.`
        : `The predicted ε_dd/ε_dd,crit reaches ${round(worst, 3)}, above the limit of ${limit} set by the lead: the gas would come close to mean-field collapse.`,
  };
}
