import { Routes } from '@angular/router';

const methodsRoutes: Routes = [{ path: '', title: 'Methods', loadComponent: () => import('./methods-page/methods-page') }];

export default methodsRoutes;
