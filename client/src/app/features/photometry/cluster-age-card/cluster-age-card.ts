import { ChangeDetectionStrategy, Component, computed, inject, input, LOCALE_ID } from '@angular/core';
import type { PhotometryTargetRow, ProgramPhotometry } from '@spincycle/shared/photometry/photometry';
import type { ChartData, ChartDataset, ChartOptions, PointStyle } from 'chart.js';
import { BaseChartDirective } from 'ng2-charts';
import { ColorScheme } from '../../../core/layout/color-scheme';
import { logTickLabel } from '../../../ui/charts/chart-format';
import { bandStyle, curveChartLegend, curveStyle, errorBarStyle } from '../../../ui/charts/chart-markers';
import { chartTheme, OKABE_ITO, RELATION_COLOURS, withAlpha } from '../../../ui/charts/chart-palette';
import { provideSpincycleCharts } from '../../../ui/charts/chart-setup';
import { logAxis125Hooks } from '../../../ui/charts/log-ticks';
import { formatAge, formatNumber, formatPeriod, type XY } from '../photometry-format';
import { type ClusterMemberPoint, clusterAgeSeries } from './cluster-age-series';

type Dataset = ChartDataset<'line', XY[]>;

/** Colour of the fitted age's sequence (the expected one keeps its relation's colour). */
const FITTED_COLOUR = OKABE_ITO.vermillion;

/**
 * A cluster program's age from its members' rotation periods: the period–colour chart (the
 * relation's sequence at the age the proposal gave, the sequence at the fitted age with its
 * range, and the members by verdict with their 1σ periods), the fitted age with its range, the
 * members used and left out, the reduced χ² and the method; or why there is no fit yet.
 */
@Component({
  selector: 'app-cluster-age-card',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [BaseChartDirective],
  providers: [provideSpincycleCharts()],
  templateUrl: './cluster-age-card.html',
  styleUrl: './cluster-age-card.scss',
})
export class ClusterAgeCard {
  readonly cluster = input.required<NonNullable<ProgramPhotometry['cluster']>>();
  readonly targets = input.required<readonly PhotometryTargetRow[]>();

  private readonly locale = inject(LOCALE_ID);
  private readonly scheme = inject(ColorScheme);

  protected readonly series = computed(() => clusterAgeSeries(this.cluster(), this.targets()));
  protected readonly measuredCount = computed(() => this.targets().filter((t) => t.verdict === 'measured').length);

  protected readonly fitText = computed(() => {
    const fit = this.series().fit;
    return fit ? formatAge(fit.ageMyr, fit.lowMyr, fit.highMyr, this.locale) : null;
  });

  protected readonly chiSquareText = computed(() => {
    const chi = this.series().fit?.reducedChiSquare;
    return chi === null || chi === undefined
      ? null
      : chi > 0 && chi < 0.01
        ? `< ${formatNumber(0.01, this.locale, 2)}`
        : formatNumber(chi, this.locale, 2);
  });

  /** The chart's text alternative: what is drawn and the numbers that matter. */
  protected readonly summary = computed(() => {
    const s = this.series();
    const age = formatAge(s.ageMyr, null, null, this.locale);
    const measured = s.members.filter((m) => m.verdict === 'measured').length;
    const tentative = s.members.length - measured;
    const fit = this.fitText();
    return (
      `Rotation period against ${s.axisLabel} for ${s.members.length} ${s.members.length === 1 ? 'member' : 'members'} with a period ` +
      `(${measured} measured, ${tentative} tentative). ${s.relationLabel} sequence at the cluster's given age of ${age}` +
      (fit ? `, and at the fitted age of ${fit}.` : '; no age fitted yet.')
    );
  });

  /** Datasets that stay out of the legend and tooltips (band edge, error bars). */
  private readonly hidden = computed(() => {
    const hidden = new Set<number>();
    this.data().datasets.forEach((d, i) => {
      if (!d.label || d.label.endsWith('(range)')) hidden.add(i);
    });
    return hidden;
  });

  protected readonly data = computed<ChartData<'line', XY[]>>(() => {
    const s = this.series();
    const theme = chartTheme(this.scheme.isDark());
    const datasets: Dataset[] = [];
    if (s.fittedBand) {
      datasets.push(
        { label: 'Fitted age range', data: s.fittedBand.high, ...bandStyle(FITTED_COLOUR) },
        { label: '', data: s.fittedBand.low, borderWidth: 0, pointRadius: 0, pointHitRadius: 0, fill: false },
      );
    }
    datasets.push({
      label: `Expected at ${formatAge(s.ageMyr, null, null, this.locale)} (${s.relationLabel})`,
      data: s.expected,
      ...curveStyle(RELATION_COLOURS[s.relation], { dashed: true }),
    });
    if (s.fitted && s.fit) {
      datasets.push({
        label: `Fitted: ${formatAge(s.fit.ageMyr, null, null, this.locale)}`,
        data: s.fitted,
        ...curveStyle(FITTED_COLOUR, { main: true }),
      });
    }
    for (const m of s.members) {
      if (m.lowDays !== null && m.highDays !== null) {
        datasets.push({
          label: `${m.name} (range)`,
          data: [
            { x: m.x, y: m.lowDays },
            { x: m.x, y: m.highDays },
          ],
          ...errorBarStyle(theme),
        });
      }
    }
    const group = (verdict: ClusterMemberPoint['verdict'], label: string, pointStyle: PointStyle, fill: string) => {
      const points = s.members.filter((m) => m.verdict === verdict);
      if (!points.length) return;
      datasets.push({
        label,
        data: points,
        showLine: false,
        pointStyle,
        pointRadius: 6,
        pointHoverRadius: 8,
        pointBorderWidth: 2,
        pointBackgroundColor: fill,
        pointBorderColor: theme.emphasis,
        backgroundColor: fill,
        borderColor: theme.emphasis,
      });
    };
    group('measured', 'Member: period measured', 'circle', withAlpha(OKABE_ITO.blue, 0.85));
    group('tentative', 'Member: period tentative', 'triangle', withAlpha(OKABE_ITO.yellow, 0.85));
    return { datasets };
  });

  protected readonly options = computed<ChartOptions<'line'>>(() => {
    const s = this.series();
    const theme = chartTheme(this.scheme.isDark());
    const hidden = this.hidden();
    const axisTitle = (text: string) => ({ display: true, text, color: theme.text });
    return {
      responsive: true,
      maintainAspectRatio: false,
      animation: false,
      color: theme.text,
      interaction: { mode: 'nearest', intersect: true },
      scales: {
        x: {
          type: 'linear',
          title: axisTitle(s.axisLabel),
          grid: { color: theme.grid },
          ticks: { color: theme.mutedText, includeBounds: false },
        },
        y: {
          type: 'logarithmic',
          title: axisTitle('Rotation period (d)'),
          grid: { color: theme.grid },
          ...logAxis125Hooks(),
          ticks: { color: theme.mutedText, callback: (value) => logTickLabel(value, this.locale), maxRotation: 0, autoSkip: false },
        },
      },
      plugins: {
        legend: curveChartLegend(theme, (index) => hidden.has(index)),
        tooltip: {
          filter: (item) => !hidden.has(item.datasetIndex),
          callbacks: {
            label: (item) => {
              const point = item.raw as XY & Partial<ClusterMemberPoint>;
              const where = `${formatNumber(point.x, this.locale, 2)} mag`;
              if (point.name) {
                const sigma = point.highDays !== null && point.highDays !== undefined ? point.highDays - point.y : null;
                return `${point.name}: ${formatPeriod(point.y, sigma, this.locale)} d at ${where}`;
              }
              return `${item.dataset.label}: ${formatNumber(point.y, this.locale, 1)} d at ${where}`;
            },
          },
        },
      },
    };
  });
}
