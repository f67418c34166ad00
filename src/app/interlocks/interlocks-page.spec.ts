import { HttpTestingController, type TestRequest } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { afterEach, describe, expect, it } from 'vitest';
import type { InterlockCondition, InterlockResetRefusal, InterlockStatus } from '../../../shared/alarms/alarm-api';
import type { Role } from '../../../shared/auth/roles';
import { configureSignedIn } from '../auth/signed-in-test-bed';
import { InterlocksPage } from './interlocks-page';

const LOW_FLOW_X: InterlockCondition = {
  name: 'low-flow-x', channel: 'flow.x', active: true, value: 0.4, limit: 1, label: 'Coolant flow x', unit: 'L/min',
  margin: -0.6, valueText: '0.40 L/min', tripsWhen: 'below 1.00 L/min',
};
const TEMPERATURE_X: InterlockCondition = {
  name: 'over-temperature-x', channel: 'temperature.x', active: false, value: 41.2, limit: 65, label: 'Coil temperature x', unit: '°C',
  margin: 23.8, valueText: '41.2 °C', tripsWhen: 'above 65.0 °C',
};

const TRIPPED: InterlockStatus = {
  state: 'tripped',
  firstOut: { condition: 'low-flow-x', channel: 'flow.x', value: 0.9, limit: 1, at: '2026-03-02T22:14:05.000Z' },
  conditions: [LOW_FLOW_X, TEMPERATURE_X],
  hardwareTripped: false,
  hardwareTripCause: null,
  trip: null,
  history: [],
};

describe('InterlocksPage', () => {
  let fixture: ComponentFixture<InterlocksPage>;
  let http: HttpTestingController;

  afterEach(() => {
    fixture.destroy();
    localStorage.clear();
  });

  /** Opens the page signed in with `role`; the server reports `status` (a tripped interlock). */
  async function open(role: Role, status = TRIPPED): Promise<void> {
    configureSignedIn(role);
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(InterlocksPage);
    TestBed.tick();
    answerStatus(status);
    await fixture.whenStable();
  }

  /** Answers every read of the interlock state asked so far (the page re-reads it after a reset). */
  function answerStatus(status = TRIPPED): void {
    for (const r of http.match('/api/interlock')) r.flush(status);
  }

  const historyCard = () => host().querySelector('[aria-labelledby="history-title"]')!;

  it('says so when the trip history cannot be read, instead of an empty list', async () => {
    await open('viewer', { ...TRIPPED, history: [], historyUnavailable: true });
    expect(historyCard().textContent).toContain('The trip history cannot be read now');
    expect(historyCard().textContent).not.toContain('No trips recorded');
  });

  it('says that no trips are recorded when the history is read and empty', async () => {
    await open('viewer');
    expect(historyCard().textContent).toContain('No trips recorded');
    expect(historyCard().textContent).not.toContain('cannot be read');
  });

  const host = () => fixture.nativeElement as HTMLElement;
  const resetButton = () => [...host().querySelectorAll('button')].find((b) => b.textContent!.includes('Reset software interlock'));

  async function submitReset(reason: string): Promise<TestRequest | null> {
    const field = host().querySelector('textarea')!;
    field.value = reason;
    field.dispatchEvent(new Event('input'));
    resetButton()!.click();
    // The request goes out at once or not at all; a few turns of the event loop settle it.
    for (let turn = 0; turn < 20; turn++) {
      const sent = http.match('/api/interlock/reset');
      if (sent.length > 0) return sent[0];
      await new Promise((resolve) => setTimeout(resolve, 5));
    }
    await fixture.whenStable();
    return null;
  }

  it('shows each condition with its present value, trip level and margin in units', async () => {
    await open('viewer');
    const row = [...host().querySelectorAll('tbody tr')].find((r) => r.textContent!.includes('over temperature x'))!;
    expect(row.textContent).toContain('41.2 °C');
    expect(row.textContent).toContain('above 65.0 °C');
    expect(row.textContent).toContain('23.8\u00a0°C');
    expect(row.textContent).toContain('Clear');
  });

  it('offers a viewer no reset', async () => {
    await open('viewer');
    expect(resetButton()).toBeUndefined();
  });

  it('sends no reset without a reason', async () => {
    await open('operator');
    expect(await submitReset('   ')).toBeNull();
    expect(host().querySelector('[role="alert"]')!.textContent).toContain('Write a reason');
  });

  it('lists the conditions the server says still hold when it refuses the reset', async () => {
    await open('operator');
    const request = await submitReset('cooling water valve x reopened');
    expect(request!.request.body).toEqual({ reason: 'cooling water valve x reopened' });
    const refusal: InterlockResetRefusal = {
      error: 'cannot reset while a trip condition holds: low-flow-x 0.40 L/min (below 1.00 L/min). Clear the cause first.',
      conditions: [LOW_FLOW_X],
    };
    request!.flush(refusal, { status: 409, statusText: 'Conflict' });
    await new Promise((resolve) => setTimeout(resolve, 0));
    answerStatus();
    await fixture.whenStable();
    const alert = host().querySelector('[role="alert"]')!;
    expect(alert.textContent).toContain('cannot reset while a trip condition holds');
    const still = [...alert.querySelectorAll('[aria-label="Conditions still holding"] li')].map((li) => li.textContent!.replace(/[ \n]+/g, ' ').trim());
    expect(still).toEqual(['low flow x on flow.x: 0.40\u00a0L/min, trip level 1.00\u00a0L/min']);
  });
});
