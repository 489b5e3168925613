import { Routes } from '@angular/router';

/** Pages of review's panel/ part (loaded by review.routes.ts). */
const routes: Routes = [];

export default routes;
