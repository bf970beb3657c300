import { Routes } from '@angular/router';
import { adminGuard, authGuard, guestGuard } from './core/auth/auth-guard';
import { unsavedChangesGuard } from './worksheets/unsaved-changes-guard';

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
    loadComponent: () => import('./worksheets/worksheet-page/worksheet-page').then((m) => m.WorksheetPage),
  },
  {
    path: 'admin/users',
    title: 'Users · Sheetwise',
    canActivate: [adminGuard],
    loadComponent: () => import('./admin/admin-users/admin-users').then((m) => m.AdminUsers),
  },
  {
    path: '**',
    title: 'Not found · Sheetwise',
    loadComponent: () => import('./not-found/not-found').then((m) => m.NotFound),
  },
];
