import type { SequenceStep } from '../../../shared/steering/steering-api';

/** One step row as typed in the editor (times in seconds). */
export interface StepDraft {
  kind: SequenceStep['kind'];
  magnitudeG: string;
  thetaDeg: string;
  phiDeg: string;
  durationS: string;
  label: string;
}

export function blankStep(kind: SequenceStep['kind']): StepDraft {
  return { kind, magnitudeG: '8', thetaDeg: '0', phiDeg: '0', durationS: kind === 'ramp' ? '3' : '2', label: kind === 'shot' ? 'shot' : '' };
}

export function draftOfStep(step: SequenceStep): StepDraft {
  const base = blankStep(step.kind);
  if (step.kind === 'ramp') return { ...base, magnitudeG: String(step.magnitudeG), thetaDeg: String(step.thetaDeg), phiDeg: String(step.phiDeg), durationS: String(step.durationMs / 1000) };
  if (step.kind === 'hold') return { ...base, durationS: String(step.durationMs / 1000) };
  return { ...base, label: step.label };
}

/** The step of a row, or what is wrong with it (as the editor labels the fields). */
export function stepOfDraft(d: StepDraft): { step: SequenceStep } | { problem: string } {
  const num = (text: string, label: string, min: number, max: number, unit: string, maxExclusive = false): number | string => {
    const v = Number(text.trim().replace(',', '.'));
    if (text.trim() === '' || !Number.isFinite(v)) return `${label} must be a number in ${unit}`;
    if (v < min || (maxExclusive ? v >= max : v > max)) return `${label} must be from ${min} to ${maxExclusive ? 'below ' : ''}${max} ${unit}`;
    return v;
  };
  if (d.kind === 'shot') {
    const label = d.label.trim();
    if (!label) return { problem: 'Label must not be empty' };
    if (label.length > 100) return { problem: 'Label must be at most 100 characters' };
    return { step: { kind: 'shot', label } };
  }
  const duration = num(d.durationS, 'Duration', d.kind === 'hold' ? 0.001 : 0, 3600, 's');
  if (typeof duration === 'string') return { problem: duration };
  const durationMs = Math.round(duration * 1000);
  if (d.kind === 'hold') return { step: { kind: 'hold', durationMs } };
  const magnitudeG = num(d.magnitudeG, '|B|', 0, 1000, 'G');
  const thetaDeg = num(d.thetaDeg, 'θ', 0, 180, '°');
  const phiDeg = num(d.phiDeg, 'φ', 0, 360, '°', true);
  for (const v of [magnitudeG, thetaDeg, phiDeg]) if (typeof v === 'string') return { problem: v };
  return { step: { kind: 'ramp', magnitudeG: magnitudeG as number, thetaDeg: thetaDeg as number, phiDeg: phiDeg as number, durationMs } };
}

/** Every row checked: the steps when all are valid, and the problem of each row (null when fine). */
export function checkDrafts(rows: readonly StepDraft[]): { steps: SequenceStep[] | null; problems: (string | null)[] } {
  const results = rows.map(stepOfDraft);
  const problems = results.map((r) => ('problem' in r ? r.problem : null));
  const ok = rows.length > 0 && problems.every((p) => p === null);
  return { steps: ok ? results.map((r) => (r as { step: SequenceStep }).step) : null, problems };
}

/** Total time of the steps, ms (ramps and holds; shots take no time of their own). */
export function totalDurationMs(steps: readonly SequenceStep[]): number {
  return steps.reduce((t, s) => t + (s.kind === 'shot' ? 0 : s.durationMs), 0);
}

/** A step in words, for tables and the run's progress. */
export function describeStep(step: SequenceStep): string {
  if (step.kind === 'ramp') return `ramp to |B| ${step.magnitudeG} G, θ ${step.thetaDeg}°, φ ${step.phiDeg}° over ${step.durationMs / 1000} s`;
  if (step.kind === 'hold') return `hold ${step.durationMs / 1000} s`;
  return `shot “${step.label}”`;
}
