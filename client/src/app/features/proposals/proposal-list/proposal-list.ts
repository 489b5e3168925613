import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIcon } from '@angular/material/icon';
import { MatSort, MatSortHeader, Sort } from '@angular/material/sort';
import {
  MatCell,
  MatCellDef,
  MatColumnDef,
  MatHeaderCell,
  MatHeaderCellDef,
  MatHeaderRow,
  MatHeaderRowDef,
  MatRow,
  MatRowDef,
  MatTable,
} from '@angular/material/table';
import { Router, RouterLink } from '@angular/router';
import type { Proposal, ProposalSummary } from '@spincycle/shared/proposals/proposal-schemas';
import { SessionAuth } from '../../../core/auth/session-auth';
import { loadErrorText } from '../../../core/http/api-error-message';
import { Clock } from '../../../core/time/clock';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { sortRows, SortValue } from '../../../ui/table/sort-rows';
import { describeCountdown } from '../../../ui/time/countdown';
import { NewProposalDialog } from '../new-proposal-dialog/new-proposal-dialog';
import { ProposalApi } from '../proposal-api';
import { ProposalStateChip } from '../proposal-state-chip/proposal-state-chip';
import { UtcInstantPipe } from '../../../ui/time/date-pipes';

export const MEMBER_ROLE_LABELS = { pi: 'PI', coi: 'Co-investigator' } as const;

const COLUMNS = ['title', 'cycle', 'state', 'role', 'targets', 'hours', 'updated', 'closes'] as const;

function summaryValue(row: ProposalSummary, column: string): SortValue {
  switch (column) {
    case 'title':
      return row.title;
    case 'cycle':
      return row.cycleCode;
    case 'state':
      return row.state;
    case 'role':
      return row.myRole;
    case 'targets':
      return row.targetCount;
    case 'hours':
      return row.requestedNodeHours;
    case 'updated':
      return Date.parse(row.updatedAt);
    case 'closes':
      return Date.parse(row.callClosesAt);
    default:
      return null;
  }
}

/** /proposals: the person's own proposals, and the start of a new one. */
@Component({
  selector: 'app-proposal-list',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    UtcInstantPipe,
    DecimalPipe,
    LoadStatus,
    MatButton,
    MatCell,
    MatCellDef,
    MatColumnDef,
    MatHeaderCell,
    MatHeaderCellDef,
    MatHeaderRow,
    MatHeaderRowDef,
    MatIcon,
    MatRow,
    MatRowDef,
    MatSort,
    MatSortHeader,
    MatTable,
    ProposalStateChip,
    RouterLink,
  ],
  templateUrl: './proposal-list.html',
  styleUrl: './proposal-list.scss',
})
export default class ProposalList {
  private readonly dialog = inject(MatDialog);
  private readonly router = inject(Router);
  private readonly clock = inject(Clock);
  private readonly auth = inject(SessionAuth);

  protected readonly proposals = inject(ProposalApi).listResource();
  protected readonly columns = COLUMNS;
  /** Widened for the table's untyped row context. */
  protected readonly roleLabels: Readonly<Record<string, string>> = MEMBER_ROLE_LABELS;
  protected readonly sort = signal<Sort>({ active: 'updated', direction: 'desc' });
  protected readonly canPropose = computed(() => this.auth.user() !== null && this.auth.hasRole('proposer'));

  private readonly list = computed(() => (this.proposals.hasValue() ? this.proposals.value() : []));
  protected readonly rows = computed(() => sortRows(this.list(), this.sort(), summaryValue));
  protected readonly error = computed(() => loadErrorText(this.proposals.error(), 'Your proposals could not be loaded.'));
  protected readonly empty = computed(() => this.proposals.hasValue() && this.list().length === 0);

  /** "in 12 days" / "3 days ago" for a call's closing. */
  protected countdown(iso: string): string {
    return describeCountdown(iso, this.clock.now());
  }

  protected isClosed(iso: string): boolean {
    return Date.parse(iso) <= this.clock.now();
  }

  protected openNewProposal(): void {
    this.dialog
      .open<NewProposalDialog, void, Proposal>(NewProposalDialog, { width: '520px', autoFocus: 'first-tabbable' })
      .afterClosed()
      .subscribe((proposal) => {
        if (proposal) void this.router.navigate(['/proposals', proposal.id]);
      });
  }
}
