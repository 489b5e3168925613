import { inject } from '@angular/core';
import { CanActivateFn, Router, UrlTree } from '@angular/router';
import { SessionAuth } from './session-auth';

/** The sign-in page, remembering where the person was going. */
export function signInUrlTree(router: Router, returnUrl: string): UrlTree {
  return router.createUrlTree(['/sign-in'], { queryParams: { returnUrl } });
}

/** Lets signed-in people through; sends everyone else to sign in and back. */
export const authGuard: CanActivateFn = (_route, state) => {
  const auth = inject(SessionAuth);
  return auth.signedIn() ? true : signInUrlTree(inject(Router), state.url);
};
