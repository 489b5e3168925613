import { Routes } from '@angular/router';

/**
 * Loaded under /proposals behind authGuard (see app.routes.ts); the server answers only with
 * the signed-in person's own proposals. Each editor tab is a child route, so that it can be
 * linked to (the submit checklist links each problem to its tab).
 */
const proposalsRoutes: Routes = [
  { path: '', title: 'Proposals', loadComponent: () => import('./proposal-list/proposal-list') },
  {
    path: ':id',
    loadComponent: () => import('./proposal-editor/proposal-editor'),
    children: [
      { path: '', pathMatch: 'full', redirectTo: 'overview' },
      { path: 'overview', title: 'Proposal overview', loadComponent: () => import('./proposal-overview/proposal-overview') },
      { path: 'team', title: 'Proposal team', loadComponent: () => import('./proposal-team/proposal-team') },
      { path: 'targets', title: 'Targets', loadComponent: () => import('./target-list/target-list') },
      { path: 'plans', title: 'Target plans', loadComponent: () => import('./proposal-plans/proposal-plans') },
      {
        path: 'justification',
        title: 'Justification',
        loadComponent: () => import('./proposal-justification/proposal-justification'),
      },
      { path: 'submit', title: 'Submit', loadComponent: () => import('./proposal-submit/proposal-submit') },
    ],
  },
];

export default proposalsRoutes;
