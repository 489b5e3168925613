import { DecimalPipe, PercentPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
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
import type { CycleProposalItem } from '@spincycle/shared/cycles/cycle-proposals';
import { loadErrorText } from '../../../core/http/api-error-message';
import { CapacityMeter } from '../../../ui/capacity-meter/capacity-meter';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { sortRows, SortValue } from '../../../ui/table/sort-rows';
import { LocalInstantPipe, UtcInstantPipe } from '../../../ui/time/date-pipes';
import { ProposalStateChip } from '../../proposals/proposal-state-chip/proposal-state-chip';
import { CycleAdminApi } from '../cycle-admin-api';

// The request (and its flags) right after the title, so that it is in view first on a phone.
const COLUMNS = ['title', 'request', 'total', 'state', 'pi', 'submittedAt'] as const;

/** The bars' scale never runs past 200 %: a higher pressure fills the track and is marked as beyond it. */
const MAX_SCALE = 2;

function proposalValue(p: CycleProposalItem, column: string): SortValue {
  switch (column) {
    case 'title':
      return p.title;
    case 'pi':
      return p.piName;
    case 'state':
      return p.state;
    case 'request':
      return p.overCapacity ? 1 : 0;
    case 'total':
      return p.totalNodeHours;
    case 'submittedAt':
      return p.submittedAt ? Date.parse(p.submittedAt) : null;
    default:
      return null;
  }
}

/**
 * The facility manager's view of one cycle's submitted proposals (/cycles/:id/proposals):
 * the pressure on each node (requested ÷ offered, as bars on one scale) and a table of the
 * proposals with what each asks per node against the node's capacity, overruns flagged.
 * Infeasible targets' node-hours are shown apart: they are not part of any request.
 */
@Component({
  selector: 'app-cycle-proposals',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    CapacityMeter,
    DecimalPipe,
    LoadStatus,
    LocalInstantPipe,
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
    PercentPipe,
    ProposalStateChip,
    RouterLink,
    UtcInstantPipe,
  ],
  templateUrl: './cycle-proposals.html',
  styleUrl: './cycle-proposals.scss',
})
export default class CycleProposals {
  /** Route parameter. */
  readonly id = input.required<string>();
  private readonly cycleId = computed(() => {
    const id = Number(this.id());
    return Number.isInteger(id) && id > 0 ? id : null;
  });

  protected readonly report = inject(CycleAdminApi).proposalsResource(this.cycleId);
  protected readonly data = computed(() => (this.report.hasValue() ? this.report.value() : null));
  protected readonly columns = COLUMNS;
  protected readonly sort = signal<Sort>({ active: 'submittedAt', direction: 'asc' });

  protected readonly rows = computed(() => sortRows(this.data()?.proposals ?? [], this.sort(), proposalValue));
  protected readonly nodes = computed(() => this.data()?.nodes ?? []);
  /** One scale for every node's bar: the highest pressure, at least 100 %. */
  protected readonly scaleMax = computed(() => Math.min(MAX_SCALE, Math.max(1, ...this.nodes().map((n) => n.pressure ?? 1))));
  protected readonly overNodes = computed(() =>
    this.nodes().filter((n) => (n.pressure === null ? n.requestedNodeHours > 0 : n.pressure > 1)),
  );
  protected readonly overProposals = computed(() => (this.data()?.proposals ?? []).filter((p) => p.overCapacity).length);

  protected readonly error = computed(() => {
    if (this.cycleId() === null) return 'There is no cycle at this address.';
    return loadErrorText(this.report.error(), 'The proposals of this cycle could not be loaded.');
  });
  protected readonly empty = computed(() => this.data() !== null && this.data()!.proposals.length === 0);
}
