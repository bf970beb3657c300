import { Routes } from '@angular/router';
import { adminGuard, authGuard, guestGuard } from './core/auth/auth-guard';
import { unsavedChangesGuard } from './worksheets/unsaved-changes-guard';
import { fetchEarly } from './core/http/early-responses';

const worksheetPage = () => import('./worksheets/worksheet-page/worksheet-page').then((m) => m.WorksheetPage);

/**
 * A visit that starts on a worksheet (a link, a reload) loads the worksheet page's code and
 * KaTeX, and asks for the worksheet and its stored report (core/http/early-responses.ts),
 * while the app starts and checks the session, not after (bench/open-worksheet).
 * A failed load here is retried by the router's own import, a failed request by the page.
 */
export function loadEarly(path: string): void {
  const id = /^\/worksheets\/(\d+)(?:[/?#]|$)/.exec(path)?.[1];
  if (!id) return;
  fetchEarly(`/api/worksheets/${id}`);
  fetchEarly(`/api/worksheets/${id}/report`);
  worksheetPage().catch(() => undefined);
  import('./worksheets/findings/math').then((m) => m.loadKatex()).catch(() => undefined);
}

export const routes: Routes = [
  { path: '', pathMatch: 'full', redirectTo: 'groups' },
  {
    path: 'sign-in',
    title: 'Sign in · Sheetwise',
    canActivate: [guestGuard],
    loadComponent: () => import('./auth/sign-in/sign-in').then((m) => m.SignIn),
  },
  {
    path: 'register',
    title: 'Create an account · Sheetwise',
    canActivate: [guestGuard],
    loadComponent: () => import('./auth/register/register').then((m) => m.Register),
  },
  {
    path: 'groups',
    title: 'Groups · Sheetwise',
    canActivate: [authGuard],
    loadComponent: () => import('./groups/group-list/group-list').then((m) => m.GroupList),
  },
  {
    path: 'groups/:groupId',
    title: 'Group · Sheetwise',
    canActivate: [authGuard],
    loadComponent: () => import('./groups/group-page/group-page').then((m) => m.GroupPage),
  },
  {
    path: 'worksheets/:id',
    title: 'Worksheet · Sheetwise',
    canActivate: [authGuard],
    canDeactivate: [unsavedChangesGuard],
    // preloaded after the first page (OnlyMarkedPreloading in app.config.ts)
    data: { preload: true },
    loadComponent: worksheetPage,
  },
  {
    path: 'admin/users',
    title: 'Users · Sheetwise',
    canActivate: [adminGuard],
    loadComponent: () => import('./admin/admin-users/admin-users').then((m) => m.AdminUsers),
  },
  {
    path: 'forgot-password',
    title: 'Forgot your password · Sheetwise',
    canActivate: [guestGuard],
    loadComponent: () => import('./auth/forgot-password/forgot-password').then((m) => m.ForgotPassword),
  },
  {
    path: 'reset-password/:token',
    title: 'Choose a new password · Sheetwise',
    loadComponent: () => import('./auth/reset-password/reset-password').then((m) => m.ResetPassword),
  },
  {
    path: 'unlock/:token',
    title: 'Unlock your account · Sheetwise',
    loadComponent: () => import('./auth/unlock/unlock').then((m) => m.Unlock),
  },
  {
    path: 'invitations/:token',
    title: 'Invitation · Sheetwise',
    loadComponent: () => import('./invitations/invitation-page/invitation-page').then((m) => m.InvitationPage),
  },
  {
    path: 'admin/outbox',
    title: 'Outbox · Sheetwise',
    canActivate: [adminGuard],
    loadComponent: () => import('./admin/admin-outbox/admin-outbox').then((m) => m.AdminOutbox),
  },
  {
    path: 'reviews',
    title: 'Reviews · Sheetwise',
    canActivate: [authGuard],
    loadComponent: () => import('./reviews/review-queue/review-queue').then((m) => m.ReviewQueue),
  },
  {
    path: 'language',
    title: 'Language reference · Sheetwise',
    canActivate: [authGuard],
    loadComponent: () => import('./language-reference/language-reference').then((m) => m.LanguageReference),
  },
  {
    path: 'referee/:token',
    title: 'Referee copy · Sheetwise',
    loadComponent: () => import('./referee/referee-page/referee-page').then((m) => m.RefereePage),
  },
  {
    path: '**',
    title: 'Not found · Sheetwise',
    loadComponent: () => import('./not-found/not-found').then((m) => m.NotFound),
  },
];
