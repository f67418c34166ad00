import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { ShotsResponse } from '../../shared/shots/shots-api.js';
import type { RunRecord, SequenceRecord } from '../../shared/steering/steering-api.js';
import { demoMeasurementCsv } from '../../server/shots/examples/demo-imaging.js';
import { ARTIFACT_DIR, launchBrowser, type TestBrowser, signInOnPage } from '../support/browser.js';
import { DEMO_PASSWORD, signIn, startStack, waitFor, type Stack } from '../support/stack.js';

describe('Shots page in Chromium', () => {
  let stack: Stack;
  let chrome: TestBrowser;
  let runId: number;
  let shots: ShotsResponse['shots'];

  beforeAll(async () => {
    // Staleness is not under test: the browser and the stack share this machine's cores.
    stack = await startStack({ env: { TILTWATCH_STALE_TRIP_MS: '3000' } });
    chrome = await launchBrowser();
    // A short scan on the real stack: the runner records each shot with the measured field and the prediction.
    const lead = await signIn(stack.server.url, 'lead');
    const operator = await signIn(stack.server.url, 'operator');
    const call = async <T>(token: string, method: string, path: string, body?: unknown): Promise<T> => {
      const res = await fetch(`${stack.server.url}${path}`, { method, headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' }, body: body === undefined ? undefined : JSON.stringify(body) });
      if (!res.ok) throw new Error(`${method} ${path}: ${res.status} ${await res.text()}`);
      return (await res.json()) as T;
    };
    await waitFor(async () => ((await call<{ field: unknown }>(operator, 'GET', '/api/live')).field ? true : undefined), 'the first field', 20_000);
    const steps = [15, 45, 75].flatMap((theta) => [
      { kind: 'ramp', magnitudeG: 8, thetaDeg: theta, phiDeg: 0, durationMs: 1500 },
      { kind: 'hold', durationMs: 1000 },
      { kind: 'shot', label: `θ = ${theta}°` },
    ]);
    const saved = await call<{ id: number; sequence: SequenceRecord }>(lead, 'POST', '/api/sequences', { name: 'Shots check', steps, reason: 'browser test' });
    runId = (await call<{ runId: number }>(operator, 'POST', `/api/sequences/${saved.id}/run`, { reason: 'browser test' })).runId;
    await waitFor(async () => ((await call<RunRecord>(operator, 'GET', `/api/runs/${runId}`)).state === 'done' ? true : undefined), 'the run to end', 45_000);
    shots = (await call<ShotsResponse>(operator, 'GET', `/api/shots?run=${runId}`)).shots;
  });
  afterAll(async () => {
    await chrome?.close();
    await stack?.close();
  });

  it('shows a refused file\'s line and problem, then stores a good file and shows it in the table and the charts', async () => {
    expect(shots).toHaveLength(3);
    const page = await chrome.browser.newPage();
    await page.setViewportSize({ width: 1920, height: 1080 });
    await page.goto(stack.server.url);
    await signInOnPage(page, 'operator@tiltwatch.example', DEMO_PASSWORD);
    await page.getByRole('navigation', { name: 'Pages' }).getByRole('link', { name: 'Shots' }).click();
    await page.getByRole('heading', { name: 'Shots', level: 1 }).waitFor();
    const table = page.getByRole('table', { name: `Shots of run ${runId}` });
    await expect.poll(() => table.getByRole('row').count(), { timeout: 15_000 }).toBe(4);
    await page.getByText('No shot of this run has a measured image yet.').waitFor();

    const good = demoMeasurementCsv(shots);
    const bad = good.split('\n').map((line, i) => (i === 2 ? line.replace(/,[\d.]+,/, ',0.9,') : line)).join('\n');
    const picker = page.locator('tw-measurement-upload input[type="file"]');
    await picker.setInputFiles({ name: 'imaging-bad.csv', mimeType: 'text/csv', buffer: Buffer.from(bad) });
    await page.getByRole('button', { name: 'Store measurements' }).click();
    const refusal = page.locator('tw-measurement-upload').getByRole('alert');
    await expect.poll(() => refusal.innerText()).toMatch(/line 3, column tof_aspect_ratio: 0\.9 must be from 1 to 100.*nothing was stored/);
    await page.screenshot({ path: join(ARTIFACT_DIR, 'shots-refused.png'), fullPage: true });

    await picker.setInputFiles({ name: 'imaging.csv', mimeType: 'text/csv', buffer: Buffer.from(good) });
    expect(await refusal.count()).toBe(0);
    await page.getByRole('button', { name: 'Store measurements' }).click();
    await page.getByText('Stored 3 measured images.').waitFor();
    // The invented measurements show 65 % of the predicted deformation, give or take their scatter.
    await expect.poll(() => page.getByRole('region', { name: 'Measured against predicted' }).innerText()).toMatch(/measured deformation ≈ 0\.\d\d ± 0\.\d\d × predicted/);
    const measuredCells = await table.getByRole('row').allInnerTexts();
    for (const row of measuredCells.slice(1)) expect(row).toMatch(/1\.0\d{3} ± 0\.0020/);
    const charts = page.getByRole('region', { name: 'Charts' });
    expect(await charts.locator('tw-shot-chart canvas').count()).toBe(2);
    await page.waitForTimeout(300);
    await page.screenshot({ path: join(ARTIFACT_DIR, 'shots-1920.png'), fullPage: true });
    await page.setViewportSize({ width: 1366, height: 768 });
    await page.waitForTimeout(300);
    await page.screenshot({ path: join(ARTIFACT_DIR, 'shots-1366.png'), fullPage: true });

    // The export: the table's rows with the units in the header.
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Export CSV' }).click()]);
    expect(download.suggestedFilename()).toBe(`tiltwatch-shots-run-${runId}.csv`);
    const exported = (await readFile(await download.path(), 'utf8')).split('\r\n');
    expect(exported[0]).toMatch(/^shot,label,time_utc,run,field_G,theta_deg,phi_deg,predicted_tof_aspect_ratio,/);
    expect(exported.slice(1, 4).map((line) => line.split(',')[0])).toEqual(shots.map((s) => s.id));

    // Sorting by θ, largest first.
    await table.getByRole('button', { name: 'θ' }).click();
    await table.getByRole('button', { name: 'θ' }).click();
    await expect.poll(async () => (await table.getByRole('row').allInnerTexts())[1]).toMatch(/θ = 75°/);
    await page.close();
  });
});
