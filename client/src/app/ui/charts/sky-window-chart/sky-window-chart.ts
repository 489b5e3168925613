import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, LOCALE_ID } from '@angular/core';
import { MatIcon } from '@angular/material/icon';
import type { CadenceAssessment } from '@spincycle/shared/sky/cadence-assessment';
import type { NightDarkReport, TargetWindowsReport } from '@spincycle/shared/sky/sky-windows-report';
import type { ChartData, ChartOptions } from 'chart.js';
import { BaseChartDirective } from 'ng2-charts';
import { ColorScheme } from '../../../core/layout/color-scheme';
import { formatNightDate } from '../chart-format';
import { chartTheme, OKABE_ITO, withAlpha } from '../chart-palette';
import { provideSpincycleCharts } from '../chart-setup';
import { skyWindowNights, summaryVerdict } from './sky-window-series';

type SkyChartType = 'bar' | 'line';

let nextId = 0;

/**
 * One target's sky window from one node's site over a campaign: usable hours per night (bars),
 * dark hours (line) and the Moon's illuminated fraction (shaded, right axis), with a one-line
 * verdict above. Presentational: give it one target of a `SkyWindowsReport` (with its nights),
 * the report's `nights`, a heading, and optionally the cadence assessment of the plan being
 * checked (its verdict replaces the summary line).
 */
@Component({
  selector: 'app-sky-window-chart',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [BaseChartDirective, DecimalPipe, MatIcon],
  providers: [provideSpincycleCharts()],
  templateUrl: './sky-window-chart.html',
  styleUrl: './sky-window-chart.scss',
})
export class SkyWindowChart {
  /** One entry of `SkyWindowsReport.targets`, requested with its nights. */
  readonly target = input.required<TargetWindowsReport>();
  /** `SkyWindowsReport.nights`: the site's darkness and Moon per night. */
  readonly nights = input.required<readonly NightDarkReport[]>();
  /** What the chart shows, e.g. "Node N1 at Hollin Moor". */
  readonly heading = input.required<string>();
  /** The plan's cadence check against this window; without it the verdict comes from the summary. */
  readonly assessment = input<CadenceAssessment | null>(null);

  private readonly locale = inject(LOCALE_ID);
  private readonly scheme = inject(ColorScheme);
  protected readonly headingId = `sky-window-chart-${nextId++}`;

  protected readonly rows = computed(() => skyWindowNights(this.target(), this.nights()));

  protected readonly verdict = computed(() => this.assessment()?.verdict ?? summaryVerdict(this.target()));
  /** True / false when an assessment says the cadence fits / does not; null without one. */
  protected readonly fits = computed(() => this.assessment()?.fits ?? null);

  protected readonly summaryText = computed(() => {
    const s = this.target().summary;
    if (!s.firstUsableNight || !s.lastUsableNight)
      return 'The target never rises above the node’s altitude limit in darkness during the campaign.';
    const number = (value: number, digits: number) => new Intl.NumberFormat(this.locale, { maximumFractionDigits: digits }).format(value);
    return (
      `First usable night ${formatNightDate(s.firstUsableNight, this.locale, true)}, last ${formatNightDate(s.lastUsableNight, this.locale, true)}; ` +
      `${number(s.totalUsableHours, 0)} usable hours in all, at most ${number(s.maxNightlyUsableHours, 1)} h in one night.`
    );
  });

  protected readonly ariaLabel = computed(() => {
    const rows = this.rows();
    const span = rows.length
      ? ` from ${formatNightDate(rows[0].nightDate, this.locale, true)} to ${formatNightDate(rows[rows.length - 1].nightDate, this.locale, true)}`
      : '';
    return `${this.heading()}: usable hours per night over ${rows.length} nights${span}, with dark hours and Moon illumination. ${this.verdict()}.`;
  });

  protected readonly data = computed<ChartData<SkyChartType, (number | null)[], string>>(() => {
    const rows = this.rows();
    const theme = chartTheme(this.scheme.isDark());
    return {
      labels: rows.map((row) => row.nightDate),
      datasets: [
        {
          type: 'line',
          label: 'Dark hours (h)',
          data: rows.map((row) => row.darkHours),
          yAxisID: 'y',
          borderColor: theme.mutedText,
          borderWidth: 1.5,
          borderDash: [4, 3],
          pointRadius: 0,
          stepped: 'middle',
          order: 1,
        },
        {
          type: 'bar',
          label: 'Usable hours (h)',
          data: rows.map((row) => row.usableHours),
          yAxisID: 'y',
          backgroundColor: rows.map((row) => (row.moonExcluded ? withAlpha(OKABE_ITO.blue, 0.35) : OKABE_ITO.blue)),
          barPercentage: 1,
          categoryPercentage: 0.9,
          order: 2,
        },
        {
          type: 'line',
          label: 'Moon illuminated (%)',
          data: rows.map((row) => row.moonPercent),
          yAxisID: 'moon',
          borderColor: withAlpha(OKABE_ITO.orange, 0.7),
          borderWidth: 1,
          backgroundColor: withAlpha(OKABE_ITO.yellow, 0.28),
          fill: 'origin',
          pointRadius: 0,
          tension: 0.3,
          order: 3,
        },
      ],
    };
  });

  protected readonly options = computed<ChartOptions<SkyChartType>>(() => {
    const theme = chartTheme(this.scheme.isDark());
    const labels = this.rows().map((row) => row.nightDate);
    const locale = this.locale;
    const axisTitle = (text: string) => ({ display: true, text, color: theme.text });
    return {
      responsive: true,
      maintainAspectRatio: false,
      animation: false,
      color: theme.text,
      interaction: { mode: 'index', intersect: false },
      scales: {
        x: {
          type: 'category',
          title: axisTitle('Night (local date on which it begins)'),
          grid: { display: false },
          ticks: {
            color: theme.mutedText,
            autoSkip: true,
            maxTicksLimit: 10,
            maxRotation: 0,
            callback: (_value, index) => formatNightDate(labels[index] ?? '', locale),
          },
        },
        y: {
          type: 'linear',
          position: 'left',
          min: 0,
          title: axisTitle('Hours per night (h)'),
          grid: { color: theme.grid },
          ticks: { color: theme.mutedText },
        },
        moon: {
          type: 'linear',
          position: 'right',
          min: 0,
          max: 100,
          title: axisTitle('Moon illuminated (%)'),
          grid: { drawOnChartArea: false },
          ticks: { color: theme.mutedText, stepSize: 25 },
        },
      },
      plugins: {
        legend: { position: 'bottom', labels: { color: theme.text, boxWidth: 14 } },
        tooltip: {
          callbacks: {
            title: (items) => (items.length ? formatNightDate(labels[items[0].dataIndex] ?? '', locale, true) : ''),
          },
        },
      },
    };
  });
}
