import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { MatDialog } from '@angular/material/dialog';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { configureSignedIn } from '../auth/signed-in-test-bed';
import { Session, SESSION_STORAGE_KEY } from '../auth/session';
import { ChangePasswordDialog } from './change-password-dialog';

describe('ChangePasswordDialog', () => {
  afterEach(() => {
    TestBed.inject(HttpTestingController).verify();
    localStorage.clear();
  });

  const dialog = () => document.querySelector('mat-dialog-container')!;
  const button = (text: string) => [...dialog().querySelectorAll('button')].find((b) => b.textContent!.includes(text))!;
  const settle = () => new Promise((resolve) => setTimeout(resolve, 0));
  const type = (i: number, text: string) => {
    const input = dialog().querySelectorAll('input')[i];
    input.value = text;
    input.dispatchEvent(new Event('input'));
  };

  it('checks the two new passwords agree, sends current and new, and keeps the session with the fresh token', async () => {
    configureSignedIn('operator');
    const http = TestBed.inject(HttpTestingController);
    let closedWith: unknown;
    TestBed.inject(MatDialog).open(ChangePasswordDialog).afterClosed().subscribe((v) => (closedWith = v));
    await settle();
    type(0, 'old pass phrase');
    type(1, 'the new pass phrase');
    type(2, 'the new pass phrasf');
    button('Change password').click();
    await settle();
    http.expectNone('/api/auth/password');
    expect(dialog().querySelector('[role="alert"]')!.textContent).toContain('The two new passwords differ');

    type(2, 'the new pass phrase');
    button('Change password').click();
    const request = http.expectOne('/api/auth/password');
    expect(request.request.body).toEqual({ currentPassword: 'old pass phrase', newPassword: 'the new pass phrase' });
    request.flush({ token: 'fresh-token', user: { email: 'operator@tiltwatch.example', role: 'operator' } });
    await vi.waitFor(() => expect(closedWith).toBe(true));
    expect(TestBed.inject(Session).token()).toBe('fresh-token');
    expect(JSON.parse(localStorage.getItem(SESSION_STORAGE_KEY)!).token).toBe('fresh-token');
  });

  it('shows the server’s refusal and stays open', async () => {
    configureSignedIn('viewer');
    const http = TestBed.inject(HttpTestingController);
    TestBed.inject(MatDialog).open(ChangePasswordDialog);
    await settle();
    type(0, 'not my password');
    type(1, 'the new pass phrase');
    type(2, 'the new pass phrase');
    button('Change password').click();
    http.expectOne('/api/auth/password').flush({ error: 'currentPassword: is not your current password' }, { status: 400, statusText: 'Bad Request' });
    await settle();
    await settle();
    expect(dialog().querySelector('[role="alert"]')!.textContent).toContain('is not your current password');
    expect(TestBed.inject(Session).token()).toBe('opaque');
  });
});
