import { describe, expect, it } from 'vitest';
import { DEMO_PROFILE } from '../../../shared/profiles/demo-profile';
import { CUSTOM_ELECTRIC, draftFromProfile, isElectricSpecies, profileFromDraft, type ProfileDraft } from './profile-draft';

const DRAFT = draftFromProfile(DEMO_PROFILE);

/** The field problems of a draft with the given changes. */
function problems(changes: Partial<ProfileDraft>) {
  const result = profileFromDraft({ ...DRAFT, ...changes });
  if (!result.problems) throw new Error('the draft was accepted');
  return result.problems;
}

describe('profile draft', () => {
  it('turns the demo profile into form text and back unchanged', () => {
    expect(DRAFT).toMatchObject({ species: '167Er', trapX: '350', trapY: '80', trapZ: '400', tofMs: '20', imaging: 'y', eulerAlpha: '15' });
    expect(profileFromDraft(DRAFT).profile).toEqual(DEMO_PROFILE);
  });

  it('asks for missing required numbers and names text that is not a number', () => {
    const found = problems({ atomNumber: '', trapY: 'eighty', tofMs: '' });
    expect(found.fields.atomNumber).toBe('Enter the atom number.');
    expect(found.fields.trapY).toBe('The trap frequency along y in Hz must be a number (got “eighty”).');
    expect(found.fields.tofMs).toBe('Enter the TOF times in ms.');
  });

  it('puts the shared schema’s and the model’s messages beside the field they are about', () => {
    expect(problems({ name: '  ' }).fields.name).toBe('Name must not be empty.');
    expect(problems({ atomNumber: '0' }).fields.atomNumber).toBe('Atom number must lie between 100 and 100000000.');
    expect(problems({ atomNumber: '2.5' }).fields.atomNumber).toBe('Atom number must lie between 100 and 100000000.');
    expect(problems({ trapZ: '-400' }).fields.trapZ).toBe('Frequency along z must lie between 1 and 10000 Hz.');
    expect(problems({ eulerAlpha: '100000', eulerBeta: '0', eulerGamma: '0' }).fields.eulerAlpha).toBe('1st turn, about coil z must lie between -360 and 360°.');
    expect(problems({ tofMs: '5, 10, 15, 20, 25' }).fields.tofMs).toBe('TOF times must list at most 4 times.');
    expect(problems({ imaging: 'custom', imagingU: '1, 0, 0', imagingV: '1, 1, 0' }).fields.imagingV).toBe('The camera u and v vectors must be perpendicular.');
    expect(problems({ species: '23Na40K', polarization: '1.5' }).fields.polarization).toMatch(/^Polarisation must lie between 0 and 1/);
  });

  it('needs all three Euler angles once one is given, and none otherwise', () => {
    expect(problems({ eulerAlpha: '', eulerBeta: '10', eulerGamma: '' }).fields.eulerAlpha).toBe('Enter the 1st turn (about coil z) in degrees.');
    const result = profileFromDraft({ ...DRAFT, eulerAlpha: '', eulerBeta: '', eulerGamma: '' });
    expect(result.profile).not.toBeNull();
    expect(result.profile && 'trapToCoilEulerDeg' in result.profile).toBe(false);
  });

  it('builds a custom molecule from mass, dipole and polarisation', () => {
    const result = profileFromDraft({ ...DRAFT, species: CUSTOM_ELECTRIC, massU: '63', dipoleDebye: '2.7', polarization: '0.4', customName: 'NaK-like' });
    expect(result.profile).toMatchObject({ species: { massU: 63, dipoleDebye: 2.7, name: 'NaK-like' }, polarization: 0.4 });
    expect(isElectricSpecies('167Er')).toBe(false);
    expect(isElectricSpecies('40K87Rb')).toBe(true);
  });
});
