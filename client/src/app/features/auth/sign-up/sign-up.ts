import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatCard } from '@angular/material/card';
import { MatError, MatFormField, MatHint, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import { PASSWORD_MIN_LENGTH, signUpSchema } from '@spincycle/shared/accounts/account-schemas';
import { SessionAuth } from '../../../core/auth/session-auth';
import { readApiError } from '../../../core/http/api-error-message';
import { applyServerFieldErrors, controlErrorMessage } from '../../../ui/forms/server-errors';
import { zodValidator } from '../../../ui/forms/zod-validator';

/** The page that accepts an invitation once the account exists (see features/invitations). */
export function invitationPath(token: string): string {
  return `/invitations/${encodeURIComponent(token)}`;
}

/**
 * Self-registration: the server creates a proposer account and signs it in. With
 * `?invite=<token>` (the link mailed to an invitee without an account) the new account then
 * goes to the invitation page, which accepts it and opens the proposal.
 */
@Component({
  selector: 'app-sign-up',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    MatButton,
    MatCard,
    MatError,
    MatFormField,
    MatHint,
    MatIcon,
    MatIconButton,
    MatInput,
    MatLabel,
    MatProgressBar,
    MatSuffix,
    ReactiveFormsModule,
    RouterLink,
  ],
  templateUrl: './sign-up.html',
  styleUrl: '../auth-page.scss',
})
export default class SignUp {
  private readonly auth = inject(SessionAuth);
  private readonly router = inject(Router);

  /** Query parameter `invite`: a proposal-team invitation to accept after signing up. */
  readonly invite = input<string>();
  protected readonly inviteToken = computed(() => this.invite()?.trim() || null);
  protected readonly signInLink = computed(() => {
    const token = this.inviteToken();
    return token ? { returnUrl: invitationPath(token) } : {};
  });

  protected readonly passwordMinLength = PASSWORD_MIN_LENGTH;
  protected readonly submitting = signal(false);
  protected readonly serverError = signal<string | null>(null);
  protected readonly showPassword = signal(false);
  protected readonly errorOf = controlErrorMessage;

  protected readonly form = new FormGroup({
    displayName: new FormControl('', { nonNullable: true, validators: [zodValidator(signUpSchema.shape.displayName)] }),
    affiliation: new FormControl('', { nonNullable: true, validators: [zodValidator(signUpSchema.shape.affiliation)] }),
    email: new FormControl('', { nonNullable: true, validators: [zodValidator(signUpSchema.shape.email)] }),
    password: new FormControl('', { nonNullable: true, validators: [zodValidator(signUpSchema.shape.password)] }),
  });

  protected submit(): void {
    if (this.submitting()) return;
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.submitting.set(true);
    this.serverError.set(null);
    this.auth.signUp(this.form.getRawValue()).subscribe({
      next: () => {
        this.submitting.set(false);
        const token = this.inviteToken();
        void this.router.navigateByUrl(token ? invitationPath(token) : '/');
      },
      error: (error: unknown) => {
        const body = readApiError(error);
        const unmatched = applyServerFieldErrors(this.form, body.fieldErrors);
        this.serverError.set([body.message, ...unmatched].join(' '));
        this.submitting.set(false);
      },
    });
  }
}
