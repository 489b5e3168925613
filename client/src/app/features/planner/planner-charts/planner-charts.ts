import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { GyrochroneChart } from '../gyrochrone-chart/gyrochrone-chart';
import type { GyrochroneSeries, PeriodColourSeries } from '../gyro-curves';
import { PeriodColourChart } from '../period-colour-chart/period-colour-chart';

/** The gyrochronology charts of the plan: period against age, and period against colour. */
@Component({
  selector: 'app-planner-charts',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [GyrochroneChart, PeriodColourChart],
  template: `
    <section aria-labelledby="gyro-heading">
      <h2 id="gyro-heading">Gyrochronology</h2>
      <div class="chart-grid">
        @if (gyrochrone(); as series) {
          <app-gyrochrone-chart [series]="series" />
        }
        @if (periodColour(); as series) {
          <app-period-colour-chart [series]="series" />
        }
      </div>
    </section>
  `,
  styles: `
    :host {
      display: block;
    }
    h2 {
      margin: 0 0 8px;
      font: var(--mat-sys-title-large);
    }
    .chart-grid {
      display: grid;
      grid-template-columns: repeat(auto-fit, minmax(min(100%, 420px), 1fr));
      gap: 24px;
    }
  `,
})
export class PlannerCharts {
  readonly gyrochrone = input<GyrochroneSeries | null>(null);
  readonly periodColour = input<PeriodColourSeries | null>(null);
}
