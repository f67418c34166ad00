import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { join, resolve } from 'node:path';
import { ARTIFACT_DIR, launchBrowser, type TestBrowser, signInOnPage } from '../support/browser.js';
import { DEMO_PASSWORD, startStack, type Stack } from '../support/stack.js';

const EXAMPLE = resolve('server/calibration/examples/lindqvist-field-magnitude.csv');

describe('Calibration page in Chromium', () => {
  let stack: Stack;
  let chrome: TestBrowser;

  beforeAll(async () => {
    stack = await startStack();
    chrome = await launchBrowser();
  });
  afterAll(async () => {
    await chrome?.close();
    await stack?.close();
  });

  it('lets a lead fit a measurement file, read the report, approve it with a reason, and see the uncertainty on Live', async () => {
    const page = await chrome.browser.newPage();
    await page.goto(stack.server.url);
    await signInOnPage(page, 'lead@tiltwatch.example', DEMO_PASSWORD);
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
});
