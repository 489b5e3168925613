import { Routes } from '@angular/router';

/** Pages of review's my-reviews/ part (loaded by review.routes.ts at /review/my, reviewers only). */
const routes: Routes = [
  { path: '', title: 'My reviews', loadComponent: () => import('./review-table/review-table') },
  { path: ':proposalId', title: 'Reading a proposal', loadComponent: () => import('./review-reading/review-reading') },
];

export default routes;
