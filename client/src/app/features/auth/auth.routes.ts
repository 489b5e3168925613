import { Routes } from '@angular/router';

/**
 * The pages used without a session. Spread into the top-level routes (see app.routes.ts);
 * each page is still its own lazily loaded chunk.
 */
export const authRoutes: Routes = [
  { path: 'sign-in', title: 'Sign in', loadComponent: () => import('./sign-in/sign-in') },
  { path: 'sign-up', title: 'Create an account', loadComponent: () => import('./sign-up/sign-up') },
  { path: 'forgot-password', title: 'Reset your password', loadComponent: () => import('./forgot-password/forgot-password') },
  { path: 'reset-password', title: 'Choose a new password', loadComponent: () => import('./reset-password/reset-password') },
];

export default authRoutes;
