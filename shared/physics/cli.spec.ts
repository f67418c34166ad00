import { execFile } from 'node:child_process';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

const run = promisify(execFile);
const CLI = ['--import', 'tsx', 'shared/physics/cli.ts'];

/** Runs the command line on a file; resolves with its exit code and streams. */
async function predictCli(file: string): Promise<{ code: number; stdout: string; stderr: string }> {
  try {
    const { stdout, stderr } = await run(process.execPath, [...CLI, file], { cwd: process.cwd() });
    return { code: 0, stdout, stderr };
  } catch (err) {
    const e = err as { code: number; stdout: string; stderr: string };
    return { code: e.code, stdout: e.stdout, stderr: e.stderr };
  }
}

describe('predict command line', () => {
  let dir: string;
  beforeAll(async () => {
    dir = await mkdtemp(join(tmpdir(), 'tiltwatch-predict-'));
  });
  afterAll(async () => {
    await rm(dir, { recursive: true, force: true });
  });

  it('prints one JSON prediction with the documented keys for an example case', async () => {
    const { code, stdout } = await predictCli('shared/physics/examples/er167-tilted.json');
    expect(code).toBe(0);
    const out = JSON.parse(stdout);
    expect(out).toMatchObject({ stable: true, epsDd: expect.closeTo(0.12186, 5) });
    for (const key of ['epsDdCritical', 'atomNumberCritical', 'fermiSurface', 'cloud', 'energyPerParticleEF', 'tof']) expect(out).toHaveProperty(key);
    expect(Object.keys(out.fermiSurface)).toEqual(expect.arrayContaining(['aspectRatio', 'kParallelPerUm', 'kPerpPerUm']));
    expect(Object.keys(out.cloud)).toEqual(expect.arrayContaining(['radiiUm', 'axes', 'axisAnglesToFieldDeg']));
    expect(Object.keys(out.energyPerParticleEF)).toEqual(expect.arrayContaining(['total', 'kinetic', 'trap', 'direct', 'exchange']));
    expect(out.tof.map((t: { tMs: number }) => t.tMs)).toEqual([0, 20]);
    expect(Object.keys(out.tof[1])).toEqual(expect.arrayContaining(['tMs', 'aspectRatio', 'majorAngleDeg', 'aspectRatioVOverU']));
    expect(out).not.toHaveProperty('warm');
  });

  it('exits with code 2 and names the offending input on stderr', async () => {
    const file = join(dir, 'negative-n.json');
    await writeFile(file, JSON.stringify({ species: '167Er', atomNumber: -1, trapHz: [350, 80, 400], thetaDeg: 0, phiDeg: 0 }));
    const { code, stdout, stderr } = await predictCli(file);
    expect(code).toBe(2);
    expect(stdout).toBe('');
    expect(stderr).toMatch(/atomNumber must be a positive finite number/);
  });

  it('exits with code 2 for a file that is not JSON', async () => {
    const file = join(dir, 'broken.json');
    await writeFile(file, '{ "species": ');
    const { code, stderr } = await predictCli(file);
    expect(code).toBe(2);
    expect(stderr).toMatch(/broken\.json is not valid JSON/);
  });
});
