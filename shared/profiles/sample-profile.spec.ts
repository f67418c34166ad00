import { describe, expect, it } from 'vitest';
import { DEMO_PROFILE } from './demo-profile.js';
import { parseSampleProfile, SampleProfile, SampleProfileError } from './sample-profile.js';

const problem = (value: unknown) => {
  try {
    parseSampleProfile(value);
  } catch (err) {
    expect(err).toBeInstanceOf(SampleProfileError);
    return (err as Error).message;
  }
  throw new Error('the profile was accepted');
};

describe('SampleProfile', () => {
  it('accepts the demo profile, custom species and vector imaging', () => {
    expect(parseSampleProfile(DEMO_PROFILE)).toEqual(DEMO_PROFILE);
    const custom = {
      name: '  Dy test  ',
      species: { massU: 160.93, magneticMomentMuB: 9.93, name: 'Dy' },
      atomNumber: 1e4,
      trapHz: [100, 100, 300],
      tofMs: [0, 5, 10, 15],
      imaging: { u: [1, 0, 0], v: [0, 1, 1] },
    };
    expect(parseSampleProfile(custom).name).toBe('Dy test');
    const molecule = { ...DEMO_PROFILE, species: { massU: 63, dipoleDebye: 2.7 }, polarization: 0.4 };
    expect(SampleProfile.safeParse(molecule).success).toBe(true);
    expect(SampleProfile.safeParse({ ...DEMO_PROFILE, species: '40K87Rb', polarization: 0.5 }).success).toBe(true);
  });

  it('names the key to fix for each bad shape', () => {
    expect(problem({ ...DEMO_PROFILE, name: ' ' })).toMatch(/name: name must not be empty/);
    expect(problem({ ...DEMO_PROFILE, trapHz: [350, 80] })).toMatch(/trapHz: .*three finite numbers/);
    expect(problem({ ...DEMO_PROFILE, tofMs: [] })).toMatch(/tofMs: tofMs must list at least one time/);
    expect(problem({ ...DEMO_PROFILE, tofMs: [1, 2, 3, 4, 5] })).toMatch(/at most 4 times/);
    expect(problem({ ...DEMO_PROFILE, tofMs: [20, -1] })).toMatch(/tofMs\.1: each tofMs entry must be a time ≥ 0/);
    expect(problem({ ...DEMO_PROFILE, imaging: 'w' })).toMatch(/imaging: imaging must be "x", "y", "z" or/);
    expect(problem({ ...DEMO_PROFILE, species: { massU: 167 } })).toMatch(/species: species must be one of 167Er/);
    expect(problem({ ...DEMO_PROFILE, colour: 'red' })).toMatch(/unknown key\(s\) colour/);
    expect(problem({ ...DEMO_PROFILE, trapToCoilEulerDeg: [0, Number.NaN, 0] })).toMatch(/trapToCoilEulerDeg\.1: .*three finite numbers/);
    expect(problem('167Er')).toMatch(/must be an object with name, species/);
  });

  it('passes on the model’s message for non-physical values', () => {
    expect(problem({ ...DEMO_PROFILE, atomNumber: 0 })).toMatch(/atomNumber must be a positive finite number/);
    expect(problem({ ...DEMO_PROFILE, trapHz: [350, 0, 400] })).toMatch(/trapHz\[1\] \(trap frequency along y\) must be a positive/);
    expect(problem({ ...DEMO_PROFILE, species: 'Er168' })).toMatch(/unknown species "Er168"/);
    expect(problem({ ...DEMO_PROFILE, species: { massU: -3, dipoleDebye: 1 } })).toMatch(/species\.massU must be a positive/);
    expect(problem({ ...DEMO_PROFILE, polarization: 0.5 })).toMatch(/polarization applies only to electric-dipole species/);
    expect(problem({ ...DEMO_PROFILE, species: '23Na40K', polarization: 1.2 })).toMatch(/polarization must lie between 0 and 1/);
    expect(problem({ ...DEMO_PROFILE, imaging: { u: [1, 0, 0], v: [1, 1, 0] } })).toMatch(/imaging\.u and imaging\.v must be perpendicular/);
  });
});
