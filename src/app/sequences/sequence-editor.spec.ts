import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { fieldError, formAlert, settle, typeInto } from '../shared-ui/form-field-test-kit';
import { SequenceEditor } from './sequence-editor';

describe('SequenceEditor', () => {
  let fixture: ComponentFixture<SequenceEditor>;
  let http: HttpTestingController;
  const host = () => fixture.nativeElement as HTMLElement;
  const save = () => [...host().querySelectorAll('button')].find((b) => b.textContent!.includes('Save as new version'))!.click();
  const cell = (label: string) => host().querySelector<HTMLInputElement>(`input[aria-label="${label}"]`)!;

  beforeEach(async () => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(SequenceEditor);
    await fixture.whenStable();
  });

  afterEach(() => http.verify());

  it('asks for the name and the reason beside their fields and sends nothing', async () => {
    save();
    await fixture.whenStable();
    http.expectNone('/api/sequences');
    expect(fieldError(host(), 'Name')).toBe('Name must not be empty');
    expect(fieldError(host(), 'Reason (goes into the audit trail)')).toBe('Reason (goes into the audit trail) must say why');
    expect(formAlert(host())).toBeNull();
  });

  it('marks a step typed out of range in its own row', async () => {
    cell('θ of step 1').value = '200';
    cell('θ of step 1').dispatchEvent(new Event('input'));
    await fixture.whenStable();
    expect(cell('θ of step 1').getAttribute('aria-invalid')).toBe('true');
    expect(cell('|B| of step 1').getAttribute('aria-invalid')).toBe('false');
    expect(host().querySelector(`#${cell('θ of step 1').getAttribute('aria-describedby')}`)!.textContent).toContain('Step 1: θ must be from 0 to 180 °');
  });

  it('places the server’s refusal beside the field it names: the name, or the input of a step', async () => {
    typeInto(host(), 'Name', 'Tilt scan');
    typeInto(host(), 'Reason (goes into the audit trail)', 'first version');
    save();
    const first = http.expectOne('/api/sequences');
    expect(first.request.body).toMatchObject({ name: 'Tilt scan', reason: 'first version' });
    first.flush({ error: 'Name: must not contain control characters', field: 'name' }, { status: 400, statusText: 'Bad Request' });
    await settle(fixture);
    expect(fieldError(host(), 'Name')).toBe('Name: must not contain control characters');
    expect(formAlert(host())).toBeNull();

    typeInto(host(), 'Name', 'Tilt scan, x–z plane');
    save();
    http.expectOne('/api/sequences').flush({ error: 'Step 2 (hold): Duration must be at most 3600000 ms', field: 'steps.1.durationMs' }, { status: 400, statusText: 'Bad Request' });
    await settle(fixture);
    const duration = cell('Duration of step 2');
    expect(duration.getAttribute('aria-invalid')).toBe('true');
    expect(host().querySelector(`#${duration.getAttribute('aria-describedby')}`)!.textContent).toContain('Step 2 (hold): Duration must be at most 3600000 ms');
    expect(fieldError(host(), 'Name')).toBeNull();
    expect(formAlert(host())).toBeNull();
  });
});
