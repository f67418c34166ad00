import { DECIMAL, printable, readCsvRecords } from '../../csv/csv-records.js';
import { CalibrationInputError } from './fit-input-error.js';

export type Triple = [number, number, number];

/** One measurement of |B| (G) at a set of coil currents (A); `line` is the file line. */
export interface MagnitudePoint {
  line: number;
  currentA: Triple;
  fieldGauss: number;
  /** One standard deviation of `fieldGauss`, G; null when the file has no sigma column. */
  sigmaGauss: number | null;
}

/** One vector-probe reading: B in the trap frame (G) at a set of coil currents (A). */
export interface VectorPoint {
  line: number;
  currentA: Triple;
  fieldGauss: Triple;
}

export type CalibrationData =
  | { kind: 'magnitude'; source: 'field' | 'frequency'; points: MagnitudePoint[] }
  | { kind: 'vector'; points: VectorPoint[] };

export interface CsvOptions {
  /** Linear Zeeman coefficient of the transition, MHz/G; needed for a `frequency_MHz` file. */
  mhzPerGauss?: number;
}

export const CURRENT_COLUMNS = ['current_x_A', 'current_y_A', 'current_z_A'] as const;
const VECTOR_COLUMNS = ['field_x_G', 'field_y_G', 'field_z_G'] as const;
const KNOWN_COLUMNS = new Set<string>([...CURRENT_COLUMNS, ...VECTOR_COLUMNS, 'field_G', 'sigma_G', 'frequency_MHz', 'sigma_MHz']);

/** At most this many data lines in one file (a calibration run has tens to thousands). */
export const MAX_DATA_LINES = 100_000;
/** Largest magnitude accepted in any cell: far beyond any coil current (A) or field (G) of a lab magnet. */
const MAX_ABS_VALUE = 1e6;

const EXPECTED =
  'current_x_A, current_y_A, current_z_A and then field_G (optional sigma_G), frequency_MHz (optional sigma_MHz) or field_x_G, field_y_G, field_z_G';

/**
 * Reads a calibration CSV (header line, comma-separated, `#` starts a comment line) with
 * csv-parse and checks every cell. Refusals name the file line (header = line 1) and column.
 */
export function parseCalibrationCsv(text: string, options: CsvOptions = {}): CalibrationData {
  const records = readCsvRecords(text, (message) => {
    throw new CalibrationInputError(message);
  }).map((r) => ({ record: r.cells, info: { lines: r.line } }));
  if (records.length === 0) throw new CalibrationInputError(`the file is empty: expected a header line with ${EXPECTED}`);
  const header = records[0].record;
  const headerLine = records[0].info.lines;
  const index = new Map<string, number>();
  header.forEach((name, i) => {
    if (!KNOWN_COLUMNS.has(name)) {
      throw new CalibrationInputError(`line ${headerLine}, column ${i + 1}: "${printable(name)}" is not a calibration column; expected ${EXPECTED}`);
    }
    if (index.has(name)) throw new CalibrationInputError(`line ${headerLine}, column ${i + 1}: ${name} appears twice`);
    index.set(name, i);
  });
  for (const name of CURRENT_COLUMNS) {
    if (!index.has(name)) throw new CalibrationInputError(`line ${headerLine}: column ${name} is missing; expected ${EXPECTED}`);
  }
  const rows = records.slice(1);
  if (rows.length > MAX_DATA_LINES) throw new CalibrationInputError(`the file has ${rows.length} data lines; at most ${MAX_DATA_LINES} are accepted`);
  const cell = (row: (typeof rows)[number], name: string): number => {
    const column = index.get(name)!;
    const line = row.info.lines;
    if (row.record.length !== header.length) {
      throw new CalibrationInputError(`line ${line}: ${row.record.length} cells, but the header has ${header.length} columns`);
    }
    const raw = row.record[column];
    if (!DECIMAL.test(raw)) throw new CalibrationInputError(`line ${line}, column ${name}: "${printable(raw)}" is not a number`);
    const value = Number(raw);
    if (!Number.isFinite(value) || Math.abs(value) > MAX_ABS_VALUE) {
      throw new CalibrationInputError(`line ${line}, column ${name}: ${raw} is out of range (|value| ≤ ${MAX_ABS_VALUE})`);
    }
    return value;
  };
  const currents = (row: (typeof rows)[number]): Triple => [cell(row, CURRENT_COLUMNS[0]), cell(row, CURRENT_COLUMNS[1]), cell(row, CURRENT_COLUMNS[2])];
  const positive = (row: (typeof rows)[number], name: string): number => {
    const value = cell(row, name);
    if (!(value > 0)) throw new CalibrationInputError(`line ${row.info.lines}, column ${name}: ${value} must be positive (a standard deviation)`);
    return value;
  };
  const notNegative = (row: (typeof rows)[number], name: string): number => {
    const value = cell(row, name);
    if (value < 0) throw new CalibrationInputError(`line ${row.info.lines}, column ${name}: ${value} must not be negative (a field magnitude or Zeeman shift)`);
    return value;
  };

  const vector = VECTOR_COLUMNS.filter((name) => index.has(name));
  const magnitudeColumns = ['field_G', 'frequency_MHz'].filter((name) => index.has(name));
  if (vector.length > 0) {
    const missing = VECTOR_COLUMNS.find((name) => !index.has(name));
    if (missing) throw new CalibrationInputError(`line ${headerLine}: column ${missing} is missing; a vector-probe file needs field_x_G, field_y_G and field_z_G`);
    const extra = ['field_G', 'frequency_MHz', 'sigma_G', 'sigma_MHz'].find((name) => index.has(name));
    if (extra) throw new CalibrationInputError(`line ${headerLine}, column ${extra}: a vector-probe file has no ${extra} column`);
    refuseCoefficient(options, 'a vector-probe file');
    return {
      kind: 'vector',
      points: rows.map((row) => ({
        line: row.info.lines,
        currentA: currents(row),
        fieldGauss: [cell(row, 'field_x_G'), cell(row, 'field_y_G'), cell(row, 'field_z_G')] as Triple,
      })),
    };
  }
  if (magnitudeColumns.length === 0) throw new CalibrationInputError(`line ${headerLine}: no field column; expected ${EXPECTED}`);
  if (magnitudeColumns.length === 2) throw new CalibrationInputError(`line ${headerLine}: give either field_G or frequency_MHz, not both`);
  if (index.has('field_G')) {
    if (index.has('sigma_MHz')) throw new CalibrationInputError(`line ${headerLine}, column sigma_MHz: a field_G file takes sigma_G`);
    refuseCoefficient(options, 'a field_G file');
    const weighted = index.has('sigma_G');
    return {
      kind: 'magnitude',
      source: 'field',
      points: rows.map((row) => ({
        line: row.info.lines,
        currentA: currents(row),
        fieldGauss: notNegative(row, 'field_G'),
        sigmaGauss: weighted ? positive(row, 'sigma_G') : null,
      })),
    };
  }
  if (index.has('sigma_G')) throw new CalibrationInputError(`line ${headerLine}, column sigma_G: a frequency_MHz file takes sigma_MHz`);
  const c = options.mhzPerGauss;
  if (c === undefined) throw new CalibrationInputError('a frequency_MHz file needs the transition\'s linear Zeeman coefficient in MHz/G (--mhz-per-gauss, or the upload\'s MHz per G field)');
  if (!Number.isFinite(c) || !(c > 0) || c > MAX_ABS_VALUE) throw new CalibrationInputError(`the Zeeman coefficient must be a positive number of MHz/G; got ${c}`);
  const weighted = index.has('sigma_MHz');
  return {
    kind: 'magnitude',
    source: 'frequency',
    points: rows.map((row) => ({
      line: row.info.lines,
      currentA: currents(row),
      fieldGauss: notNegative(row, 'frequency_MHz') / c,
      sigmaGauss: weighted ? positive(row, 'sigma_MHz') / c : null,
    })),
  };
}

function refuseCoefficient(options: CsvOptions, what: string): void {
  if (options.mhzPerGauss !== undefined) throw new CalibrationInputError(`${what} has no frequency_MHz column: leave the MHz per G coefficient out`);
}
