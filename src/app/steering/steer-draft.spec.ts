import { describe, expect, it } from 'vitest';
import { requestFromDraft } from './steer-draft';

describe('Steer form', () => {
  it('sends the ramp time in ms and accepts a decimal comma', () => {
    expect(requestFromDraft({ magnitudeG: '9', thetaDeg: '54,7', phiDeg: '120', rampS: '2.5', reason: ' scan ' })).toEqual({
      request: { magnitudeG: 9, thetaDeg: 54.7, phiDeg: 120, rampMs: 2500, reason: 'scan' },
    });
  });

  it('names the field to fix', () => {
    const base = { magnitudeG: '9', thetaDeg: '50', phiDeg: '10', rampS: '5', reason: 'x' };
    expect(requestFromDraft({ ...base, magnitudeG: '' })).toEqual({ problem: '|B| must be a number in G' });
    expect(requestFromDraft({ ...base, thetaDeg: '181' })).toEqual({ problem: 'θ must be from 0 to 180 °' });
    expect(requestFromDraft({ ...base, phiDeg: '360' })).toEqual({ problem: 'φ must be from 0 to below 360 °' });
    expect(requestFromDraft({ ...base, reason: ' ' })).toEqual({ problem: 'Reason must say why (it goes into the audit trail)' });
  });
});
