import { HttpTestingController } from '@angular/common/http/testing';
import { Component, input } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { SteeringStatus } from '../../../shared/steering/steering-api';
import { configureSignedIn } from '../auth/signed-in-test-bed';
import { fieldError, formAlert, settle, typeInto } from '../shared-ui/form-field-test-kit';
import { PathMap } from './path-map';
import { SteerPage } from './steer-page';

/** The map under the path is not under test here (it computes in a Web Worker). */
@Component({ selector: 'tw-path-map', template: '' })
class NoPathMap {
  readonly path = input<unknown>();
}

const IDLE: SteeringStatus = { mode: 'idle', target: null, actor: null, reason: null, startedAt: null, path: [], runId: null, lastStop: null };
const HOLDING: SteeringStatus = {
  ...IDLE, mode: 'holding', target: { magnitudeG: 9, thetaDeg: 54.7, phiDeg: 120, rampMs: 6000 }, actor: 'operator@tiltwatch.example', reason: 'scan', startedAt: '2026-12-02T12:00:00.000Z',
};

describe('SteerPage', () => {
  let fixture: ComponentFixture<SteerPage>;
  let http: HttpTestingController;
  const host = () => fixture.nativeElement as HTMLElement;
  const button = (text: string) => [...host().querySelectorAll('button')].find((b) => b.textContent!.includes(text))!;

  beforeEach(() => {
    configureSignedIn('operator');
    TestBed.overrideComponent(SteerPage, { remove: { imports: [PathMap] }, add: { imports: [NoPathMap] } });
    http = TestBed.inject(HttpTestingController);
  });

  afterEach(() => {
    fixture.destroy();
    localStorage.clear();
  });

  async function open(status = IDLE): Promise<void> {
    fixture = TestBed.createComponent(SteerPage);
    TestBed.tick();
    for (const r of http.match('/api/steering')) r.flush(status);
    await settle(fixture);
  }

  function fillTarget(): void {
    typeInto(host(), '|B|', '9');
    typeInto(host(), 'θ (from trap z)', '54.7');
    typeInto(host(), 'φ (from trap x to y)', '120');
    typeInto(host(), 'Ramp time', '6');
    typeInto(host(), 'Reason (goes into the audit trail)', 'afternoon scan');
  }

  it('shows what to fix beside each field, in the form’s words, and sends nothing', async () => {
    await open();
    fillTarget();
    typeInto(host(), 'θ (from trap z)', '200');
    typeInto(host(), 'Reason (goes into the audit trail)', '  ');
    button('Run pre-flight').click();
    await settle(fixture);
    http.expectNone('/api/steering/preflight');
    expect(fieldError(host(), 'θ (from trap z)')).toBe('θ (from trap z) must be from 0 to 180 °');
    expect(fieldError(host(), 'Reason (goes into the audit trail)')).toBe('Reason (goes into the audit trail) must say why');
    expect(fieldError(host(), '|B|')).toBeNull();
    expect(formAlert(host())).toBeNull();

    typeInto(host(), 'θ (from trap z)', '20');
    await settle(fixture);
    expect(fieldError(host(), 'θ (from trap z)')).toBeNull();
  });

  it('places the server’s refusal beside the field it names, and a refusal naming no field under the form', async () => {
    await open();
    fillTarget();
    button('Run pre-flight').click();
    const preflight = http.expectOne('/api/steering/preflight');
    expect(preflight.request.body).toEqual({ magnitudeG: 9, thetaDeg: 54.7, phiDeg: 120, rampMs: 6000, reason: 'afternoon scan' });
    preflight.flush({ error: 'Ramp time must be at most 3600 s', field: 'rampMs' }, { status: 400, statusText: 'Bad Request' });
    await settle(fixture);
    expect(fieldError(host(), 'Ramp time')).toBe('Ramp time must be at most 3600 s');
    expect(formAlert(host())).toBeNull();

    button('Run pre-flight').click();
    http.expectOne('/api/steering/preflight').flush({ error: 'The interlock is tripped' }, { status: 409, statusText: 'Conflict' });
    await settle(fixture);
    expect(formAlert(host())).toContain('The interlock is tripped');
  });

  it('asks for the reason of a release beside its field and shows the server’s refusal there', async () => {
    await open(HOLDING);
    button('Release steering').click();
    await settle(fixture);
    http.expectNone('/api/steering/release');
    expect(fieldError(host(), 'Reason for abort or release')).toBe('Reason for abort or release must say why (it goes into the audit trail)');

    typeInto(host(), 'Reason for abort or release', 'bad \u0007 text');
    button('Release steering').click();
    http.expectOne('/api/steering/release').flush({ error: 'Reason for abort or release: must not contain control characters', field: 'reason' }, { status: 400, statusText: 'Bad Request' });
    await settle(fixture);
    expect(fieldError(host(), 'Reason for abort or release')).toBe('Reason for abort or release: must not contain control characters');
    expect(fieldError(host(), 'Reason (goes into the audit trail)')).toBeNull();
  });

  it('shows what a restart left: a kept target, or an interrupted ramp whose measured field counts, with release but no abort', async () => {
    await open({ ...HOLDING, mode: 'restored' });
    expect(host().querySelector('.mode')!.textContent).toContain('Target kept from before the restart');
    expect(host().querySelector('[data-restart="restored"]')!.textContent).toContain('sends no setpoint');
    fixture.destroy();

    await open({ ...HOLDING, mode: 'interrupted' });
    expect(host().querySelector('.mode')!.textContent).toContain('Ramp interrupted by a restart');
    expect(host().querySelector('[data-restart="interrupted"]')!.textContent).toContain('the measured field is what counts now');
    expect(button('Release steering')).toBeDefined();
    expect(button('Abort ramp')).toBeUndefined();
  });
});
