import { inject } from '@angular/core';
import { CanActivateFn, Router } from '@angular/router';
import { hasRole, type Role } from '../../../shared/auth/roles';
import { Session } from './session';

/** Lets only a signed-in user through; everyone else goes to the sign-in page. */
export const signedIn: CanActivateFn = () => inject(Session).signedIn() || inject(Router).createUrlTree(['/sign-in']);

/** Sends an already signed-in user past the sign-in page. */
export const signedOut: CanActivateFn = () => !inject(Session).signedIn() || inject(Router).createUrlTree(['/']);

/** Lets through only a user whose role carries at least `required`; others go to the start page. */
export function roleAtLeast(required: Role): CanActivateFn {
  return () => {
    const role = inject(Session).role();
    return (role !== null && hasRole(role, required)) || inject(Router).createUrlTree(['/']);
  };
}
