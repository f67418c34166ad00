import type { SteerTargetRequest } from '../../../shared/steering/steering-api';
import { MAX_RAMP_MS, MAX_TARGET_GAUSS } from '../../../shared/steering/target';

/** The Steer form as typed: text per field (ramp time in seconds). */
export interface SteerDraft {
  magnitudeG: string;
  thetaDeg: string;
  phiDeg: string;
  rampS: string;
  reason: string;
}

export const EMPTY_DRAFT: SteerDraft = { magnitudeG: '', thetaDeg: '', phiDeg: '', rampS: '10', reason: '' };

/** The labels of the New target form; its refusals name the fields by them. */
export const STEER_LABELS: Readonly<Record<keyof SteerDraft, string>> = {
  magnitudeG: '|B|',
  thetaDeg: 'θ (from trap z)',
  phiDeg: 'φ (from trap x to y)',
  rampS: 'Ramp time',
  reason: 'Reason (goes into the audit trail)',
};

/** What is wrong with a draft, by field. */
export type SteerDraftProblems = Partial<Record<keyof SteerDraft, string>>;

/** The number typed in `text` (a decimal comma too) when it lies in range, else what is wrong, naming the field `label`. */
export function numberInRange(text: string, label: string, min: number, max: number, unit: string, maxExclusive = false): number | string {
  const v = Number(text.trim().replace(',', '.'));
  if (text.trim() === '' || !Number.isFinite(v)) return `${label} must be a number in ${unit}`;
  if (v < min || (maxExclusive ? v >= max : v > max)) return `${label} must be from ${min} to ${maxExclusive ? 'below ' : ''}${max} ${unit}`;
  return v;
}

/** The request for a draft, or the problem of each field to fix, named as the form labels it. */
export function requestFromDraft(d: SteerDraft): { request: SteerTargetRequest } | { problems: SteerDraftProblems } {
  const values = {
    magnitudeG: numberInRange(d.magnitudeG, STEER_LABELS.magnitudeG, 0, MAX_TARGET_GAUSS, 'G'),
    thetaDeg: numberInRange(d.thetaDeg, STEER_LABELS.thetaDeg, 0, 180, '°'),
    phiDeg: numberInRange(d.phiDeg, STEER_LABELS.phiDeg, 0, 360, '°', true),
    rampS: numberInRange(d.rampS, STEER_LABELS.rampS, 0, MAX_RAMP_MS / 1000, 's'),
  };
  const reason = d.reason.trim();
  const problems: SteerDraftProblems = Object.fromEntries(Object.entries(values).filter(([, v]) => typeof v === 'string'));
  if (!reason) problems.reason = `${STEER_LABELS.reason} must say why`;
  if (Object.keys(problems).length > 0) return { problems };
  const { magnitudeG, thetaDeg, phiDeg, rampS } = values as Record<keyof typeof values, number>;
  return { request: { magnitudeG, thetaDeg, phiDeg, rampMs: Math.round(rampS * 1000), reason } };
}
