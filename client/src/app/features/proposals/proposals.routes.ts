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
      { path: 'team', title: 'Proposal team', loadComponent: () => import('./team/proposal-team/proposal-team') },
      { path: 'targets', title: 'Targets', loadComponent: () => import('./targets/target-list/target-list') },
      { path: 'plans', title: 'Target plans', loadComponent: () => import('./plans/proposal-plans/proposal-plans') },
      {
        path: 'justification',
        title: 'Justification',
        loadComponent: () => import('./justification/proposal-justification/proposal-justification'),
      },
      { path: 'submit', title: 'Submit', loadComponent: () => import('./submission/proposal-submit/proposal-submit') },
      // Returned photometry of the program (once awarded): the program's table, and one target's measurement.
      { path: 'photometry', title: 'Light curves', loadComponent: () => import('../photometry/photometry-page/photometry-page') },
      {
        path: 'photometry/:targetId',
        title: 'Light curve of a target',
        loadComponent: () => import('../photometry/target-photometry/target-photometry'),
      },
    ],
  },
];

export default proposalsRoutes;
