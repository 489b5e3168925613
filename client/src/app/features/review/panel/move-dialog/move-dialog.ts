import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { DialogShell } from '../../../../ui/dialog-shell/dialog-shell';

export interface MoveDialogData {
  title: string;
  from: number;
  to: number;
  /** Number of places in the standing. */
  size: number;
}

export interface MoveDialogResult {
  toPosition: number;
  reason: string;
}

/** Asks where to move a proposal in the standing and why (the reason is kept in the history). */
@Component({
  selector: 'app-move-dialog',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DialogShell, MatError, MatFormField, MatHint, MatInput, MatLabel, ReactiveFormsModule],
  template: `
    <app-dialog-shell [heading]="'Move “' + data.title + '”'" confirmLabel="Move" form="move-form" [confirmDisabled]="form.invalid">
      <form id="move-form" [formGroup]="form" (ngSubmit)="submit()">
        <p>It is at position {{ data.from }} of {{ data.size }}. The proposals in between shift by one place.</p>
        <mat-form-field>
          <mat-label>New position</mat-label>
          <input matInput type="number" formControlName="toPosition" min="1" [max]="data.size" required />
          @if (form.controls.toPosition.invalid) {
            <mat-error>Enter a position from 1 to {{ data.size }}, other than {{ data.from }}.</mat-error>
          }
        </mat-form-field>
        <mat-form-field class="reason">
          <mat-label>Reason for the move</mat-label>
          <textarea matInput formControlName="reason" rows="3" maxlength="500" required cdkFocusInitial></textarea>
          <mat-hint align="end">{{ form.controls.reason.value.length }} / 500</mat-hint>
          @if (form.controls.reason.invalid && form.controls.reason.touched) {
            <mat-error>Give the reason for the move (up to 500 characters).</mat-error>
          }
        </mat-form-field>
      </form>
    </app-dialog-shell>
  `,
  styles: `
    mat-form-field {
      display: block;
      inline-size: 100%;
    }
  `,
})
export class MoveDialog {
  protected readonly data = inject<MoveDialogData>(MAT_DIALOG_DATA);
  private readonly ref = inject<MatDialogRef<MoveDialog, MoveDialogResult>>(MatDialogRef);

  protected readonly form = new FormGroup({
    toPosition: new FormControl<number>(this.data.to, {
      nonNullable: true,
      validators: [
        Validators.required,
        Validators.min(1),
        Validators.max(this.data.size),
        (c) => (Number.isInteger(c.value) && c.value !== this.data.from ? null : { position: true }),
      ],
    }),
    reason: new FormControl('', {
      nonNullable: true,
      validators: [Validators.required, Validators.maxLength(500), (c) => (c.value.trim() ? null : { blank: true })],
    }),
  });

  protected submit(): void {
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const { toPosition, reason } = this.form.getRawValue();
    this.ref.close({ toPosition, reason: reason.trim() });
  }
}
