import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import {
  MAT_DIALOG_DATA,
  MatDialogActions,
  MatDialogClose,
  MatDialogContent,
  MatDialogRef,
  MatDialogTitle,
} from '@angular/material/dialog';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { lostNightSchema, type NightPlanBuildStatus } from '@spincycle/shared/night-plans/night-plans';
import { readApiError } from '../../../core/http/api-error-message';
import { controlErrorMessage } from '../../../ui/forms/server-errors';
import { zodValidator } from '../../../ui/forms/zod-validator';
import { NightPlansApi } from '../night-plans-api';

export interface LostNightDialogData {
  cycleId: number;
  nodeId: number;
  nodeCode: string;
  date: string;
  /** The night as written on screen ("3 Mar 2027"). */
  dateText: string;
}

/** Longest reason the server keeps (lostNightSchema). */
const REASON_MAX = 500;

/**
 * Marks a night of a node lost: asks the reason, warns that the node's later nights are
 * re-planned from it (done visits never move), sends it, and closes with the re-plan's status.
 */
@Component({
  selector: 'app-lost-night-dialog',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    MatButton,
    MatDialogActions,
    MatDialogClose,
    MatDialogContent,
    MatDialogTitle,
    MatError,
    MatFormField,
    MatHint,
    MatIcon,
    MatInput,
    MatLabel,
    MatProgressBar,
    ReactiveFormsModule,
  ],
  template: `
    <h2 mat-dialog-title>Mark the night lost</h2>
    <form [formGroup]="form" (ngSubmit)="submit()">
      <mat-dialog-content>
        <p>
          The night of <strong>{{ data.dateText }}</strong> on <strong>{{ data.nodeCode }}</strong> was lost: nothing will be planned on it.
        </p>
        <p class="caution" role="note" data-testid="lost-caution">
          <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">warning</mat-icon>
          <span>
            The remaining nights of {{ data.nodeCode }} are planned again from this night on, so their visits may change. Visits marked done
            never move, and nights before this one stay as they are.
          </span>
        </p>
        <mat-form-field class="reason">
          <mat-label>Why was the night lost?</mat-label>
          <textarea
            matInput
            formControlName="reason"
            rows="3"
            [maxlength]="max"
            required
            cdkFocusInitial
            placeholder="Weather, a fault…"
            data-testid="lost-reason"
          ></textarea>
          <mat-hint align="end">{{ reason.value.length }} / {{ max }}</mat-hint>
          @if (reason.invalid && reason.touched) {
            <mat-error>{{ reasonError() }}</mat-error>
          }
        </mat-form-field>
        @if (sending()) {
          <mat-progress-bar mode="indeterminate" aria-label="Marking the night lost" />
        }
        @if (failure(); as f) {
          <p class="problem" role="alert" data-testid="lost-error">The night was not marked lost. {{ f }}</p>
        }
      </mat-dialog-content>
      <mat-dialog-actions align="end">
        <button matButton type="button" [mat-dialog-close]="undefined" [disabled]="sending()">Cancel</button>
        <button matButton="filled" type="submit" [disabled]="sending()" data-testid="lost-submit">Mark lost and re-plan</button>
      </mat-dialog-actions>
    </form>
  `,
  styles: `
    .reason {
      display: block;
      inline-size: 100%;
      margin-block-start: 8px;
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
    .problem {
      color: var(--mat-sys-error);
    }
  `,
})
export class LostNightDialog {
  protected readonly data = inject<LostNightDialogData>(MAT_DIALOG_DATA);
  private readonly ref = inject<MatDialogRef<LostNightDialog, NightPlanBuildStatus>>(MatDialogRef);
  private readonly api = inject(NightPlansApi);
  protected readonly max = REASON_MAX;
  protected readonly reason = new FormControl('', {
    nonNullable: true,
    validators: [zodValidator(lostNightSchema.shape.reason)],
  });
  protected readonly form = new FormGroup({ reason: this.reason });
  protected readonly sending = signal(false);
  protected readonly failure = signal<string | null>(null);

  protected reasonError(): string {
    const text = controlErrorMessage(this.reason);
    return text.charAt(0).toUpperCase() + text.slice(1);
  }

  protected submit(): void {
    if (this.sending()) return;
    if (this.reason.invalid) {
      this.reason.markAsTouched();
      return;
    }
    this.sending.set(true);
    this.failure.set(null);
    this.api.markLost(this.data.cycleId, this.data.nodeId, { date: this.data.date, reason: this.reason.value.trim() }).subscribe({
      next: (build) => {
        this.sending.set(false);
        this.ref.close(build);
      },
      error: (err: unknown) => {
        this.sending.set(false);
        const body = readApiError(err);
        const onReason = body.fieldErrors?.['reason']?.[0];
        this.failure.set(onReason ? `Reason: ${onReason}` : body.message);
      },
    });
  }
}
