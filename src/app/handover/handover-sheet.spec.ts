import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { Handover } from '../../../shared/handover/handover-api';
import { fieldError, formAlert, settle, typeInto } from '../shared-ui/form-field-test-kit';
import { HandoverSheet } from './handover-sheet';

const AT = '2026-12-02T06:00:00.000Z';
const DRAFT: Handover = {
  id: 7,
  status: 'draft',
  author: 'operator@tiltwatch.example',
  createdAt: AT,
  periodFrom: '2026-12-01T22:00:00.000Z',
  periodTo: AT,
  record: {
    filledAt: AT,
    apparatus: {
      telemetryAt: null, controllerOnline: true, controllerMode: 'demo', field: null, currentsA: null, setpointsA: null, interlock: 'ok',
      interlockFirstOut: null, hardwareTripped: false, hardwareTripCause: null, calibration: null,
    },
    alarms: [],
    trips: [],
    changes: [],
    runs: { recorded: true, note: null, items: [] },
    logbook: [],
  },
  summary: 'Quiet night.',
  notes: {},
  openItems: [
    { id: 3, text: 'Chiller pump noisy', openedBy: 'lead@tiltwatch.example', openedAt: AT, carried: true, closed: null },
    { id: null, text: 'Recheck coil x flow', openedBy: 'operator@tiltwatch.example', openedAt: null, carried: false, closed: null },
  ],
  submitted: null,
  accepted: null,
};

describe('HandoverSheet', () => {
  let fixture: ComponentFixture<HandoverSheet>;
  let http: HttpTestingController;
  const host = () => fixture.nativeElement as HTMLElement;
  const section = (title: string) => host().querySelector<HTMLElement>(`section[aria-label="${title}"]`)!;
  const button = (text: string, within = host()) => [...within.querySelectorAll('button')].find((b) => b.textContent!.includes(text))!;

  beforeEach(async () => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(HandoverSheet);
    fixture.componentRef.setInput('handover', DRAFT);
    fixture.componentRef.setInput('me', { email: 'operator@tiltwatch.example', role: 'operator' });
    await fixture.whenStable();
  });

  afterEach(() => http.verify());

  it('places a refusal of a section’s notes beside that section’s notes', async () => {
    typeInto(section('Alarms away from normal'), 'Your notes on this', 'bell \u0007 rang');
    button('Save draft').click();
    const put = http.expectOne('/api/handovers/7');
    expect(put.request.body).toEqual({ summary: 'Quiet night.', notes: { alarms: 'bell \u0007 rang' }, openItems: [{ text: 'Recheck coil x flow' }] });
    put.flush({ error: 'Your notes on this: must not contain control characters', field: 'notes.alarms' }, { status: 400, statusText: 'Bad Request' });
    await settle(fixture);
    expect(fieldError(section('Alarms away from normal'), 'Your notes on this')).toBe('Your notes on this: must not contain control characters');
    expect(fieldError(section('Apparatus now'), 'Your notes on this')).toBeNull();
    expect(formAlert(host())).toBeNull();
  });

  it('places a refusal of a new open item beside that item, counting only the items sent', async () => {
    const items = section('Open items');
    button('Add an open item', items).click();
    button('Add an open item', items).click();
    await fixture.whenStable();
    typeInto(items, 'New open item', 'Order a spare \u0007 fuse', 2);
    button('Save draft').click();
    // The blank second row is not sent, so the server's item 2 is the third row.
    const put = http.expectOne('/api/handovers/7');
    expect(put.request.body.openItems).toEqual([{ text: 'Recheck coil x flow' }, { text: 'Order a spare \u0007 fuse' }]);
    put.flush({ error: 'New open item 2: must not contain control characters', field: 'openItems.1.text' }, { status: 400, statusText: 'Bad Request' });
    await settle(fixture);
    expect([0, 1, 2].map((n) => fieldError(items, 'New open item', n))).toEqual([null, null, 'New open item 2: must not contain control characters']);
  });

  it('places a refusal of how an item was settled beside that field', async () => {
    const items = section('Open items');
    button('Close…', items).click();
    await fixture.whenStable();
    typeInto(items, 'How was it settled?', ' ');
    button('Close item', items).click();
    http
      .expectOne('/api/handover-items/3/close')
      .flush({ error: 'How was it settled?: must not be empty: say how it was settled', field: 'note' }, { status: 400, statusText: 'Bad Request' });
    await settle(fixture);
    expect(fieldError(items, 'How was it settled?')).toBe('How was it settled?: must not be empty: say how it was settled');
    expect(formAlert(host())).toBeNull();
  });
});
