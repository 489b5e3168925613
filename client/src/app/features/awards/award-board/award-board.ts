import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, LOCALE_ID, signal, untracked } from '@angular/core';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatOption } from '@angular/material/core';
import { MatDialog } from '@angular/material/dialog';
import { MatFormField, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSelect } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTab, MatTabGroup } from '@angular/material/tabs';
import { MatTooltip } from '@angular/material/tooltip';
import { RouterLink } from '@angular/router';
import {
  AWARD_OUTCOME_LABELS,
  AWARD_OUTCOMES,
  PROGRAM_STATE_LABELS,
  type AwardBoard,
  type AwardBoardRow,
  type AwardInput,
  type AwardNodeCapacity,
  type AwardOutcome,
  type ReleaseResult,
  type StaleAwardBody,
} from '@spincycle/shared/awards/awards';
import { loadErrorText, readApiError } from '../../../core/http/api-error-message';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { DayPipe, LocalInstantPipe, UtcInstantPipe } from '../../../ui/time/date-pipes';
import { formatHours } from '../../../ui/units/format-units';
import { AwardAudit } from '../award-audit/award-audit';
import { AwardCapacity } from '../award-capacity/award-capacity';
import { CapacityDialog, type CapacityDialogData } from '../award-dialogs/capacity-dialog';
import { ReleaseDialog, type ReleaseDialogData } from '../award-dialogs/release-dialog';
import { TargetsDialog, type TargetsDialogData, type TargetsDialogResult } from '../award-dialogs/targets-dialog';
import { AwardsApi } from '../awards-api';
import { AwardDraft, draftFieldErrors, draftRequest, nodeKey, nodesLeft, rowNodes, type NodeLeft } from './award-draft';

/** One ranked proposal on the page: the row as read, its draft, and the nodes it can get hours on. */
export interface BoardRowView {
  row: AwardBoardRow;
  draft: AwardDraft;
  nodes: AwardNodeCapacity[];
}

/** The rows of one panel, in standing order. */
interface PanelGroup {
  panelId: number;
  panelName: string;
  rows: BoardRowView[];
}

const STALE_MESSAGE =
  'Someone else changed this decision meanwhile. The row now shows the stored decision; make your change again if it still applies.';

/** `1 team` / `3 teams`. */
function count(n: number, one: string, many: string): string {
  return `${n} ${n === 1 ? one : many}`;
}

/** The sentence the snackbar gives after a release. */
export function releaseSummary(result: Pick<ReleaseResult, 'mailed' | 'mailFailures' | 'programsCreated'>): string {
  const parts = [`${count(result.mailed, 'team', 'teams')} mailed`, `${count(result.programsCreated, 'program', 'programs')} created`];
  if (result.mailFailures) {
    parts.splice(1, 0, `${count(result.mailFailures, 'mail', 'mails')} not sent yet (tried again automatically)`);
  }
  return `Decisions released: ${parts.join(', ')}.`;
}

/**
 * /awards/:cycleId, for facility managers: the award board of one cycle. Capacity per node at
 * the top; the panels whose standing is not locked yet; the ranked proposals by panel and
 * standing position, each with its decision (outcome, node-hours per node, targets of a
 * partial award), what the decision leaves on each node, and its own Save (Enter in an hours
 * field saves the row); the release of the decisions to the teams; and the audit log.
 */
@Component({
  selector: 'app-award-board',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    AwardAudit,
    AwardCapacity,
    DayPipe,
    DecimalPipe,
    LoadStatus,
    LocalInstantPipe,
    MatButton,
    MatFormField,
    MatIcon,
    MatIconButton,
    MatInput,
    MatLabel,
    MatOption,
    MatProgressBar,
    MatSelect,
    MatSuffix,
    MatTab,
    MatTabGroup,
    MatTooltip,
    RouterLink,
    UtcInstantPipe,
  ],
  templateUrl: './award-board.html',
  styleUrl: './award-board.scss',
})
export default class AwardBoardPage {
  /** Route parameter. */
  readonly cycleId = input.required<string>();
  private readonly api = inject(AwardsApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly locale = inject(LOCALE_ID);

  protected readonly id = computed(() => {
    const id = Number(this.cycleId());
    return Number.isInteger(id) && id > 0 ? id : null;
  });

  protected readonly board = this.api.boardResource(this.id);
  protected readonly data = computed<AwardBoard | null>(() => (this.board.hasValue() ? this.board.value() : null));
  private readonly auditWanted = signal(false);
  protected readonly audit = this.api.auditResource(() => (this.auditWanted() ? this.id() : null));
  protected readonly auditEntries = computed(() => (this.audit.hasValue() ? this.audit.value() : null));

  protected readonly outcomes = AWARD_OUTCOMES;
  protected readonly outcomeLabels = AWARD_OUTCOME_LABELS;
  protected readonly programLabels = PROGRAM_STATE_LABELS;

  /** The drafts by proposal id; kept across reads so that unsaved edits survive another row's save. */
  private readonly drafts = signal<ReadonlyMap<number, AwardDraft>>(new Map());
  /** Rows to show as stored at the next read (someone else changed them). */
  private readonly staleRows = new Set<number>();

  protected readonly releasing = signal(false);
  protected readonly releaseError = signal<string | null>(null);

  protected readonly error = computed(() => {
    if (this.id() === null) return 'There is no cycle at this address.';
    return loadErrorText(this.board.error(), 'The award board could not be loaded.');
  });
  protected readonly auditError = computed(() => loadErrorText(this.audit.error(), 'The audit log could not be loaded.'));

  protected readonly nodes = computed(() => this.data()?.nodes ?? []);
  protected readonly nodeCodes = computed(() => new Map(this.nodes().map((n) => [n.nodeId, n.code])));
  protected readonly openPanels = computed(() => (this.data()?.panels ?? []).filter((p) => !p.standingLocked));

  protected readonly groups = computed<PanelGroup[]>(() => {
    const board = this.data();
    const drafts = this.drafts();
    if (!board) return [];
    const groups: PanelGroup[] = [];
    for (const row of board.rows) {
      const draft = drafts.get(row.proposalId);
      if (!draft) continue;
      let group = groups.find((g) => g.panelId === row.panelId);
      if (!group) {
        group = { panelId: row.panelId, panelName: row.panelName, rows: [] };
        groups.push(group);
      }
      group.rows.push({ row, draft, nodes: rowNodes(row, board.nodes) });
    }
    for (const g of groups) g.rows.sort((a, b) => a.row.position - b.row.position);
    return groups;
  });

  /** Rows whose edits are not stored (they hold back the release). */
  protected readonly unsaved = computed(() => this.groups().reduce((n, g) => n + g.rows.filter((r) => r.draft.isUnsaved()).length, 0));
  /** After the release: decisions whose team has not been told (the mail failed). */
  protected readonly unsent = computed(() => (this.data()?.rows ?? []).filter((r) => r.award && !r.award.mailedAt).length);
  /** Panels holding proposals whose standing is not locked: the release waits for them. */
  protected readonly waitingPanels = computed(() => this.openPanels().filter((p) => p.proposals > 0));

  constructor() {
    effect(() => {
      const board = this.data();
      if (board) untracked(() => this.syncDrafts(board));
    });
  }

  /**
   * Keeps a draft per ranked proposal: a new row gets one; a row whose stored decision changed
   * shows it, unless the manager is editing it (their edits stay, and a save then meets the
   * version check); a row someone else changed under a save shows the stored decision.
   */
  private syncDrafts(board: AwardBoard): void {
    const current = this.drafts();
    const next = new Map<number, AwardDraft>();
    for (const row of board.rows) {
      let draft = current.get(row.proposalId);
      const version = row.award?.version ?? 0;
      if (!draft) {
        draft = new AwardDraft(row);
      } else if (this.staleRows.has(row.proposalId)) {
        draft.resetFrom(row);
        draft.state.set('stale');
        draft.message.set(STALE_MESSAGE);
      } else if (draft.baseVersion !== version && !draft.isUnsaved()) {
        draft.resetFrom(row);
      }
      this.staleRows.delete(row.proposalId);
      next.set(row.proposalId, draft);
    }
    this.drafts.set(next);
  }

  protected onTab(index: number): void {
    if (index === 1) this.auditWanted.set(true);
  }

  // ---- one row ---------------------------------------------------------------------------------

  protected chooseOutcome(view: BoardRowView, outcome: AwardOutcome): void {
    view.draft.chooseOutcome(outcome, view.row, this.nodes());
  }

  protected typeHours(view: BoardRowView, nodeId: number, event: Event): void {
    view.draft.setHours(nodeId, (event.target as HTMLInputElement).value);
  }

  protected hoursError(view: BoardRowView, nodeId: number): string | null {
    return view.draft.fieldErrors()[nodeKey(nodeId)] ?? null;
  }

  protected requestOn(view: BoardRowView, nodeId: number): number {
    return view.row.requests.find((r) => r.nodeId === nodeId)?.requestedHours ?? 0;
  }

  /** The hours the saved targets of a partial award need on a node, when they differ from the request. */
  protected neededOn(view: BoardRowView, nodeId: number): number | null {
    if (!view.row.award?.targetIds) return null;
    const request = view.row.requests.find((r) => r.nodeId === nodeId);
    return request && request.neededForAwardedTargets !== request.requestedHours ? request.neededForAwardedTargets : null;
  }

  protected left(view: BoardRowView): NodeLeft[] {
    return nodesLeft(view.draft, view.row, this.nodes());
  }

  /** "leaves 102.5 h of 620 h on NODE-A", or the overrun in words. */
  protected leftText(left: NodeLeft, outcome: AwardOutcome | null): string {
    const offered = formatHours(left.offeredHours, this.locale);
    const text =
      left.leftHours < 0
        ? `takes ${left.code} ${formatHours(-left.leftHours, this.locale)} past its ${offered}`
        : `leaves ${formatHours(left.leftHours, this.locale)} of ${offered} on ${left.code}`;
    return outcome === 'reserve' ? `if promoted, ${text}` : text;
  }

  protected targetsText(view: BoardRowView): string {
    const chosen = view.draft.targetIds();
    return chosen === null ? `All ${view.row.targetCount}` : `${chosen.length} of ${view.row.targetCount}`;
  }

  protected chooseTargets(view: BoardRowView): void {
    const data: TargetsDialogData = { title: view.row.title, targets: view.row.targets, selected: view.draft.targetIds() };
    this.dialog
      .open<TargetsDialog, TargetsDialogData, TargetsDialogResult>(TargetsDialog, { data, width: '560px' })
      .afterClosed()
      .subscribe((result) => {
        if (result) view.draft.setTargets(result.targetIds);
      });
  }

  protected undo(view: BoardRowView): void {
    view.draft.resetFrom(view.row);
  }

  protected save(view: BoardRowView): void {
    const draft = view.draft;
    if (draft.state() === 'saving') return;
    const request = draftRequest(draft, view.row, this.nodes());
    if (request.errors) {
      draft.fieldErrors.set(request.errors);
      draft.state.set('failed');
      draft.message.set(request.errors['row'] ?? 'Not saved: see the message beside the field.');
      return;
    }
    this.send(view, request.input);
  }

  private send(view: BoardRowView, input: AwardInput): void {
    const draft = view.draft;
    draft.state.set('saving');
    draft.message.set(null);
    draft.fieldErrors.set({});
    this.api.decide(view.row.proposalId, input).subscribe({
      next: (board) => this.saved(view.row.proposalId, board, input),
      error: (err: unknown) => this.refused(view, input, err),
    });
  }

  private saved(proposalId: number, board: AwardBoard, input: AwardInput): void {
    const draft = this.drafts().get(proposalId);
    const row = board.rows.find((r) => r.proposalId === proposalId);
    if (draft && row) {
      draft.resetFrom(row);
      draft.state.set('saved');
      draft.message.set(input.overrideReason ? 'Saved past capacity, with your reason.' : 'Saved.');
    }
    this.board.set(board);
    if (this.auditWanted()) this.audit.reload();
  }

  private refused(view: BoardRowView, input: AwardInput, err: unknown): void {
    const draft = view.draft;
    const body = readApiError(err);
    if (body.code === 'capacity_exceeded' && input.overrideReason === null) {
      this.askOverride(view, input, body.fieldErrors, body.message);
      return;
    }
    if (body.code === 'stale_version') {
      const current = (body as Partial<StaleAwardBody>).row;
      if (current?.proposalId === view.row.proposalId) {
        // The answer carries the row as it is now: show it at once.
        draft.resetFrom(current);
        draft.state.set('stale');
        draft.message.set(STALE_MESSAGE);
        this.board.update((b) => b && { ...b, rows: b.rows.map((r) => (r.proposalId === current.proposalId ? current : r)) });
      } else {
        this.staleRows.add(view.row.proposalId);
        draft.message.set('Someone else changed this decision meanwhile: reading it again…');
      }
      // The other change moved the capacity too.
      this.board.reload();
      return;
    }
    const fields = draftFieldErrors(body.fieldErrors, input);
    const onFields = Object.keys(fields).some((k) => k !== 'row');
    draft.fieldErrors.set(fields);
    draft.state.set('failed');
    draft.message.set(onFields ? `Not saved: ${fields['row'] ?? 'see the message beside the field.'}` : `Not saved: ${body.message}`);
  }

  /** A 409 capacity_exceeded: names the nodes and asks the reason to go past capacity, then sends again with it. */
  private askOverride(view: BoardRowView, input: AwardInput, fieldErrors: Record<string, string[]> | undefined, message: string): void {
    const draft = view.draft;
    const fields = draftFieldErrors(fieldErrors, input);
    const codes = this.nodeCodes();
    const messages = input.nodes
      .map((n) => {
        const text = fields[nodeKey(n.nodeId)];
        const code = codes.get(n.nodeId) ?? 'A node';
        // The server's sentence usually names the node already.
        return text ? (text.includes(code) ? text : `${code}: ${text}`) : null;
      })
      .filter((m): m is string => m !== null);
    const data: CapacityDialogData = { title: view.row.title, messages: messages.length ? messages : [message] };
    this.dialog
      .open<CapacityDialog, CapacityDialogData, string>(CapacityDialog, { data, width: '560px' })
      .afterClosed()
      .subscribe((reason) => {
        if (reason) {
          this.send(view, { ...input, overrideReason: reason });
          return;
        }
        draft.fieldErrors.set(fields);
        draft.state.set('failed');
        draft.message.set('Not saved: the award would take a node past its capacity.');
      });
  }

  // ---- release ----------------------------------------------------------------------------------

  protected release(): void {
    const board = this.data();
    const cycleId = this.id();
    if (!board || cycleId === null || this.releasing()) return;
    const outcomes = board.rows.map((r) => r.award?.outcome);
    const data: ReleaseDialogData = {
      cycleCode: board.cycle.code,
      awarded: outcomes.filter((o) => o === 'awarded').length,
      reserve: outcomes.filter((o) => o === 'reserve').length,
      notAwarded: outcomes.filter((o) => o === 'not_awarded').length,
    };
    this.dialog
      .open<ReleaseDialog, ReleaseDialogData, boolean>(ReleaseDialog, { data, width: '600px' })
      .afterClosed()
      .subscribe((confirmed) => {
        if (confirmed !== true) return;
        this.releasing.set(true);
        this.releaseError.set(null);
        this.api.release(cycleId, { confirm: true }).subscribe({
          next: (result) => {
            this.releasing.set(false);
            this.board.set(result.board);
            if (this.auditWanted()) this.audit.reload();
            this.snackBar.open(releaseSummary(result), 'Dismiss', { duration: 12000 });
          },
          error: (err: unknown) => {
            this.releasing.set(false);
            this.releaseError.set(`The decisions were not released. ${readApiError(err).message}`);
          },
        });
      });
  }
}
