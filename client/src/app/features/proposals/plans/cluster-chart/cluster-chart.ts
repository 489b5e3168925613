import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, LOCALE_ID, output } from '@angular/core';
import type { PlanMarker } from '@spincycle/shared/proposals/plan-types';
import type { ActiveElement, ChartData, ChartDataset, ChartOptions } from 'chart.js';
import { BaseChartDirective } from 'ng2-charts';
import { ColorScheme } from '../../../../core/layout/color-scheme';
import { logTickLabel } from '../../../../ui/charts/chart-format';
import { bandStyle, curveChartLegend, curveStyle, markerStyle } from '../../../../ui/charts/chart-markers';
import { chartTheme, RELATION_COLOURS } from '../../../../ui/charts/chart-palette';
import { provideSpincycleCharts } from '../../../../ui/charts/chart-setup';
import { logAxis125Hooks } from '../../../../ui/charts/log-ticks';
import type { CurvePoint } from '../../../planner/gyro-curves';
import { type ClusterTarget, ClusterTargetPoint, clusterSeries, TargetFeasibility } from './cluster-curves';

/**
 * Feasibility is told by marker shape as well as colour (the charts' one marker style,
 * ui/charts/chart-markers.ts), so it survives any colour vision and print.
 */
const FEASIBILITY_LABELS: Record<TargetFeasibility, string> = {
  feasible: 'Target: feasible on every planned node',
  partly: 'Target: feasible on some nodes',
  infeasible: 'Target: infeasible on every node',
  unplanned: 'Target: no plan yet',
};
const FEASIBILITY_ORDER: TargetFeasibility[] = ['feasible', 'partly', 'infeasible', 'unplanned'];

type ClusterChartType = 'line';
type Dataset = ChartDataset<ClusterChartType, CurvePoint[]>;

/** What a click on a target point asks for. */
export interface ClusterPointSelection {
  targetId: number;
  nodeIds: number[];
}

/**
 * For a target list that shares one age: expected rotation period against intrinsic colour
 * at that age, one curve per gyrochronology relation (the default one with its ±1σ band),
 * and every target placed on it, marked by the feasibility of its plans. A click on a point
 * asks for that target's sky window.
 */
@Component({
  selector: 'app-cluster-chart',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [BaseChartDirective, DecimalPipe],
  providers: [provideSpincycleCharts()],
  templateUrl: './cluster-chart.html',
  styleUrl: './cluster-chart.scss',
})
export class ClusterChart {
  readonly targets = input.required<readonly ClusterTarget[]>();
  readonly plans = input.required<readonly PlanMarker[]>();
  readonly pointSelected = output<ClusterPointSelection>();

  private readonly locale = inject(LOCALE_ID);
  private readonly scheme = inject(ColorScheme);

  protected readonly series = computed(() => clusterSeries(this.targets(), this.plans()));

  /** Point groups in dataset order, so that a click can be traced back to its target. */
  private readonly groups = computed(() => {
    const series = this.series();
    if (!series) return [];
    return FEASIBILITY_ORDER.map((feasibility) => ({
      feasibility,
      points: series.points.filter((p) => p.feasibility === feasibility),
    })).filter((group) => group.points.length > 0);
  });

  protected readonly counts = computed(() => {
    const counts: Record<TargetFeasibility, number> = { feasible: 0, partly: 0, infeasible: 0, unplanned: 0 };
    for (const point of this.series()?.points ?? []) counts[point.feasibility]++;
    return counts;
  });

  protected readonly summary = computed(() => {
    const series = this.series();
    if (!series) return '';
    const c = this.counts();
    const defaultCurve = series.curves.find((curve) => curve.isDefault);
    const others = series.curves.filter((curve) => !curve.isDefault).map((curve) => curve.label);
    const parts = [
      `${series.points.length} targets of one age, ${this.number(series.ageMyr)} Myr`,
      `${c.feasible} feasible on every planned node, ${c.partly} on some, ${c.infeasible} on none` +
        (c.unplanned ? `, ${c.unplanned} not planned yet` : ''),
    ];
    const curves = defaultCurve
      ? `Curves: ${defaultCurve.label} (default, with its ±1σ band${series.ageUncertaintyMyr ? ` including the ${this.number(series.ageUncertaintyMyr)} Myr age uncertainty` : ''})` +
        (others.length ? `; ${others.join(', ')}` : '')
      : `Curves: ${others.join(', ')}`;
    return `${parts.join('; ')}. ${curves}.`;
  });

  protected readonly ariaLabel = computed(() => {
    const series = this.series();
    return series
      ? `Chart of expected rotation period in days against ${series.axisLabel} at ${this.number(series.ageMyr)} Myr. ${this.summary()}`
      : '';
  });

  protected readonly data = computed<ChartData<ClusterChartType, CurvePoint[]>>(() => {
    const series = this.series();
    if (!series) return { datasets: [] };
    const theme = chartTheme(this.scheme.isDark());
    const datasets: Dataset[] = [];
    const defaultCurve = series.curves.find((curve) => curve.isDefault);
    if (series.band && defaultCurve) {
      const colour = RELATION_COLOURS[defaultCurve.relation];
      datasets.push(
        { label: `${defaultCurve.label} ±1σ`, data: series.band.high, ...bandStyle(colour) },
        { label: '', data: series.band.low, borderWidth: 0, pointRadius: 0, pointHitRadius: 0, fill: false },
      );
    }
    for (const curve of series.curves) {
      // As in the planner's charts: the default relation thicker, the others thinner, all solid.
      datasets.push({
        label: curve.isDefault ? `${curve.label} (default)` : curve.label,
        data: curve.points,
        ...curveStyle(RELATION_COLOURS[curve.relation], { main: curve.isDefault }),
      });
    }
    for (const group of this.groups()) {
      datasets.push({ label: FEASIBILITY_LABELS[group.feasibility], data: group.points, ...markerStyle(group.feasibility, theme) });
    }
    return { datasets };
  });

  protected readonly options = computed<ChartOptions<ClusterChartType>>(() => {
    const series = this.series();
    const theme = chartTheme(this.scheme.isDark());
    const axisTitle = (text: string) => ({ display: true, text, color: theme.text });
    const curveCount = this.data().datasets.length - this.groups().length;
    return {
      responsive: true,
      maintainAspectRatio: false,
      animation: false,
      color: theme.text,
      interaction: { mode: 'nearest', intersect: true },
      scales: {
        x: {
          type: 'linear',
          title: axisTitle(series?.axisLabel ?? 'Intrinsic colour (mag)'),
          grid: { color: theme.grid },
          ticks: { color: theme.mutedText, includeBounds: false },
        },
        y: {
          // A log period axis with 1–2–5 ticks, as in the planner's charts.
          type: 'logarithmic',
          title: axisTitle('Expected rotation period (d)'),
          grid: { color: theme.grid },
          ...logAxis125Hooks(),
          ticks: { color: theme.mutedText, callback: (value) => logTickLabel(value, this.locale), maxRotation: 0, autoSkip: false },
        },
      },
      plugins: {
        legend: curveChartLegend(theme),
        tooltip: {
          filter: (item) => item.datasetIndex >= curveCount,
          callbacks: {
            label: (item) => {
              const point = item.raw as ClusterTargetPoint;
              return `${point.name}: ${this.number(point.y, 1)} d at ${this.number(point.x, 3)} mag`;
            },
          },
        },
      },
    };
  });

  /** A click on a target point: its target and the nodes it was planned on. */
  protected onChartClick(event: { active?: object[] }): void {
    const active = (event.active ?? []) as ActiveElement[];
    const curveCount = this.data().datasets.length - this.groups().length;
    for (const element of active) {
      const group = this.groups()[element.datasetIndex - curveCount];
      const point = group?.points[element.index];
      if (point) {
        this.pointSelected.emit({ targetId: point.targetId, nodeIds: point.nodeIds });
        return;
      }
    }
  }

  private number(value: number, digits = 0): string {
    return new Intl.NumberFormat(this.locale, { maximumFractionDigits: digits }).format(value);
  }
}
