import { Routes } from '@angular/router';
import { roleGuard } from '../../core/auth/role-guard';

/**
 * Loaded under /review behind authGuard (see app.routes.ts): the reviewer's grading table
 * (my/), the manager's panels and assignment (manage/), a panel's statistics, standing and
 * pressure for its chair and the managers (panels/).
 */
const reviewRoutes: Routes = [
  { path: 'my', canActivate: [roleGuard('reviewer')], loadChildren: () => import('./my-reviews/my-reviews.routes') },
  { path: 'manage', canActivate: [roleGuard('facility_manager')], loadChildren: () => import('./manage/manage.routes') },
  { path: 'panels', loadChildren: () => import('./panel/panel.routes') },
];

export default reviewRoutes;
