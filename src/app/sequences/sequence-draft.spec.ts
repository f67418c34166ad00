import { describe, expect, it } from 'vitest';
import { blankStep, checkDrafts, draftOfStep, stepOfDraft, totalDurationMs } from './sequence-draft';

describe('sequence editor rows', () => {
  it('turns rows into steps, seconds into ms, and back', () => {
    const rows = [
      { ...blankStep('ramp'), magnitudeG: '6', thetaDeg: '54.74', phiDeg: '0', durationS: '4' },
      { ...blankStep('hold'), durationS: '2.5' },
      { ...blankStep('shot'), label: ' magic angle ' },
    ];
    const { steps, problems } = checkDrafts(rows);
    expect(problems).toEqual([null, null, null]);
    expect(steps).toEqual([
      { kind: 'ramp', magnitudeG: 6, thetaDeg: 54.74, phiDeg: 0, durationMs: 4000 },
      { kind: 'hold', durationMs: 2500 },
      { kind: 'shot', label: 'magic angle' },
    ]);
    expect(totalDurationMs(steps!)).toBe(6500);
    expect(steps!.map(draftOfStep).map(stepOfDraft)).toEqual(steps!.map((step) => ({ step })));
  });

  it('names the field of a bad row as the table labels it', () => {
    const { steps, problems } = checkDrafts([
      { ...blankStep('ramp'), thetaDeg: '200' },
      { ...blankStep('ramp'), phiDeg: '360' },
      { ...blankStep('hold'), durationS: 'x' },
      { ...blankStep('shot'), label: '  ' },
    ]);
    expect(steps).toBeNull();
    expect(problems).toEqual([
      { field: 'thetaDeg', message: 'θ must be from 0 to 180 °' },
      { field: 'phiDeg', message: 'φ must be from 0 to below 360 °' },
      { field: 'durationS', message: 'Duration must be a number in s' },
      { field: 'label', message: 'Label must not be empty' },
    ]);
    expect(checkDrafts([]).steps).toBeNull();
  });
});
