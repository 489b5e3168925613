import { Routes } from '@angular/router';

const networkRoutes: Routes = [{ path: '', title: 'Network', loadComponent: () => import('./network-page/network-page') }];

export default networkRoutes;
