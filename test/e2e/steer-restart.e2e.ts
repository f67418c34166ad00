import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { openDatabase } from '../../server/db/database.js';
import { saveSteering } from '../../server/steering/steering-store.js';
import { targetVector } from '../../shared/steering/target.js';
import { ARTIFACT_DIR } from '../support/browser.js';
import { openPage, openSignedIn, useBrowserStack } from '../support/browser-stack.js';

const TARGET = { magnitudeG: 9, thetaDeg: 54.7, phiDeg: 120, rampMs: 60_000 };

/** The data folder holds what a server stopped during a ramp left; the server starts on it. */
describe('Steer page after a restart in Chromium', () => {
  const env = useBrowserStack({
    env: { TILTWATCH_STALE_TRIP_MS: '3000' },
    beforeServer: async (dataDir) => {
      const database = await openDatabase({ dataDir, databaseUrl: null });
      try {
        await saveSteering(database.db, {
          program: { target: TARGET, to: targetVector(TARGET), startedAt: new Date(Date.now() - 20_000).toISOString(), actor: 'operator@tiltwatch.example', reason: 'slow tilt for the scan', runId: null, reached: false },
          lastStop: null,
        });
      } finally {
        await database.close();
      }
    },
  });

  it('shows the interrupted ramp, offers release but no abort, and is idle once released', async () => {
    const page = await openSignedIn(env, 'operator');
    await openPage(page, 'Steer');
    const now = page.getByRole('region', { name: 'What steers the field' });
    await expect.poll(() => now.innerText(), { timeout: 15_000 }).toMatch(/Ramp interrupted by a restart/);
    expect(await now.innerText()).toMatch(/the measured field is what counts now/);
    expect(await now.getByRole('button', { name: /Abort ramp/ }).count()).toBe(0);
    await page.screenshot({ path: join(ARTIFACT_DIR, 'steer-interrupted.png'), fullPage: true });

    await now.getByLabel('Reason for abort or release').fill('measured field checked');
    await now.getByRole('button', { name: /Release steering/ }).click();
    await expect.poll(() => now.innerText(), { timeout: 15_000 }).toMatch(/Idle/);
    expect(await now.innerText()).toMatch(/released by operator@tiltwatch.example: measured field checked/);
  });
});
