import { Routes } from '@angular/router';
import { roleAtLeast, signedIn, signedOut } from './auth/session-guards';

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
      { path: 'replay', title: 'Replay · Tiltwatch', loadComponent: () => import('./replay/replay-page').then((m) => m.ReplayPage) },
      {
        path: 'map',
        title: 'Orientation map · Tiltwatch',
        loadComponent: () => import('./orientation-map/orientation-map-page').then((m) => m.OrientationMapPage),
      },
      {
        path: 'profiles',
        title: 'Sample profiles · Tiltwatch',
        loadComponent: () => import('./profiles/profiles-page').then((m) => m.ProfilesPage),
      },
      { path: 'coils', pathMatch: 'full', redirectTo: 'coils/x' },
      {
        path: 'coils/:axis',
        title: 'Coil detail · Tiltwatch',
        loadComponent: () => import('./coils/coil-detail-page').then((m) => m.CoilDetailPage),
      },
      { path: 'steer', title: 'Steer · Tiltwatch', loadComponent: () => import('./steering/steer-page').then((m) => m.SteerPage) },
      {
        path: 'sequences',
        title: 'Sequences · Tiltwatch',
        loadComponent: () => import('./sequences/sequences-page').then((m) => m.SequencesPage),
      },
      { path: 'shots', title: 'Shots · Tiltwatch', loadComponent: () => import('./shots/shots-page').then((m) => m.ShotsPage) },
      { path: 'alarms', title: 'Alarms · Tiltwatch', loadComponent: () => import('./alarms/alarms-page').then((m) => m.AlarmsPage) },
      {
        path: 'interlocks',
        title: 'Interlocks · Tiltwatch',
        loadComponent: () => import('./interlocks/interlocks-page').then((m) => m.InterlocksPage),
      },
      { path: 'logbook', title: 'Logbook · Tiltwatch', loadComponent: () => import('./logbook/logbook-page').then((m) => m.LogbookPage) },
      { path: 'handover', title: 'Handover · Tiltwatch', loadComponent: () => import('./handover/handover-page').then((m) => m.HandoverPage) },
      {
        path: 'users',
        title: 'Users · Tiltwatch',
        canActivate: [roleAtLeast('admin')],
        loadComponent: () => import('./users/users-page').then((m) => m.UsersPage),
      },
      {
        path: 'setup/calibration',
        title: 'Calibration · Tiltwatch',
        loadComponent: () => import('./calibration/calibration-page').then((m) => m.CalibrationPage),
      },
      {
        path: 'outbox',
        title: 'Outbox · Tiltwatch',
        canActivate: [roleAtLeast('admin')],
        loadComponent: () => import('./outbox/outbox-page').then((m) => m.OutboxPage),
      },
    ],
  },
  { path: '**', redirectTo: '' },
];
