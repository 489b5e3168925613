import { ChangeDetectionStrategy, Component, computed, inject, input, LOCALE_ID } from '@angular/core';
import { colourLabel } from '@spincycle/shared/science/colour-sequence';
import type { ChartData } from 'chart.js';
import { BaseChartDirective } from 'ng2-charts';
import { ColorScheme } from '../../../core/layout/color-scheme';
import { chartTheme, RELATION_COLOURS } from '../../../ui/charts/chart-palette';
import { provideSpincycleCharts } from '../../../ui/charts/chart-setup';
import { type CurveDataset, curveChartOptions, starDatasets } from '../curve-chart-options';
import type { CurvePoint, PeriodColourSeries } from '../gyro-curves';
import { formatValue } from '../plan-display';

let nextId = 0;

/**
 * Period against intrinsic colour at one age (a cluster of known age): one line per relation
 * over the colours it is calibrated for, in the chosen colour system, with the star as a point
 * and its plausible period range.
 */
@Component({
  selector: 'app-period-colour-chart',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [BaseChartDirective],
  providers: [provideSpincycleCharts()],
  templateUrl: './period-colour-chart.html',
  styleUrl: '../curve-chart.scss',
})
export class PeriodColourChart {
  readonly series = input.required<PeriodColourSeries>();

  private readonly locale = inject(LOCALE_ID);
  private readonly scheme = inject(ColorScheme);
  protected readonly headingId = `period-colour-chart-${nextId++}`;

  protected readonly axisLabel = computed(() => `(${colourLabel(this.series().system)})0`);
  protected readonly ageText = computed(() => `${formatValue(this.series().ageMyr, this.locale)} Myr`);

  private readonly built = computed(() => {
    const s = this.series();
    const theme = chartTheme(this.scheme.isDark());
    const datasets: CurveDataset[] = [];
    const hidden = new Set<number>();
    for (const curve of s.curves) {
      datasets.push({
        label: `${curve.label}${curve.selected ? " (the plan's relation)" : ''}${curve.ageCalibrated ? '' : ' — age outside its calibration'}`,
        data: curve.points,
        borderColor: RELATION_COLOURS[curve.relation],
        backgroundColor: RELATION_COLOURS[curve.relation],
        borderWidth: curve.selected ? 3 : 1.75,
        borderDash: curve.ageCalibrated ? undefined : [6, 4],
        pointRadius: 0,
        fill: false,
        order: curve.selected ? 1 : 2,
      });
    }
    if (s.star) {
      const st = s.star;
      const star = starDatasets(
        theme,
        `This star: ${this.axisLabel()} ${formatValue(st.colour.value, this.locale)}, ${formatValue(st.periodDays, this.locale)} d`,
        { x: st.colour.value, y: st.periodDays },
        [
          [
            { x: st.colour.value, y: st.periodLowDays },
            { x: st.colour.value, y: st.periodHighDays },
          ],
        ],
      );
      datasets.push(star.marker);
      for (const bar of star.bars) {
        hidden.add(datasets.length);
        datasets.push(bar);
      }
    }
    return { datasets, hidden, theme };
  });

  protected readonly data = computed<ChartData<'line', CurvePoint[]>>(() => ({ datasets: this.built().datasets }));

  protected readonly options = computed(() => {
    const { hidden, theme } = this.built();
    const s = this.series();
    return curveChartOptions({
      theme,
      locale: this.locale,
      hidden,
      xUnit: 'mag',
      x: {
        type: 'linear',
        min: Math.floor(s.domain.min * 10) / 10,
        max: Math.ceil(s.domain.max * 10) / 10,
        title: { display: true, text: `Intrinsic colour ${this.axisLabel()} (mag)`, color: theme.text },
      },
    });
  });

  /** Each relation's colour span and its period range over it, for the text alternative. */
  protected readonly rows = computed(() =>
    this.series().curves.map((curve) => {
      const first = curve.points[0];
      const last = curve.points[curve.points.length - 1];
      const f = (v: number) => formatValue(v, this.locale);
      return {
        relation: curve.relation,
        label: curve.label,
        colours: `${f(first.x)}–${f(last.x)}`,
        periods: `${f(first.y)}–${f(last.y)} d`,
      };
    }),
  );

  protected readonly summary = computed(() => {
    const s = this.series();
    const parts = [`At ${this.ageText()}, periods grow from blue to red colours.`];
    if (s.star) {
      parts.push(
        `This star: ${this.axisLabel()} ${formatValue(s.star.colour.value, this.locale)}, ${formatValue(s.star.periodDays, this.locale)} d (plausible ${formatValue(s.star.periodLowDays, this.locale)}–${formatValue(s.star.periodHighDays, this.locale)} d).`,
      );
    }
    if (s.curves.some((c) => !c.ageCalibrated)) parts.push('Dashed: the age is outside that relation’s calibrated ages.');
    return parts.join(' ');
  });

  protected readonly ariaLabel = computed(
    () => `Expected rotation period against intrinsic colour ${this.axisLabel()} at ${this.ageText()}. ${this.summary()}`,
  );
}
