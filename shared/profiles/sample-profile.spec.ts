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

  it('names each input to fix as the form labels it', () => {
    expect(problem({ ...DEMO_PROFILE, name: ' ' })).toMatch(/Name must not be empty/);
    expect(problem({ ...DEMO_PROFILE, trapHz: [350, 80] })).toMatch(/The trap frequencies must be three numbers/);
    expect(problem({ ...DEMO_PROFILE, tofMs: [] })).toMatch(/TOF times must list at least one time/);
    expect(problem({ ...DEMO_PROFILE, tofMs: [1, 2, 3, 4, 5] })).toMatch(/at most 4 times/);
    expect(problem({ ...DEMO_PROFILE, tofMs: [20, -1] })).toMatch(/Each of the TOF times must lie between 0 and 200 ms/);
    expect(problem({ ...DEMO_PROFILE, imaging: 'w' })).toMatch(/Camera line of sight must be along x, y or z/);
    expect(problem({ ...DEMO_PROFILE, species: { massU: 167 } })).toMatch(/Species must be one of 167Er/);
    expect(problem({ ...DEMO_PROFILE, colour: 'red' })).toMatch(/unknown key\(s\) colour/);
    expect(problem({ ...DEMO_PROFILE, trapToCoilEulerDeg: [0, Number.NaN, 0] })).toMatch(/2nd turn, about the new y must be a number/);
    expect(problem('167Er')).toMatch(/must be an object with name, species/);
  });

  it('refuses values outside the physically sensible ranges the form states', () => {
    expect(problem({ ...DEMO_PROFILE, atomNumber: 0 })).toBe('sample profile: Atom number must lie between 100 and 100000000');
    expect(problem({ ...DEMO_PROFILE, atomNumber: 2.5 })).toMatch(/Atom number must lie between 100 and 100000000/);
    expect(problem({ ...DEMO_PROFILE, atomNumber: 1e12 })).toMatch(/Atom number must lie between 100 and 100000000/);
    expect(problem({ ...DEMO_PROFILE, trapHz: [350, 0, 400] })).toBe('sample profile: Frequency along y must lie between 1 and 10000 Hz');
    expect(problem({ ...DEMO_PROFILE, trapToCoilEulerDeg: [100_000, 0, 0] })).toMatch(/1st turn, about coil z must lie between -360 and 360°/);
  });

  it('passes on the model’s message for non-physical values the ranges do not cover', () => {
    expect(problem({ ...DEMO_PROFILE, species: 'Er168' })).toMatch(/unknown species "Er168"/);
    expect(problem({ ...DEMO_PROFILE, species: { massU: -3, dipoleDebye: 1 } })).toMatch(/Species must be one of/);
    expect(problem({ ...DEMO_PROFILE, polarization: 0.5 })).toMatch(/Polarisation applies only to electric-dipole species/);
    expect(problem({ ...DEMO_PROFILE, species: '23Na40K', polarization: 1.2 })).toMatch(/Polarisation must lie between 0 and 1/);
    expect(problem({ ...DEMO_PROFILE, imaging: { u: [1, 0, 0], v: [1, 1, 0] } })).toMatch(/The camera u and v vectors must be perpendicular/);
  });
});
