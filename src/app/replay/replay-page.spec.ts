import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatButtonToggleHarness } from '@angular/material/button-toggle/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { RunRecord } from '../../../shared/steering/steering-api';
import { configureSignedIn } from '../auth/signed-in-test-bed';
import { ReplayPage } from './replay-page';
import { ReplayPresence } from './replay-presence';
import { FIXTURE_FROM, historyFixture } from './testing/history-fixture';

const RUN: RunRecord = {
  id: 7, sequenceId: 2, sequenceName: 'θ scan', sequenceVersion: 3, state: 'done', startedAt: new Date(FIXTURE_FROM).toISOString(),
  endedAt: new Date(FIXTURE_FROM + 60_000).toISOString(), step: 4, stepCount: 4, actor: 'operator@tiltwatch.example', reason: 'nightly scan',
  endReason: null, shots: [],
};

describe('ReplayPage', { timeout: 30_000 }, () => {
  let fixture: ComponentFixture<ReplayPage>;
  let http: HttpTestingController;
  let host: HTMLElement;

  beforeEach(async () => {
    configureSignedIn('viewer');
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ReplayPage);
    host = fixture.nativeElement as HTMLElement;
    TestBed.tick();
    http.expectOne('/api/runs').flush({ runs: [RUN] });
    await fixture.whenStable();
  });

  afterEach(() => localStorage.clear());

  const text = (selector: string) => host.querySelector<HTMLElement>(selector)?.textContent?.replace(/\s+/g, ' ').trim() ?? '';
  const fieldText = () => text('tw-field-panel');
  const clockMs = () => Number(host.querySelector('[aria-label="Replay clock"] time')?.getAttribute('data-time-ms'));

  async function loadFixtureWindow(): Promise<void> {
    host.querySelector<HTMLButtonElement>('form[aria-label="A time window"] button[type="submit"]')!.click();
    const request = http.expectOne((r) => r.url === '/api/history');
    expect(request.request.params.has('from') && request.request.params.has('to')).toBe(true);
    request.flush(historyFixture());
    await fixture.whenStable();
  }

  it('says it is a replay, of when, and tells the shell', async () => {
    expect(TestBed.inject(ReplayPresence).active()).toBe(true);
    await loadFixtureWindow();
    expect(text('.replay-label strong')).toMatch(/^Replay — recorded .+, not live\.$/);
    expect(clockMs()).toBe(FIXTURE_FROM);
    expect(fieldText()).toContain('10.0°');
    fixture.destroy();
    expect(TestBed.inject(ReplayPresence).active()).toBe(false);
  });

  it('jumps to a mark, steps with the arrow keys and shows the recorded values there', async () => {
    await loadFixtureWindow();
    const alarm = host.querySelector<HTMLButtonElement>('.mark[data-kind="alarm"]')!;
    expect(alarm.getAttribute('aria-label')).toMatch(/^Jump to Alarm at \d\d:\d\d:\d\d — Alarm temperature\.x\.H/);
    expect(text('tw-replay-timeline .legend')).toContain('Alarm');
    expect(text('tw-replay-timeline .legend')).toContain('Run step');
    alarm.click();
    await fixture.whenStable();
    expect(clockMs()).toBe(FIXTURE_FROM + 15_000);
    expect(fieldText()).toContain('25.0°'); // θ = 10° + 1° per second

    const track = host.querySelector<HTMLElement>('[role="slider"]')!;
    track.dispatchEvent(new KeyboardEvent('keydown', { key: 'ArrowRight', bubbles: true }));
    await fixture.whenStable();
    expect(clockMs()).toBe(FIXTURE_FROM + 15_600); // 1 % of the 60 s window
    expect(fieldText()).toContain('25.6°');
  });

  it('shows no values inside a gap in the recording', async () => {
    await loadFixtureWindow();
    for (const key of ['End', 'PageDown', 'PageDown', 'PageDown', 'PageDown']) {
      host.querySelector<HTMLElement>('[role="slider"]')!.dispatchEvent(new KeyboardEvent('keydown', { key, bubbles: true }));
      await fixture.whenStable();
    }
    expect(clockMs()).toBe(FIXTURE_FROM + 36_000);
    expect(fieldText()).toContain('Nothing recorded within 2 s before this moment');
    expect(fieldText()).not.toMatch(/\d+\.\d°/);
  });

  it('plays and pauses with space and changes speed', async () => {
    await loadFixtureWindow();
    const loader = TestbedHarnessEnvironment.loader(fixture);
    const twenty = await loader.getHarness(MatButtonToggleHarness.with({ text: '20×' }));
    await twenty.check();
    expect(host.querySelector('.mat-button-toggle-checked')?.textContent?.trim()).toBe('20×');
    host.querySelector<HTMLElement>('.charts')!.dispatchEvent(new KeyboardEvent('keydown', { key: ' ', bubbles: true }));
    await fixture.whenStable();
    expect(text('button.play')).toContain('Pause');
    host.querySelector<HTMLElement>('.charts')!.dispatchEvent(new KeyboardEvent('keydown', { key: ' ', bubbles: true }));
    await fixture.whenStable();
    expect(text('button.play')).toContain('Play');
    const paused = clockMs();
    host.querySelector<HTMLElement>('.charts')!.dispatchEvent(new KeyboardEvent('keydown', { key: 'ArrowRight', bubbles: true }));
    await fixture.whenStable();
    expect(clockMs()).toBe(paused + 600); // 1 % of the window, from anywhere on the page
  });

  it('shows the prediction as it was shown live at the moment, camera view included', async () => {
    await loadFixtureWindow();
    const panel = () => text('tw-prediction-panel');
    expect(panel()).toContain('1.0200');
    expect(host.querySelector('tw-prediction-panel tw-camera-sketch')).not.toBeNull();
    host.querySelector<HTMLButtonElement>('.mark[data-kind="shot"]')!.click(); // 50 s: the collapsed prediction from 20 s
    await fixture.whenStable();
    expect(panel()).toContain('Collapsed');
    expect(host.querySelector('tw-prediction-panel tw-camera-sketch')).toBeNull();
  });

  it('greys the prediction where it did not apply, saying why, and names the versions in force at the clock', async () => {
    await loadFixtureWindow();
    const panel = () => text('tw-prediction-panel');
    expect(text('.in-force')).toContain('calibration v1 "Lindqvist Hall demo calibration" · sample profile "Lindqvist Hall 167Er, crossed trap" v2');
    expect(text('tw-coil-strip')).toContain('level set v1 and alarm marks of the alarm limits, both in force at the replay clock');
    // The first alarm mark of the X current gauge (scale −25…25 A): +H, 18 A at 86 %, 16 A at 82 %.
    const alarmMark = () => Math.round(Number(host.querySelector('tw-gauge-bar[aria-label^="X current"] .mark[data-kind="alarm"]')?.getAttribute('data-percent')));
    const before = alarmMark();
    for (const key of ['End', 'ArrowLeft', 'ArrowLeft', 'ArrowLeft', 'ArrowLeft', 'ArrowLeft']) {
      host.querySelector<HTMLElement>('[role="slider"]')!.dispatchEvent(new KeyboardEvent('keydown', { key, bubbles: true }));
      await fixture.whenStable();
    }
    expect(clockMs()).toBe(FIXTURE_FROM + 57_000);
    expect(panel()).toContain('Did not apply at this moment. |B| = 0.30 G is below 0.50 G, too weak to orient the dipoles');
    expect(host.querySelector('tw-prediction-panel')!.classList).toContain('stale');
    expect(text('.in-force')).toContain('calibration v2 "Vector-probe fit of probe-night.csv"');
    expect(fieldText()).toContain('Calibration v2 · Vector-probe fit of probe-night.csv');
    expect(text('tw-coil-strip')).toContain('level set v2');
    expect([before, alarmMark()]).toEqual([86, 82]); // the limit edited at 45 s
  });

  it('loads a run from the list by its id', async () => {
    const loader = TestbedHarnessEnvironment.loader(fixture);
    const select = await loader.getHarness(MatSelectHarness.with({ selector: 'form[aria-label="A run"] mat-select' }));
    await select.open();
    await select.clickOptions({ text: /θ scan v3/ });
    host.querySelector<HTMLButtonElement>('form[aria-label="A run"] button[type="submit"]')!.click();
    const run = { id: 7, label: 'sequence "θ scan" version 3', state: 'done', startedAt: RUN.startedAt, endedAt: RUN.endedAt };
    http.expectOne('/api/history?run=7').flush({ ...historyFixture(), run });
    await fixture.whenStable();
    expect(text('.replay-label')).toMatch(/not live\. \(run 7: sequence "θ scan" version 3, done\)$/);
  });

  it('names the field of a reversed window and asks nothing', async () => {
    const [fromTime, toTime] = host.querySelectorAll<HTMLInputElement>('input[type="time"]');
    const day = host.querySelectorAll<HTMLInputElement>('input[name="fromDate"], input[name="toDate"]');
    expect(day.length).toBe(2);
    fromTime.value = '10:00:00';
    fromTime.dispatchEvent(new Event('input'));
    toTime.value = '09:00:00';
    toTime.dispatchEvent(new Event('input'));
    await fixture.whenStable();
    host.querySelector<HTMLButtonElement>('form[aria-label="A time window"] button[type="submit"]')!.click();
    await fixture.whenStable();
    expect(text('.problem')).toContain('To must be later than From.');
    http.expectNone((r) => r.url === '/api/history');
  });
});
