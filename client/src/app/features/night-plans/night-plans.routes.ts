import { Routes } from '@angular/router';

/** Loaded at /night-plans behind authGuard and the facility manager's roleGuard (see app.routes.ts). */
const routes: Routes = [
  { path: '', title: 'Night plans: choose a cycle', loadComponent: () => import('./cycle-picker/night-plan-cycle-picker') },
  { path: ':cycleId', title: 'Night plans of the cycle', loadComponent: () => import('./night-plan-page/night-plan-page') },
];

export default routes;
