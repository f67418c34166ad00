import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { ARTIFACT_DIR } from '../support/browser.js';
import { openSignedIn, useBrowserStack } from '../support/browser-stack.js';

const EXAMPLE = resolve('server/calibration/examples/lindqvist-field-magnitude.csv');

describe('Calibration page in Chromium', () => {
  const env = useBrowserStack();

  it('lets a lead fit a measurement file, read the report, approve it with a reason, and see the uncertainty on Live', async () => {
    const page = await openSignedIn(env, 'lead');
    await page.getByRole('region', { name: 'Field' }).waitFor();
    // Live shows σ beside the angles from the demo calibration's covariance.
    await expect.poll(() => page.getByRole('region', { name: 'Field' }).innerText(), { timeout: 15_000 }).toMatch(/±\s*[\d.]+°/);

    await page.getByRole('link', { name: 'Calibration' }).click();
    await page.getByRole('heading', { name: 'Calibration', level: 1 }).waitFor();
    await page.locator('tw-calibration-upload input[type="file"]').setInputFiles(EXAMPLE);
    await page.getByRole('button', { name: /Fit/ }).click();
    await page.getByText(/as draft v2/).waitFor();
    const report = page.getByRole('region', { name: 'Calibration report' });
    await expect.poll(() => report.innerText()).toMatch(/Residual RMS\s*[\d.]+ mG/);
    await expect.poll(async () => report.locator('tw-residual-chart canvas').count()).toBe(4);
    await expect.poll(() => report.innerText(), { timeout: 15_000 }).toMatch(/Would move by/);
    await page.waitForTimeout(500);
    await page.screenshot({ path: join(ARTIFACT_DIR, 'calibration-draft-lead.png'), fullPage: true });

    await page.getByRole('button', { name: /Approve and activate/ }).click();
    await expect.poll(() => report.innerText()).toMatch(/say why/);
    await page.getByLabel(/Reason for approving v2/).fill('viewport flange moved; re-measured 36 points');
    await page.getByRole('button', { name: /Approve and activate/ }).click();
    await page.getByText(/v2 is approved and active/).waitFor();

    await page.getByRole('link', { name: 'Live' }).click();
    const field = page.getByRole('region', { name: 'Field' });
    await expect.poll(() => field.innerText(), { timeout: 15_000 }).toMatch(/Calibration v2/);
    expect(await field.innerText()).toMatch(/±\s*[\d.]+°/);
    await page.screenshot({ path: join(ARTIFACT_DIR, 'live-with-uncertainty.png'), fullPage: true });
  });

  it('takes a measurement file dropped onto the drop zone, one file at a time, and fits it', async () => {
    const page = await openSignedIn(env, 'lead');
    await page.getByRole('link', { name: 'Calibration' }).click();
    const upload = page.getByRole('region', { name: 'Fit a new calibration' });
    const zone = upload.locator('.drop');
    await zone.waitFor();
    /** A drag of `count` copies of the example file, as the browser hands it to the page. */
    const dragOf = (count: number) =>
      zone.evaluateHandle(
        (el, [text, n]) => {
          const view = el.ownerDocument.defaultView!;
          const transfer = new view.DataTransfer();
          for (let i = 0; i < n; i++) transfer.items.add(new view.File([text], i === 0 ? 'field-scan.csv' : `field-scan-${i}.csv`, { type: 'text/csv' }));
          return transfer;
        },
        [readFileSync(EXAMPLE, 'utf8'), count] as const,
      );

    const two = await dragOf(2);
    await zone.dispatchEvent('dragover', { dataTransfer: two });
    await expect.poll(() => zone.getAttribute('class')).toMatch(/dragging/);
    await zone.dispatchEvent('drop', { dataTransfer: two });
    await upload.getByRole('alert').filter({ hasText: 'Drop one file at a time.' }).waitFor();
    expect(await zone.getAttribute('class')).not.toMatch(/dragging/);
    expect(await upload.getByRole('button', { name: /Fit/ }).isDisabled()).toBe(true);

    // A file dropped beside the zone is kept from the browser, which would open it in place of the app.
    const beside = await dragOf(1);
    const kept = await page.locator('body').evaluate((body, transfer) => {
      const view = body.ownerDocument.defaultView!;
      return !body.dispatchEvent(new view.DragEvent('drop', { dataTransfer: transfer, bubbles: true, cancelable: true }));
    }, beside);
    expect(kept).toBe(true);

    const one = await dragOf(1);
    await zone.dispatchEvent('dragover', { dataTransfer: one });
    await zone.dispatchEvent('drop', { dataTransfer: one });
    await expect.poll(() => zone.innerText()).toMatch(/field-scan\.csv \(\d+\.\d kB\)/);
    expect(await upload.getByRole('alert').count()).toBe(0);
    await upload.getByRole('button', { name: /Fit/ }).click();
    await page.getByText(/as draft v\d+/).waitFor();
    await expect.poll(() => page.getByRole('region', { name: 'Calibration report' }).innerText()).toMatch(/Residual RMS\s*[\d.]+ mG/);
    expect(await zone.innerText()).toMatch(/Drop a measurement file/);
    await page.close();
  });
});
