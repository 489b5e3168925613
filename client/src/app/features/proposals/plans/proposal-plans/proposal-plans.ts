import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, linkedSignal, signal, untracked } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormField, MatLabel, MatPrefix } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatPaginator, PageEvent } from '@angular/material/paginator';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSlideToggle } from '@angular/material/slide-toggle';
import { MatSnackBar } from '@angular/material/snack-bar';
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
import { MatTooltip } from '@angular/material/tooltip';
import {
  PLAN_SORT_KEYS,
  type PlanListParams,
  type PlanRunStatus,
  type PlanTableQuantity,
  type ProposalPlans as ProposalPlansBody,
  type TargetPlanRow,
} from '@spincycle/shared/proposals/plan-types';
import type { NodeRequest } from '@spincycle/shared/proposals/proposal-schemas';
import { debounceTime, map } from 'rxjs';
import { loadErrorText, readApiError } from '../../../../core/http/api-error-message';
import { LoadStatus } from '../../../../ui/load-status/load-status';
import { pollWhileActive } from '../../../../ui/polling/poll-while-active';
import { reasonSentence } from '../../../../ui/text/reason-sentence';
import { FractionPercentPipe } from '../../../../ui/units/fraction-percent-pipe';
import { FeeWhyPipe } from '../../../../ui/units/fee-why-pipe';
import { MinorCurrencyPipe } from '../../../../ui/units/minor-currency-pipe';
import { ClusterChart, ClusterPointSelection } from '../cluster-chart/cluster-chart';
import { sharedAgeMyr } from '../cluster-chart/cluster-curves';
import { PlanApi } from '../plan-api';
import { PlanExplainDialog, type PlanExplainData } from '../plan-explain-dialog/plan-explain-dialog';
import { ProposalStore } from '../../proposal-store';
import { SkyWindowDialog, SkyWindowDialogData } from '../../targets/sky-window-dialog/sky-window-dialog';
import { TargetApi } from '../../targets/target-api';

/** How often the run's status is asked for while the plans are being computed. */
export const PLAN_POLL_MS = 1000;

/** The table's columns: every sortable one, in the order the server sorts by, then the actions. */
const COLUMNS = [...PLAN_SORT_KEYS, 'actions'] as const;

/** The quantity whose "why" a cell's tooltip shows. */
export const CELL_QUANTITY: Readonly<Record<string, string>> = {
  period: 'periodDays',
  amplitude: 'amplitudeRperPpm',
  precision: 'perVisitPrecisionPpm',
  exposure: 'exposureSeconds',
  visits: 'visits',
  completeness: 'completeness',
  visitsPerNight: 'visitsPerNight',
  cadence: 'nightStepDays',
  baseline: 'baselineDays',
  nodeHours: 'nodeHours',
  fee: 'feeMinor',
};

/** A run still in progress (the status is polled until it ends). */
const inProgress = (run: PlanRunStatus | null | undefined) => run?.state === 'queued' || run?.state === 'running';

/** The list query of the table's state: the column ids are the server's sort keys. */
export function planListParams(state: {
  pageIndex: number;
  pageSize: number;
  sort: Sort;
  text: string;
  infeasibleOnly: boolean;
}): PlanListParams {
  return {
    page: state.pageIndex + 1,
    pageSize: state.pageSize,
    sort: state.sort.direction && state.sort.active ? `${state.sort.direction === 'desc' ? '-' : ''}${state.sort.active}` : undefined,
    q: state.text || undefined,
    feasible: state.infeasibleOnly ? false : undefined,
  };
}

/**
 * The chance that a row's plan recovers the period (0–1), or null for a row that does not
 * carry it (plans stored before the completeness was part of the row).
 */
export function rowCompleteness(row: TargetPlanRow): number | null {
  const value = (row as TargetPlanRow & { completeness?: number | null }).completeness;
  return typeof value === 'number' && Number.isFinite(value) ? value : null;
}

/** Fee totals per currency (nodes may charge in different currencies). */
export function feeTotals(request: readonly NodeRequest[]): { currency: string; feeMinor: number }[] {
  const totals = new Map<string, number>();
  for (const r of request) totals.set(r.currency, (totals.get(r.currency) ?? 0) + r.feeMinor);
  return [...totals].map(([currency, feeMinor]) => ({ currency, feeMinor }));
}

/**
 * The plans tab: the target plans of every target on every requested node, the request per
 * node, the computation's progress (its status polled every second while it runs, the list
 * fetched again once it ends), one page at a time from the server, and for a coeval
 * target list the cluster chart. Each row explains its numbers and opens its sky window.
 */
@Component({
  selector: 'app-proposal-plans',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    ClusterChart,
    DecimalPipe,
    FractionPercentPipe,
    LoadStatus,
    MatButton,
    MatIconButton,
    MatCell,
    MatCellDef,
    MatColumnDef,
    MatFormField,
    MatHeaderCell,
    MatHeaderCellDef,
    MatHeaderRow,
    MatHeaderRowDef,
    MatIcon,
    MatInput,
    MatLabel,
    MatPaginator,
    MatPrefix,
    MatProgressBar,
    MatRow,
    MatRowDef,
    MatSlideToggle,
    MatSort,
    MatSortHeader,
    MatTable,
    MatTooltip,
    FeeWhyPipe,
    MinorCurrencyPipe,
    ReactiveFormsModule,
  ],
  templateUrl: './proposal-plans.html',
  styleUrl: './proposal-plans.scss',
})
export default class ProposalPlans {
  private readonly planApi = inject(PlanApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  protected readonly store = inject(ProposalStore);

  protected readonly targets = inject(TargetApi).listResource(() => this.store.id());

  protected readonly sort = signal<Sort>({ active: '', direction: '' });
  protected readonly filterControl = new FormControl('', { nonNullable: true });
  protected readonly onlyInfeasible = new FormControl(false, { nonNullable: true });
  private readonly filterText = toSignal(
    this.filterControl.valueChanges.pipe(
      debounceTime(200),
      map((text) => text.trim().toLowerCase()),
    ),
    { initialValue: '' },
  );
  private readonly infeasibleOnly = toSignal(this.onlyInfeasible.valueChanges, { initialValue: false });
  protected readonly pageSize = signal(25);
  /** Back to the first page whenever the filter or the sort changes. */
  protected readonly pageIndex = linkedSignal({
    source: () => ({ text: this.filterText(), infeasible: this.infeasibleOnly(), sort: this.sort() }),
    computation: () => 0,
  });

  /** Paged, filtered and sorted on the server: one request per page. */
  protected readonly plans = this.planApi.plansResource(() => {
    const proposalId = this.store.id();
    if (proposalId === null) return null;
    const params = planListParams({
      pageIndex: this.pageIndex(),
      pageSize: this.pageSize(),
      sort: this.sort(),
      text: this.filterText(),
      infeasibleOnly: this.infeasibleOnly(),
    });
    return { proposalId, params };
  });

  /** Every plan as a marker for the cluster chart (the list itself is paged). */
  protected readonly markers = this.planApi.markersResource(() => this.store.id());
  protected readonly markerRows = computed(() => (this.markers.hasValue() ? this.markers.value() : []));

  /** The last page received; kept while the next one is on its way or after a failed request. */
  protected readonly body = linkedSignal<ProposalPlansBody | undefined, ProposalPlansBody | null>({
    source: () => (this.plans.hasValue() ? this.plans.value() : undefined),
    computation: (next, previous) => next ?? previous?.value ?? null,
  });
  /** The run: from the list, then from each poll of the status while it is in progress. */
  protected readonly run = linkedSignal<PlanRunStatus | null>(() => this.body()?.run ?? null);
  protected readonly computing = computed(() => inProgress(this.run()));
  protected readonly percentDone = computed(() => {
    const run = this.run();
    return run && run.total > 0 ? Math.round((100 * run.done) / run.total) : 0;
  });
  protected readonly recomputing = signal(false);

  protected readonly columns = COLUMNS;
  protected readonly detailColumns = ['detail'];
  protected readonly cellQuantity = CELL_QUANTITY;

  protected readonly pageRows = computed(() => this.body()?.plans ?? []);
  protected readonly matched = computed(() => this.body()?.matched ?? 0);
  protected readonly planCount = computed(() => this.body()?.counts.plans ?? 0);
  protected readonly infeasibleCount = computed(() => this.body()?.counts.infeasible ?? 0);

  protected readonly request = computed(() => this.store.proposal()?.request ?? []);
  protected readonly capacity = computed(() => {
    const map = new Map<number, number>();
    for (const node of this.store.proposal()?.cycle.nodes ?? []) map.set(node.nodeId, node.nodeHoursAvailable);
    return map;
  });
  protected readonly totalHours = computed(() => this.request().reduce((sum, r) => sum + r.nodeHours, 0));
  protected readonly totalFees = computed(() => feeTotals(this.request()));

  protected readonly targetRows = computed(() => (this.targets.hasValue() ? this.targets.value() : []));
  /** The cluster chart is drawn only for a target list that shares one age. */
  protected readonly showCluster = computed(() => sharedAgeMyr(this.targetRows()) !== null);

  protected readonly error = computed(() => loadErrorText(this.plans.error(), 'The target plans could not be loaded.'));
  protected readonly empty = computed(() => this.body() !== null && this.planCount() === 0 && !this.computing());

  protected readonly isInfeasible = (_index: number, row: TargetPlanRow) => !row.feasible;
  protected readonly completenessOf = rowCompleteness;
  protected readonly reasonSentence = reasonSentence;

  constructor() {
    // While a run is in progress, poll its status (a few hundred bytes) every second; when it
    // ends, the list is fetched once.
    pollWhileActive({
      status: this.run,
      id: () => this.store.id(),
      active: inProgress,
      fetch: (id) => this.planApi.status(id),
      pauseMs: PLAN_POLL_MS,
      finished: () => {
        this.plans.reload();
        this.markers.reload();
      },
    });
    // The proposal's request per node comes from the stored plans: fetch it again whenever a
    // computation has finished since it was loaded (also one that finished before this tab
    // opened, e.g. right after a target upload).
    let seenFinishedAt: string | null | undefined;
    let wasComputing = false;
    effect(() => {
      const run = this.run();
      const computing = this.computing();
      if (run && !computing) {
        const ended = wasComputing || (run.finishedAt !== null && run.finishedAt !== seenFinishedAt);
        if (ended) untracked(() => this.store.refresh());
        seenFinishedAt = run.finishedAt;
      }
      wasComputing = computing;
    });
  }

  protected onPage(event: PageEvent): void {
    this.pageSize.set(event.pageSize);
    this.pageIndex.set(event.pageIndex);
  }

  protected recompute(): void {
    const id = this.store.id();
    if (id === null || this.recomputing()) return;
    this.recomputing.set(true);
    this.planApi.recompute(id).subscribe({
      next: (run) => {
        this.recomputing.set(false);
        this.run.set(run);
      },
      error: (error: unknown) => {
        this.recomputing.set(false);
        this.snackBar.open(`The plans were not recomputed: ${readApiError(error).message}`, 'Dismiss', { duration: 10000 });
      },
    });
  }

  protected why(row: TargetPlanRow, column: string): string {
    const key = CELL_QUANTITY[column];
    // The why lines travel by quantity key; a key the row does not carry gives no tooltip.
    return (key && (row.why as Partial<Record<PlanTableQuantity | string, string>>)[key]) || '';
  }

  protected explain(row: TargetPlanRow): void {
    this.dialog.open(PlanExplainDialog, {
      data: { proposalId: this.store.id()!, row } satisfies PlanExplainData,
      position: { right: '0', top: '0' },
      height: '100vh',
      width: 'min(560px, 100vw)',
      maxWidth: '100vw',
      panelClass: 'side-panel-dialog',
      ariaLabel: `Every number of the plan of ${row.targetName} on ${row.nodeCode}`,
    });
  }

  protected openSkyWindow(row: TargetPlanRow): void {
    this.openSkyWindowFor(row.targetId, row.nodeId);
  }

  protected onClusterPoint(selection: ClusterPointSelection): void {
    this.openSkyWindowFor(selection.targetId, selection.nodeIds[0]);
  }

  private openSkyWindowFor(targetId: number, nodeId: number | undefined): void {
    const proposalId = this.store.id();
    if (proposalId === null) return;
    const rows = this.pageRows().filter((row) => row.targetId === targetId);
    const target = this.targetRows().find((t) => t.id === targetId);
    const nodes = rows.length
      ? rows.map((row) => ({ nodeId: row.nodeId, nodeCode: row.nodeCode }))
      : (this.store.proposal()?.cycle.nodes ?? [])
          .filter((node) => this.store.proposal()?.nodeIds.includes(node.nodeId))
          .map((node) => ({ nodeId: node.nodeId, nodeCode: node.nodeCode }));
    if (!nodes.length) {
      this.snackBar.open('Request a node on the overview first: a sky window is seen from a node.', 'Dismiss');
      return;
    }
    const data: SkyWindowDialogData = {
      proposalId,
      targetId,
      targetName: rows[0]?.targetName ?? target?.name ?? `Target ${targetId}`,
      nodes,
      nodeId: nodeId ?? nodes[0].nodeId,
      verdicts: Object.fromEntries(rows.map((row) => [row.nodeId, row.skyVerdict])),
    };
    this.dialog.open(SkyWindowDialog, { data, width: '880px', maxWidth: '95vw' });
  }
}
