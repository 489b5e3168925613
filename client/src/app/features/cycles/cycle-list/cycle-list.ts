import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatChip, MatChipSet } from '@angular/material/chips';
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
import { RouterLink } from '@angular/router';
import type { CallStatus, CycleSummary } from '@spincycle/shared/facility/facility-types';
import { loadErrorText } from '../../../core/http/api-error-message';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { sortRows, SortValue } from '../../../ui/table/sort-rows';
import { DayPipe, LocalInstantPipe, UtcInstantPipe } from '../../../ui/time/date-pipes';
import { CycleAdminApi } from '../cycle-admin-api';

export const CALL_STATUS_LABELS: Record<CallStatus, string> = {
  upcoming: 'Upcoming',
  open: 'Call open',
  closed: 'Call closed',
};

const COLUMNS = ['code', 'title', 'callOpensAt', 'callClosesAt', 'campaign', 'status', 'nodes', 'actions'] as const;

function cycleValue(cycle: CycleSummary, column: string): SortValue {
  switch (column) {
    case 'code':
      return cycle.code;
    case 'title':
      return cycle.title;
    case 'callOpensAt':
      return Date.parse(cycle.callOpensAt);
    case 'callClosesAt':
      return Date.parse(cycle.callClosesAt);
    case 'campaign':
      return cycle.campaignStart;
    case 'status':
      return cycle.status;
    case 'nodes':
      return cycle.nodes.reduce((sum, n) => sum + n.nodeHoursAvailable, 0);
    default:
      return null;
  }
}

/** The facility manager's cycles: every call with its deadlines (in UTC, and on the person's clock when it differs), campaign and capacity. */
@Component({
  selector: 'app-cycle-list',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    DayPipe,
    DecimalPipe,
    LoadStatus,
    LocalInstantPipe,
    MatButton,
    MatCell,
    MatCellDef,
    MatChip,
    MatChipSet,
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
    RouterLink,
    UtcInstantPipe,
  ],
  templateUrl: './cycle-list.html',
  styleUrl: './cycle-list.scss',
})
export default class CycleList {
  protected readonly cycles = inject(CycleAdminApi).listResource();
  protected readonly columns = COLUMNS;
  /** Widened for the table's untyped row context. */
  protected readonly statusLabels: Readonly<Record<string, string>> = CALL_STATUS_LABELS;
  protected readonly sort = signal<Sort>({ active: 'callClosesAt', direction: 'desc' });

  private readonly list = computed(() => (this.cycles.hasValue() ? this.cycles.value() : []));
  protected readonly rows = computed(() => sortRows(this.list(), this.sort(), cycleValue));
  protected readonly error = computed(() => loadErrorText(this.cycles.error(), 'The cycles could not be loaded.'));
  protected readonly empty = computed(() => this.cycles.hasValue() && this.list().length === 0);
}
