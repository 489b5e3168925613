import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogActions, MatDialogClose, MatDialogContent, MatDialogTitle } from '@angular/material/dialog';
import { MatButtonToggle, MatButtonToggleGroup } from '@angular/material/button-toggle';
import { loadErrorText } from '../../../../core/http/api-error-message';
import { LoadStatus } from '../../../../ui/load-status/load-status';
import { SkyWindowChart } from '../../../../ui/charts/sky-window-chart/sky-window-chart';
import { PlanApi } from '../../plans/plan-api';

export interface SkyWindowDialogData {
  proposalId: number;
  targetId: number;
  targetName: string;
  /** The nodes the target was planned on; the first is shown first unless `nodeId` says otherwise. */
  nodes: { nodeId: number; nodeCode: string }[];
  nodeId?: number;
  /** The plan's own one-line sky verdict per node, when known. */
  verdicts?: Record<number, string>;
  /** Opened by a reviewer: the windows come through the reviewer's route. */
  reviewing?: boolean;
}

/** One target's sky window from one node's site over the campaign, night by night. */
@Component({
  selector: 'app-sky-window-dialog',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    LoadStatus,
    MatButton,
    MatButtonToggle,
    MatButtonToggleGroup,
    MatDialogActions,
    MatDialogClose,
    MatDialogContent,
    MatDialogTitle,
    SkyWindowChart,
  ],
  template: `
    <h2 mat-dialog-title>Sky window of {{ data.targetName }}</h2>
    <mat-dialog-content>
      @if (data.nodes.length > 1) {
        <mat-button-toggle-group
          [value]="nodeId()"
          (change)="nodeId.set($event.value)"
          aria-label="Node"
          hideSingleSelectionIndicator
          class="nodes"
        >
          @for (node of data.nodes; track node.nodeId) {
            <mat-button-toggle [value]="node.nodeId">{{ node.nodeCode }}</mat-button-toggle>
          }
        </mat-button-toggle-group>
      }
      <app-load-status [loading]="report.isLoading()" loadingLabel="Computing the sky window" [error]="error()" (retry)="report.reload()" />
      @if (report.hasValue() && report.value().targets[0]; as target) {
        <app-sky-window-chart [target]="target" [nights]="report.value().nights" [heading]="heading()" />
        @if (planVerdict(); as verdict) {
          <p class="plan-verdict">Target plan on {{ nodeCode() }}: {{ verdict }}.</p>
        }
        <p class="note">
          The sky window is the target's visibility at night. Usable time is dark time (Sun at or below
          {{ report.value().limits.sunAltitudeLimitDeg }}°) with the target at or above the node's altitude limit of
          {{ report.value().limits.altitudeLimitDeg }}°, from the node's own safety configuration.
        </p>
      }
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button matButton type="button" mat-dialog-close>Close</button>
    </mat-dialog-actions>
  `,
  styles: `
    .nodes {
      margin-block-end: 12px;
    }
    .note,
    .plan-verdict {
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-body-small);
      max-inline-size: 80ch;
    }
  `,
})
export class SkyWindowDialog {
  protected readonly data = inject<SkyWindowDialogData>(MAT_DIALOG_DATA);
  protected readonly nodeId = signal(this.data.nodeId ?? this.data.nodes[0]?.nodeId ?? 0);
  protected readonly nodeCode = computed(() => this.data.nodes.find((n) => n.nodeId === this.nodeId())?.nodeCode ?? '');
  protected readonly report = inject(PlanApi).skyWindowResource(() => ({
    proposalId: this.data.proposalId,
    targetId: this.data.targetId,
    nodeId: this.nodeId(),
    reviewing: this.data.reviewing,
  }));
  protected readonly heading = computed(() => `${this.data.targetName} from node ${this.nodeCode()}`);
  protected readonly planVerdict = computed(() => this.data.verdicts?.[this.nodeId()] ?? null);
  protected readonly error = computed(() => loadErrorText(this.report.error(), 'The sky window could not be computed.'));
}
