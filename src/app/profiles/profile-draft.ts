import { SPECIES } from '../../../shared/physics/species';
import { SampleProfile, SampleProfileError, parseSampleProfile } from '../../../shared/profiles/sample-profile';

/** Species choices besides the table's keys. */
export const CUSTOM_MAGNETIC = 'custom-magnetic';
export const CUSTOM_ELECTRIC = 'custom-electric';

/** The profile form's fields, all as typed text (numbers are parsed on submit). */
export interface ProfileDraft {
  name: string;
  /** A key of the species table, or CUSTOM_MAGNETIC / CUSTOM_ELECTRIC. */
  species: string;
  customName: string;
  massU: string;
  magneticMomentMuB: string;
  dipoleDebye: string;
  polarization: string;
  atomNumber: string;
  trapX: string;
  trapY: string;
  trapZ: string;
  eulerAlpha: string;
  eulerBeta: string;
  eulerGamma: string;
  /** Comma-separated times, ms. */
  tofMs: string;
  /** "x", "y", "z" or "custom". */
  imaging: string;
  /** Comma-separated components, trap frame. */
  imagingU: string;
  imagingV: string;
}

export type DraftField = keyof ProfileDraft;

/** Every field of the draft once; the type makes a missing or extra one a compile error. */
const FIELD_SET: Record<DraftField, true> = {
  name: true, species: true, customName: true, massU: true, magneticMomentMuB: true, dipoleDebye: true, polarization: true,
  atomNumber: true, trapX: true, trapY: true, trapZ: true, eulerAlpha: true, eulerBeta: true, eulerGamma: true, tofMs: true,
  imaging: true, imagingU: true, imagingV: true,
};
export const DRAFT_FIELDS = Object.keys(FIELD_SET) as DraftField[];

/** Problems found in a draft: per field, and those that belong to no single field. */
export interface DraftProblems {
  fields: Partial<Record<DraftField, string>>;
  general: string[];
}

export type DraftResult = { profile: SampleProfile; problems: null } | { profile: null; problems: DraftProblems };

/** True when the species choice is a polar molecule (its lab-frame polarisation applies). */
export function isElectricSpecies(species: string): boolean {
  return species === CUSTOM_ELECTRIC || (Object.hasOwn(SPECIES, species) && SPECIES[species].dipoleDebye !== undefined);
}

/** The form's starting text for an existing profile (a new version starts from the one shown). */
export function draftFromProfile(profile: SampleProfile): ProfileDraft {
  const species = profile.species;
  const custom = typeof species === 'object' ? species : null;
  const euler = profile.trapToCoilEulerDeg;
  const imaging = profile.imaging;
  return {
    name: profile.name,
    species: typeof species === 'string' ? species : 'dipoleDebye' in species ? CUSTOM_ELECTRIC : CUSTOM_MAGNETIC,
    customName: custom?.name ?? '',
    massU: custom ? String(custom.massU) : '',
    magneticMomentMuB: custom && 'magneticMomentMuB' in custom ? String(custom.magneticMomentMuB) : '',
    dipoleDebye: custom && 'dipoleDebye' in custom ? String(custom.dipoleDebye) : '',
    polarization: profile.polarization === undefined ? '' : String(profile.polarization),
    atomNumber: String(profile.atomNumber),
    trapX: String(profile.trapHz[0]),
    trapY: String(profile.trapHz[1]),
    trapZ: String(profile.trapHz[2]),
    eulerAlpha: euler ? String(euler[0]) : '',
    eulerBeta: euler ? String(euler[1]) : '',
    eulerGamma: euler ? String(euler[2]) : '',
    tofMs: profile.tofMs.join(', '),
    imaging: typeof imaging === 'string' ? imaging : 'custom',
    imagingU: typeof imaging === 'string' ? '' : imaging.u.join(', '),
    imagingV: typeof imaging === 'string' ? '' : imaging.v.join(', '),
  };
}

/**
 * Turns the form's text into a sample profile, validated by the shared schema
 * (`parseSampleProfile`, the same rules the server applies). Every problem is returned with
 * the field it belongs to, in words that say what to fix.
 */
export function profileFromDraft(draft: ProfileDraft): DraftResult {
  const problems: DraftProblems = { fields: {}, general: [] };
  const number = (field: DraftField, label: string, optional = false): number | undefined => {
    const text = draft[field].replace(/\s+/g, '');
    if (text === '') {
      if (!optional) problems.fields[field] ??= `Enter ${label}.`;
      return undefined;
    }
    const value = Number(text);
    if (!Number.isFinite(value)) problems.fields[field] ??= `${capitalise(label)} must be a number (got “${draft[field].trim()}”).`;
    return value;
  };
  const list = (field: DraftField, label: string): number[] => {
    const parts = draft[field].split(/[,;\s]+/).filter((p) => p !== '');
    const values = parts.map(Number);
    if (parts.length === 0) problems.fields[field] ??= `Enter ${label}.`;
    else if (values.some((v) => !Number.isFinite(v))) problems.fields[field] ??= `${capitalise(label)} must be numbers separated by commas.`;
    return values;
  };

  const electric = isElectricSpecies(draft.species);
  let species: SampleProfile['species'] = draft.species;
  if (draft.species === CUSTOM_MAGNETIC || draft.species === CUSTOM_ELECTRIC) {
    const massU = number('massU', 'the mass in u') ?? Number.NaN;
    const name = draft.customName.trim() || undefined;
    species =
      draft.species === CUSTOM_MAGNETIC
        ? { massU, magneticMomentMuB: number('magneticMomentMuB', 'the magnetic moment in μB') ?? Number.NaN, ...(name ? { name } : {}) }
        : { massU, dipoleDebye: number('dipoleDebye', 'the electric dipole in D') ?? Number.NaN, ...(name ? { name } : {}) };
  } else if (!draft.species) {
    problems.fields.species = 'Choose a species.';
  }
  const eulerFields = ['eulerAlpha', 'eulerBeta', 'eulerGamma'] as const;
  const eulerGiven = eulerFields.some((f) => draft[f].trim() !== '');
  const euler = eulerFields.map((f, i) => number(f, EULER_LABELS[i], !eulerGiven));
  const candidate = {
    name: draft.name,
    species,
    ...(electric && draft.polarization.trim() !== '' ? { polarization: number('polarization', 'the polarisation (0…1)') } : {}),
    atomNumber: number('atomNumber', 'the atom number'),
    trapHz: [number('trapX', 'the trap frequency along x in Hz'), number('trapY', 'the trap frequency along y in Hz'), number('trapZ', 'the trap frequency along z in Hz')],
    ...(eulerGiven ? { trapToCoilEulerDeg: euler } : {}),
    tofMs: list('tofMs', 'the TOF times in ms'),
    imaging: draft.imaging === 'custom' ? { u: list('imagingU', 'the camera u vector'), v: list('imagingV', 'the camera v vector') } : draft.imaging,
  };
  if (Object.keys(problems.fields).length > 0) return { profile: null, problems };

  try {
    return { profile: parseSampleProfile(candidate), problems: null };
  } catch (err) {
    if (!(err instanceof SampleProfileError)) throw err;
    for (const issue of SampleProfile.safeParse(candidate).error?.issues ?? []) {
      const text = issue.code === 'unrecognized_keys' ? `unknown key(s) ${issue.keys.join(', ')}` : issue.message;
      const field = fieldOfPath(issue.path.map(String)) ?? fieldOfMessage(text);
      if (field) problems.fields[field] ??= sentence(text);
      else problems.general.push(sentence(text));
    }
    if (Object.keys(problems.fields).length === 0 && problems.general.length === 0) problems.general.push(err.message);
    return { profile: null, problems };
  }
}

/** The z-y-z turns by what they turn about (β is the Fermi-surface aspect ratio on every screen). */
const EULER_LABELS = ['the 1st turn (about coil z) in degrees', 'the 2nd turn (about the new y) in degrees', 'the 3rd turn (about the new z) in degrees'];
const TRAP_FIELDS: DraftField[] = ['trapX', 'trapY', 'trapZ'];
const EULER_FIELDS: DraftField[] = ['eulerAlpha', 'eulerBeta', 'eulerGamma'];

/** The form field of a schema issue path, e.g. ["trapHz", "1"] → trapY. */
export function fieldOfPath(path: string[]): DraftField | null {
  const [key, sub] = path;
  switch (key) {
    case 'name':
    case 'atomNumber':
    case 'polarization':
    case 'tofMs':
      return key;
    case 'species':
      return sub === 'massU' || sub === 'magneticMomentMuB' || sub === 'dipoleDebye' ? sub : 'species';
    case 'trapHz':
      return TRAP_FIELDS[Number(sub)] ?? 'trapX';
    case 'trapToCoilEulerDeg':
      return EULER_FIELDS[Number(sub)] ?? 'eulerAlpha';
    case 'imaging':
      return sub === 'u' ? 'imagingU' : sub === 'v' ? 'imagingV' : 'imaging';
    default:
      return null;
  }
}

/**
 * The form field a model message names: the physics model's checks run on the whole profile,
 * and their messages start with the input's name (e.g. "trapHz[1] (trap frequency along y) …").
 */
function fieldOfMessage(message: string): DraftField | null {
  const trap = /^trapHz\[(\d)\]/.exec(message);
  if (trap) return TRAP_FIELDS[Number(trap[1])] ?? null;
  if (/^atomNumber\b/.test(message)) return 'atomNumber';
  if (/^species\.massU\b/.test(message)) return 'massU';
  if (/^species\.magneticMomentMuB\b/.test(message)) return 'magneticMomentMuB';
  if (/^species\.dipoleDebye\b/.test(message)) return 'dipoleDebye';
  if (/^(unknown species|species\b)/.test(message)) return 'species';
  if (/^polarization\b/.test(message)) return 'polarization';
  if (/^imaging\.u and imaging\.v\b/.test(message)) return 'imagingV';
  if (/^imaging\.u\b/.test(message)) return 'imagingU';
  if (/^imaging\.v\b/.test(message)) return 'imagingV';
  return null;
}

function capitalise(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/** The schema's message as a sentence; its first word is often a key name, so it keeps its case. */
function sentence(text: string): string {
  const t = text.trim();
  return /[.!?)]$/.test(t) ? t : `${t}.`;
}
