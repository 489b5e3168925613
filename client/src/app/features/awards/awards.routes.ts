import { Routes } from '@angular/router';

/** Loaded at /awards behind authGuard and the facility manager's roleGuard (see app.routes.ts). */
const routes: Routes = [
  { path: '', title: 'Awards: choose a cycle', loadComponent: () => import('./award-cycle-picker/award-cycle-picker') },
  { path: ':cycleId', title: 'Awards of the cycle', loadComponent: () => import('./award-board/award-board') },
];

export default routes;
