import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatCheckbox } from '@angular/material/checkbox';
import {
  MAT_DIALOG_DATA,
  MatDialogActions,
  MatDialogClose,
  MatDialogContent,
  MatDialogRef,
  MatDialogTitle,
} from '@angular/material/dialog';

export interface ReleaseDialogData {
  cycleCode: string;
  awarded: number;
  reserve: number;
  notAwarded: number;
}

/**
 * Confirms the release of a cycle's decisions: what happens (mails, states, programs) and a
 * box the manager ticks to say the decisions follow the consortium's allocation rules.
 * Closes with true only when ticked and confirmed.
 */
@Component({
  selector: 'app-release-dialog',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButton, MatCheckbox, MatDialogActions, MatDialogClose, MatDialogContent, MatDialogTitle],
  template: `
    <h2 mat-dialog-title>Release the decisions of {{ data.cycleCode }}?</h2>
    <mat-dialog-content>
      <p data-testid="release-counts">
        {{ data.awarded }} awarded, {{ data.reserve }} on reserve, {{ data.notAwarded }} not awarded. When you release them:
      </p>
      <ul>
        <li>
          each team is e-mailed its outcome, the node-hours awarded per node and the reviewers' comments, with the reviewers' names left
          out;
        </li>
        <li>each proposal changes to awarded, reserve or not awarded, and its team sees the decision on the proposal;</li>
        <li>every awarded proposal becomes a program, ready for night planning.</li>
      </ul>
      <p>A decision changed after the release is mailed to its team again.</p>
      <mat-checkbox [checked]="agreed()" (change)="agreed.set($event.checked)" data-testid="release-confirm">
        These decisions follow the consortium's allocation rules
      </mat-checkbox>
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button matButton type="button" [mat-dialog-close]="false">Cancel</button>
      <button matButton="filled" type="button" class="cta" [disabled]="!agreed()" (click)="ref.close(true)">Release decisions</button>
    </mat-dialog-actions>
  `,
})
export class ReleaseDialog {
  protected readonly data = inject<ReleaseDialogData>(MAT_DIALOG_DATA);
  protected readonly ref = inject<MatDialogRef<ReleaseDialog, boolean>>(MatDialogRef);
  protected readonly agreed = signal(false);
}
