import { Routes } from '@angular/router';

/** Loaded under /admin behind authGuard and roleGuard('administrator') (see app.routes.ts). */
const adminRoutes: Routes = [
  { path: '', pathMatch: 'full', redirectTo: 'accounts' },
  { path: 'accounts', title: 'Accounts', loadComponent: () => import('./account-list/account-list') },
  { path: 'outgoing-mail', title: 'Outgoing mail', loadComponent: () => import('./mail-outbox/mail-outbox') },
];

export default adminRoutes;
