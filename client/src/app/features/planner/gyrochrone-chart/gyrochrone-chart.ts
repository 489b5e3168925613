import { ChangeDetectionStrategy, Component, computed, inject, input, LOCALE_ID } from '@angular/core';
import { colourLabel } from '@spincycle/shared/science/colour-sequence';
import { periodFromAge } from '@spincycle/shared/science/gyrochronology';
import type { ChartData } from 'chart.js';
import { BaseChartDirective } from 'ng2-charts';
import { ColorScheme } from '../../../core/layout/color-scheme';
import { logTickLabel } from '../../../ui/charts/chart-format';
import { chartTheme, RELATION_COLOURS, withAlpha } from '../../../ui/charts/chart-palette';
import { provideSpincycleCharts } from '../../../ui/charts/chart-setup';
import { type CurveDataset, curveChartOptions, starDatasets } from '../curve-chart-options';
import { type CurvePoint, GYROCHRONE_AGE_RANGE_MYR, type GyrochroneSeries } from '../gyro-curves';
import { formatValue } from '../plan-display';

/** Ages of the chart's table alternative, Myr. */
const TABLE_AGES_MYR = [100, 300, 1000, 3000, 10000];

let nextId = 0;

/**
 * Gyrochrones at the star's colour: expected period against age (log–log), one line per
 * relation that covers the colour (dashed outside its calibrated ages), the ±1σ band of the
 * plan's relation, and the star at its age ± 1σ with its plausible period range.
 */
@Component({
  selector: 'app-gyrochrone-chart',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [BaseChartDirective],
  providers: [provideSpincycleCharts()],
  templateUrl: './gyrochrone-chart.html',
  styleUrl: '../curve-chart.scss',
})
export class GyrochroneChart {
  readonly series = input.required<GyrochroneSeries>();

  private readonly locale = inject(LOCALE_ID);
  private readonly scheme = inject(ColorScheme);
  protected readonly headingId = `gyrochrone-chart-${nextId++}`;

  protected readonly colourText = computed(() => {
    const c = this.series().colour;
    return `(${colourLabel(c.system)})0 = ${formatValue(c.value, this.locale)} mag`;
  });

  private readonly built = computed(() => {
    const s = this.series();
    const theme = chartTheme(this.scheme.isDark());
    const datasets: CurveDataset[] = [];
    const hidden = new Set<number>();
    if (s.band) {
      const colour = RELATION_COLOURS[s.band.relation];
      datasets.push({
        label: `±1σ of ${s.band.label} (coefficients)`,
        data: s.band.high,
        borderWidth: 0,
        pointRadius: 0,
        pointHitRadius: 0,
        backgroundColor: withAlpha(colour, 0.18),
        borderColor: withAlpha(colour, 0.18),
        fill: '+1',
        order: 3,
      });
      hidden.add(datasets.length);
      datasets.push({
        label: `−1σ of ${s.band.label}`,
        data: s.band.low,
        borderWidth: 0,
        pointRadius: 0,
        pointHitRadius: 0,
        fill: false,
        order: 3,
      });
    }
    for (const curve of s.curves) {
      const { min, max } = curve.calibratedAgeMyr;
      const outside = (x: number) => x < min - 1e-9 || x > max + 1e-9;
      datasets.push({
        label: curve.selected ? `${curve.label} (the plan's relation)` : curve.label,
        data: curve.points,
        borderColor: RELATION_COLOURS[curve.relation],
        backgroundColor: RELATION_COLOURS[curve.relation],
        borderWidth: curve.selected ? 3 : 1.75,
        pointRadius: 0,
        fill: false,
        order: curve.selected ? 1 : 2,
        segment: { borderDash: (ctx) => (outside(ctx.p0.parsed.x ?? 0) || outside(ctx.p1.parsed.x ?? 0) ? [6, 4] : undefined) },
      });
    }
    if (s.star) {
      const st = s.star;
      const star = starDatasets(
        theme,
        `This star: ${formatValue(st.ageMyr, this.locale)} Myr, ${formatValue(st.periodDays, this.locale)} d`,
        { x: st.ageMyr, y: st.periodDays },
        [
          [
            { x: st.ageLowMyr, y: st.periodDays },
            { x: st.ageHighMyr, y: st.periodDays },
          ],
          [
            { x: st.ageMyr, y: st.periodLowDays },
            { x: st.ageMyr, y: st.periodHighDays },
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
    const locale = this.locale;
    return curveChartOptions({
      theme,
      locale,
      hidden,
      xUnit: 'Myr',
      x: {
        type: 'logarithmic',
        min: GYROCHRONE_AGE_RANGE_MYR.min,
        max: GYROCHRONE_AGE_RANGE_MYR.max,
        title: { display: true, text: 'Age (Myr)', color: theme.text },
        ticks: { callback: (value) => logTickLabel(value, locale), maxRotation: 0, autoSkip: false },
      },
    });
  });

  /** Each drawn relation's period at the star's age, for the text alternative. */
  protected readonly atStarAge = computed(() => {
    const s = this.series();
    const age = s.star?.ageMyr;
    if (age === undefined) return [];
    return s.curves.map((curve) => ({ label: curve.label, period: this.periodOf(curve.relation, curve.relationColour.value, age) }));
  });

  protected readonly summary = computed(() => {
    const s = this.series();
    const parts: string[] = [];
    if (s.star) {
      const list = this.atStarAge()
        .map((row) => `${row.label} ${row.period}`)
        .join('; ');
      parts.push(list ? `At ${formatValue(s.star.ageMyr, this.locale)} Myr: ${list}.` : '');
    }
    if (s.band) parts.push(`Shaded: ±1σ of ${s.band.label} from its coefficients.`);
    if (
      s.curves.some((c) => c.calibratedAgeMyr.min > GYROCHRONE_AGE_RANGE_MYR.min || c.calibratedAgeMyr.max < GYROCHRONE_AGE_RANGE_MYR.max)
    ) {
      parts.push('Dashed: outside a relation’s calibrated ages.');
    }
    if (!s.curves.length) parts.push('No relation is calibrated for this colour.');
    return parts.filter(Boolean).join(' ');
  });

  protected readonly ariaLabel = computed(
    () => `Expected rotation period against age, 100 Myr to 10 Gyr, at ${this.colourText()}. ${this.summary()}`,
  );

  protected readonly table = computed(() =>
    TABLE_AGES_MYR.map((age) => ({
      age: formatValue(age, this.locale),
      periods: this.series().curves.map((curve) => this.periodOf(curve.relation, curve.relationColour.value, age)),
    })),
  );

  private periodOf(relation: Parameters<typeof periodFromAge>[0], colour: number, age: number): string {
    try {
      return `${formatValue(periodFromAge(relation, colour, age), this.locale)} d`;
    } catch {
      return '—';
    }
  }
}
