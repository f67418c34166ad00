import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { ARTIFACT_DIR } from '../support/browser.js';
import { openPage, openSignedIn, useBrowserStack } from '../support/browser-stack.js';
import { signIn } from '../support/stack.js';
import type { SteeringStatus } from '../../shared/steering/steering-api.js';

describe('Steer page in Chromium', () => {
  // Staleness is not under test: the browser and the stack share this machine's cores.
  const env = useBrowserStack({ env: { TILTWATCH_STALE_TRIP_MS: '3000' } });

  /** The Steer page, signed in as `role` once the live feed runs. */
  async function steerPage(role: 'viewer' | 'operator') {
    const page = await openSignedIn(env, role);
    await expect.poll(async () => page.getByRole('status', { name: 'Connection' }).innerText(), { timeout: 15_000 }).toMatch(/live/i);
    await openPage(page, 'Steer');
    return page;
  }

  async function steeringStatus(): Promise<SteeringStatus> {
    const token = await signIn(env.stack.server.url, 'viewer');
    return (await (await fetch(`${env.stack.server.url}/api/steering`, { headers: { authorization: `Bearer ${token}` } })).json()) as SteeringStatus;
  }

  it('pre-flights a target, refuses to send a failing one, and steers after the confirm step', async () => {
    const page = await steerPage('operator');
    const form = page.getByRole('region', { name: 'New target' });
    await form.getByLabel('|B|').fill('40');
    await form.getByLabel('θ (from trap z)').fill('54.7');
    await form.getByLabel('φ (from trap x to y)').fill('120');
    await form.getByLabel('Ramp time').fill('6');
    // A refusal names the field as the form labels it and stands beside that field: the page's
    // own check of a value out of range, then the server's check of the reason.
    await form.getByLabel('Reason (goes into the audit trail)').fill('a bell \u0007 in the reason');
    await form.getByLabel('θ (from trap z)').fill('200');
    await form.getByRole('button', { name: 'Run pre-flight' }).click();
    const theta = form.locator('mat-form-field', { has: page.getByLabel('θ (from trap z)') });
    await expect.poll(() => theta.innerText()).toMatch(/θ \(from trap z\) must be from 0 to 180 °/);
    await form.getByLabel('θ (from trap z)').fill('54.7');
    expect(await theta.innerText()).not.toMatch(/must be/);
    await form.getByRole('button', { name: 'Run pre-flight' }).click();
    const reason = form.locator('mat-form-field', { has: page.getByLabel('Reason (goes into the audit trail)') });
    await expect.poll(() => reason.innerText(), { timeout: 15_000 }).toMatch(/Reason \(goes into the audit trail\): must not contain control characters/);
    expect(await page.getByRole('alert').count()).toBe(0);
    expect(await form.innerText()).not.toMatch(/thetaDeg|rampMs|"reason"/);
    // The message fades in; the picture is taken once it is fully shown.
    const opacity = () =>
      reason.locator('mat-error').evaluate((el) => {
        const view = el.ownerDocument.defaultView!;
        let shown = 1;
        for (let node: typeof el | null = el; node; node = node.parentElement) shown *= Number(view.getComputedStyle(node).opacity);
        return shown;
      });
    await expect.poll(opacity).toBe(1);
    await page.screenshot({ path: join(ARTIFACT_DIR, 'steer-refused.png'), fullPage: true });

    await form.getByLabel('Reason (goes into the audit trail)').fill('end-to-end check');
    await form.getByRole('button', { name: 'Run pre-flight' }).click();
    const checks = page.getByRole('table', { name: 'Pre-flight checks' });
    await checks.waitFor({ timeout: 60_000 });
    expect(await checks.getByRole('row', { name: /Field magnitude/ }).innerText()).toMatch(/fails/);
    expect(await form.getByRole('button', { name: 'Steer…' }).count()).toBe(0);

    await form.getByLabel('|B|').fill('9');
    expect(await checks.count()).toBe(0);
    await form.getByRole('button', { name: 'Run pre-flight' }).click();
    await page.getByText('every check passes').waitFor({ timeout: 60_000 });
    await form.getByRole('button', { name: 'Steer…' }).click();
    await form.getByRole('group', { name: 'Confirm the steer' }).waitFor();
    expect((await steeringStatus()).mode).toBe('idle');
    await page.screenshot({ path: join(ARTIFACT_DIR, 'steer-confirm.png'), fullPage: true });
    await form.getByRole('button', { name: 'Confirm and steer' }).click();
    await page.getByText('command recorded and sent').waitFor();
    await expect.poll(async () => (await steeringStatus()).mode, { timeout: 15_000 }).not.toBe('idle');
    const now = page.getByRole('region', { name: 'What steers the field' });
    await expect.poll(async () => now.innerText(), { timeout: 15_000 }).toMatch(/Ramping to|Holding/);
    expect(await now.innerText()).toMatch(/end-to-end check/);

    // Live shows the target beside the measured angles while steering.
    await page.getByRole('navigation', { name: 'Pages' }).getByRole('link', { name: 'Live' }).click();
    await expect.poll(async () => page.getByText(/target \|B\| 9\.00/).count(), { timeout: 15_000 }).toBe(1);
    await page.getByRole('navigation', { name: 'Pages' }).getByRole('link', { name: 'Steer' }).click();

    // Release with a reason.
    await now.getByLabel('Reason for abort or release').fill('done with the check');
    await now.getByRole('button', { name: 'Release steering' }).click();
    await expect.poll(async () => (await steeringStatus()).mode, { timeout: 15_000 }).toBe('idle');
    await page.close();
  });

  it('shows a refusal in the sequence editor beside the input it names', async () => {
    const page = await openSignedIn(env, 'lead');
    await openPage(page, 'Sequences');
    await page.getByRole('button', { name: 'New sequence' }).click();
    await page.getByLabel('Name', { exact: true }).fill('A bell \u0007 scan');
    await page.getByLabel('Reason (goes into the audit trail)').fill('browser test');
    await page.getByRole('button', { name: 'Save as new version' }).click();
    const name = page.locator('mat-form-field', { has: page.getByLabel('Name', { exact: true }) });
    await expect.poll(() => name.innerText(), { timeout: 15_000 }).toMatch(/Name: must not contain control characters/);

    // A step typed out of range is marked in its own row, naming the input.
    const theta = page.getByLabel('θ of step 1');
    await theta.fill('200');
    expect(await theta.getAttribute('aria-invalid')).toBe('true');
    expect(await page.locator(`#${await theta.getAttribute('aria-describedby')}`).innerText()).toMatch(/Step 1: θ must be from 0 to 180 °/);
    expect(await page.getByRole('alert').count()).toBe(0);
    await page.screenshot({ path: join(ARTIFACT_DIR, 'sequence-refused.png'), fullPage: true });
    await page.close();
  });

  it('shows the state read-only to a viewer', async () => {
    const page = await steerPage('viewer');
    await page.getByRole('region', { name: 'What steers the field' }).waitFor();
    expect(await page.getByText('Viewing only: setting a target needs the operator role').count()).toBe(1);
    expect(await page.getByRole('button', { name: 'Run pre-flight' }).count()).toBe(0);
    await page.screenshot({ path: join(ARTIFACT_DIR, 'steer-viewer.png'), fullPage: true });
    await page.close();
  });
});

