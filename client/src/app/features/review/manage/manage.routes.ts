import { Routes } from '@angular/router';

/** Pages of review's manage/ part (loaded by review.routes.ts at /review/manage, facility managers). */
const routes: Routes = [
  { path: '', title: 'Review: choose a cycle', loadComponent: () => import('./cycle-picker/review-cycle-picker') },
  { path: ':cycleId', title: 'Review of the cycle', loadComponent: () => import('./cycle-review/cycle-review') },
  { path: ':cycleId/panels/:panelId', title: 'Reviewer assignment', loadComponent: () => import('./panel-matrix/panel-matrix') },
];

export default routes;
