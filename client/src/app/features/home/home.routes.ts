import { Routes } from '@angular/router';

const homeRoutes: Routes = [{ path: '', title: 'Home', loadComponent: () => import('./home-page/home-page') }];

export default homeRoutes;
