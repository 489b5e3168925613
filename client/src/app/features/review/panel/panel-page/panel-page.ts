import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { FormControl, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatTab, MatTabGroup } from '@angular/material/tabs';
import type { PanelStatisticsReport } from '@spincycle/shared/review/standing';
import { loadErrorText, readApiError } from '../../../../core/http/api-error-message';
import { confirmAction } from '../../../../ui/confirm-dialog/confirm-dialog';
import { LoadStatus } from '../../../../ui/load-status/load-status';
import { LocalInstantPipe, UtcInstantPipe } from '../../../../ui/time/date-pipes';
import { GradesTable } from '../grades-table/grades-table';
import { MoveDialog, type MoveDialogData, type MoveDialogResult } from '../move-dialog/move-dialog';
import { PanelReviewApi } from '../panel-review-api';
import { PressureCharts } from '../pressure-charts/pressure-charts';
import { StandingList, type MoveRequest } from '../standing-list/standing-list';

/**
 * A panel's page (/review/panels/:panelId) for its chair (once the review deadline has passed)
 * and facility managers: the grades with their normalised values and flags, the standing with
 * its moves and lock, the cycle's pressure, and CSV downloads.
 */
@Component({
  selector: 'app-panel-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    GradesTable,
    LoadStatus,
    LocalInstantPipe,
    MatButton,
    MatError,
    MatFormField,
    MatHint,
    MatIcon,
    MatInput,
    MatLabel,
    MatTab,
    MatTabGroup,
    PressureCharts,
    ReactiveFormsModule,
    StandingList,
    UtcInstantPipe,
  ],
  templateUrl: './panel-page.html',
  styleUrl: './panel-page.scss',
})
export default class PanelPage {
  /** Route parameter. */
  readonly panelId = input.required<string>();
  private readonly api = inject(PanelReviewApi);
  private readonly dialog = inject(MatDialog);

  protected readonly id = computed(() => {
    const id = Number(this.panelId());
    return Number.isInteger(id) && id > 0 ? id : null;
  });

  protected readonly statistics = this.api.statisticsResource(this.id);
  protected readonly report = computed(() => (this.statistics.hasValue() ? this.statistics.value() : null));
  protected readonly panel = computed(() => this.report()?.panel ?? null);
  /** The standing and the pressure load when their tab is first opened. */
  private readonly standingWanted = signal(false);
  private readonly pressureWanted = signal(false);
  protected readonly standing = this.api.standingResource(() => (this.standingWanted() ? this.id() : null));
  protected readonly pressure = this.api.pressureResource(() => (this.pressureWanted() ? (this.report()?.panel.cycleId ?? null) : null));

  protected readonly standingValue = computed(() => (this.standing.hasValue() ? this.standing.value() : null));
  protected readonly pressureValue = computed(() => (this.pressure.hasValue() ? this.pressure.value() : null));

  protected readonly error = computed(() => {
    if (this.id() === null) return 'There is no panel at this address.';
    return loadErrorText(this.statistics.error(), 'The panel could not be loaded.');
  });
  protected readonly standingError = computed(() => loadErrorText(this.standing.error(), 'The standing could not be loaded.'));
  protected readonly pressureError = computed(() => loadErrorText(this.pressure.error(), 'The pressure could not be loaded.'));

  protected readonly busy = signal(false);
  /** The outcome of the last change, announced politely. */
  protected readonly notice = signal<string | null>(null);
  protected readonly actionError = signal<string | null>(null);

  protected readonly threshold = new FormControl<number | null>(null, [Validators.required, Validators.min(0), Validators.max(10)]);
  protected readonly triage = new FormControl<number | null>(null, [Validators.required, Validators.min(0), Validators.max(90)]);

  protected readonly matrixUrl = computed(() => (this.id() === null ? null : this.api.matrixCsvUrl(this.id()!)));
  protected readonly standingCsvUrl = computed(() => (this.id() === null ? null : this.api.standingCsvUrl(this.id()!)));

  protected onTab(index: number): void {
    if (index === 1) this.standingWanted.set(true);
    if (index === 2) this.pressureWanted.set(true);
  }

  private applyStatistics(report: PanelStatisticsReport, message: string): void {
    this.statistics.set(report);
    this.notice.set(message);
    this.actionError.set(null);
    this.busy.set(false);
    if (this.standingWanted()) this.standing.reload();
  }

  private fail(error: unknown): void {
    this.actionError.set(readApiError(error).message);
    this.busy.set(false);
  }

  protected saveThreshold(): void {
    const panel = this.panel();
    const value = this.threshold.value ?? panel?.spreadThreshold ?? null;
    if (!panel || value === null || this.threshold.invalid) return;
    this.busy.set(true);
    this.api.setSpreadThreshold(panel.id, value).subscribe({
      next: (r) => this.applyStatistics(r, `Grades that differ by more than ${value} points are now flagged for discussion.`),
      error: (e) => this.fail(e),
    });
  }

  protected saveTriage(): void {
    const panel = this.panel();
    const percent = this.triage.value;
    if (!panel || percent === null || this.triage.invalid) return;
    this.busy.set(true);
    this.api.setTriage(panel.id, percent / 100).subscribe({
      next: (r) => {
        const count = r.proposals.filter((p) => p.notDiscussed).length;
        this.applyStatistics(
          r,
          count === 0
            ? 'Every proposal will be discussed.'
            : `${count} ${count === 1 ? 'proposal is' : 'proposals are'} marked not discussed.`,
        );
      },
      error: (e) => this.fail(e),
    });
  }

  protected requestMove(request: MoveRequest): void {
    const panel = this.panel();
    const standing = this.standingValue();
    if (!panel || !standing) return;
    const data: MoveDialogData = {
      title: request.entry.proposal.title,
      from: request.entry.position,
      to: request.toPosition,
      size: standing.entries.length === 0 ? 0 : Math.max(...standing.entries.map((e) => e.position)),
    };
    this.dialog
      .open<MoveDialog, MoveDialogData, MoveDialogResult>(MoveDialog, { data, width: '460px' })
      .afterClosed()
      .subscribe((result) => {
        if (!result) return;
        this.busy.set(true);
        this.api.move(panel.id, { proposalId: request.entry.proposal.proposalId, ...result }).subscribe({
          next: (s) => {
            this.standing.set(s);
            this.notice.set(`“${data.title}” moved from position ${data.from} to ${result.toPosition}.`);
            this.actionError.set(null);
            this.busy.set(false);
          },
          error: (e) => this.fail(e),
        });
      });
  }

  protected lock(): void {
    const panel = this.panel();
    if (!panel) return;
    confirmAction(this.dialog, {
      title: 'Lock the standing?',
      message:
        'Locking is final: the order can no longer be changed by anyone, and every proposal of the panel that is in review becomes ranked.',
      confirmLabel: 'Lock standing',
      destructive: true,
    }).subscribe((confirmed) => {
      if (!confirmed) return;
      this.busy.set(true);
      this.api.lock(panel.id).subscribe({
        next: (s) => {
          this.standing.set(s);
          this.statistics.reload();
          this.notice.set('The standing is locked.');
          this.actionError.set(null);
          this.busy.set(false);
        },
        error: (e) => this.fail(e),
      });
    });
  }
}
