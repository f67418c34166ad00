/**
 * Command line: `npm run --silent calibrate -- FILE.csv [--mhz-per-gauss C]` fits a calibration
 * file and prints one JSON object (the fit report) on stdout. Bad input goes to stderr with what
 * to fix, exit code 2, and nothing on stdout. Without a database there is no active calibration,
 * so a |B| fit is reported in the default frame (K upper triangular, positive diagonal).
 */
import { readFileSync } from 'node:fs';
import { parseCalibrationCsv } from './calibration-csv.js';
import { fitCalibration } from './calibration-fit.js';
import { CalibrationInputError } from './fit-input-error.js';

const USAGE = 'usage: npm run --silent calibrate -- FILE.csv [--mhz-per-gauss C]';

function fail(message: string): never {
  process.stderr.write(`calibrate: ${message}\n`);
  process.exit(2);
}

const args = process.argv.slice(2);
let path: string | undefined;
let mhzPerGauss: number | undefined;
for (let i = 0; i < args.length; i++) {
  const arg = args[i];
  if (arg === '--mhz-per-gauss' || arg.startsWith('--mhz-per-gauss=')) {
    const raw = arg.includes('=') ? arg.slice(arg.indexOf('=') + 1) : args[++i];
    if (raw === undefined || raw.trim() === '' || !Number.isFinite(Number(raw))) fail(`--mhz-per-gauss needs a number of MHz/G; got ${raw ?? 'nothing'}`);
    mhzPerGauss = Number(raw);
  } else if (arg.startsWith('-') || path !== undefined) {
    fail(`unexpected argument ${arg}; ${USAGE}`);
  } else {
    path = arg;
  }
}
if (path === undefined) fail(USAGE);
let text: string;
try {
  text = readFileSync(path, 'utf8');
} catch (error) {
  fail(`cannot read ${path}: ${(error as Error).message}`);
}
try {
  const fit = fitCalibration(parseCalibrationCsv(text, { mhzPerGauss }));
  process.stdout.write(`${JSON.stringify(fit.report, null, 2)}\n`);
} catch (error) {
  if (error instanceof CalibrationInputError) fail(`${path}: ${error.message}`);
  throw error;
}
