import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { ARTIFACT_DIR } from '../support/browser.js';
import { openSignedIn, useBrowserStack } from '../support/browser-stack.js';
import { DEMO_PASSWORD, signIn } from '../support/stack.js';

/** Coil detail, profile validation, acknowledgement focus and live limit changes in Chromium. */
describe('Clarity in Chromium', () => {
  const env = useBrowserStack();
  let leadToken: string;

  beforeAll(async () => {
    leadToken = await signIn(env.stack.server.url, 'lead');
  });

  const api = async (method: string, path: string, body?: unknown) =>
    fetch(`${env.stack.server.url}${path}`, {
      method,
      headers: { authorization: `Bearer ${leadToken}`, 'content-type': 'application/json' },
      body: body === undefined ? undefined : JSON.stringify(body),
    });

  /** A wall-size page signed in as `role`, once Live shows the field. */
  async function signedIn(role: 'operator' | 'lead') {
    const page = await openSignedIn(env, role, { viewport: { width: 1920, height: 1080 } });
    await page.getByRole('region', { name: 'Field' }).waitFor({ timeout: 30_000 });
    return page;
  }

  it('opens Coil detail from the Live coil strip and from a rationale text, with readings, trip chain, alarms and charts', async () => {
    const page = await signedIn('operator');
    await page.getByRole('link', { name: 'Coil pair Y: open Coil detail' }).click();
    await page.getByRole('heading', { name: 'Coil detail: pair Y' }).waitFor();
    expect(page.url()).toMatch(/\/coils\/y$/);
    const readings = page.getByRole('region', { name: 'Readings' });
    await expect.poll(() => readings.innerText(), { timeout: 15_000 }).toMatch(/Y current[\s\S]*\d+\.\d{3}\s*A/);
    // A number while current flows and has settled, otherwise a dash and the reason (a busy
    // test machine can trip the stale-telemetry interlock, which ramps the coils to zero).
    await expect.poll(() => readings.innerText(), { timeout: 15_000 }).toMatch(/Winding temperature \(from resistance\)\s*(\d+\.\d\s*°C\s*mean over the winding|—\s*needs ≥ 1 A)/);
    const chain = page.getByRole('region', { name: 'Trip chain' });
    expect(await chain.innerText()).toMatch(/Software trip\s*20(\.0+)?\s*A/);
    expect(await chain.innerText()).toMatch(/Coolant flow[\s\S]*Software trip\s*1(\.0+)?\s*L\/min/);
    expect(await chain.innerText()).toMatch(/supervisory/);
    await page.getByRole('heading', { name: 'Alarms of pair Y' }).waitFor();
    for (const caption of ['Current, pair Y', 'Coil temperature and flow, pair Y']) {
      const figure = page.locator('figure', { has: page.locator('figcaption', { hasText: caption }) });
      await expect.poll(async () => figure.locator('canvas').count()).toBeGreaterThan(0);
    }
    await page.waitForTimeout(1500);
    await page.screenshot({ path: join(ARTIFACT_DIR, 'coil-detail-1920.png'), fullPage: true });

    await page.getByRole('link', { name: 'Alarms', exact: true }).click();
    await page.getByRole('tab', { name: 'Limits' }).click();
    const row = page.locator('tr', { has: page.locator('code', { hasText: 'currentDeviation.z.H' }) });
    await row.getByRole('link', { name: 'Coil detail' }).click();
    await page.getByRole('heading', { name: 'Coil detail: pair Z' }).waitFor();
    await page.close();
  });

  it('refuses a profile with nonsense values next to the field, and saves a draft that does not go live', async () => {
    const page = await signedIn('lead');
    await page.getByRole('link', { name: 'Sample profiles' }).click();
    await page.getByRole('button', { name: 'New version from this one' }).click();
    const atoms = page.getByLabel('Atom number');
    await atoms.fill('2.5');
    await page.getByLabel('Reason for this version').fill('typo test');
    await page.getByRole('button', { name: 'Save as draft version' }).click();
    const field = page.locator('mat-form-field', { has: page.getByLabel('Atom number') });
    await expect.poll(() => field.innerText()).toMatch(/Atom number must lie between 100 and 100000000/);
    expect(await page.getByText(/active profile when saved/i).count()).toBe(0);
    await page.screenshot({ path: join(ARTIFACT_DIR, 'profile-refused-1920.png'), fullPage: true });

    // The server refuses the same nonsense on its own, naming the input as the form labels it.
    const current = (await (await api('GET', '/api/profiles/active')).json()) as { profile: Record<string, unknown> };
    const refused = await api('POST', '/api/profiles', { profile: { ...current.profile, atomNumber: 1e12 }, reason: 'x' });
    expect(refused.status).toBe(400);
    expect(((await refused.json()) as { error: string }).error).toMatch(/Atom number must lie between/);

    await atoms.fill('40000');
    await page.getByRole('button', { name: 'Save as draft version' }).click();
    await expect.poll(() => page.getByRole('status').filter({ hasText: 'as a draft' }).count()).toBe(1);
    const active = (await (await api('GET', '/api/profiles/active')).json()) as { version: number; profile: { atomNumber: number } };
    expect(active.profile.atomNumber).not.toBe(40000);
    await page.close();
  });

  it('keeps the keyboard focus on the alarm row after Acknowledge on the Alarms page, never on the page body', async () => {
    // The chiller delivers about 18 °C: a high supply-water limit of 15 °C raises at once.
    expect((await api('PUT', '/api/alarm-limits/waterSupply.H', { limit: 15, onDelayMs: 0, reason: 'focus test' })).status).toBe(200);
    const page = await signedIn('operator');
    await page.getByRole('navigation', { name: 'Pages' }).getByRole('link', { name: /Alarms/ }).click();
    const row = page.getByRole('list', { name: 'Active alarms' }).locator('[data-alarm-id="waterSupply.H"]');
    const acknowledge = row.getByRole('button', { name: 'Acknowledge' });
    await acknowledge.waitFor({ timeout: 20_000 });
    await acknowledge.focus();
    await page.keyboard.press('Enter');
    await expect.poll(() => acknowledge.count(), { timeout: 10_000 }).toBe(0);
    // Where the keyboard is, after the row was drawn anew with its new state (the page's own code, run in the browser).
    const focusedAlarm = () =>
      page.locator('body').evaluate((body) => {
        const active = body.ownerDocument.activeElement;
        return active?.closest('[data-alarm-id]')?.getAttribute('data-alarm-id') ?? active?.tagName;
      });
    await expect.poll(focusedAlarm).toBe('waterSupply.H');
    await page.waitForTimeout(1500); // a few pushes of the live list later, it is still there
    expect(await focusedAlarm()).toBe('waterSupply.H');
    expect(await row.evaluate((el) => el.ownerDocument.defaultView!.getComputedStyle(el).outlineStyle)).not.toBe('none');
    await page.screenshot({ path: join(ARTIFACT_DIR, 'alarms-focus-after-acknowledge.png'), fullPage: true });
    expect((await api('PUT', '/api/alarm-limits/waterSupply.H', { limit: 25, onDelayMs: 10_000, reason: 'focus test done' })).status).toBe(200);
    await page.close();
  });

  it('keeps the keyboard focus on the alarm after Acknowledge on Live, and redraws a changed trip level without a reload', async () => {
    // Put the low supply-water alarm above the chiller's 18 °C so that it raises whatever the coils do.
    expect((await api('PUT', '/api/alarm-limits/waterSupply.L', { limit: 21, reason: 'focus test' })).status).toBe(200);
    const page = await signedIn('operator');
    const button = page.getByRole('button', { name: 'Acknowledge waterSupply.L' });
    await button.waitFor({ timeout: 20_000 });
    await button.focus();
    await page.keyboard.press('Enter');
    await expect.poll(() => page.getByRole('button', { name: 'Acknowledge waterSupply.L' }).count(), { timeout: 10_000 }).toBe(0);
    // The focused line, and its focus ring (the page's own code, run in the browser).
    await expect.poll(() => page.locator('[data-alarm-id="waterSupply.L"]:focus').count()).toBe(1);
    const focusRing = await page.locator('[data-alarm-id="waterSupply.L"]').evaluate((el) => el.ownerDocument.defaultView!.getComputedStyle(el).outlineStyle);
    expect(focusRing).not.toBe('none');

    const tripMarks = () => page.locator('tw-gauge-bar').first().locator('.mark[data-kind="trip"]').evaluateAll((els) => els.map((e) => e.getAttribute('data-percent')));
    const before = await tripMarks();
    const levels = (await (await api('GET', '/api/levels')).json()) as { levels: { trips: { currentHighA: number } } };
    const next = { ...levels.levels, trips: { ...levels.levels.trips, currentHighA: 19 } };
    expect((await api('PUT', '/api/levels', { levels: next, reason: 'supply derated' })).status).toBe(200);
    await expect.poll(tripMarks, { timeout: 10_000 }).not.toEqual(before);
    expect(await tripMarks()).toContain('88');
    await page.screenshot({ path: join(ARTIFACT_DIR, 'live-alarms-1920.png'), fullPage: true });
    await page.close();
  });

  it('offers a skip link and keeps the focus in the password field after a failed sign-in', async () => {
    const page = await env.chrome.browser.newPage();
    await page.goto(env.stack.server.url);
    await page.evaluate('localStorage.clear()');
    await page.goto(env.stack.server.url);
    await page.getByLabel('Email').fill('operator@tiltwatch.example');
    await page.getByLabel('Password').fill('not-the-password');
    await page.getByLabel('Password').press('Enter');
    await page.getByRole('alert').waitFor();
    await expect.poll(() => page.locator('input[type="password"]:focus').count()).toBe(1);
    await page.screenshot({ path: join(ARTIFACT_DIR, 'sign-in-failed.png') });

    await page.getByLabel('Password').fill(DEMO_PASSWORD);
    await page.getByLabel('Password').press('Enter');
    await page.getByRole('region', { name: 'Field' }).waitFor();
    await page.keyboard.press('Tab');
    const skip = page.getByRole('link', { name: 'Skip to the page content' });
    await expect.poll(() => skip.evaluate((el) => el === el.ownerDocument.activeElement)).toBe(true);
    await page.keyboard.press('Enter');
    await expect.poll(() => page.locator('main#tw-main:focus').count()).toBe(1);
    await page.close();
  });
});
