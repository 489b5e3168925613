import { HttpErrorResponse } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, effect, inject, linkedSignal, LOCALE_ID, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatButtonToggle, MatButtonToggleGroup } from '@angular/material/button-toggle';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
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
import { RouterLink } from '@angular/router';
import {
  DEFAULT_DETREND,
  type LightCurveValueKind,
  type PhotometryRunStatus,
  type PhotometryTargetRow,
  type ProgramPhotometry,
} from '@spincycle/shared/photometry/photometry';
import { colourLabel } from '@spincycle/shared/science/colour-sequence';
import { readApiError } from '../../../core/http/api-error-message';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { pollWhileActive } from '../../../ui/polling/poll-while-active';
import { sortRows, type SortValue } from '../../../ui/table/sort-rows';
import { UtcInstantPipe } from '../../../ui/time/date-pipes';
import { ProposalStore } from '../../proposals/proposal-store';
import { ClusterAgeCard } from '../cluster-age-card/cluster-age-card';
import { createDetrendForm, detrendOptionsOf } from '../detrend-fields/detrend-form';
import { DetrendFields } from '../detrend-fields/detrend-fields';
import { LightCurveUpload } from '../light-curve-upload/light-curve-upload';
import { PHOTOMETRY_POLL_MS, PhotometryApi } from '../photometry-api';
import {
  amplitudeUnit,
  formatAge,
  formatAmplitude,
  formatExpected,
  formatFap,
  formatNumber,
  formatPeriod,
  isRunActive,
  runPercent,
  runSentence,
} from '../photometry-format';
import { VerdictChip } from '../verdict-chip/verdict-chip';

/** The table's columns, in order. */
export const PHOTOMETRY_COLUMNS = [
  'target',
  'colour',
  'expected',
  'period',
  'fap',
  'amplitude',
  'verdict',
  'alias',
  'age',
  'cautions',
] as const;

/** Verdicts in the order a sort by verdict puts them (best first). */
const VERDICT_ORDER: Readonly<Record<string, number>> = { measured: 0, tentative: 1, not_detected: 2 };

/** The value a column sorts by. */
export function photometrySortValue(row: PhotometryTargetRow, column: string, kind: LightCurveValueKind = 'mag'): SortValue {
  switch (column) {
    case 'target':
      return row.targetName;
    case 'colour':
      return row.colour;
    case 'expected':
      return row.expected?.periodDays ?? null;
    case 'period':
      return row.periodDays;
    case 'fap':
      return row.falseAlarmProbability;
    case 'amplitude':
      return kind === 'mag' ? row.semiAmplitudeMmag : row.semiAmplitudePpm;
    case 'verdict':
      return row.verdict === null ? null : VERDICT_ORDER[row.verdict];
    case 'alias':
      return row.aliasFlagged === null ? null : row.aliasFlagged ? 1 : 0;
    case 'age':
      return row.ageMyr;
    case 'cautions':
      return row.cautions.length;
    default:
      return null;
  }
}

/**
 * /proposals/:id/photometry: the program's returned photometry. The team uploads light curves
 * (with the detrending choices), follows the analysis's progress (polled every second while it
 * runs; the table is fetched again when it ends), reads every target's period, significance,
 * amplitude, verdict and implied age in one sortable table, exports it, analyses again with
 * other choices, and for a cluster program reads the cluster's fitted age.
 */
@Component({
  selector: 'app-photometry-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    ClusterAgeCard,
    DetrendFields,
    LightCurveUpload,
    LoadStatus,
    MatButton,
    MatButtonToggle,
    MatButtonToggleGroup,
    MatCell,
    MatCellDef,
    MatColumnDef,
    MatHeaderCell,
    MatHeaderCellDef,
    MatHeaderRow,
    MatHeaderRowDef,
    MatIcon,
    MatProgressBar,
    MatRow,
    MatRowDef,
    MatSort,
    MatSortHeader,
    MatTable,
    MatTooltip,
    RouterLink,
    UtcInstantPipe,
    VerdictChip,
  ],
  templateUrl: './photometry-page.html',
  styleUrl: './photometry-page.scss',
})
export default class PhotometryPage {
  private readonly api = inject(PhotometryApi);
  private readonly store = inject(ProposalStore);
  private readonly snackBar = inject(MatSnackBar);
  private readonly pollMs = inject(PHOTOMETRY_POLL_MS);
  protected readonly locale = inject(LOCALE_ID);

  protected readonly proposalId = computed(() => this.store.id());
  protected readonly resource = this.api.programResource(() => this.store.id());

  /** The last program received; kept while it is fetched again. */
  protected readonly program = linkedSignal<ProgramPhotometry | undefined, ProgramPhotometry | null>({
    source: () => (this.resource.hasValue() ? this.resource.value() : undefined),
    computation: (next, previous) => next ?? previous?.value ?? null,
  });

  /** 409 `no_program`: not awarded yet, an empty state rather than an error. */
  protected readonly noProgram = computed(() => statusOf(this.resource.error()) === 409);
  protected readonly error = computed(() => {
    const error = this.resource.error();
    if (!error || this.program()) return null;
    const status = statusOf(error);
    if (status === 409) return null;
    if (status === 404) return 'This proposal does not exist, or you are not on its team.';
    return `The light curves could not be loaded. ${readApiError(error).message}`;
  });

  /** The analysis: from the program, then from each poll while it runs. */
  protected readonly run = linkedSignal<PhotometryRunStatus | null>(() => this.program()?.run ?? null);
  protected readonly running = computed(() => isRunActive(this.run()));
  protected readonly runPercent = computed(() => runPercent(this.run()));
  protected readonly runSentence = computed(() => {
    const run = this.run();
    return run ? runSentence(run) : '';
  });

  protected readonly rows = computed(() => this.program()?.targets ?? []);
  protected readonly withPhotometry = computed(() => this.rows().filter((r) => r.points !== null).length);
  protected readonly sort = signal<Sort>({ active: '', direction: '' });
  /** The unit amplitudes are shown in. */
  protected readonly amplitudeKind = signal<LightCurveValueKind>('mag');
  protected readonly sortedRows = computed(() => {
    const kind = this.amplitudeKind();
    return sortRows(this.rows(), this.sort(), (row, column) => photometrySortValue(row, column, kind));
  });
  protected readonly columns = PHOTOMETRY_COLUMNS;
  protected readonly exportUrl = computed(() => {
    const id = this.proposalId();
    return id === null ? null : this.api.exportUrl(id);
  });

  /** "Analyse again": its panel and form (starting from the choices in force). */
  protected readonly reanalyseOpen = signal(false);
  protected readonly reanalyseForm = createDetrendForm(DEFAULT_DETREND);
  protected readonly reanalysing = signal(false);

  protected readonly formatFap = (p: number | null) => formatFap(p, this.locale);
  protected readonly formatPeriod = (row: PhotometryTargetRow) => formatPeriod(row.periodDays, row.periodUncertaintyDays, this.locale);
  protected readonly formatExpected = (row: PhotometryTargetRow) => formatExpected(row.expected, this.locale);
  protected readonly formatAge = (row: PhotometryTargetRow) => formatAge(row.ageMyr, row.ageLowMyr, row.ageHighMyr, this.locale);
  protected readonly formatAmplitude = (row: PhotometryTargetRow) =>
    formatAmplitude({ mmag: row.semiAmplitudeMmag, ppm: row.semiAmplitudePpm }, this.amplitudeKind(), this.locale);
  protected readonly amplitudeUnit = computed(() => amplitudeUnit(this.amplitudeKind()));
  protected readonly colourOf = (row: PhotometryTargetRow) =>
    `${formatNumber(row.colour, this.locale, 2)} (${colourLabel(row.colourSystem)})`;

  constructor() {
    // While the analysis runs, ask for its progress every second; when it ends, the program is
    // fetched again once.
    pollWhileActive({
      status: this.run,
      id: () => this.store.id(),
      active: isRunActive,
      fetch: (id) => this.api.runStatus(id),
      pauseMs: this.pollMs,
      finished: () => this.resource.reload(),
    });
    // The "Analyse again" form follows the choices in force until the person edits it.
    effect(() => {
      const detrend = this.program()?.detrend;
      if (!detrend || !this.reanalyseForm.pristine) return;
      this.reanalyseForm.reset({
        offsets: detrend.offsets,
        clip: detrend.clipSigma !== null,
        clipSigma: detrend.clipSigma ?? this.reanalyseForm.controls.clipSigma.value,
        bin: detrend.binMinutes !== null,
        binMinutes: detrend.binMinutes ?? this.reanalyseForm.controls.binMinutes.value,
      });
    });
  }

  protected onQueued(run: PhotometryRunStatus): void {
    this.run.set(run);
  }

  protected reanalyse(): void {
    const id = this.store.id();
    const detrend = detrendOptionsOf(this.reanalyseForm);
    if (id === null || this.reanalysing()) return;
    if (!detrend) {
      this.reanalyseForm.markAllAsTouched();
      return;
    }
    this.reanalysing.set(true);
    this.api.reanalyse(id, detrend).subscribe({
      next: ({ run }) => {
        this.reanalysing.set(false);
        this.reanalyseOpen.set(false);
        this.reanalyseForm.markAsPristine();
        this.run.set(run);
      },
      error: (error: unknown) => {
        this.reanalysing.set(false);
        this.snackBar.open(`The light curves were not analysed again: ${readApiError(error).message}`, 'Dismiss', { duration: 10000 });
      },
    });
  }

  /** Share of a count in a total, percent (for the small meters). */
  protected share(count: number, total: number): number {
    return total > 0 ? Math.min(100, (100 * Math.max(0, count)) / total) : 0;
  }
}

/** The HTTP status of a failed request or of a resource's error (0 when there is none). */
function statusOf(error: unknown): number {
  if (!error) return 0;
  const cause = error instanceof HttpErrorResponse ? error : (error as { cause?: unknown }).cause;
  return cause instanceof HttpErrorResponse ? cause.status : 0;
}
