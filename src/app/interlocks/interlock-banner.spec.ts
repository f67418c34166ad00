import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { beforeEach, describe, expect, it } from 'vitest';
import type { InterlockStatus } from '../../../shared/alarms/alarm-api';
import type { LiveState } from '../../../shared/live/live-state';
import { formatLocalTime } from '../readout/format-quantity';
import { InterlockBanner } from './interlock-banner';

const TRIP_AT = '2026-03-02T22:14:05.000Z';

const OK: InterlockStatus = {
  state: 'ok',
  firstOut: null,
  conditions: [{ name: 'low-flow-x', channel: 'flow.x', active: false, value: 3.1, limit: 1, unit: 'L/min', label: 'Coolant flow x' }],
  hardwareTripped: false,
};

const TRIPPED: InterlockStatus = {
  ...OK,
  state: 'tripped',
  firstOut: { condition: 'low-flow-x', channel: 'flow.x', value: 0.42, limit: 1, at: TRIP_AT },
};

const CONTROLLER: LiveState['controller'] = {
  online: true, tripped: true, hardwareTripped: false, hardwareTripCause: null, softwareHold: true, mode: 'demo', lastFrameAt: null,
};

describe('InterlockBanner', () => {
  let fixture: ComponentFixture<InterlockBanner>;
  let host: HTMLElement;

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideRouter([])] });
    fixture = TestBed.createComponent(InterlockBanner);
    host = fixture.nativeElement as HTMLElement;
  });

  async function show(status: InterlockStatus | null, controller: LiveState['controller'] | null = CONTROLLER): Promise<void> {
    fixture.componentRef.setInput('status', status);
    fixture.componentRef.setInput('controller', controller);
    await fixture.whenStable();
  }

  const alerts = () => [...host.querySelectorAll('[role="alert"] p')].map((a) => a.textContent!.replace(/[ \t\n]+/g, ' ').trim());

  it('shows nothing at all while the interlock is ok', async () => {
    await show(OK);
    expect(host.textContent!.trim()).toBe('');
  });

  it('shows nothing while the interlock state is not yet known', async () => {
    await show(null, null);
    expect(alerts()).toEqual([]);
  });

  it('names the first-out condition, its channel, the local trip time and value against limit with units', async () => {
    await show(TRIPPED);
    const [text] = alerts();
    const at = formatLocalTime(Date.parse(TRIP_AT));
    expect(text).toContain(`Software interlock tripped — first out: low flow x on flow.x at ${at} (0.42\u00a0L/min, trip level 1.00\u00a0L/min)`);
    expect(host.querySelector('a[href="/interlocks"]')).not.toBeNull();
    expect(host.querySelector('mat-icon')!.textContent).toBe('report');
  });

  it('shows a value just past the trip level with enough decimals to tell it from the level', async () => {
    await show({ ...TRIPPED, firstOut: { ...TRIPPED.firstOut!, value: 0.9962 } });
    expect(alerts()[0]).toContain('(0.996\u00a0L/min, trip level 1.000\u00a0L/min)');
  });

  it('names a condition that watches no coil channel without a channel', async () => {
    await show({ ...TRIPPED, firstOut: { condition: 'telemetry-stale', channel: 'stale', value: 514, limit: 250, at: TRIP_AT } });
    expect(alerts()[0]).toContain('first out: telemetry stale at ');
    expect(alerts()[0]).toContain('(514\u00a0ms, trip level 250\u00a0ms)');
  });

  it('says a latched hardware trip can be reset only at the controller, apart from the software trip', async () => {
    await show(OK, { ...CONTROLLER, hardwareTripped: true, hardwareTripCause: 'coolant flow low on x' });
    expect(alerts()).toEqual([
      'Hardware interlock tripped at the controller (cause: coolant flow low on x). It can only be reset at the controller itself, never from Tiltwatch.',
    ]);
  });

  it('says it is about now while a replay shows', async () => {
    fixture.componentRef.setInput('replaying', true);
    await show(TRIPPED, { ...CONTROLLER, hardwareTripped: true, hardwareTripCause: 'coil X over-temperature' });
    const [software, hardware] = alerts();
    expect(software).toMatch(/^Now, not in the replay: Software interlock tripped/);
    expect(hardware).toMatch(/^Now, not in the replay: Hardware interlock tripped at the controller/);
  });
});
