import { Routes } from '@angular/router';

/** Loaded under /cycles behind authGuard and roleGuard('facility_manager') (see app.routes.ts). */
const cyclesRoutes: Routes = [
  { path: '', title: 'Cycles', loadComponent: () => import('./cycle-list/cycle-list') },
  { path: 'new', title: 'New cycle', loadComponent: () => import('./cycle-form/cycle-form') },
  { path: ':id', title: 'Edit cycle', loadComponent: () => import('./cycle-form/cycle-form') },
  { path: ':id/proposals', title: 'Proposals of the cycle', loadComponent: () => import('./cycle-proposals/cycle-proposals') },
];

export default cyclesRoutes;
