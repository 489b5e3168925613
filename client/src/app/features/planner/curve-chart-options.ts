/** What the planner's two curve charts share: the star's datasets and the chart.js options. */
import type { ChartDataset, ChartOptions } from 'chart.js';
import { logTickLabel } from '../../ui/charts/chart-format';
import type { ChartTheme } from '../../ui/charts/chart-palette';
import { formatValue } from './plan-display';
import type { CurvePoint } from './gyro-curves';

export type CurveDataset = ChartDataset<'line', CurvePoint[]>;

/** One axis of a line chart's options (chart.js's deep-partial scale options). */
export type LineScale = NonNullable<NonNullable<ChartOptions<'line'>['scales']>[string]>;

/** The star's marker and its error bars (the bars are hidden from the legend by the caller). */
export function starDatasets(
  theme: ChartTheme,
  label: string,
  point: CurvePoint,
  bars: CurvePoint[][],
): { marker: CurveDataset; bars: CurveDataset[] } {
  return {
    marker: {
      label,
      data: [point],
      showLine: false,
      pointRadius: 6,
      pointHoverRadius: 7,
      pointStyle: 'rectRot',
      pointBackgroundColor: theme.emphasis,
      pointBorderColor: theme.emphasis,
      borderColor: theme.emphasis,
      backgroundColor: theme.emphasis,
      order: 0,
    },
    bars: bars.map((data) => ({
      label: `${label} (range)`,
      data,
      borderColor: theme.emphasis,
      borderWidth: 2,
      pointRadius: 0,
      pointHitRadius: 0,
      fill: false,
      order: 0,
    })),
  };
}

/**
 * Options of a period chart: log period axis, the given x axis, legend and tooltip without the
 * datasets listed in `hidden` (band edges, error bars).
 */
export function curveChartOptions(args: {
  theme: ChartTheme;
  locale: string;
  hidden: ReadonlySet<number>;
  x: LineScale;
  xUnit: string;
}): ChartOptions<'line'> {
  const { theme, locale, hidden } = args;
  const axisTitle = (text: string) => ({ display: true, text, color: theme.text });
  return {
    responsive: true,
    maintainAspectRatio: false,
    animation: false,
    color: theme.text,
    interaction: { mode: 'nearest', intersect: false },
    scales: {
      x: { ...args.x, grid: { color: theme.grid }, ticks: { ...(args.x.ticks ?? {}), color: theme.mutedText } } as LineScale,
      y: {
        type: 'logarithmic',
        title: axisTitle('Rotation period (d)'),
        grid: { color: theme.grid },
        ticks: { color: theme.mutedText, callback: (value) => logTickLabel(value, locale) },
      },
    },
    plugins: {
      legend: {
        position: 'bottom',
        labels: { color: theme.text, boxWidth: 14, filter: (item) => !hidden.has(item.datasetIndex ?? -1) },
      },
      tooltip: {
        filter: (item) => !hidden.has(item.datasetIndex),
        callbacks: {
          label: (item) => {
            const p = item.raw as CurvePoint;
            return `${item.dataset.label}: ${formatValue(p.y, locale)} d at ${formatValue(p.x, locale)} ${args.xUnit}`;
          },
        },
      },
    },
  };
}
