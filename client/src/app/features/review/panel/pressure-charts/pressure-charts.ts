import { DecimalPipe, PercentPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { MatIcon } from '@angular/material/icon';
import type { CyclePressureReport } from '@spincycle/shared/review/pressure';
import type { ChartData, ChartOptions } from 'chart.js';
import { BaseChartDirective } from 'ng2-charts';
import { ColorScheme } from '../../../../core/layout/color-scheme';
import { chartTheme, OKABE_ITO } from '../../../../ui/charts/chart-palette';
import { provideSpincycleCharts } from '../../../../ui/charts/chart-setup';

/** "0–2 h" for a right-ascension bin. */
export function raBinLabel(bin: { startHours: number; endHours: number }): string {
  return `${bin.startHours}–${bin.endHours} h`;
}

/**
 * The cycle's pressure: per node, node-hours requested against available; per 2-h bin of right
 * ascension, node-hours requested against the dark hours the bin offers over the campaign. Each
 * chart has its numbers in a table beside it.
 */
@Component({
  selector: 'app-pressure-charts',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [BaseChartDirective, DecimalPipe, MatIcon, PercentPipe],
  providers: [provideSpincycleCharts()],
  template: `
    <p class="lead">
      {{ report().proposalCount }} {{ report().proposalCount === 1 ? 'proposal' : 'proposals' }} in review or ranked in
      {{ report().cycleCode }}; only feasible target plans on the nodes each proposal asks for are counted. Campaign
      {{ report().campaignStart }} to {{ report().campaignEnd }}.
    </p>
    <section class="pair" aria-labelledby="node-pressure-heading">
      <h3 id="node-pressure-heading">Per node: requested against available node-hours</h3>
      <div class="canvas-box">
        <canvas baseChart [type]="'bar'" [data]="nodeData()" [options]="nodeOptions()" role="img" [attr.aria-label]="nodeLabel()"></canvas>
      </div>
      <div class="table-scroll" tabindex="0" role="region" aria-label="Per node pressure table">
        <p class="table-scroll-hint">
          <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">swipe</mat-icon>Scroll sideways for more columns
        </p>
        <table data-testid="node-pressure-table">
          <thead>
            <tr>
              <th scope="col">Node</th>
              <th scope="col" class="num">Requested (node-hours)</th>
              <th scope="col" class="num">Available (node-hours)</th>
              <th scope="col" class="num">Pressure</th>
            </tr>
          </thead>
          <tbody>
            @for (n of report().nodes; track n.nodeId) {
              <tr [class.over]="n.pressure !== null && n.pressure > 1">
                <th scope="row">{{ n.nodeCode }}</th>
                <td class="num">{{ n.requestedNodeHours | number: '1.0-1' }}</td>
                <td class="num">{{ n.availableNodeHours | number: '1.0-1' }}</td>
                <td class="num">{{ n.pressure === null ? 'no capacity' : (n.pressure | percent: '1.0-0') }}</td>
              </tr>
            }
          </tbody>
        </table>
      </div>
    </section>
    <section class="pair" aria-labelledby="ra-pressure-heading">
      <h3 id="ra-pressure-heading">Per right ascension: requested node-hours against dark hours</h3>
      <div class="canvas-box">
        <canvas baseChart [type]="'bar'" [data]="raData()" [options]="raOptions()" role="img" [attr.aria-label]="raLabel()"></canvas>
      </div>
      <div class="table-scroll" tabindex="0" role="region" aria-label="Per right ascension pressure table">
        <p class="table-scroll-hint">
          <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">swipe</mat-icon>Scroll sideways for more columns
        </p>
        <table data-testid="ra-pressure-table">
          <thead>
            <tr>
              <th scope="col">Right ascension</th>
              <th scope="col" class="num">Requested (node-hours)</th>
              <th scope="col" class="num">Dark hours</th>
              <th scope="col" class="num">Pressure</th>
            </tr>
          </thead>
          <tbody>
            @for (b of report().raBins; track b.bin) {
              <tr [class.over]="b.pressure !== null && b.pressure > 1">
                <th scope="row">{{ label(b) }}</th>
                <td class="num">{{ b.requestedNodeHours | number: '1.0-1' }}</td>
                <td class="num">{{ b.darkHours | number: '1.0-1' }}</td>
                <td class="num">{{ b.pressure === null ? '—' : (b.pressure | percent: '1.0-0') }}</td>
              </tr>
            }
          </tbody>
        </table>
      </div>
      <p class="explain">
        Dark hours of a range of right ascension: for every night of the campaign and every node, the hours when the Sun is more than 18°
        below the horizon and a star in the middle of the range, passing overhead at the node's site, stands above the node's altitude limit
        — the most that range can be observed from there. They are added over the nodes.
      </p>
    </section>
  `,
  styles: `
    .pair {
      display: grid;
      grid-template-columns: minmax(0, 3fr) minmax(0, 2fr);
      gap: 16px;
      align-items: start;
      margin-block-end: 24px;
    }
    .pair h3,
    .pair .explain {
      grid-column: 1 / -1;
    }
    @media (max-width: 800px) {
      .pair {
        grid-template-columns: 1fr;
      }
    }
    .canvas-box {
      position: relative;
      block-size: 280px;
    }
    table {
      border-collapse: collapse;
      font-variant-numeric: tabular-nums;
      inline-size: 100%;
    }
    th[scope='row'] {
      white-space: nowrap;
    }
    /* The box's own border closes the table. */
    tbody tr:last-child > * {
      border-block-end: 0;
    }
    th,
    td {
      padding: 4px 8px;
      border-block-end: 1px solid var(--mat-sys-outline-variant);
      text-align: start;
    }
    .num {
      text-align: end;
    }
    tr.over td:last-child {
      color: var(--mat-sys-error);
      font-weight: 600;
    }
    .explain,
    .lead {
      color: var(--mat-sys-on-surface-variant);
      max-inline-size: 80ch;
    }
  `,
})
export class PressureCharts {
  readonly report = input.required<CyclePressureReport>();
  private readonly scheme = inject(ColorScheme);
  protected readonly label = raBinLabel;

  /**
   * The colour of what is available (node-hours, dark hours): the darker blue on the light
   * scheme, the sky blue on the dark one, so that the bars stand out (3:1 or more) from either ground.
   */
  private readonly capacityColour = computed(() => (this.scheme.isDark() ? OKABE_ITO.skyBlue : OKABE_ITO.blue));

  protected readonly nodeData = computed<ChartData<'bar', number[], string>>(() => ({
    labels: this.report().nodes.map((n) => n.nodeCode),
    datasets: [
      {
        label: 'Requested (node-hours)',
        data: this.report().nodes.map((n) => n.requestedNodeHours),
        backgroundColor: OKABE_ITO.vermillion,
      },
      {
        label: 'Available (node-hours)',
        data: this.report().nodes.map((n) => n.availableNodeHours),
        backgroundColor: this.capacityColour(),
      },
    ],
  }));

  protected readonly raData = computed<ChartData<'bar', number[], string>>(() => ({
    labels: this.report().raBins.map(raBinLabel),
    datasets: [
      {
        label: 'Requested (node-hours)',
        data: this.report().raBins.map((b) => b.requestedNodeHours),
        backgroundColor: OKABE_ITO.vermillion,
      },
      { label: 'Dark hours (h)', data: this.report().raBins.map((b) => b.darkHours), backgroundColor: this.capacityColour() },
    ],
  }));

  protected readonly nodeLabel = computed(
    () =>
      `Bar chart of requested and available node-hours for ${this.report().nodes.length} nodes; the numbers are in the table beside it.`,
  );
  protected readonly raLabel = computed(
    () =>
      'Bar chart of requested node-hours and dark hours for each 2-hour range of right ascension; the numbers are in the table beside it.',
  );

  protected readonly nodeOptions = computed(() => this.options('Node', 'Node-hours'));
  protected readonly raOptions = computed(() => this.options('Right ascension (h)', 'Hours'));

  private options(xTitle: string, yTitle: string): ChartOptions<'bar'> {
    const theme = chartTheme(this.scheme.isDark());
    return {
      responsive: true,
      maintainAspectRatio: false,
      animation: false,
      plugins: { legend: { labels: { color: theme.text } } },
      scales: {
        x: { title: { display: true, text: xTitle, color: theme.text }, ticks: { color: theme.mutedText }, grid: { color: theme.grid } },
        y: {
          beginAtZero: true,
          title: { display: true, text: yTitle, color: theme.text },
          ticks: { color: theme.mutedText },
          grid: { color: theme.grid },
        },
      },
    };
  }
}
