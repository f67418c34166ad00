import { Routes } from '@angular/router';
import { signedIn, signedOut } from './auth/session-guards';

export const routes: Routes = [
  {
    path: 'sign-in',
    canActivate: [signedOut],
    title: 'Sign in · Tiltwatch',
    loadComponent: () => import('./auth/sign-in').then((m) => m.SignIn),
  },
  {
    path: '',
    canActivate: [signedIn],
    loadComponent: () => import('./shell/shell').then((m) => m.Shell),
    children: [
      { path: '', pathMatch: 'full', redirectTo: 'live' },
      { path: 'live', title: 'Live · Tiltwatch', loadComponent: () => import('./live/live-page').then((m) => m.LivePage) },
    ],
  },
  { path: '**', redirectTo: '' },
];
