import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import type { ChartData, ChartOptions } from 'chart.js';
import { BaseChartDirective } from 'ng2-charts';
import { provideSpincycleCharts } from '../../../ui/charts/chart-setup';
import type { XY } from '../photometry-format';

let nextId = 0;

/**
 * One chart of a measurement as a figure: its heading, the canvas (an image whose accessible
 * name is the chart's summary), and a caption under it; projected content (a visually hidden
 * table of the key numbers, a note) follows the caption.
 */
@Component({
  selector: 'app-chart-figure',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [BaseChartDirective],
  providers: [provideSpincycleCharts()],
  template: `
    <figure [attr.aria-labelledby]="uid + '-title'" [attr.data-testid]="testId()">
      <h4 [id]="uid + '-title'">{{ heading() }}</h4>
      <div class="canvas-box" [style.block-size.px]="height()">
        <canvas baseChart [type]="'line'" [data]="data()" [options]="options()" role="img" [attr.aria-label]="summary()"></canvas>
      </div>
      <!-- The canvas is named by the same sentence: the caption is for sighted readers only, not read twice. -->
      <figcaption aria-hidden="true" [attr.data-testid]="testId() + '-summary'">{{ summary() }}</figcaption>
      <ng-content />
    </figure>
  `,
  styles: `
    :host {
      display: block;
      min-inline-size: 0;
    }
    figure {
      margin: 0;
      padding: 12px 16px;
      border: 1px solid var(--mat-sys-outline-variant);
      border-radius: var(--mat-sys-corner-medium);
    }
    h4 {
      font: var(--mat-sys-title-small);
      margin: 0 0 8px;
    }
    .canvas-box {
      position: relative;
    }
    figcaption {
      margin-block-start: 8px;
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-body-small);
      max-inline-size: 90ch;
    }
  `,
})
export class ChartFigure {
  readonly heading = input.required<string>();
  readonly data = input.required<ChartData<'line', XY[]>>();
  readonly options = input.required<ChartOptions<'line'>>();
  /** What the chart shows, in words: the canvas's accessible name and the caption. */
  readonly summary = input.required<string>();
  readonly height = input(300);
  readonly testId = input.required<string>();
  protected readonly uid = `chart-figure-${++nextId}`;
}
