import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatCard } from '@angular/material/card';
import { MatError, MatFormField, MatHint, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { PASSWORD_MIN_LENGTH, signUpSchema } from '@spincycle/shared/accounts/account-schemas';
import { readApiError } from '../../../core/http/api-error-message';
import { applyServerFieldErrors, controlErrorMessage } from '../../../ui/forms/server-errors';
import { zodValidator } from '../../../ui/forms/zod-validator';
import { SignUpApi } from '../sign-up-api';

/** The page that accepts an invitation once the account exists (see features/invitations). */
export function invitationPath(token: string): string {
  return `/invitations/${encodeURIComponent(token)}`;
}

/**
 * Self-registration: the server answers "check your inbox" (202) whether or not the address
 * has an account, so that the form does not reveal who has one, and mails a welcome (new
 * account, a proposer) or a note on how to reset the password (existing account). The page then
 * offers to sign in. With `?invite=<token>` (the link mailed to an invitee without an account)
 * signing in continues to the invitation page, which accepts it and opens the proposal.
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
  private readonly api = inject(SignUpApi);

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
  /** The server's "check your inbox" message once the form has been accepted. */
  protected readonly accepted = signal<string | null>(null);
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
    this.api.signUp(this.form.getRawValue()).subscribe({
      next: ({ message }) => {
        this.submitting.set(false);
        this.form.controls.password.reset('');
        this.accepted.set(message);
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
