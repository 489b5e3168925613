import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatCheckbox } from '@angular/material/checkbox';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import {
  MatCell,
  MatCellDef,
  MatColumnDef,
  MatFooterCell,
  MatFooterCellDef,
  MatFooterRow,
  MatFooterRowDef,
  MatHeaderCell,
  MatHeaderCellDef,
  MatHeaderRow,
  MatHeaderRowDef,
  MatRow,
  MatRowDef,
  MatTable,
} from '@angular/material/table';
import { MatTooltip } from '@angular/material/tooltip';
import { RouterLink } from '@angular/router';
import type { AssignmentMatrix, MatrixCell, MatrixProposal, MatrixReviewer } from '@spincycle/shared/review/panels';
import { loadErrorText, readApiError } from '../../../../core/http/api-error-message';
import { LoadStatus } from '../../../../ui/load-status/load-status';
import { UtcInstantPipe } from '../../../../ui/time/date-pipes';
import { ReviewAdminApi } from '../review-admin-api';

const SOURCE_LABELS = { manual: 'assigned by hand', automatic: 'assigned automatically', team: 'assigned as team reviewer' } as const;

/** The words of one cell, for its tooltip and its accessible name. */
export function describeCell(cell: MatrixCell): string {
  switch (cell.state) {
    case 'assigned':
      return `${SOURCE_LABELS[cell.source]}${cell.graded ? ', graded (cannot be removed)' : ', not graded yet'}${cell.expertiseMatch ? ', expertise matches' : ''}`;
    case 'conflict':
      return `Conflict declared: ${cell.reason}`;
    case 'ineligible':
      return `Cannot review: ${cell.label}`;
    case 'free':
      return cell.expertiseMatch ? 'Not assigned; expertise matches' : 'Not assigned';
  }
}

/**
 * /review/manage/:cycleId/panels/:panelId: the assignment matrix of one panel. Rows are the
 * panel's proposals, columns its members; each cell a checkbox (disabled with the reason when
 * the reviewer cannot review the proposal, or when a grade exists). Each row counts its
 * reviewers against the k the cycle asks; the footer shows each reviewer's load.
 */
@Component({
  selector: 'app-panel-matrix',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    LoadStatus,
    MatButton,
    MatCell,
    MatCellDef,
    MatCheckbox,
    MatColumnDef,
    MatFooterCell,
    MatFooterCellDef,
    MatFooterRow,
    MatFooterRowDef,
    MatHeaderCell,
    MatHeaderCellDef,
    MatHeaderRow,
    MatHeaderRowDef,
    MatIcon,
    MatProgressBar,
    MatRow,
    MatRowDef,
    MatTable,
    MatTooltip,
    RouterLink,
    UtcInstantPipe,
  ],
  templateUrl: './panel-matrix.html',
  styleUrl: './panel-matrix.scss',
})
export default class PanelMatrix {
  private readonly api = inject(ReviewAdminApi);
  /** Route parameters. */
  readonly cycleId = input.required<string>();
  readonly panelId = input.required<string>();
  private readonly id = computed(() => {
    const id = Number(this.panelId());
    return Number.isInteger(id) && id > 0 ? id : null;
  });

  protected readonly matrix = this.api.matrixResource(this.id);
  protected readonly data = computed<AssignmentMatrix | null>(() => (this.matrix.hasValue() ? this.matrix.value() : null));
  protected readonly columns = computed(() => ['proposal', 'count', ...(this.data()?.reviewers ?? []).map((r) => `r${r.id}`)]);
  protected readonly busyCell = signal<string | null>(null);
  protected readonly running = signal(false);
  protected readonly result = signal<string | null>(null);
  protected readonly problem = signal<string | null>(null);
  protected readonly describe = describeCell;

  protected readonly error = computed(() => {
    if (this.id() === null) return 'There is no panel at this address.';
    return loadErrorText(this.matrix.error(), 'The assignment matrix could not be loaded.');
  });
  protected readonly empty = computed(() => {
    const d = this.data();
    return d !== null && (d.proposals.length === 0 || d.reviewers.length === 0);
  });
  protected readonly emptyText = computed(() =>
    this.data()?.reviewers.length === 0
      ? 'This panel has no members yet.'
      : 'No proposal is in this panel yet. Put proposals in it on the cycle page.',
  );

  protected cellAt(row: MatrixProposal, index: number): MatrixCell {
    return row.cells[index];
  }

  protected disabled(cell: MatrixCell): boolean {
    const d = this.data();
    return (
      !!d?.panel.standingLocked || cell.state === 'conflict' || cell.state === 'ineligible' || (cell.state === 'assigned' && cell.graded)
    );
  }

  protected cellLabel(row: MatrixProposal, reviewer: MatrixReviewer, cell: MatrixCell): string {
    return `${reviewer.displayName} for “${row.title}”: ${describeCell(cell)}`;
  }

  protected toggle(row: MatrixProposal, reviewer: MatrixReviewer, assigned: boolean): void {
    const panelId = this.id();
    if (panelId === null) return;
    this.busyCell.set(`${row.id}:${reviewer.id}`);
    this.problem.set(null);
    this.api.toggleAssignment(panelId, { proposalId: row.id, reviewerId: reviewer.id, assigned }).subscribe({
      next: (m) => {
        this.busyCell.set(null);
        this.matrix.set(m);
      },
      error: (err: unknown) => {
        this.busyCell.set(null);
        this.problem.set(readApiError(err).message);
        this.matrix.reload();
      },
    });
  }

  protected assignAutomatically(): void {
    const panelId = this.id();
    if (panelId === null) return;
    this.running.set(true);
    this.result.set(null);
    this.problem.set(null);
    this.api.assignAutomatically(panelId).subscribe({
      next: (r) => {
        this.running.set(false);
        this.matrix.set(r.matrix);
        const matches = r.expertiseMatches;
        this.result.set(
          `Done: ${r.added} new ${r.added === 1 ? 'assignment' : 'assignments'}, ${r.removed} removed; ${matches} ${matches === 1 ? 'assignment matches' : 'assignments match'} the reviewer's expertise.`,
        );
      },
      error: (err: unknown) => {
        this.running.set(false);
        this.problem.set(readApiError(err).message);
      },
    });
  }
}
