import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { Router } from '@angular/router';
import { afterEach, describe, expect, it } from 'vitest';
import type { Role } from '../../../shared/auth/roles';
import { roleAtLeast } from '../auth/session-guards';
import { configureSignedIn } from '../auth/signed-in-test-bed';
import { Shell } from './shell';

describe('Shell navigation', () => {
  let fixture: ComponentFixture<Shell>;

  afterEach(() => {
    fixture?.destroy();
    localStorage.clear();
  });

  /** Opens the shell signed in with `role`, answering the requests it makes on start. */
  async function open(role: Role): Promise<void> {
    configureSignedIn(role, [{ path: 'outbox', canActivate: [roleAtLeast('admin')], children: [] }, { path: '**', children: [] }]);
    fixture = TestBed.createComponent(Shell);
    TestBed.tick();
    const http = TestBed.inject(HttpTestingController);
    http.expectOne('/api/auth/me').flush({ email: `${role}@tiltwatch.example`, role });
    http.expectOne('/api/live').flush(null);
    await fixture.whenStable();
  }

  const navTitles = () =>
    [...(fixture.nativeElement as HTMLElement).querySelectorAll('nav [matListItemTitle]')].map((t) => t.textContent!.trim());

  it('offers Alarms and Interlocks but no Outbox to an operator', async () => {
    await open('operator');
    expect(navTitles()).toEqual(expect.arrayContaining(['Alarms', 'Interlocks']));
    expect(navTitles()).not.toContain('Outbox');
  });

  it('offers the Outbox to an admin', async () => {
    await open('admin');
    expect(navTitles()).toContain('Outbox');
  });

  it('turns a lead who types the Outbox address away', async () => {
    await open('lead');
    const router = TestBed.inject(Router);
    await router.navigateByUrl('/outbox');
    expect(router.url).toBe('/');
  });
});
