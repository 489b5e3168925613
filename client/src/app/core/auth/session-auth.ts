import { HttpClient } from '@angular/common/http';
import { computed, inject, Injectable, signal } from '@angular/core';
import { firstValueFrom, map, Observable, tap } from 'rxjs';
// Type-only imports: the schemas (and zod) stay out of the initial bundle.
import type {
  PasswordResetConfirmInput,
  PasswordResetRequestInput,
  SessionUser,
  SignInInput,
} from '@spincycle/shared/accounts/account-schemas';
import { hasAnyRole, type Role } from '@spincycle/shared/accounts/roles';

/** Body of GET /api/auth/session. */
export interface SessionResponse {
  user: SessionUser | null;
}

/** Body of POST /api/auth/sign-in and /api/auth/sign-up. */
export interface SignedInResponse {
  user: SessionUser;
}

/** URL prefix of the calls that establish or end a session (the error interceptor leaves their 401s alone). */
export const AUTH_API_PREFIX = '/api/auth/';

/**
 * The signed-in person and the calls that change who that is. The server keeps the session
 * in a cookie; this service only mirrors it so that guards and templates can read it.
 */
@Injectable({ providedIn: 'root' })
export class SessionAuth {
  private readonly http = inject(HttpClient);
  private readonly current = signal<SessionUser | null>(null);

  /** The signed-in person, or `null`. */
  readonly user = this.current.asReadonly();
  readonly signedIn = computed(() => this.current() !== null);

  /**
   * Asks the server who is signed in. Never rejects: when the server cannot answer, the
   * application starts signed out and the page that needs a session sends the person to sign in.
   */
  async load(): Promise<SessionUser | null> {
    try {
      const { user } = await firstValueFrom(this.http.get<SessionResponse>(`${AUTH_API_PREFIX}session`));
      this.current.set(user);
    } catch {
      this.current.set(null);
    }
    return this.current();
  }

  signIn(input: SignInInput): Observable<SessionUser> {
    return this.http.post<SignedInResponse>(`${AUTH_API_PREFIX}sign-in`, input).pipe(
      map(({ user }) => user),
      tap((user) => this.current.set(user)),
    );
  }

  signOut(): Observable<void> {
    return this.http.post<void>(`${AUTH_API_PREFIX}sign-out`, null).pipe(tap(() => this.current.set(null)));
  }

  /** Always answers 202, whether or not the address has an account. */
  requestReset(input: PasswordResetRequestInput): Observable<void> {
    return this.http.post<void>(`${AUTH_API_PREFIX}password-reset`, input);
  }

  confirmReset(input: PasswordResetConfirmInput): Observable<void> {
    return this.http.post<void>(`${AUTH_API_PREFIX}password-reset/confirm`, input);
  }

  /** Forgets the session locally (the server already ended it, e.g. after a 401). */
  clear(): void {
    this.current.set(null);
  }

  /** True when the signed-in person holds at least one of the roles. */
  hasRole(...roles: Role[]): boolean {
    return hasAnyRole(this.current(), ...roles);
  }
}
