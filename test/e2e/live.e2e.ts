import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { ARTIFACT_DIR } from '../support/browser.js';
import { openSignedIn, useBrowserStack } from '../support/browser-stack.js';

describe('Live page in Chromium', () => {
  const env = useBrowserStack();

  it('shows moving values and charts to a signed-in operator', async () => {
    const page = await openSignedIn(env, 'operator');

    const field = page.getByRole('region', { name: 'Field' });
    await field.waitFor();
    await expect.poll(() => field.innerText(), { timeout: 15_000 }).toMatch(/\d+\.\d+\s*G/);
    const before = await field.innerText();
    await expect.poll(() => field.innerText(), { timeout: 15_000 }).not.toBe(before);
    expect(await page.getByRole('region', { name: 'Coils' }).innerText()).toMatch(/A/);
    for (const caption of ['Coil currents', 'Coil temperatures', 'Field angles']) {
      const figure = page.locator('figure', { has: page.locator('figcaption', { hasText: caption }) });
      await expect.poll(async () => figure.locator('canvas').count()).toBeGreaterThan(0);
    }
    await expect.poll(async () => page.getByRole('status', { name: 'Connection' }).innerText()).toMatch(/live/i);
    await page.waitForTimeout(1500); // let a second of samples reach the charts before the picture
    await page.screenshot({ path: join(ARTIFACT_DIR, 'live-operator.png'), fullPage: true });

    await page.reload();
    await field.waitFor();
    expect(page.url()).not.toMatch(/sign-in/);
  });
});
