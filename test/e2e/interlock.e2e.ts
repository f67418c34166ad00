import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { ARTIFACT_DIR } from '../support/browser.js';
import { controlSimulator, openPage, openSignedIn, useBrowserStack } from '../support/browser-stack.js';
import { waitFor } from '../support/stack.js';

/** `GET {controlUrl}/state`: the part of the simulated controller's front panel this test reads. */
interface ControllerPanel {
  status: { hardwareTripped: boolean };
}

describe('Software interlock in Chromium', () => {
  // The browser and the whole stack share this machine's cores; a start-up stall of a few
  // hundred ms must not latch a staleness trip before the cooling loss this test is about.
  const env = useBrowserStack({ env: { TILTWATCH_STALE_TRIP_MS: '2000' } });
  const control = (method: 'POST' | 'DELETE' | 'GET', path: string, body?: unknown) => controlSimulator(env.stack, method, path, body);

  it('trips on a cooling loss, shows it on every screen, and resets with a reason once the flow is back', async () => {
    const page = await openSignedIn(env, 'operator');
    await expect.poll(async () => page.getByRole('status', { name: 'Connection' }).innerText(), { timeout: 15_000 }).toMatch(/live/i);
    const banner = page.getByRole('alert', { name: 'Software interlock' });
    expect(await banner.count()).toBe(0);

    // A cooling loss on coil pair x: the flow falls below the software trip level.
    expect((await control('POST', '/faults', { kind: 'cooling-loss', axis: 'x' })).status).toBe(201);
    await banner.waitFor({ timeout: 30_000 });
    expect(await banner.innerText()).toMatch(/Software interlock tripped — first out: low flow x on flow\.x at \d\d:\d\d:\d\d \(\d+\.\d+\s?L\/min, trip level 1\.0+\s?L\/min\)/);
    await page.screenshot({ path: join(ARTIFACT_DIR, 'interlock-tripped.png'), fullPage: true });

    // The operator acknowledges the low-low flow alarm on the Alarms page (unfolding any group
    // it sits in: the demo program's ramps may have raised an alarm shortly before).
    await openPage(page, /Alarms/);
    const active = page.getByRole('list', { name: 'Active alarms' });
    await active.waitFor();
    const lowLowFlow = active.getByRole('article', { name: 'flow.x.LL' });
    await expect
      .poll(
        async () => {
          for (const fold of await active.locator('button[aria-expanded="false"]').all()) await fold.click();
          return lowLowFlow.count();
        },
        { timeout: 15_000 },
      )
      .toBe(1);
    expect(await lowLowFlow.innerText()).toMatch(/High[\s\S]*Coolant flow x low-low[\s\S]*L\/min/);
    await lowLowFlow.getByRole('button', { name: 'Acknowledge' }).click();
    await expect.poll(async () => lowLowFlow.innerText(), { timeout: 10_000 }).toMatch(/Acknowledged|Latched/);
    expect(await banner.count()).toBe(1); // acknowledging an alarm does not touch the interlock
    await page.screenshot({ path: join(ARTIFACT_DIR, 'alarms.png'), fullPage: true });

    // The cause is cleared; the controller's own low-flow trip, if it latched, is reset at the
    // controller's front panel, as a person would do standing at it.
    expect((await control('DELETE', '/faults')).status).toBe(200);
    await openPage(page, 'Interlocks');
    const lowFlowX = page.getByRole('table', { name: 'Trip conditions' }).locator('tbody tr', { hasText: 'low flow x' });
    await expect.poll(async () => lowFlowX.innerText(), { timeout: 30_000 }).toMatch(/Clear/);
    const panel = (await (await control('GET', '/state')).json()) as ControllerPanel;
    if (panel.status.hardwareTripped) {
      await waitFor(async () => ((await control('POST', '/reset')).status === 200 ? true : undefined), 'the hardware trip to reset locally', 20_000);
    }

    await page.getByLabel('Reason for the reset').fill('cooling water valve on pair x had closed; reopened and flow checked at 3 L/min');
    await page.getByRole('button', { name: 'Reset software interlock' }).click();
    await expect.poll(async () => banner.count(), { timeout: 15_000 }).toBe(0);
    expect(await page.getByRole('region', { name: 'Software interlock' }).innerText()).toMatch(/Not tripped/);
    const history = page.getByRole('table', { name: 'Trips and resets' });
    await expect.poll(async () => history.innerText(), { timeout: 10_000 }).toMatch(/operator@tiltwatch\.example/);
  });
});
