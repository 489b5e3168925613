import { inject } from '@angular/core';
import { MatSnackBar } from '@angular/material/snack-bar';
import { CanActivateFn, Router } from '@angular/router';
import { ROLE_LABELS, type Role } from '@spincycle/shared/accounts/roles';
import { signInUrlTree } from './auth-guard';
import { SessionAuth } from './session-auth';

/**
 * Lets through people holding at least one of `roles`. Others go home with a message saying
 * why. This only shapes the interface: the server re-checks every permission.
 */
export function roleGuard(...roles: Role[]): CanActivateFn {
  return (_route, state) => {
    const auth = inject(SessionAuth);
    const router = inject(Router);
    if (!auth.signedIn()) return signInUrlTree(router, state.url);
    if (auth.hasRole(...roles)) return true;
    const needed = roles.map((role) => ROLE_LABELS[role].toLowerCase()).join(' or ');
    inject(MatSnackBar).open(`That page is for the ${needed} role.`, 'Dismiss', { duration: 8000 });
    return router.parseUrl('/');
  };
}
