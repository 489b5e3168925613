import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { DialogShell } from '../../../ui/dialog-shell/dialog-shell';

export interface CapacityDialogData {
  title: string;
  /** What the server said about each node taken past its capacity. */
  messages: string[];
}

/** Longest reason the server keeps (awardInputSchema's notes). */
const REASON_MAX = 1000;

/**
 * The award would take a node past what it offers in the cycle: shows why, and asks the
 * reason to go ahead anyway (kept in the audit log). Closes with the reason, or nothing.
 */
@Component({
  selector: 'app-capacity-dialog',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DialogShell, MatError, MatFormField, MatHint, MatIcon, MatInput, MatLabel, ReactiveFormsModule],
  template: `
    <app-dialog-shell
      heading="Past capacity"
      confirmLabel="Award past capacity"
      tone="destructive"
      form="capacity-form"
      [confirmDisabled]="reason.invalid"
    >
      <form id="capacity-form" [formGroup]="form" (ngSubmit)="submit()">
        <p>Awarding “{{ data.title }}” as entered takes more node-hours than the cycle offers:</p>
        <ul class="messages" data-testid="capacity-messages">
          @for (m of data.messages; track $index) {
            <li>{{ m }}</li>
          }
        </ul>
        <p class="caution" role="note">
          <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">warning</mat-icon>
          <span>
            The facility's own allocation rules govern whether a node may be awarded past its capacity. Exceeding it may displace other
            programs from that node's nights. Go ahead only with a reason those rules accept; it is kept in the audit log.
          </span>
        </p>
        <mat-form-field class="reason">
          <mat-label>Reason to exceed capacity</mat-label>
          <textarea matInput formControlName="reason" rows="3" [maxlength]="max" required cdkFocusInitial></textarea>
          <mat-hint align="end">{{ reason.value.length }} / {{ max }}</mat-hint>
          @if (reason.invalid && reason.touched) {
            <mat-error>Give the reason to exceed capacity (up to {{ max }} characters).</mat-error>
          }
        </mat-form-field>
      </form>
    </app-dialog-shell>
  `,
  styles: `
    .reason {
      display: block;
      inline-size: 100%;
    }
    .messages li {
      color: var(--mat-sys-error);
    }
    .caution {
      display: flex;
      gap: 8px;
      align-items: flex-start;
      padding: 10px 12px;
      border-radius: var(--mat-sys-corner-medium);
      background: var(--mat-sys-tertiary-container);
      color: var(--mat-sys-on-tertiary-container);
    }
    .caution mat-icon {
      flex: none;
    }
  `,
})
export class CapacityDialog {
  protected readonly data = inject<CapacityDialogData>(MAT_DIALOG_DATA);
  private readonly ref = inject<MatDialogRef<CapacityDialog, string>>(MatDialogRef);
  protected readonly max = REASON_MAX;
  protected readonly reason = new FormControl('', {
    nonNullable: true,
    validators: [Validators.required, Validators.maxLength(REASON_MAX), (c) => (c.value.trim() ? null : { blank: true })],
  });
  protected readonly form = new FormGroup({ reason: this.reason });

  protected submit(): void {
    if (this.reason.invalid) {
      this.reason.markAsTouched();
      return;
    }
    this.ref.close(this.reason.value.trim());
  }
}
