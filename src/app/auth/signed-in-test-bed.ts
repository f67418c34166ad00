/**
 * Test set-up for components behind the sign-in: a stored session of one role, the router, and
 * HTTP through the auth interceptor to Angular's testing backend.
 */
import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter, type Routes } from '@angular/router';
import type { Role } from '../../../shared/auth/roles';
import { authInterceptor } from './auth-interceptor';
import { SESSION_STORAGE_KEY } from './session';

/**
 * Stores a session of `role` (the session service reads it on start) and configures the test
 * bed with `routes`. The spec clears localStorage after each test.
 */
export function configureSignedIn(role: Role, routes: Routes = []): void {
  localStorage.setItem(SESSION_STORAGE_KEY, JSON.stringify({ token: 'opaque', user: { email: `${role}@tiltwatch.example`, role } }));
  TestBed.configureTestingModule({
    providers: [provideRouter(routes), provideHttpClient(withInterceptors([authInterceptor])), provideHttpClientTesting()],
  });
}
