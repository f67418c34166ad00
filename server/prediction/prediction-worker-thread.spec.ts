import { execFile } from 'node:child_process';
import { tmpdir } from 'node:os';
import { promisify } from 'node:util';
import { describe, expect, it } from 'vitest';

const run = promisify(execFile);

describe('startPredictionWorker', () => {
  it('loads the TypeScript worker under `node --import tsx` from any working directory, as the server runs', async () => {
    const engineUrl = new URL('./prediction-engine.ts', import.meta.url).href;
    const profileUrl = new URL('../../shared/profiles/demo-profile.ts', import.meta.url).href;
    const script = `
      const { PredictionEngine } = await import(${JSON.stringify(engineUrl)});
      const { DEMO_PROFILE } = await import(${JSON.stringify(profileUrl)});
      const engine = new PredictionEngine();
      engine.setProfile(1, DEMO_PROFILE);
      engine.updateDirection({ thetaDeg: 0, phiDeg: 0 }, 0);
      const p = await new Promise((resolve) => engine.onPrediction(resolve));
      await engine.close();
      console.log(JSON.stringify(p));`;
    const tsx = import.meta.resolve('tsx');
    const { stdout } = await run(process.execPath, ['--import', tsx, '--input-type=module', '-e', script], { cwd: tmpdir() });
    expect(JSON.parse(stdout)).toMatchObject({ stable: true, profileId: 1, thetaDeg: 0 });
  });
});
