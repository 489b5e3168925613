import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, ValidatorFn } from '@angular/forms';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { versionedReasonSchema, type InvoiceDetail, type VersionedReasonInput } from '@spincycle/shared/billing/billing';
import type { Observable } from 'rxjs';
import { readApiError } from '../../../core/http/api-error-message';
import { DialogShell } from '../../../ui/dialog-shell/dialog-shell';
import { applyServerFieldErrors, controlErrorMessage } from '../../../ui/forms/server-errors';
import { zodValidator } from '../../../ui/forms/zod-validator';

/** The longest reason the server accepts (versionedReasonSchema). */
export const REASON_MAX = 1000;

export interface ReasonDialogData {
  heading: string;
  /** What the action does, in a sentence or two. */
  message: string;
  /** A caution shown apart (the refund's: the money goes back to the card; the consortium's rules apply). */
  caution?: string;
  confirmLabel: string;
  /** Sends the action with the reason typed; the dialog shows a refusal and stays open. */
  send: (input: VersionedReasonInput) => Observable<InvoiceDetail>;
  version: number;
}

/**
 * Result of the dialog: the invoice after the action, `'stale'` when someone else changed the
 * invoice meanwhile (the page reloads and says so), or nothing when cancelled.
 */
export type ReasonDialogResult = InvoiceDetail | 'stale' | undefined;

const schemaCheck = zodValidator(versionedReasonSchema.shape.reason);

/** The server's check of the reason (versionedReasonSchema), with a full sentence for an empty one. */
const reasonCheck: ValidatorFn = (control) =>
  String(control.value ?? '').trim() ? schemaCheck(control) : { schema: 'Give a reason: it is kept with the invoice’s history.' };

/** Asks why before voiding or refunding an invoice (the reason is required and kept in the audit log). */
@Component({
  selector: 'app-reason-dialog',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DialogShell, MatError, MatFormField, MatHint, MatIcon, MatInput, MatLabel, ReactiveFormsModule],
  template: `
    <app-dialog-shell
      [heading]="data.heading"
      [confirmLabel]="data.confirmLabel"
      form="reason-form"
      tone="destructive"
      [busy]="busy()"
      busyLabel="Sending"
      [error]="error()"
      confirmTestId="reason-confirm"
    >
      <form id="reason-form" [formGroup]="form" (ngSubmit)="submit()" novalidate>
        <p>{{ data.message }}</p>
        @if (data.caution) {
          <p class="caution" role="note" data-testid="reason-caution">
            <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">warning</mat-icon>
            <span>{{ data.caution }}</span>
          </p>
        }
        <mat-form-field class="reason">
          <mat-label>Reason</mat-label>
          <textarea matInput formControlName="reason" rows="3" [maxlength]="max" required data-testid="reason-text"></textarea>
          <mat-hint align="end">{{ form.controls.reason.value.length }} / {{ max }}</mat-hint>
          <mat-error data-testid="reason-error">{{ errorOf(form.controls.reason) }}</mat-error>
        </mat-form-field>
      </form>
    </app-dialog-shell>
  `,
  styles: `
    .reason {
      inline-size: 100%;
    }
    .caution {
      display: flex;
      gap: 8px;
      align-items: flex-start;
      padding: 8px 12px;
      border-radius: var(--mat-sys-corner-small);
      background: var(--mat-sys-surface-container);
      mat-icon {
        flex: none;
      }
    }
  `,
})
export class ReasonDialog {
  protected readonly data = inject<ReasonDialogData>(MAT_DIALOG_DATA);
  private readonly ref = inject(MatDialogRef<ReasonDialog, ReasonDialogResult>);
  protected readonly max = REASON_MAX;
  protected readonly errorOf = controlErrorMessage;
  protected readonly form = new FormGroup({
    reason: new FormControl('', {
      nonNullable: true,
      validators: [reasonCheck],
    }),
  });
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);

  protected submit(): void {
    this.form.markAllAsTouched();
    if (this.form.invalid || this.busy()) return;
    this.busy.set(true);
    this.error.set(null);
    this.data.send({ version: this.data.version, reason: this.form.controls.reason.value.trim() }).subscribe({
      next: (invoice) => this.ref.close(invoice),
      error: (err: unknown) => {
        this.busy.set(false);
        const body = readApiError(err);
        if (body.code === 'stale_version') {
          this.ref.close('stale');
          return;
        }
        const unmatched = applyServerFieldErrors(this.form, body.fieldErrors);
        this.error.set(body.fieldErrors && !unmatched.length ? null : body.message);
      },
    });
  }
}
