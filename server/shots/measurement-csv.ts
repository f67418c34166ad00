import { MEASUREMENT_COLUMNS, type ShotMeasurement } from '../../shared/shots/shots-api.js';
import { textProblem } from '../../shared/validation/edge-rules.js';
import { DECIMAL, printable, readCsvRecords } from '../csv/csv-records.js';

/** One line of a measurement file; `line` is the file line (header = line 1). */
export interface MeasurementLine extends ShotMeasurement {
  line: number;
  shotId: string;
}

/** A measurement file that cannot be stored; the message names the line and what to fix. */
export class MeasurementInputError extends Error {
  override readonly name = 'MeasurementInputError';
}

/** At most this many data lines in one file (a day of shots is tens to thousands). */
export const MAX_MEASUREMENT_LINES = 20_000;
/** Longest shot id accepted (ids written by Tiltwatch are about 30 characters). */
const MAX_SHOT_ID = 100;
const REQUIRED = MEASUREMENT_COLUMNS.slice(0, 3);
const EXPECTED = `${MEASUREMENT_COLUMNS.join(', ')} (the last optional)`;

function refuse(message: string): never {
  throw new MeasurementInputError(message);
}

/**
 * Reads the imaging analysis's CSV (header line, then one line per shot) with csv-parse and
 * checks every cell: the aspect ratio is long over short axis (≥ 1, docs/physics.md §6.1),
 * the angle in −180…180°, sigma positive or empty. A shot may appear only once per file.
 * Whether the shot ids exist is the store's check, inside its transaction.
 */
export function parseMeasurementCsv(text: string): MeasurementLine[] {
  const records = readCsvRecords(text, refuse);
  if (records.length === 0) refuse(`the file is empty: expected a header line with ${EXPECTED}`);
  const [header, ...rows] = records;
  const index = new Map<string, number>();
  header.cells.forEach((name, i) => {
    if (!(MEASUREMENT_COLUMNS as readonly string[]).includes(name)) {
      refuse(`line ${header.line}, column ${i + 1}: "${printable(name)}" is not a measurement column; expected ${EXPECTED}`);
    }
    if (index.has(name)) refuse(`line ${header.line}, column ${i + 1}: ${name} appears twice`);
    index.set(name, i);
  });
  const missing = REQUIRED.find((name) => !index.has(name));
  if (missing) refuse(`line ${header.line}: column ${missing} is missing; expected ${EXPECTED}`);
  if (rows.length === 0) refuse(`the file has a header but no shots: add one line per shot after line ${header.line}`);
  if (rows.length > MAX_MEASUREMENT_LINES) refuse(`the file has ${rows.length} data lines; at most ${MAX_MEASUREMENT_LINES} are accepted`);

  const seen = new Map<string, number>();
  return rows.map(({ cells, line }) => {
    // Only the optional sigma cell may be left off the end of a line.
    const shortOf = REQUIRED.some((name) => index.get(name)! >= cells.length);
    if (cells.length > header.cells.length || shortOf) refuse(`line ${line}: ${cells.length} cells, but the header has ${header.cells.length} columns`);
    const raw = (name: string) => cells[index.get(name)!] ?? '';
    const number = (name: string): number => {
      const value = raw(name);
      if (value === '') refuse(`line ${line}, column ${name}: empty; a number is needed`);
      if (!DECIMAL.test(value) || !Number.isFinite(Number(value))) refuse(`line ${line}, column ${name}: "${printable(value)}" is not a number`);
      return Number(value);
    };
    const shotId = raw('shot');
    if (shotId === '') refuse(`line ${line}, column shot: empty; the shot id is needed`);
    if (shotId.length > MAX_SHOT_ID || textProblem(shotId)) refuse(`line ${line}, column shot: "${printable(shotId)}" is not a shot id`);
    const first = seen.get(shotId);
    if (first !== undefined) refuse(`line ${line}, column shot: shot ${printable(shotId)} appears again (first on line ${first}); give each shot once`);
    seen.set(shotId, line);
    const tofAspect = number('tof_aspect_ratio');
    if (!(tofAspect >= 1) || tofAspect > 100) refuse(`line ${line}, column tof_aspect_ratio: ${tofAspect} must be from 1 to 100 (long axis over short axis)`);
    const tofAngleDeg = number('tof_angle_deg');
    if (Math.abs(tofAngleDeg) > 180) refuse(`line ${line}, column tof_angle_deg: ${tofAngleDeg} must be from −180 to 180°`);
    const sigmaText = index.has('sigma_aspect_ratio') ? raw('sigma_aspect_ratio') : '';
    const sigma = sigmaText === '' ? null : number('sigma_aspect_ratio');
    if (sigma !== null && !(sigma > 0 && sigma < 100)) refuse(`line ${line}, column sigma_aspect_ratio: ${sigma} must be positive (a standard deviation), or leave the cell empty`);
    return { line, shotId, tofAspect, tofAngleDeg, sigma };
  });
}
