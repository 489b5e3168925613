import { Routes } from '@angular/router';

const plannerRoutes: Routes = [{ path: '', title: 'Target planner', loadComponent: () => import('./target-planner/target-planner') }];

export default plannerRoutes;
