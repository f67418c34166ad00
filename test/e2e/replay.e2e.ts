import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import type { HistoryResponse } from '../../shared/history/history-api.js';
import type { LevelSetVersion } from '../../shared/levels/level-set.js';
import type { LiveState } from '../../shared/live/live-state.js';
import { ARTIFACT_DIR } from '../support/browser.js';
import { openPage, openSignedIn, useBrowserStack } from '../support/browser-stack.js';
import { signIn, waitFor } from '../support/stack.js';

/** Local date as the calendar field reads it in the browser's (en-US) locale, and hh:mm:ss. */
function dateText(ms: number): string {
  const d = new Date(ms);
  return `${d.getMonth() + 1}/${d.getDate()}/${d.getFullYear()}`;
}
function timeText(ms: number): string {
  const d = new Date(ms);
  return [d.getHours(), d.getMinutes(), d.getSeconds()].map((n) => String(n).padStart(2, '0')).join(':');
}

describe('Replay page in Chromium', () => {
  const env = useBrowserStack();

  /** The replay clock, Unix epoch ms, as the page shows it. */
  async function clockMs(page: Page): Promise<number> {
    return Number(await page.getByRole('timer', { name: 'Replay clock' }).locator('time').getAttribute('data-time-ms'));
  }

  /** θ and |B| as the field panel must show them at `timeMs`: the newest recorded sample at or before it. */
  function expectedField(history: HistoryResponse, timeMs: number): { theta: string; magnitude: string } {
    const t = history.series.t;
    let i = t.length - 1;
    while (i >= 0 && t[i] > timeMs) i--;
    if (i < 0) throw new Error(`no sample before ${new Date(timeMs).toISOString()}`);
    return { theta: `${history.series.thetaDeg[i]!.toFixed(1)}°`, magnitude: `${history.series.bMagG[i].toFixed(3)}\u00a0G` };
  }

  async function expectReadoutAtClock(page: Page, history: HistoryResponse): Promise<void> {
    const at = await clockMs(page);
    const want = expectedField(history, at);
    const field = page.getByRole('region', { name: 'Field' });
    await expect.poll(() => field.innerText()).toContain(want.theta);
    expect(await field.innerText()).toContain(want.magnitude);
  }

  it('plays a recorded window: seeks by mark and timeline, changes speed, and shows what history holds', async () => {
    const { stack } = env;
    // Let the simulator run a while, with a short sequence run and a logbook note in it as marks.
    const operator = await signIn(stack.server.url, 'operator');
    const post = async (token: string, path: string, body: unknown) =>
      (await fetch(`${stack.server.url}${path}`, { method: 'POST', headers: { 'content-type': 'application/json', authorization: `Bearer ${token}` }, body: JSON.stringify(body) })).json() as Promise<Record<string, number>>;
    const firstDataMs = await waitFor(async () => {
      const live = (await (await fetch(`${stack.server.url}/api/live`, { headers: { authorization: `Bearer ${operator}` } })).json()) as LiveState;
      return live.time ? Date.parse(live.time) : undefined;
    }, 'the first telemetry', 30_000);
    const steps = [{ kind: 'hold', durationMs: 1000 }, { kind: 'shot', label: 'replay check' }, { kind: 'hold', durationMs: 1000 }];
    const sequence = await post(await signIn(stack.server.url, 'lead'), '/api/sequences', { name: 'Replay marks', steps, reason: 'replay check' });
    const { runId } = await post(operator, `/api/sequences/${sequence['id']}/run`, { reason: 'replay check' });
    await waitFor(() => (Date.now() > firstDataMs + 10_000 ? true : undefined), 'ten seconds of telemetry', 30_000);
    await post(operator, '/api/steering/release', { reason: 'end of the replay check run' });
    const noteAtMs = firstDataMs + 5000;
    const note = await fetch(`${stack.server.url}/api/logbook/entries`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', authorization: `Bearer ${operator}` },
      body: JSON.stringify({ text: 'Field steady for the replay check', at: new Date(noteAtMs).toISOString() }),
    });
    expect(note.status).toBe(201);
    const toMs = Date.now();

    const page = await openSignedIn(env, 'viewer', { viewport: { width: 1920, height: 1080 } });
    await openPage(page, 'Replay');

    const windowForm = page.getByRole('form', { name: 'A time window' });
    await windowForm.getByLabel('From date').fill(dateText(firstDataMs));
    await windowForm.getByLabel('From time').fill(timeText(firstDataMs));
    await windowForm.getByLabel('To date').fill(dateText(toMs + 1000));
    await windowForm.getByLabel('To time').fill(timeText(toMs + 1000));
    const answer = page.waitForResponse((r) => r.url().includes('/api/history?') && r.status() === 200);
    await windowForm.getByRole('button', { name: 'Load window' }).click();
    const history = (await (await answer).json()) as HistoryResponse;
    expect(history.series.t.length).toBeGreaterThan(10);

    const bar = page.getByRole('region', { name: 'Replay controls' });
    await expect.poll(() => bar.innerText()).toMatch(/Replay — recorded .+, not live\./);
    await expect.poll(() => page.getByRole('status', { name: 'Connection' }).innerText()).not.toMatch(/^\s*\S*\s*Live\b/);

    // Each step of the run is a mark of its own, named in the legend.
    await expect.poll(() => page.getByRole('button', { name: /^Jump to Run step at / }).count()).toBe(3);
    expect(await page.getByRole('button', { name: /^Jump to Run step at / }).first().getAttribute('aria-label')).toMatch(new RegExp(`— Run ${runId} step 1: hold for 1\\.0 s\\. Done after [\\d.]+ s$`));
    expect(await page.locator('tw-replay-timeline .legend').innerText()).toContain('Run step');

    // Jump to the note's mark.
    await page.getByRole('button', { name: /^Jump to Note .*Field steady for the replay check/ }).click();
    await expect.poll(() => clockMs(page)).toBe(Date.parse(history.events.find((e) => e.kind === 'note')!.at));
    await expectReadoutAtClock(page, history);

    // Play at 0.5×, then pause: the clock moved on, and the readout is history's at the new moment.
    const before = await clockMs(page);
    const speed = (label: string) => bar.getByRole('radio', { name: label, exact: true });
    await speed('0.5×').click();
    await bar.getByRole('button', { name: 'Play', exact: true }).click();
    await expect.poll(() => clockMs(page), { timeout: 10_000 }).toBeGreaterThan(before + 500);
    await bar.getByRole('button', { name: 'Pause', exact: true }).click();
    await expectReadoutAtClock(page, history);

    // At 20× the whole window (about 11 s) plays in well under its own length, then stops at its end.
    const toWindowEnd = Date.parse(history.to);
    await page.getByRole('slider', { name: 'Replay position' }).press('Home');
    await speed('20×').click();
    const startedPlaying = Date.now();
    await bar.getByRole('button', { name: 'Play', exact: true }).click();
    await expect.poll(() => clockMs(page), { timeout: 8000 }).toBe(toWindowEnd);
    expect(Date.now() - startedPlaying).toBeLessThan(toWindowEnd - Date.parse(history.from));
    await expect.poll(() => bar.getByRole('button', { name: 'Play', exact: true }).count()).toBe(1);

    // Click the timeline a quarter of the way along; step with the keyboard.
    const track = page.getByRole('slider', { name: 'Replay position' });
    const box = (await track.boundingBox())!;
    await track.click({ position: { x: box.width * 0.25, y: box.height / 2 } });
    const fromMs = Date.parse(history.from);
    const span = Date.parse(history.to) - fromMs;
    await expect.poll(async () => Math.abs((await clockMs(page)) - (fromMs + 0.25 * span))).toBeLessThan(span * 0.01);
    await expectReadoutAtClock(page, history);
    const clicked = await clockMs(page);
    await track.press('ArrowRight');
    await expect.poll(() => clockMs(page)).toBeCloseTo(clicked + 0.01 * span, 0);
    await expectReadoutAtClock(page, history);

    await page.waitForTimeout(500); // let the charts draw their marker before the pictures
    await page.screenshot({ path: join(ARTIFACT_DIR, 'replay-1920.png'), fullPage: true });
    await page.setViewportSize({ width: 1366, height: 768 });
    await page.waitForTimeout(500);
    await page.screenshot({ path: join(ARTIFACT_DIR, 'replay-1366.png'), fullPage: true });
  });

  it('greys the prediction where Live did and draws the level set and alarm limits and names the calibration in force at the clock', async () => {
    const { stack } = env;
    const lead = await signIn(stack.server.url, 'lead');
    const call = (method: string, path: string, body?: unknown) =>
      fetch(`${stack.server.url}${path}`, { method, headers: { 'content-type': 'application/json', authorization: `Bearer ${lead}` }, body: body === undefined ? undefined : JSON.stringify(body) });
    const firstDataMs = await waitFor(async () => {
      const live = (await (await call('GET', '/api/live')).json()) as LiveState;
      return live.prediction && live.time ? Date.parse(live.time) : undefined;
    }, 'the first prediction', 30_000);
    await waitFor(() => (Date.now() > firstDataMs + 8000 ? true : undefined), 'eight seconds of telemetry', 30_000);
    const before = (await (await call('GET', '/api/levels')).json()) as LevelSetVersion;
    const withMinField = (minOrientingFieldG: number, reason: string) =>
      call('PUT', '/api/levels', { levels: { ...before.levels, settings: { ...before.levels.settings, minOrientingFieldG } }, reason });
    const currentXHigh = (limit: number, reason: string) => call('PUT', '/api/alarm-limits/current.x.H', { limit, reason });
    // For four seconds a lead asks for more field than the demo makes (Live greys the prediction) and lowers an alarm limit.
    expect((await withMinField(1000, 'Replay check: prediction greyed for a moment')).status).toBe(200);
    expect((await currentXHigh(17, 'Replay check: alarm limit lowered for a moment')).status).toBe(200);
    const raisedMs = Date.now();
    await waitFor(() => (Date.now() > raisedMs + 4000 ? true : undefined), 'four seconds of a greyed prediction', 10_000);
    const note = await call('POST', '/api/logbook/entries', { text: 'Prediction greyed on purpose', at: new Date(raisedMs + 2000).toISOString() });
    expect(note.status).toBe(201);
    expect((await withMinField(before.levels.settings.minOrientingFieldG, 'Replay check: back to the usual least field')).status).toBe(200);
    expect((await currentXHigh(18, 'Replay check: back to the usual alarm limit')).status).toBe(200);

    const page = await openSignedIn(env, 'viewer', { viewport: { width: 1366, height: 768 } });
    await openPage(page, 'Replay');
    await page.getByRole('button', { name: 'Last 10 minutes' }).click();
    await page.getByRole('button', { name: /^Jump to Note .*Prediction greyed on purpose/ }).click();
    const prediction = page.getByRole('region', { name: 'Prediction' });
    await expect.poll(() => prediction.innerText()).toMatch(/Did not apply at this moment\.\s+\|B\| = \d+\.\d\d G is below 1000\.00 G, too weak to orient the dipoles/);
    expect(await prediction.getAttribute('class')).toContain('stale');
    const bar = page.getByRole('region', { name: 'Replay controls' });
    expect(await bar.innerText()).toMatch(/In force at the replay clock: calibration v1 "Lindqvist Hall demo calibration" · sample profile "Lindqvist Hall 167Er, crossed trap" v1/);
    const coils = page.getByRole('region', { name: 'Coils' });
    expect(await coils.innerText()).toContain(`level set v${before.version + 1} and alarm marks of the alarm limits, both in force at the replay clock`);
    const alarmMark = async () => Number(await page.locator('tw-gauge-bar[aria-label^="X current"] .mark[data-kind="alarm"]').first().getAttribute('data-percent'));
    const lowered = await alarmMark();
    await page.waitForTimeout(500);
    await page.screenshot({ path: join(ARTIFACT_DIR, 'replay-greyed-1366.png'), fullPage: true });

    // 6 s earlier (1 % of the window), before the raise, it applied under the level set then in force.
    await page.getByRole('slider', { name: 'Replay position' }).press('ArrowLeft');
    await expect.poll(() => prediction.innerText()).not.toContain('Did not apply');
    expect(await prediction.innerText()).toMatch(/β = K∥\/K⊥/);
    expect(await coils.innerText()).toContain(`level set v${before.version} and`);
    expect(await alarmMark()).toBeGreaterThan(lowered); // 18 A then, 17 A during the raise
  });
});
