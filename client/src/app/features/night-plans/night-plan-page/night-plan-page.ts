import { DecimalPipe } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  DestroyRef,
  effect,
  inject,
  input,
  LOCALE_ID,
  signal,
  untracked,
} from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatTab, MatTabContent, MatTabGroup } from '@angular/material/tabs';
import { RouterLink } from '@angular/router';
import type { NightPlanBuildStatus, NightPlanNode, NightPlanOverview } from '@spincycle/shared/night-plans/night-plans';
import { loadErrorText, readApiError } from '../../../core/http/api-error-message';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { DayPipe, UtcInstantPipe } from '../../../ui/time/date-pipes';
import { CalendarLinkDialog, type CalendarLinkDialogData } from '../calendar-link-dialog/calendar-link-dialog';
import { ExecutionUpload } from '../execution-upload/execution-upload';
import { NightDialog, type NightDialogData } from '../night-dialog/night-dialog';
import { buildPercent, buildWords, isBuildActive, programColours } from '../night-plan-format';
import { NIGHT_PLAN_POLL_MS, NightPlansApi } from '../night-plans-api';
import { NodeTimeline } from '../node-timeline/node-timeline';
import { ProgramsTable } from '../programs-table/programs-table';

/** Consecutive failed progress reads after which the page stops asking. */
const MAX_POLL_FAILURES = 5;

/**
 * /night-plans/:cycleId, for facility managers: the night plans of one released cycle. Build
 * (or re-build) them with a progress bar; each node's nights a month at a time, a night's plan
 * in a dialog (mark visits done or missed, mark the night lost); each program's progress and
 * science yield; the execution log upload; the plan's CSV and calendar per node, and its
 * calendar subscription link (in a dialog).
 */
@Component({
  selector: 'app-night-plan-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    DayPipe,
    DecimalPipe,
    ExecutionUpload,
    LoadStatus,
    MatButton,
    MatIcon,
    MatProgressBar,
    MatTab,
    MatTabContent,
    MatTabGroup,
    NodeTimeline,
    ProgramsTable,
    RouterLink,
    UtcInstantPipe,
  ],
  templateUrl: './night-plan-page.html',
  styleUrl: './night-plan-page.scss',
})
export default class NightPlanPage {
  /** Route parameter. */
  readonly cycleId = input.required<string>();
  private readonly api = inject(NightPlansApi);
  private readonly dialog = inject(MatDialog);
  private readonly locale = inject(LOCALE_ID);
  private readonly pollMs = inject(NIGHT_PLAN_POLL_MS);

  protected readonly id = computed(() => {
    const id = Number(this.cycleId());
    return Number.isInteger(id) && id > 0 ? id : null;
  });
  protected readonly overview = this.api.overviewResource(this.id);
  protected readonly data = computed<NightPlanOverview | null>(() => (this.overview.hasValue() ? this.overview.value() : null));
  protected readonly error = computed(() => {
    if (this.id() === null) return 'There is no cycle at this address.';
    return loadErrorText(this.overview.error(), 'The night plans could not be loaded.');
  });

  /** The newest build known: from the overview, then from starting one and from polling. */
  protected readonly build = signal<NightPlanBuildStatus | null>(null);
  protected readonly active = computed(() => isBuildActive(this.build()));
  protected readonly percent = computed(() => {
    const b = this.build();
    return b ? buildPercent(b) : 0;
  });
  protected readonly words = computed(() => {
    const b = this.build();
    return b ? buildWords(b, this.locale) : '';
  });
  protected readonly starting = signal(false);
  protected readonly buildError = signal<string | null>(null);
  protected readonly pollError = signal<string | null>(null);
  /** Bumped to make the timelines read their month again. */
  protected readonly refresh = signal(0);

  protected readonly colours = computed(() => programColours(this.data()?.programs ?? []));
  protected readonly titles = computed(() => new Map((this.data()?.programs ?? []).map((p) => [p.proposalId, p.title])));

  private timer: ReturnType<typeof setTimeout> | null = null;
  private pollFailures = 0;

  constructor() {
    effect(() => {
      const fromOverview = this.data()?.build ?? null;
      untracked(() => {
        const known = this.build();
        if (!known || !fromOverview || fromOverview.id >= known.id) this.build.set(fromOverview ?? known);
      });
    });
    effect(() => {
      if (this.active()) untracked(() => this.schedulePoll());
      // Track the build itself, so that each new status schedules the next read.
      this.build();
    });
    inject(DestroyRef).onDestroy(() => this.stopPolling());
  }

  private schedulePoll(): void {
    if (this.timer !== null) return;
    this.timer = setTimeout(() => {
      this.timer = null;
      this.poll();
    }, this.pollMs);
  }

  private stopPolling(): void {
    if (this.timer !== null) clearTimeout(this.timer);
    this.timer = null;
  }

  private poll(): void {
    const id = this.id();
    if (id === null || !this.active()) return;
    this.api.latestBuild(id).subscribe({
      next: (b) => {
        this.pollFailures = 0;
        this.pollError.set(null);
        const before = this.build();
        if (!b) return;
        this.build.set(b);
        if (isBuildActive(before) && !isBuildActive(b)) this.finished(b);
        else if (isBuildActive(b)) this.schedulePoll();
      },
      error: (err: unknown) => {
        this.pollFailures += 1;
        if (this.pollFailures >= MAX_POLL_FAILURES) {
          this.pollError.set(`The progress could not be read: ${readApiError(err).message} Reload the page to see how the build went.`);
          return;
        }
        this.schedulePoll();
      },
    });
  }

  /** A build or re-plan ended: its numbers are in the overview and the nights. */
  private finished(b: NightPlanBuildStatus): void {
    if (b.state === 'done') {
      this.overview.reload();
      this.refresh.update((n) => n + 1);
    }
  }

  protected startBuild(): void {
    const id = this.id();
    if (id === null || this.starting() || this.active()) return;
    this.starting.set(true);
    this.buildError.set(null);
    this.api.build(id).subscribe({
      next: (b) => {
        this.starting.set(false);
        this.track(b);
      },
      error: (err: unknown) => {
        this.starting.set(false);
        this.buildError.set(`The build was not started. ${readApiError(err).message}`);
      },
    });
  }

  /** Follows a build or re-plan just queued. */
  private track(b: NightPlanBuildStatus): void {
    this.pollFailures = 0;
    this.pollError.set(null);
    this.build.set(b);
    if (!isBuildActive(b)) this.finished(b);
  }

  protected openNight(node: NightPlanNode, date: string): void {
    const id = this.id();
    if (id === null) return;
    const data: NightDialogData = {
      cycleId: id,
      nodeId: node.nodeId,
      nodeCode: node.code,
      date,
      colours: this.colours(),
      changed: () => {
        this.overview.reload();
        this.refresh.update((n) => n + 1);
      },
      replanned: (b) => {
        this.refresh.update((n) => n + 1);
        this.track(b);
      },
    };
    this.dialog.open(NightDialog, { data, width: '1000px', maxWidth: '96vw', autoFocus: 'dialog' });
  }

  protected uploaded(): void {
    this.overview.reload();
    this.refresh.update((n) => n + 1);
  }

  protected openCalendarLink(node: NightPlanNode): void {
    const id = this.id();
    if (id === null) return;
    const data: CalendarLinkDialogData = { cycleId: id, nodeId: node.nodeId, nodeCode: node.code };
    this.dialog.open(CalendarLinkDialog, { data, width: '640px', maxWidth: '96vw', autoFocus: 'dialog' });
  }

  protected exports(nodeId: number): { csv: string; ics: string } {
    return this.api.exportUrls(this.id() ?? 0, nodeId);
  }
}
