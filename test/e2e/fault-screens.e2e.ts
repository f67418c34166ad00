/**
 * What the night shift sees during a cooling loss must be true: the present value of an active
 * alarm follows the flow as it falls (and the value at the raise stays beside it), and the
 * software reset is refused while the controller's own hardware trip holds — it is reset at
 * the apparatus first. Real stack, built app, Debian's Chromium.
 */
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { beforeAll, describe, expect, it } from 'vitest';
import type { InterlockResetRefusal, InterlockStatus } from '../../shared/alarms/alarm-api.js';
import { ARTIFACT_DIR } from '../support/browser.js';
import { controlSimulator, openPage, openSignedIn, useBrowserStack } from '../support/browser-stack.js';
import { signIn, waitFor } from '../support/stack.js';

describe('Screens during a fault in Chromium', () => {
  // A start-up stall of the shared cores must not latch a staleness trip before the fault.
  const env = useBrowserStack({ env: { TILTWATCH_STALE_TRIP_MS: '2000' } });
  let page: Page;

  beforeAll(async () => {
    page = await openSignedIn(env, 'operator');
    await waitFor(async () => (/live/i.test(await page.getByRole('status', { name: 'Connection' }).innerText()) ? true : undefined), 'the live feed', 15_000);
  });

  const control = (method: 'POST' | 'DELETE', path: string, body?: unknown) => controlSimulator(env.stack, method, path, body);
  const interlock = async (token: string) =>
    (await (await fetch(`${env.stack.server.url}/api/interlock`, { headers: { authorization: `Bearer ${token}` } })).json()) as InterlockStatus;
  const open = (name: RegExp | string) => openPage(page, name);

  it('shows the present value of an active alarm live while the flow falls, and the value at the raise apart', async () => {
    expect((await control('POST', '/faults', { kind: 'cooling-loss', axis: 'x' })).status).toBe(201);
    await open(/Alarms/);
    const active = page.getByRole('list', { name: 'Active alarms' });
    const lowFlow = active.getByRole('article', { name: 'flow.x.L', exact: true }); // not flow.x.LL
    await expect
      .poll(
        async () => {
          for (const fold of await active.locator('button[aria-expanded="false"]').all()) await fold.click();
          return lowFlow.count();
        },
        { timeout: 30_000 },
      )
      .toBe(1);
    const now = async () => /now ([\d.]+)\s?L\/min/.exec(await lowFlow.innerText())?.[1];
    const first = await now();
    expect(first).toBeDefined();
    expect(await lowFlow.innerText()).toMatch(/at raise [\d.]+\s?L\/min[\s\S]*limit 1\.5/);
    // The flow keeps falling (and the meter is noisy): the shown value must move without a reload.
    await expect.poll(now, { timeout: 15_000 }).not.toBe(first);
    await page.screenshot({ path: join(ARTIFACT_DIR, 'alarms-during-fault.png'), fullPage: true });
    await open('Live');
    await page.getByRole('region', { name: 'Prediction' }).waitFor();
    await page.screenshot({ path: join(ARTIFACT_DIR, 'live-during-fault.png'), fullPage: true });
  });

  it("refuses the software reset while the controller's hardware trip holds, and resets once it was cleared at the apparatus", async () => {
    const token = await signIn(env.stack.server.url, 'operator');
    await waitFor(async () => ((await interlock(token)).hardwareTripped ? true : undefined), 'the hardware low-flow trip', 30_000);
    expect((await control('DELETE', '/faults')).status).toBe(200);
    await open('Interlocks');
    const lowFlowX = page.getByRole('table', { name: 'Trip conditions' }).locator('tbody tr', { hasText: 'low flow x' });
    await expect.poll(async () => lowFlowX.innerText(), { timeout: 30_000 }).toMatch(/Clear/);

    // Every software condition is clear, but the hardware trip is latched: no reset from here.
    const note = page.getByRole('note').filter({ hasText: "Reset the controller's hardware trip at the apparatus first" });
    await expect.poll(async () => note.count(), { timeout: 10_000 }).toBe(1);
    const button = page.getByRole('button', { name: 'Reset software interlock' });
    expect(await button.isDisabled()).toBe(true);
    const refused = await fetch(`${env.stack.server.url}/api/interlock/reset`, {
      method: 'POST',
      headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' },
      body: JSON.stringify({ reason: 'flow back at 3 L/min' }),
    });
    expect(refused.status).toBe(409);
    expect(((await refused.json()) as InterlockResetRefusal).error).toMatch(/hardware trip is latched.*at the apparatus first/);
    await page.screenshot({ path: join(ARTIFACT_DIR, 'interlocks-hardware-hold.png'), fullPage: true });

    // Standing at the controller, someone resets its trip; then the software reset goes through.
    await waitFor(async () => ((await control('POST', '/reset')).status === 200 ? true : undefined), 'the local hardware reset', 20_000);
    await expect.poll(async () => button.isDisabled(), { timeout: 10_000 }).toBe(false);
    await page.getByLabel('Reason for the reset').fill('cooling valve x reopened; hardware trip reset at the controller');
    await button.click();
    const banner = page.getByRole('alert', { name: 'Software interlock' });
    await expect.poll(async () => banner.count(), { timeout: 15_000 }).toBe(0);
    expect((await interlock(token)).history?.[0]).toMatchObject({ reset: { actor: 'operator@tiltwatch.example' } });
  });
});
