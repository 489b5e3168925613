import { HttpClient } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import type { Observable } from 'rxjs';
import type { SignUpAccepted, SignUpInput } from '@spincycle/shared/accounts/account-schemas';

/**
 * POST /api/auth/sign-up. The server answers 202 with the same message whether or not the
 * address has an account (so that the form does not reveal who has one) and starts no
 * session: the person signs in once the welcome mail has arrived.
 */
@Injectable({ providedIn: 'root' })
export class SignUpApi {
  private readonly http = inject(HttpClient);

  signUp(input: SignUpInput): Observable<SignUpAccepted> {
    return this.http.post<SignUpAccepted>('/api/auth/sign-up', input);
  }
}
