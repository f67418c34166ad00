/**
 * Command line: `npm run --silent predict -- CASE.json` prints one JSON prediction to stdout.
 * Bad input (unreadable file, invalid JSON, a key of the wrong type, a non-physical value)
 * goes to stderr with what to fix, exit code 2.
 */
import { readFileSync } from 'node:fs';
import { parseCase } from './case-input.js';
import { PhysicsInputError } from './input-error.js';
import { predict } from './predict.js';

function fail(message: string): never {
  process.stderr.write(`predict: ${message}\n`);
  process.exit(2);
}

const path = process.argv[2];
if (!path || process.argv.length > 3) fail('usage: npm run --silent predict -- CASE.json');
let text: string;
try {
  text = readFileSync(path, 'utf8');
} catch (err) {
  fail(`cannot read ${path}: ${(err as Error).message}`);
}
let json: unknown;
try {
  json = JSON.parse(text);
} catch (err) {
  fail(`${path} is not valid JSON: ${(err as Error).message}`);
}
try {
  const { params, field, options } = parseCase(json, path);
  const { warm: _warm, ...prediction } = predict(params, field, options);
  process.stdout.write(`${JSON.stringify(prediction, null, 2)}\n`);
} catch (err) {
  if (err instanceof PhysicsInputError) fail(err.message);
  throw err;
}
