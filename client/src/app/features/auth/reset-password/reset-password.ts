import { ChangeDetectionStrategy, Component, DestroyRef, inject, input, signal } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { AbstractControl, FormControl, FormGroup, ReactiveFormsModule, ValidationErrors, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatCard } from '@angular/material/card';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router, RouterLink } from '@angular/router';
import { PASSWORD_MIN_LENGTH, passwordResetConfirmSchema } from '@spincycle/shared/accounts/account-schemas';
import { SessionAuth } from '../../../core/auth/session-auth';
import { readApiError } from '../../../core/http/api-error-message';
import { applyServerFieldErrors, controlErrorMessage } from '../../../ui/forms/server-errors';
import { zodValidator } from '../../../ui/forms/zod-validator';

/** The second field must repeat the first. */
function sameAsPassword(control: AbstractControl): ValidationErrors | null {
  const password = control.parent?.get('password')?.value as string | undefined;
  return control.value && control.value !== password ? { mismatch: true } : null;
}

/** Opened from the e-mailed link `/reset-password?token=…`. */
@Component({
  selector: 'app-reset-password',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButton, MatCard, MatError, MatFormField, MatHint, MatInput, MatLabel, MatProgressBar, ReactiveFormsModule, RouterLink],
  templateUrl: './reset-password.html',
  styleUrl: '../auth-page.scss',
})
export default class ResetPassword {
  private readonly auth = inject(SessionAuth);
  private readonly router = inject(Router);
  private readonly snackBar = inject(MatSnackBar);

  /** `?token=` from the e-mailed link. */
  readonly token = input<string>();

  protected readonly passwordMinLength = PASSWORD_MIN_LENGTH;
  protected readonly submitting = signal(false);
  protected readonly serverError = signal<string | null>(null);
  protected readonly errorOf = controlErrorMessage;

  protected readonly form = new FormGroup({
    password: new FormControl('', {
      nonNullable: true,
      validators: [zodValidator(passwordResetConfirmSchema.shape.password)],
    }),
    repeat: new FormControl('', { nonNullable: true, validators: [Validators.required, sameAsPassword] }),
  });

  constructor() {
    this.form.controls.password.valueChanges
      .pipe(takeUntilDestroyed(inject(DestroyRef)))
      .subscribe(() => this.form.controls.repeat.updateValueAndValidity({ emitEvent: false }));
  }

  protected submit(): void {
    const token = this.token();
    if (this.submitting() || !token) return;
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.submitting.set(true);
    this.serverError.set(null);
    this.auth.confirmReset({ token, password: this.form.controls.password.value }).subscribe({
      next: () => {
        this.submitting.set(false);
        this.snackBar.open('Your password is changed. Sign in with the new one.', 'Dismiss', { duration: 8000 });
        void this.router.navigateByUrl('/sign-in');
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
