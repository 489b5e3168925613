import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { CONFLICT_REASON_MAX } from '@spincycle/shared/review/reviewing';
import { readApiError } from '../../../../core/http/api-error-message';
import { DialogShell } from '../../../../ui/dialog-shell/dialog-shell';
import { ReviewingApi } from '../reviewing-api';

export interface ConflictDialogData {
  proposalId: number;
  title: string;
}

/**
 * Declares a conflict of interest with one proposal, with the reason the facility managers read.
 * Closes with `true` once the server has recorded it (the proposal then leaves the reviewer's list).
 */
@Component({
  selector: 'app-conflict-dialog',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DialogShell, MatError, MatFormField, MatHint, MatInput, MatLabel, ReactiveFormsModule],
  template: `
    <app-dialog-shell
      heading="Declare a conflict of interest"
      confirmLabel="Declare conflict"
      form="conflict-form"
      [cancelResult]="false"
      [busy]="busy()"
      busyLabel="Declaring the conflict"
      [error]="error()"
    >
      <form id="conflict-form" [formGroup]="form" (ngSubmit)="declare()">
        <p>
          You will no longer review “{{ data.title }}”: it leaves your list, with any grade you gave it, and the facility managers are told
          so that they can find another reviewer.
        </p>
        <mat-form-field class="reason">
          <mat-label>Reason</mat-label>
          <textarea matInput [formControl]="reason" rows="3" [maxlength]="max" required></textarea>
          <mat-hint align="end">{{ reason.value.length }} / {{ max }}</mat-hint>
          @if (reason.touched && reason.invalid) {
            <mat-error>Give a reason, for example a recent collaboration with the team.</mat-error>
          }
        </mat-form-field>
      </form>
    </app-dialog-shell>
  `,
  styles: `
    .reason {
      inline-size: 100%;
    }
  `,
})
export class ConflictDialog {
  protected readonly data = inject<ConflictDialogData>(MAT_DIALOG_DATA);
  private readonly ref = inject(MatDialogRef<ConflictDialog, boolean>);
  private readonly api = inject(ReviewingApi);
  protected readonly max = CONFLICT_REASON_MAX;
  protected readonly reason = new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.pattern(/\S/)] });
  protected readonly form = new FormGroup({ reason: this.reason });
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);

  protected declare(): void {
    this.reason.markAsTouched();
    if (this.reason.invalid || this.busy()) return;
    this.busy.set(true);
    this.error.set(null);
    this.api.declareConflict(this.data.proposalId, this.reason.value.trim()).subscribe({
      next: () => this.ref.close(true),
      error: (err: unknown) => {
        this.busy.set(false);
        this.error.set(readApiError(err).message);
      },
    });
  }
}
