import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { afterEach, describe, expect, it } from 'vitest';
import type { AlarmHealthReport, AlarmListItem } from '../../../shared/alarms/alarm-api';
import type { Role } from '../../../shared/auth/roles';
import { configureSignedIn } from '../auth/signed-in-test-bed';
import { AlarmsPage } from './alarms-page';

const ALARMS: AlarmListItem[] = [
  {
    id: 'flow.x.L', channel: 'flow.x', level: 'L', priority: 'high', state: 'unacknowledged', raisedAt: '2026-03-02T22:14:04.000Z',
    conditionSince: '2026-03-02T22:14:03.000Z', value: 0.8, valueAtRaise: 1.3, limit: 1.5, firstOut: true, shelf: null,
  },
  {
    id: 'temperature.x.H', channel: 'temperature.x', level: 'H', priority: 'medium', state: 'unacknowledged', raisedAt: '2026-03-02T22:14:09.000Z',
    conditionSince: '2026-03-02T22:14:08.000Z', value: 56.2, valueAtRaise: 55.4, limit: 55, firstOut: false, firstOutOf: 'flow.x.L', shelf: null,
  },
  {
    id: 'current.y.H', channel: 'current.y', level: 'H', priority: 'medium', state: 'normal', raisedAt: null,
    conditionSince: null, value: 3.1, valueAtRaise: null, limit: 18, firstOut: false, shelf: null,
  },
];

const HEALTH: AlarmHealthReport = {
  from: '2026-03-01T22:20:00.000Z', to: '2026-03-02T22:20:00.000Z', recentCount: 2, flooding: false, averagePerInterval: 0.1,
  intervals: [], chattering: [], stale: [],
  rules: { intervalMinutes: 10, floodAbove: 10, chatterRaises: 3, chatterWindowS: 60, staleAfterHours: 24 },
};

describe('AlarmsPage', () => {
  let fixture: ComponentFixture<AlarmsPage>;
  let http: HttpTestingController;

  afterEach(() => {
    TestBed.inject(HttpTestingController).verify();
    localStorage.clear();
  });

  /** Opens the page signed in with `role`, the server answering the alarm list and health figures. */
  async function open(role: Role): Promise<void> {
    configureSignedIn(role);
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(AlarmsPage);
    TestBed.tick();
    answerList();
    http.expectOne('/api/alarms/health').flush(HEALTH);
    await fixture.whenStable();
  }

  function answerList(): void {
    http.expectOne('/api/alarms?state=all').flush({ alarms: ALARMS });
  }

  /** Answers the list again once the page asks for it (it re-reads the list after each request). */
  async function answerReload(): Promise<void> {
    for (let turn = 0; turn < 50; turn++) {
      const requests = http.match('/api/alarms?state=all');
      if (requests.length > 0) {
        for (const r of requests) r.flush({ alarms: ALARMS });
        await fixture.whenStable();
        return;
      }
      await new Promise((resolve) => setTimeout(resolve, 10));
    }
    throw new Error('the page did not read the alarm list again');
  }

  const host = () => fixture.nativeElement as HTMLElement;
  const activeList = () => host().querySelector('[aria-label="Active alarms"]')!;
  const buttonTexts = (root: Element) => [...root.querySelectorAll('button')].map((b) => b.textContent!.replace(/\s+/g, ' ').trim());
  const button = (root: Element, text: string) => [...root.querySelectorAll('button')].find((b) => b.textContent!.includes(text))!;
  const dialog = () => document.querySelector('mat-dialog-container')!;

  it('shows a viewer the active alarms with priority, state and units but offers no action at all', async () => {
    await open('viewer');
    const text = activeList().textContent!;
    expect(text).toContain('High');
    expect(text).toContain('Unacknowledged');
    expect(text).toContain('0.80\u00a0L/min');
    expect(text).toContain('limit 1.50\u00a0L/min');
    expect(buttonTexts(activeList()).filter((b) => /Acknowledge|Shelve|Reset|Out of service/.test(b))).toEqual([]);
  });

  it('offers an operator acknowledge and shelve on an unacknowledged alarm, but not out of service', async () => {
    await open('operator');
    const buttons = buttonTexts(activeList().querySelector('[aria-label="flow.x.L"]')!);
    expect(buttons).toEqual(['check Acknowledge', 'shelves Shelve']);
  });

  it('folds the alarms raised by the same cause under the first-out alarm with their count', async () => {
    await open('viewer');
    expect(activeList().querySelector('[aria-label="temperature.x.H"]')).toBeNull();
    const fold = button(activeList(), 'more alarm');
    expect(fold.textContent).toContain('1 more alarm raised by the same cause');
    fold.click();
    await fixture.whenStable();
    expect(activeList().querySelector('[aria-label="Grouped under flow.x.L"] [aria-label="temperature.x.H"]')).not.toBeNull();
  });

  it('sends an acknowledgement for the operator', async () => {
    await open('operator');
    button(activeList(), 'Acknowledge').click();
    const request = http.expectOne('/api/alarms/flow.x.L/acknowledge');
    expect(request.request.method).toBe('POST');
    request.flush({ alarm: { ...ALARMS[0], state: 'acknowledged' }, changed: true });
    await answerReload();
  });

  it('does not shelve without a reason, then sends minutes and reason once one is written', async () => {
    await open('operator');
    button(activeList().querySelector('[aria-label="flow.x.L"]')!, 'Shelve').click();
    await fixture.whenStable();
    button(dialog(), 'Shelve').click();
    await fixture.whenStable();
    http.expectNone('/api/alarms/flow.x.L/shelve');
    expect(dialog().querySelector('[role="alert"]')!.textContent).toContain('Write a reason');

    const reason = dialog().querySelector('textarea')!;
    reason.value = 'flow sensor x being replaced by the lab engineer';
    reason.dispatchEvent(new Event('input'));
    button(dialog(), 'Shelve').click();
    const request = http.expectOne('/api/alarms/flow.x.L/shelve');
    expect(request.request.body).toEqual({ minutes: 60, reason: 'flow sensor x being replaced by the lab engineer' });
    request.flush({ alarm: { ...ALARMS[0], state: 'shelved' }, changed: true });
    await answerReload();
    expect(document.querySelector('mat-dialog-container')).toBeNull();
  });
});
