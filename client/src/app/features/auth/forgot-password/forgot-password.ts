import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatCard } from '@angular/material/card';
import { MatError, MatFormField, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { passwordResetRequestSchema } from '@spincycle/shared/accounts/account-schemas';
import { SessionAuth } from '../../../core/auth/session-auth';
import { readApiError } from '../../../core/http/api-error-message';
import { applyServerFieldErrors, controlErrorMessage } from '../../../ui/forms/server-errors';
import { zodValidator } from '../../../ui/forms/zod-validator';

export const RESET_REQUESTED_MESSAGE = 'If an account exists for that address, a link is on its way.';

/** Asks for a reset link. The answer is the same whether or not the address has an account. */
@Component({
  selector: 'app-forgot-password',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButton, MatCard, MatError, MatFormField, MatInput, MatLabel, MatProgressBar, ReactiveFormsModule, RouterLink],
  templateUrl: './forgot-password.html',
  styleUrl: '../auth-page.scss',
})
export default class ForgotPassword {
  private readonly auth = inject(SessionAuth);

  protected readonly confirmation = RESET_REQUESTED_MESSAGE;
  protected readonly submitting = signal(false);
  protected readonly sent = signal(false);
  protected readonly serverError = signal<string | null>(null);
  protected readonly errorOf = controlErrorMessage;

  protected readonly form = new FormGroup({
    email: new FormControl('', { nonNullable: true, validators: [zodValidator(passwordResetRequestSchema.shape.email)] }),
  });

  protected submit(): void {
    if (this.submitting()) return;
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.submitting.set(true);
    this.serverError.set(null);
    this.auth.requestReset(this.form.getRawValue()).subscribe({
      next: () => {
        this.submitting.set(false);
        this.sent.set(true);
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
