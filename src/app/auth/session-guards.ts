import { inject } from '@angular/core';
import { CanActivateFn, Router } from '@angular/router';
import { Session } from './session';

/** Lets only a signed-in user through; everyone else goes to the sign-in page. */
export const signedIn: CanActivateFn = () => inject(Session).signedIn() || inject(Router).createUrlTree(['/sign-in']);

/** Sends an already signed-in user past the sign-in page. */
export const signedOut: CanActivateFn = () => !inject(Session).signedIn() || inject(Router).createUrlTree(['/']);
