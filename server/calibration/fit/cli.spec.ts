import { execFile } from 'node:child_process';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

const run = promisify(execFile);
const CLI = ['--import', 'tsx', 'server/calibration/fit/cli.ts'];
const EXAMPLES = 'server/calibration/examples';

/** Runs the command line; resolves with its exit code and streams. */
async function calibrate(...args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  try {
    const { stdout, stderr } = await run(process.execPath, [...CLI, ...args], { cwd: process.cwd() });
    return { code: 0, stdout, stderr };
  } catch (err) {
    const e = err as { code: number; stdout: string; stderr: string };
    return { code: e.code, stdout: e.stdout, stderr: e.stderr };
  }
}

// Each case starts a Node process with the TypeScript loader: slow on a loaded machine.
describe('calibrate command line', { timeout: 180_000 }, () => {
  let dir: string;
  beforeAll(async () => {
    dir = await mkdtemp(join(tmpdir(), 'tiltwatch-calibrate-'));
  });
  afterAll(async () => {
    await rm(dir, { recursive: true, force: true });
  });

  it('prints exactly the documented JSON object for a |B| file', async () => {
    const { code, stdout, stderr } = await calibrate(`${EXAMPLES}/lindqvist-field-magnitude.csv`);
    expect(code).toBe(0);
    expect(stderr).toBe('');
    const out = JSON.parse(stdout);
    expect(Object.keys(out)).toEqual(['kind', 'points', 'gaussPerAmp', 'offsetGauss', 'standardErrors', 'residualRmsGauss', 'maxResidualGauss', 'gauge']);
    expect(Object.keys(out.standardErrors)).toEqual(['gaussPerAmp', 'offsetGauss']);
    expect(out).toMatchObject({ kind: 'magnitude', points: 36 });
    // The invented example data were made with K00 = 1.214 G/A and noise σ = 3 mG.
    expect(out.gaussPerAmp[0][0]).toBeCloseTo(1.214, 2);
    expect(out.residualRmsGauss).toBeGreaterThan(0.001);
    expect(out.residualRmsGauss).toBeLessThan(0.005);
  });

  it('fits a frequency file with the Zeeman coefficient, in either option spelling, and a vector-probe file', async () => {
    const [a, b, v] = await Promise.all([
      calibrate(`${EXAMPLES}/lindqvist-rf-frequency.csv`, '--mhz-per-gauss', '1.4'),
      calibrate(`${EXAMPLES}/lindqvist-rf-frequency.csv`, '--mhz-per-gauss=1.4'),
      calibrate(`${EXAMPLES}/lindqvist-vector-probe.csv`),
    ]);
    expect(a.code).toBe(0);
    expect(a.stdout).toBe(b.stdout);
    expect(JSON.parse(a.stdout)).toMatchObject({ kind: 'magnitude', points: 30 });
    expect(JSON.parse(v.stdout)).toMatchObject({ kind: 'vector', points: 24, gauge: expect.stringMatching(/identity/) });
  });

  it('refuses bad input on stderr with a non-zero exit and nothing on stdout', async () => {
    const file = join(dir, 'one-pair.csv');
    await writeFile(file, 'current_x_A,current_y_A,current_z_A,field_G\n' + Array.from({ length: 12 }, (_, n) => `${n},0,0,${1.2 * n + 0.1}`).join('\n'));
    const [bad, missingCoefficient, negative, onePair, usage, absent] = await Promise.all([
      calibrate(`${EXAMPLES}/bad-cell.csv`),
      calibrate(`${EXAMPLES}/lindqvist-rf-frequency.csv`),
      calibrate(`${EXAMPLES}/lindqvist-rf-frequency.csv`, '--mhz-per-gauss', '-2'),
      calibrate(file),
      calibrate(),
      calibrate(join(dir, 'absent.csv')),
    ]);
    expect(bad).toEqual({ code: 2, stdout: '', stderr: `calibrate: ${EXAMPLES}/bad-cell.csv: line 4, column current_z_A: "oops" is not a number\n` });
    expect(missingCoefficient.code).toBe(2);
    expect(missingCoefficient.stdout).toBe('');
    expect(missingCoefficient.stderr).toMatch(/--mhz-per-gauss/);
    expect(negative.stderr).toMatch(/must be a positive number of MHz\/G; got -2/);
    expect(onePair.code).toBe(2);
    expect(onePair.stdout).toBe('');
    expect(onePair.stderr).toMatch(/only the x pair ever moves/);
    expect(usage).toMatchObject({ code: 2, stdout: '' });
    expect(absent.stderr).toMatch(/cannot read/);
  });
});
