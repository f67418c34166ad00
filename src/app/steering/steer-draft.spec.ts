import { describe, expect, it } from 'vitest';
import { requestFromDraft } from './steer-draft';

describe('Steer form', () => {
  it('sends the ramp time in ms and accepts a decimal comma', () => {
    expect(requestFromDraft({ magnitudeG: '9', thetaDeg: '54,7', phiDeg: '120', rampS: '2.5', reason: ' scan ' })).toEqual({
      request: { magnitudeG: 9, thetaDeg: 54.7, phiDeg: 120, rampMs: 2500, reason: 'scan' },
    });
  });

  it('names each field to fix as the form labels it', () => {
    const base = { magnitudeG: '9', thetaDeg: '50', phiDeg: '10', rampS: '5', reason: 'x' };
    expect(requestFromDraft({ ...base, magnitudeG: '' })).toEqual({ problems: { magnitudeG: '|B| must be a number in G' } });
    expect(requestFromDraft({ ...base, thetaDeg: '181' })).toEqual({ problems: { thetaDeg: 'θ (from trap z) must be from 0 to 180 °' } });
    expect(requestFromDraft({ ...base, phiDeg: '360', reason: ' ' })).toEqual({
      problems: { phiDeg: 'φ (from trap x to y) must be from 0 to below 360 °', reason: 'Reason (goes into the audit trail) must say why' },
    });
    expect(requestFromDraft({ ...base, rampS: '3601' })).toEqual({ problems: { rampS: 'Ramp time must be from 0 to 3600 s' } });
  });
});
