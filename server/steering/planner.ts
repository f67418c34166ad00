/**
 * Turns a steer target or a sequence into planned points (time, field, currents) from the
 * field in force now, and fills in the predictions along them.
 */
import type { CalibrationBody } from '../../shared/field/calibration.js';
import type { Vec3 } from '../../shared/field/field-vector.js';
import type { ProfileRecord } from '../../shared/profiles/profile-record.js';
import { profileTrapField } from '../../shared/profiles/trap-orientation.js';
import type { PlannedPoint, SequenceStep } from '../../shared/steering/steering-api.js';
import { planPath, targetVector, type PathPoint } from '../../shared/steering/target.js';
import type { PathPredictor } from './path-predictor.js';

/** A ramp to a target over `rampMs`, starting `startMs` after the plan begins. */
export interface PlannedRamp {
  startMs: number;
  from: Vec3;
  to: Vec3;
  rampMs: number;
}

/** The ramps of a sequence (holds and shots only move the clock or nothing), from the field `from`. */
export function rampsOfSequence(steps: readonly SequenceStep[], from: Vec3): { ramps: PlannedRamp[]; durationMs: number } {
  const ramps: PlannedRamp[] = [];
  let t = 0;
  let field = from;
  for (const step of steps) {
    if (step.kind === 'ramp') {
      const to = targetVector(step);
      ramps.push({ startMs: t, from: field, to, rampMs: step.durationMs });
      field = to;
      t += step.durationMs;
    } else if (step.kind === 'hold') {
      t += step.durationMs;
    }
  }
  return { ramps, durationMs: t };
}

/** Planned points of every ramp, in time order, without predictions. */
export function plannedPoints(cal: CalibrationBody, ramps: readonly PlannedRamp[]): PlannedPoint[] {
  return ramps.flatMap((r) =>
    planPath(cal, r.from, r.to, r.rampMs).map((p: PathPoint) => ({ ...p, tMs: r.startMs + p.tMs, mapThetaDeg: null, mapPhiDeg: null, fermiSurfaceAspect: null, collapseRatio: null })),
  );
}

/**
 * The points with β and ε_dd/ε_dd,crit predicted for the active sample profile: each point's
 * currents give the field in the profile's trap frame (the frame the model works in). A point
 * without field (|B| = 0) keeps nulls.
 */
export async function withPredictions(
  cal: CalibrationBody,
  profile: ProfileRecord,
  points: readonly PlannedPoint[],
  predictor: Pick<PathPredictor, 'evaluate'>,
): Promise<PlannedPoint[]> {
  const directions: { index: number; thetaDeg: number; phiDeg: number }[] = [];
  points.forEach((p, index) => {
    const f = profileTrapField(cal, profile.profile, p.currentsA);
    if (f.thetaDeg !== null && f.phiDeg !== null) directions.push({ index, thetaDeg: f.thetaDeg, phiDeg: f.phiDeg });
  });
  const out = points.map((p) => ({ ...p }));
  for (const d of directions) {
    out[d.index].mapThetaDeg = d.thetaDeg;
    out[d.index].mapPhiDeg = d.phiDeg;
  }
  const predicted = await predictor.evaluate(profile, directions);
  directions.forEach((d, i) => {
    out[d.index].fermiSurfaceAspect = predicted[i].fermiSurfaceAspect;
    out[d.index].collapseRatio = predicted[i].collapseRatio;
  });
  return out;
}
