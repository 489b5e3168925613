import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { MatCheckbox } from '@angular/material/checkbox';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import { DialogShell } from '../../../ui/dialog-shell/dialog-shell';

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
  imports: [DialogShell, MatCheckbox],
  template: `
    <app-dialog-shell
      [heading]="'Release the decisions of ' + data.cycleCode + '?'"
      confirmLabel="Release decisions"
      tone="cta"
      [cancelResult]="false"
      [confirmDisabled]="!agreed()"
      (confirmed)="ref.close(true)"
    >
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
    </app-dialog-shell>
  `,
})
export class ReleaseDialog {
  protected readonly data = inject<ReleaseDialogData>(MAT_DIALOG_DATA);
  protected readonly ref = inject<MatDialogRef<ReleaseDialog, boolean>>(MatDialogRef);
  protected readonly agreed = signal(false);
}
