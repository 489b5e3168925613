import { ChangeDetectionStrategy, Component, inject, input, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatCard } from '@angular/material/card';
import { MatError, MatFormField, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import { signInSchema } from '@spincycle/shared/accounts/account-schemas';
import { SessionAuth } from '../../../core/auth/session-auth';
import { readApiError } from '../../../core/http/api-error-message';
import { applyServerFieldErrors, controlErrorMessage } from '../../../ui/forms/server-errors';
import { zodValidator } from '../../../ui/forms/zod-validator';
import { safeReturnUrl } from '../return-url';

@Component({
  selector: 'app-sign-in',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    MatButton,
    MatCard,
    MatError,
    MatFormField,
    MatIcon,
    MatIconButton,
    MatInput,
    MatLabel,
    MatProgressBar,
    MatSuffix,
    ReactiveFormsModule,
    RouterLink,
  ],
  templateUrl: './sign-in.html',
  styleUrl: '../auth-page.scss',
})
export default class SignIn {
  private readonly auth = inject(SessionAuth);
  private readonly router = inject(Router);

  /** `?returnUrl=` — where the person was going before being asked to sign in. */
  readonly returnUrl = input<string>();

  protected readonly submitting = signal(false);
  protected readonly serverError = signal<string | null>(null);
  protected readonly showPassword = signal(false);
  protected readonly errorOf = controlErrorMessage;

  protected readonly form = new FormGroup({
    email: new FormControl('', { nonNullable: true, validators: [zodValidator(signInSchema.shape.email)] }),
    password: new FormControl('', { nonNullable: true, validators: [zodValidator(signInSchema.shape.password)] }),
  });

  protected submit(): void {
    if (this.submitting()) return;
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.submitting.set(true);
    this.serverError.set(null);
    this.auth.signIn(this.form.getRawValue()).subscribe({
      next: () => {
        this.submitting.set(false);
        void this.router.navigateByUrl(safeReturnUrl(this.returnUrl()));
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
