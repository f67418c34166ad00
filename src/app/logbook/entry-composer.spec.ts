import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { fieldError, formAlert, settle, typeInto } from '../shared-ui/form-field-test-kit';
import { EntryComposer } from './entry-composer';

describe('EntryComposer', () => {
  let fixture: ComponentFixture<EntryComposer>;
  let http: HttpTestingController;
  const host = () => fixture.nativeElement as HTMLElement;
  const submit = async () => {
    host().querySelector('form')!.dispatchEvent(new Event('submit'));
    await fixture.whenStable();
  };

  beforeEach(async () => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(EntryComposer);
    await fixture.whenStable();
  });

  afterEach(() => http.verify());

  it('asks for the text beside the Entry box and sends nothing', async () => {
    typeInto(host(), 'Tags', 'cooling');
    await submit();
    http.expectNone('/api/logbook/entries');
    expect(fieldError(host(), 'Entry')).toBe('Entry: write what happened; an entry cannot be empty');
    expect(formAlert(host())).toBeNull();
  });

  it('places the server’s refusal beside the field it names, and one naming no field under the form', async () => {
    typeInto(host(), 'Entry', 'Chiller restarted');
    typeInto(host(), 'Linked to', 'alarm:no.such.alarm');
    await submit();
    const request = http.expectOne('/api/logbook/entries');
    expect((request.request.body as FormData).get('link')).toBe('alarm:no.such.alarm');
    request.flush({ error: 'Linked to: there is no alarm no.such.alarm', field: 'link' }, { status: 400, statusText: 'Bad Request' });
    await settle(fixture);
    expect(fieldError(host(), 'Linked to')).toBe('Linked to: there is no alarm no.such.alarm');
    expect(fieldError(host(), 'Entry')).toBeNull();
    expect(formAlert(host())).toBeNull();

    typeInto(host(), 'Linked to', '');
    await submit();
    http.expectOne('/api/logbook/entries').flush({ error: 'Attachments: the file is not an image, PDF or CSV' }, { status: 400, statusText: 'Bad Request' });
    await settle(fixture);
    expect(formAlert(host())).toContain('Attachments: the file is not an image, PDF or CSV');
    expect(fieldError(host(), 'Linked to')).toBeNull();
  });
});
