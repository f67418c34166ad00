import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { afterEach, describe, expect, it } from 'vitest';
import type { Role } from '../../../shared/auth/roles';
import { DEMO_PROFILE } from '../../../shared/profiles/demo-profile';
import type { ProfileRecord } from '../../../shared/profiles/profile-record';
import { configureSignedIn } from '../auth/signed-in-test-bed';
import { ProfilesPage } from './profiles-page';

const RECORDS: ProfileRecord[] = [
  { id: 1, name: DEMO_PROFILE.name, version: 1, profile: DEMO_PROFILE, active: false, createdBy: 'lead@tiltwatch.example', createdAt: '2026-02-01T09:00:00Z', reason: 'first trap' },
  { id: 2, name: DEMO_PROFILE.name, version: 2, profile: { ...DEMO_PROFILE, atomNumber: 4e4 }, active: true, createdBy: 'lead@tiltwatch.example', createdAt: '2026-02-03T09:00:00Z', reason: 'fewer atoms after the new loading sequence' },
];

describe('ProfilesPage', () => {
  let fixture: ComponentFixture<ProfilesPage>;
  let http: HttpTestingController;
  let host: HTMLElement;

  afterEach(() => localStorage.clear());

  /** Opens the page signed in with `role`, with the server answering the profile list. */
  async function open(role: Role): Promise<void> {
    configureSignedIn(role);
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ProfilesPage);
    host = fixture.nativeElement as HTMLElement;
    // Requests count as pending work, so the page is stable only once they are answered.
    TestBed.tick();
    http.expectOne('/api/profiles').flush({ profiles: RECORDS });
    http.expectOne('/api/profiles/active').flush(RECORDS[1]);
    await fixture.whenStable();
  }

  const buttons = () => [...host.querySelectorAll('button')].map((b) => b.textContent!.replace(/\s+/g, ' ').trim());

  it('lists the versions with the active one marked and shown', async () => {
    await open('viewer');
    expect(buttons().some((b) => b.includes('v2') && b.includes('active'))).toBe(true);
    expect(host.querySelector('tw-profile-details')!.textContent).toContain('fewer atoms after the new loading sequence');
  });

  it('offers an operator no edit controls at all, not even disabled ones', async () => {
    await open('operator');
    const text = buttons().join(' | ');
    expect(text).not.toMatch(/New profile|New version|Activate/);
    expect(host.querySelector('tw-profile-form')).toBeNull();
    expect(host.textContent).toContain('Read only');
  });

  it('offers the lead new versions and activation of a version that is not active', async () => {
    await open('lead');
    expect(buttons()).toEqual(expect.arrayContaining(['add New profile', 'edit_note New version from this one']));
    // v2 is active: nothing to activate until v1 is chosen.
    expect(buttons().some((b) => b.includes('Activate'))).toBe(false);
    [...host.querySelectorAll('button')].find((b) => b.textContent!.includes('v1'))!.click();
    await fixture.whenStable();
    expect(buttons().some((b) => b.includes('Activate this version'))).toBe(true);
  });

  it('asks the lead for a reason before activating, then sends it', async () => {
    await open('lead');
    [...host.querySelectorAll('button')].find((b) => b.textContent!.includes('v1'))!.click();
    await fixture.whenStable();
    [...host.querySelectorAll('button')].find((b) => b.textContent!.includes('Activate this version'))!.click();
    await fixture.whenStable();
    const form = host.querySelector('form.activation') as HTMLFormElement;
    form.dispatchEvent(new Event('submit'));
    await fixture.whenStable();
    expect(host.querySelector('[role="alert"]')!.textContent).toContain('Give a reason for activating this version');
    const input = form.querySelector('input')!;
    input.value = 'back to the larger cloud';
    input.dispatchEvent(new Event('input'));
    form.dispatchEvent(new Event('submit'));
    const request = http.expectOne('/api/profiles/1/activate');
    expect(request.request.body).toEqual({ reason: 'back to the larger cloud' });
  });
});
