import type { Routes } from '@angular/router';
import { homeRedirectGuard, signedInGuard, signedOutGuard } from './core/auth.guard';

export const routes: Routes = [
  { path: '', pathMatch: 'full', canActivate: [homeRedirectGuard], children: [] },
  {
    path: 'sign-in',
    canActivate: [signedOutGuard],
    title: 'Sign in · Emberline',
    loadComponent: () => import('./features/account/sign-in').then((m) => m.SignIn),
  },
  {
    path: 'sign-up',
    canActivate: [signedOutGuard],
    title: 'Create account · Emberline',
    loadComponent: () => import('./features/account/sign-up').then((m) => m.SignUp),
  },
  {
    path: 'verify-email',
    title: 'Confirm your address · Emberline',
    loadComponent: () => import('./features/account/verify-email').then((m) => m.VerifyEmail),
  },
  {
    path: 'forgot-password',
    title: 'Reset password · Emberline',
    loadComponent: () => import('./features/account/forgot-password').then((m) => m.ForgotPassword),
  },
  {
    path: 'reset-password',
    title: 'Choose a new password · Emberline',
    loadComponent: () => import('./features/account/reset-password').then((m) => m.ResetPassword),
  },
  {
    path: 'share/:token',
    title: 'Shared look · Emberline',
    loadComponent: () => import('./features/share/shared-view').then((m) => m.SharedView),
  },
  {
    path: 'shared-exports/:token',
    title: 'Shared export · Emberline',
    loadComponent: () => import('./features/share/shared-export').then((m) => m.SharedExport),
  },
  {
    path: 'invites/:token',
    title: 'Studio invite · Emberline',
    loadComponent: () => import('./features/studio/invite-accept').then((m) => m.InviteAccept),
  },
  {
    path: 'account',
    canActivate: [signedInGuard],
    title: 'Your account · Emberline',
    loadComponent: () => import('./features/account/account-settings').then((m) => m.AccountSettings),
  },
  {
    path: 'studios',
    canActivate: [signedInGuard],
    title: 'Your studios · Emberline',
    loadComponent: () => import('./features/studio/studio-list').then((m) => m.StudioList),
  },
  {
    path: 'studios/:studioId',
    canActivate: [signedInGuard],
    loadComponent: () => import('./features/studio/studio-shell').then((m) => m.StudioShell),
    children: [
      { path: '', pathMatch: 'full', redirectTo: 'bench' },
      { path: 'bench', title: 'Bench · Emberline', loadComponent: () => import('./features/bench/bench').then((m) => m.Bench) },
      {
        path: 'presets',
        title: 'Presets · Emberline',
        loadComponent: () => import('./features/presets/preset-list').then((m) => m.PresetList),
      },
      {
        path: 'presets/:presetId',
        title: 'Preset · Emberline',
        loadComponent: () => import('./features/presets/preset-detail').then((m) => m.PresetDetail),
      },
      {
        path: 'activity',
        title: 'Activity · Emberline',
        loadComponent: () => import('./features/studio/activity').then((m) => m.Activity),
      },
      {
        path: 'artworks',
        title: 'Artworks · Emberline',
        loadComponent: () => import('./features/artworks/artwork-library').then((m) => m.ArtworkLibrary),
      },
      { path: 'exports', title: 'Exports · Emberline', loadComponent: () => import('./features/exports/exports').then((m) => m.Exports) },
      {
        path: 'match',
        title: 'Panel match · Emberline',
        loadComponent: () => import('./features/match/panel-match').then((m) => m.PanelMatch),
      },
      {
        path: 'drive',
        title: 'Drive timing · Emberline',
        loadComponent: () => import('./features/drive/drive-timing').then((m) => m.DriveTiming),
      },
      { path: 'bios', title: 'Video BIOS · Emberline', loadComponent: () => import('./features/bios/video-bios').then((m) => m.VideoBios) },
      { path: 'members', title: 'Members · Emberline', loadComponent: () => import('./features/studio/members').then((m) => m.Members) },
    ],
  },
  { path: '**', title: 'Not found · Emberline', loadComponent: () => import('./features/account/not-found').then((m) => m.NotFound) },
];
