import { Routes } from '@angular/router';

/** Loaded under /invitations behind authGuard: signing in first returns here (see app.routes.ts). */
const invitationsRoutes: Routes = [
  { path: ':token', title: 'Join a proposal team', loadComponent: () => import('./invitation-accept/invitation-accept') },
];

export default invitationsRoutes;
