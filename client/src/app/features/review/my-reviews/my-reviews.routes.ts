import { Routes } from '@angular/router';

/** Pages of review's my-reviews/ part (loaded by review.routes.ts). */
const routes: Routes = [];

export default routes;
