import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { afterEach, describe, expect, it } from 'vitest';
import type { SecurityReport, UserAccount } from '../../../shared/auth/user-api';
import { configureSignedIn } from '../auth/signed-in-test-bed';
import { UsersPage } from './users-page';

const USERS: UserAccount[] = [
  { id: 4, email: 'admin@tiltwatch.example', role: 'admin', disabled: false, createdAt: '2026-03-01T08:00:00.000Z' },
  { id: 5, email: 'night.operator@lindqvist-hall.example', role: 'operator', disabled: false, createdAt: '2026-03-02T08:00:00.000Z' },
  { id: 6, email: 'former.lead@lindqvist-hall.example', role: 'lead', disabled: true, createdAt: '2026-03-02T09:00:00.000Z' },
];

const SECURITY: SecurityReport = {
  throttles: [{ scope: 'account', key: 'lead@tiltwatch.example', failures: 5, blockedUntil: '2026-03-02T22:20:04.000Z' }],
  events: [
    {
      id: 1, at: '2026-03-02T22:20:00.000Z', kind: 'sign-in.account-delayed', email: 'lead@tiltwatch.example', address: '10.0.0.9',
      detail: { failures: 5, delayMs: 4000 },
    },
  ],
};

describe('UsersPage', () => {
  let fixture: ComponentFixture<UsersPage>;
  let http: HttpTestingController;

  afterEach(() => {
    TestBed.inject(HttpTestingController).verify();
    localStorage.clear();
  });

  async function open(): Promise<void> {
    configureSignedIn('admin');
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(UsersPage);
    TestBed.tick();
    http.expectOne('/api/admin/users').flush({ users: USERS });
    http.expectOne('/api/admin/security?hours=24').flush(SECURITY);
    await fixture.whenStable();
  }

  /** Answers the next request for `url` once the page makes it. */
  async function answer(url: string, body: object): Promise<void> {
    for (let turn = 0; turn < 50; turn++) {
      const requests = http.match(url);
      if (requests.length > 0) {
        for (const r of requests) r.flush(body);
        await fixture.whenStable();
        return;
      }
      await new Promise((resolve) => setTimeout(resolve, 10));
    }
    throw new Error(`the page did not ask for ${url}`);
  }

  const host = () => fixture.nativeElement as HTMLElement;
  const button = (root: Element, text: string) => [...root.querySelectorAll('button')].find((b) => b.textContent!.includes(text))!;
  const dialog = () => document.querySelector('mat-dialog-container')!;
  const row = (email: string) => [...host().querySelectorAll('tr')].find((r) => r.textContent!.includes(email))!;
  const type = (el: HTMLInputElement | HTMLTextAreaElement, text: string) => {
    el.value = text;
    el.dispatchEvent(new Event('input'));
  };

  it('lists the accounts with role and state in words, and the sign-in security section', async () => {
    await open();
    expect(row('admin@tiltwatch.example').textContent).toContain('(you)');
    expect(row('night.operator').textContent).toContain('Enabled');
    expect(row('former.lead').textContent).toContain('Disabled');
    expect(button(row('former.lead'), 'Enable')).toBeTruthy();
    const text = host().textContent!;
    expect(text).toContain('Account lead@tiltwatch.example');
    expect(text).toContain('Sign-ins to an account delayed after failed attempts');
    expect(text).toContain('5 failures, next attempt after 4 s');
  });

  it('disables an account only with a reason, then reads the list again', async () => {
    await open();
    button(row('night.operator'), 'Disable').click();
    await fixture.whenStable();
    button(dialog(), 'Disable').click();
    await fixture.whenStable();
    http.expectNone('/api/admin/users/5');
    type(dialog().querySelector('textarea')!, 'left the group');
    button(dialog(), 'Disable').click();
    const request = http.expectOne('/api/admin/users/5');
    expect(request.request.method).toBe('PATCH');
    expect(request.request.body).toEqual({ disabled: true, reason: 'left the group' });
    request.flush({ user: { ...USERS[1], disabled: true }, changed: true });
    await answer('/api/admin/users', { users: USERS });
  });

  it('adds an account with e-mail, role and a first password', async () => {
    await open();
    button(host(), 'Add account').click();
    await fixture.whenStable();
    const inputs = dialog().querySelectorAll('input');
    type(inputs[0], 'day.viewer@lindqvist-hall.example');
    type(inputs[1], 'short');
    button(dialog(), 'Add account').click();
    await fixture.whenStable();
    expect(dialog().querySelector('[role="alert"]')!.textContent).toContain('at least 12 characters');
    type(inputs[1], 'a first pass phrase');
    button(dialog(), 'Add account').click();
    const request = http.expectOne('/api/admin/users');
    expect(request.request.method).toBe('POST');
    expect(request.request.body).toEqual({ email: 'day.viewer@lindqvist-hall.example', role: 'viewer', password: 'a first pass phrase' });
    request.flush({ user: { id: 7 } });
    await answer('/api/admin/users', { users: USERS });
  });
});
