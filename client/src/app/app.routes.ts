import { Routes } from '@angular/router';
import { authGuard } from './core/auth/auth-guard';
import { roleGuard } from './core/auth/role-guard';
import { authRoutes } from './features/auth/auth.routes';

/**
 * Top-level routes; every page is a lazily loaded chunk. The auth pages are spread in rather
 * than loaded with loadChildren: they live at top-level URLs that e-mails link to
 * (/reset-password?token=…), and a path-'' loadChildren would fetch their chunk on every
 * first navigation while the router looks for a match.
 */
export const routes: Routes = [
  ...authRoutes,
  {
    path: '',
    pathMatch: 'full',
    canActivate: [authGuard],
    loadChildren: () => import('./features/home/home.routes'),
  },
  {
    path: 'planner',
    canActivate: [authGuard],
    loadChildren: () => import('./features/planner/planner.routes'),
  },
  {
    path: 'network',
    canActivate: [authGuard],
    loadChildren: () => import('./features/network/network.routes'),
  },
  {
    path: 'proposals',
    canActivate: [authGuard],
    loadChildren: () => import('./features/proposals/proposals.routes'),
  },
  {
    // Formulas, sources and assumptions behind every computed number; public, like a paper's methods.
    path: 'methods',
    loadChildren: () => import('./features/methods/methods.routes'),
  },
  {
    // The link mailed to an invitee who has an account; signing in returns here.
    path: 'invitations',
    canActivate: [authGuard],
    loadChildren: () => import('./features/invitations/invitations.routes'),
  },
  {
    path: 'cycles',
    canActivate: [authGuard, roleGuard('facility_manager')],
    loadChildren: () => import('./features/cycles/cycles.routes'),
  },
  {
    // The committee's journey: grading, panels and assignment, statistics and standing.
    path: 'review',
    canActivate: [authGuard],
    loadChildren: () => import('./features/review/review.routes'),
  },
  {
    // The facility manager's award board: node-hours per node from the panels' locked standings.
    path: 'awards',
    canActivate: [authGuard, roleGuard('facility_manager')],
    loadChildren: () => import('./features/awards/awards.routes'),
  },
  {
    // The facility manager's night plans: each node's visits night by night, lost nights, execution and program progress.
    path: 'night-plans',
    canActivate: [authGuard, roleGuard('facility_manager')],
    loadChildren: () => import('./features/night-plans/night-plans.routes'),
  },
  {
    // Fees: payers' invoices and card payments; the facility managers' invoicing under /fees/manage (its own role guard).
    path: 'fees',
    canActivate: [authGuard],
    loadChildren: () => import('./features/fees/fees.routes'),
  },
  {
    path: 'admin',
    canActivate: [authGuard, roleGuard('administrator')],
    loadChildren: () => import('./features/admin/admin.routes'),
  },
  {
    path: '**',
    title: 'Page not found',
    loadComponent: () => import('./features/not-found/not-found'),
  },
];
