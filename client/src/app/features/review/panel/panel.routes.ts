import { Routes } from '@angular/router';

/** Pages of review's panel/ part (loaded by review.routes.ts at /review/panels). */
const routes: Routes = [{ path: ':panelId', title: 'Panel', loadComponent: () => import('./panel-page/panel-page') }];

export default routes;
