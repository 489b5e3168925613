import { isApiErrorBody } from '@spincycle/shared/http/api-error';
import { HttpErrorResponse, HttpInterceptorFn } from '@angular/common/http';
import { inject } from '@angular/core';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router } from '@angular/router';
import { catchError, throwError } from 'rxjs';
import { AUTH_API_PREFIX, SessionAuth } from '../auth/session-auth';

export const UNREACHABLE_MESSAGE = 'The server could not be reached. Check the connection and try again.';
export const SERVER_FAILURE_MESSAGE = 'Something went wrong on the server. Please try again in a moment.';
export const SESSION_ENDED_MESSAGE = 'Your session has ended. Please sign in again.';

/**
 * App-wide reactions to failed API calls. Every error is re-thrown so that the page can show
 * its own error state; 4xx bodies (with `fieldErrors`) are the page's business alone.
 * - 401 on a call outside /api/auth/: the session has ended → forget it, go to sign-in.
 * - status 0 (no answer) or 5xx: a snackbar, since the page cannot do anything better.
 */
export const errorInterceptor: HttpInterceptorFn = (req, next) => {
  const auth = inject(SessionAuth);
  const router = inject(Router);
  const snackBar = inject(MatSnackBar);

  return next(req).pipe(
    catchError((error: unknown) => {
      if (error instanceof HttpErrorResponse) {
        if (error.status === 401 && !isAuthCall(req.url)) {
          auth.clear();
          const current = router.url;
          if (!current.startsWith('/sign-in')) {
            snackBar.open(SESSION_ENDED_MESSAGE, 'Dismiss', { duration: 8000 });
            void router.navigate(['/sign-in'], { queryParams: { returnUrl: current } });
          }
        } else if (error.status === 0) {
          snackBar.open(UNREACHABLE_MESSAGE, 'Dismiss', { duration: 8000 });
        } else if (error.status >= 500 && !(error.status === 503 && isApiErrorBody(error.error))) {
          // A 503 with the API's body says which service is unavailable; the page shows its message.
          snackBar.open(SERVER_FAILURE_MESSAGE, 'Dismiss', { duration: 8000 });
        }
      }
      return throwError(() => error);
    }),
  );
};

function isAuthCall(url: string): boolean {
  const path = url.startsWith('http') ? new URL(url).pathname : url;
  return path.startsWith(AUTH_API_PREFIX);
}
