import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, LOCALE_ID, signal } from '@angular/core';
import { MatButton, MatIconButton } from '@angular/material/button';
import {
  MAT_DIALOG_DATA,
  MatDialog,
  MatDialogActions,
  MatDialogClose,
  MatDialogContent,
  MatDialogRef,
  MatDialogTitle,
} from '@angular/material/dialog';
import { MatIcon } from '@angular/material/icon';
import { MatTooltip } from '@angular/material/tooltip';
import {
  VISIT_STATUS_LABELS,
  type NightPlan,
  type NightPlanBuildStatus,
  type NightPlanVisit,
  type VisitStatus,
} from '@spincycle/shared/night-plans/night-plans';
import { loadErrorText, readApiError } from '../../../core/http/api-error-message';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { formatDay } from '../../../ui/time/date-format';
import { UtcInstantPipe } from '../../../ui/time/date-pipes';
import { formatPercent } from '../../../ui/units/format-units';
import { LostNightDialog, type LostNightDialogData } from '../lost-night-dialog/lost-night-dialog';
import { utcClock } from '../night-plan-format';
import { NightPlansApi } from '../night-plans-api';

export interface NightDialogData {
  cycleId: number;
  nodeId: number;
  nodeCode: string;
  date: string;
  /** Program colours by proposal id (the timeline's). */
  colours: ReadonlyMap<number, string>;
  /** Called after a visit's status changed (the page reads its figures again). */
  changed: () => void;
  /** Called with the re-plan a lost night queued. */
  replanned: (build: NightPlanBuildStatus) => void;
}

/**
 * One night's plan of one node: the visits in order with their UTC and site times, altitude,
 * airmass and status, buttons to mark each visit done or missed (or planned again), and
 * "Mark this night lost", which re-plans the node's later nights.
 */
@Component({
  selector: 'app-night-dialog',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    DecimalPipe,
    LoadStatus,
    MatButton,
    MatDialogActions,
    MatDialogClose,
    MatDialogContent,
    MatDialogTitle,
    MatIcon,
    MatIconButton,
    MatTooltip,
    UtcInstantPipe,
  ],
  templateUrl: './night-dialog.html',
  styleUrl: './night-dialog.scss',
})
export class NightDialog {
  protected readonly data = inject<NightDialogData>(MAT_DIALOG_DATA);
  private readonly ref = inject<MatDialogRef<NightDialog>>(MatDialogRef);
  private readonly dialog = inject(MatDialog);
  private readonly api = inject(NightPlansApi);
  private readonly locale = inject(LOCALE_ID);

  protected readonly night = this.api.nightResource(() => ({ cycleId: this.data.cycleId, nodeId: this.data.nodeId, date: this.data.date }));
  protected readonly plan = computed<NightPlan | null>(() => (this.night.hasValue() ? this.night.value() : null));
  protected readonly error = computed(() => loadErrorText(this.night.error(), 'The plan of this night could not be loaded.'));
  protected readonly dateText = formatDay(this.data.date, this.locale);
  protected readonly statusLabels = VISIT_STATUS_LABELS;
  protected readonly utc = utcClock;

  /** Visits whose change is on its way. */
  protected readonly pending = signal<ReadonlySet<number>>(new Set());
  protected readonly visitError = signal<{ id: number; message: string } | null>(null);
  protected readonly announcement = signal('');

  protected moon(plan: NightPlan): string {
    return formatPercent(plan.moonIllumination, this.locale);
  }

  protected colour(v: NightPlanVisit): string {
    return this.data.colours.get(v.proposalId) ?? 'var(--mat-sys-outline)';
  }

  protected setStatus(v: NightPlanVisit, status: VisitStatus): void {
    if (this.pending().has(v.id) || v.status === status) return;
    this.pending.update((s) => new Set(s).add(v.id));
    this.visitError.set(null);
    this.api.setVisitStatus(v.id, status).subscribe({
      next: () => {
        this.done(v.id);
        this.night.update((n) => n && { ...n, visits: n.visits.map((x) => (x.id === v.id ? { ...x, status } : x)) });
        this.announcement.set(`${v.targetName}: ${VISIT_STATUS_LABELS[status].toLowerCase()}.`);
        this.data.changed();
      },
      error: (err: unknown) => {
        this.done(v.id);
        this.visitError.set({ id: v.id, message: `Not changed: ${readApiError(err).message}` });
      },
    });
  }

  private done(id: number): void {
    this.pending.update((s) => {
      const next = new Set(s);
      next.delete(id);
      return next;
    });
  }

  protected markLost(plan: NightPlan): void {
    const data: LostNightDialogData = {
      cycleId: this.data.cycleId,
      nodeId: this.data.nodeId,
      nodeCode: plan.node.code,
      date: plan.date,
      dateText: this.dateText,
    };
    this.dialog
      .open<LostNightDialog, LostNightDialogData, NightPlanBuildStatus>(LostNightDialog, { data, width: '560px' })
      .afterClosed()
      .subscribe((build) => {
        if (!build) return;
        this.data.replanned(build);
        this.ref.close();
      });
  }
}
