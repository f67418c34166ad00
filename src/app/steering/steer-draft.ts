import type { SteerTargetRequest } from '../../../shared/steering/steering-api';

/** The Steer form as typed: text per field (ramp time in seconds). */
export interface SteerDraft {
  magnitudeG: string;
  thetaDeg: string;
  phiDeg: string;
  rampS: string;
  reason: string;
}

export const EMPTY_DRAFT: SteerDraft = { magnitudeG: '', thetaDeg: '', phiDeg: '', rampS: '10', reason: '' };

/** The request for a draft, or the first problem named as the form labels the field. */
export function requestFromDraft(d: SteerDraft): { request: SteerTargetRequest } | { problem: string } {
  const number = (text: string, label: string, min: number, max: number, unit: string, maxExclusive = false): number | string => {
    const v = Number(text.trim().replace(',', '.'));
    if (text.trim() === '' || !Number.isFinite(v)) return `${label} must be a number in ${unit}`;
    if (v < min || (maxExclusive ? v >= max : v > max)) return `${label} must be from ${min} to ${maxExclusive ? 'below ' : ''}${max} ${unit}`;
    return v;
  };
  const magnitudeG = number(d.magnitudeG, '|B|', 0, 1000, 'G');
  const thetaDeg = number(d.thetaDeg, 'θ', 0, 180, '°');
  const phiDeg = number(d.phiDeg, 'φ', 0, 360, '°', true);
  const rampS = number(d.rampS, 'Ramp time', 0, 3600, 's');
  for (const v of [magnitudeG, thetaDeg, phiDeg, rampS]) if (typeof v === 'string') return { problem: v };
  const reason = d.reason.trim();
  if (!reason) return { problem: 'Reason must say why (it goes into the audit trail)' };
  return { request: { magnitudeG: magnitudeG as number, thetaDeg: thetaDeg as number, phiDeg: phiDeg as number, rampMs: Math.round((rampS as number) * 1000), reason } };
}
