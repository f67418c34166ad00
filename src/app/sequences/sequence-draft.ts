import type { SequenceStep } from '../../../shared/steering/steering-api';
import { MAX_RAMP_MS, MAX_TARGET_GAUSS } from '../../../shared/steering/target';
import { numberInRange } from '../steering/steer-draft';

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

/** What is wrong with a row: the input to fix and why, named as the table labels it. */
export interface RowProblem {
  field: keyof StepDraft;
  message: string;
}

/** The step of a row, or what is wrong with it. */
export function stepOfDraft(d: StepDraft): { step: SequenceStep } | { problem: RowProblem } {
  if (d.kind === 'shot') {
    const label = d.label.trim();
    if (!label) return { problem: { field: 'label', message: 'Label must not be empty' } };
    if (label.length > 100) return { problem: { field: 'label', message: 'Label must be at most 100 characters' } };
    return { step: { kind: 'shot', label } };
  }
  const duration = numberInRange(d.durationS, 'Duration', d.kind === 'hold' ? 0.001 : 0, MAX_RAMP_MS / 1000, 's');
  if (typeof duration === 'string') return { problem: { field: 'durationS', message: duration } };
  const durationMs = Math.round(duration * 1000);
  if (d.kind === 'hold') return { step: { kind: 'hold', durationMs } };
  const values = {
    magnitudeG: numberInRange(d.magnitudeG, '|B|', 0, MAX_TARGET_GAUSS, 'G'),
    thetaDeg: numberInRange(d.thetaDeg, 'θ', 0, 180, '°'),
    phiDeg: numberInRange(d.phiDeg, 'φ', 0, 360, '°', true),
  };
  for (const [field, v] of Object.entries(values)) if (typeof v === 'string') return { problem: { field: field as keyof StepDraft, message: v } };
  const { magnitudeG, thetaDeg, phiDeg } = values as Record<keyof typeof values, number>;
  return { step: { kind: 'ramp', magnitudeG, thetaDeg, phiDeg, durationMs } };
}

/** Every row checked: the steps when all are valid, and the problem of each row (null when fine). */
export function checkDrafts(rows: readonly StepDraft[]): { steps: SequenceStep[] | null; problems: (RowProblem | null)[] } {
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
