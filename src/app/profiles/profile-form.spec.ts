import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { DEMO_PROFILE } from '../../../shared/profiles/demo-profile';
import { ProfileForm } from './profile-form';

describe('ProfileForm', () => {
  let fixture: ComponentFixture<ProfileForm>;
  let http: HttpTestingController;
  let host: HTMLElement;

  beforeEach(async () => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ProfileForm);
    fixture.componentRef.setInput('start', DEMO_PROFILE);
    fixture.componentRef.setInput('heading', 'New version');
    host = fixture.nativeElement as HTMLElement;
    await fixture.whenStable();
  });

  afterEach(() => http.verify());

  /** Types into the input of the form field labelled `label`. */
  function type(label: string, value: string): void {
    const field = [...host.querySelectorAll('mat-form-field')].find((f) => f.querySelector('mat-label')!.textContent!.trim() === label);
    const input = field!.querySelector('input, textarea') as HTMLInputElement;
    input.value = value;
    input.dispatchEvent(new Event('input'));
  }

  async function submit(): Promise<void> {
    host.querySelector('form')!.dispatchEvent(new Event('submit'));
    await fixture.whenStable();
  }

  const errors = () => [...host.querySelectorAll('mat-error')].map((e) => e.textContent!.trim());

  it('starts from the profile it is given', () => {
    const inputs = [...host.querySelectorAll('input')].map((i) => i.value);
    expect(inputs).toEqual(expect.arrayContaining([DEMO_PROFILE.name, '50000', '350', '80', '400', '20']));
  });

  it('shows what to fix beside each field and sends nothing', async () => {
    type('Atom number', '0');
    type('Frequency along y', 'eighty');
    await submit();
    expect(errors()).toEqual(
      expect.arrayContaining(['The trap frequency along y in Hz must be a number (got “eighty”).', 'Give a reason for this version; it goes into the audit trail.']),
    );
    http.expectNone('/api/profiles');
  });

  it('sends a valid profile with its reason and shows the server’s refusal in its own words', async () => {
    type('Atom number', '4e4');
    type('Reason for this version', 'fewer atoms after the new loading sequence');
    await submit();
    const request = http.expectOne('/api/profiles');
    expect(request.request.body).toEqual({
      profile: { ...DEMO_PROFILE, atomNumber: 40000 },
      reason: 'fewer atoms after the new loading sequence',
    });
    request.flush({ error: 'profile name already used by another lab group' }, { status: 400, statusText: 'Bad Request' });
    await new Promise((resolve) => setTimeout(resolve, 0)); // the save's promise settles
    await fixture.whenStable();
    expect(host.querySelector('[role="alert"]')!.textContent).toContain('profile name already used by another lab group');
  });

  it('offers no way to activate on save, and shows a refusal naming an input next to that input', async () => {
    expect(host.textContent).not.toMatch(/active profile when saved/i);
    expect(host.querySelector('mat-checkbox')).toBeNull();
    type('Reason for this version', 'check');
    await submit();
    http.expectOne('/api/profiles').flush(
      { error: 'The profile was not saved: Frequency along y must lie between 1 and 10000 Hz', field: 'profile.trapHz.1' },
      { status: 400, statusText: 'Bad Request' },
    );
    await new Promise((resolve) => setTimeout(resolve, 0));
    await fixture.whenStable();
    const field = [...host.querySelectorAll('mat-form-field')].find((f) => f.textContent?.includes('Frequency along y'))!;
    expect(field.querySelector('mat-error')!.textContent).toContain('Frequency along y must lie between 1 and 10000 Hz');
  });
});
