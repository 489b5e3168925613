import { HttpErrorResponse } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, input, LOCALE_ID } from '@angular/core';
import { MatIcon } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import {
  TIME_SYSTEM_LABELS,
  type RotationMeasurement,
  type TargetPhotometry as TargetPhotometryBody,
} from '@spincycle/shared/photometry/photometry';
import { readApiError } from '../../../core/http/api-error-message';
import { ColorScheme } from '../../../core/layout/color-scheme';
import { chartTheme } from '../../../ui/charts/chart-palette';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { plainFlag } from '../../../ui/text/plan-wording';
import { UtcInstantPipe } from '../../../ui/time/date-pipes';
import { ProposalStore } from '../../proposals/proposal-store';
import { ChartFigure } from '../measurement-charts/chart-figure';
import { foldedChart, lightCurveChart, periodogramChart, windowChart } from '../measurement-charts/measurement-charts';
import { PhotometryApi } from '../photometry-api';
import { amplitudeUnit, formatAge, formatFap, formatNumber, formatPeriod, readableReferences } from '../photometry-format';
import { VerdictChip } from '../verdict-chip/verdict-chip';

/**
 * /proposals/:id/photometry/:targetId: one target's measurement. The headline (verdict, period
 * ± σ, false-alarm probability, amplitude, cycles covered, the expected range, the implied age
 * with its cautions, the verdict's rule and reasons), the alias warning with its candidates,
 * the light curve, periodogram, spectral window and folded curve, how the curve was prepared
 * and which periods were searched, and the uploads it came from.
 */
@Component({
  selector: 'app-target-photometry',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ChartFigure, LoadStatus, MatIcon, RouterLink, UtcInstantPipe, VerdictChip],
  templateUrl: './target-photometry.html',
  styleUrl: './target-photometry.scss',
})
export default class TargetPhotometry {
  private readonly api = inject(PhotometryApi);
  private readonly store = inject(ProposalStore);
  private readonly scheme = inject(ColorScheme);
  protected readonly locale = inject(LOCALE_ID);

  /** Route parameter. */
  readonly targetId = input<string>();
  private readonly parsedTargetId = computed(() => {
    const id = Number(this.targetId());
    return Number.isInteger(id) && id > 0 ? id : null;
  });

  protected readonly resource = this.api.targetResource(() => {
    const proposalId = this.store.id();
    const targetId = this.parsedTargetId();
    return proposalId === null || targetId === null ? null : { proposalId, targetId };
  });
  protected readonly body = computed<TargetPhotometryBody | null>(() => (this.resource.hasValue() ? this.resource.value() : null));
  protected readonly measurement = computed<RotationMeasurement | null>(() => this.body()?.measurement ?? null);

  protected readonly noProgram = computed(() => statusOf(this.resource.error()) === 409);
  protected readonly error = computed(() => {
    if (this.targetId() !== undefined && this.parsedTargetId() === null) return 'There is no target at this address.';
    const error = this.resource.error();
    if (!error) return null;
    const status = statusOf(error);
    if (status === 409) return null;
    if (status === 404) return 'This target is not in the program, or you are not on its team.';
    return `The target's light curve could not be loaded. ${readApiError(error).message}`;
  });

  private readonly theme = computed(() => chartTheme(this.scheme.isDark()));
  protected readonly lightCurve = computed(() => {
    const m = this.measurement();
    return m ? lightCurveChart(m, this.theme(), this.locale) : null;
  });
  protected readonly periodogram = computed(() => {
    const m = this.measurement();
    return m ? periodogramChart(m, this.theme(), this.locale) : null;
  });
  protected readonly window = computed(() => {
    const m = this.measurement();
    return m ? windowChart(m, this.theme(), this.locale) : null;
  });
  protected readonly folded = computed(() => {
    const m = this.measurement();
    return m ? foldedChart(m, this.theme(), this.locale) : null;
  });

  protected readonly unit = computed(() => amplitudeUnit(this.measurement()?.input.valueKind ?? 'mag'));
  protected readonly amplitudeText = computed(() => {
    const best = this.measurement()?.best;
    if (!best) return '—';
    return this.unit() === 'mmag'
      ? `${formatNumber(best.semiAmplitudeMmag, this.locale, 1)} mmag`
      : `${formatNumber(best.semiAmplitudePpm, this.locale, 0)} ppm`;
  });
  protected readonly periodText = computed(() => {
    const best = this.measurement()?.best;
    return best ? `${formatPeriod(best.periodDays, best.periodUncertaintyDays, this.locale)} d` : '—';
  });
  protected readonly fapText = computed(() => formatFap(this.measurement()?.best?.falseAlarmProbability ?? null, this.locale));
  protected readonly ageText = computed(() => {
    const age = this.measurement()?.age;
    return age ? formatAge(age.ageMyr, age.lowMyr, age.highMyr, this.locale) : '—';
  });
  protected readonly ageFlags = computed(() => (this.measurement()?.age?.flags ?? []).map(plainFlag));
  protected readonly timeSystems = computed(() =>
    (this.measurement()?.input.timeSystems ?? []).map((s) => TIME_SYSTEM_LABELS[s]).join(', '),
  );
  protected readonly sources = computed(() => readableReferences(this.measurement()?.sources ?? {}));

  protected number(value: number | null | undefined, digits = 2): string {
    return formatNumber(value, this.locale, digits);
  }

  protected fap(p: number | null | undefined): string {
    return formatFap(p ?? null, this.locale);
  }
}

/** The HTTP status of a resource's error (0 when there is none). */
function statusOf(error: unknown): number {
  if (!error) return 0;
  const cause = error instanceof HttpErrorResponse ? error : (error as { cause?: unknown }).cause;
  return cause instanceof HttpErrorResponse ? cause.status : 0;
}
