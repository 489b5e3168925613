/** What the planner's two curve charts share: the star's datasets and the chart.js options. */
import type { ChartDataset, ChartOptions } from 'chart.js';
import { logTickLabel } from '../../ui/charts/chart-format';
import { curveChartLegend, errorBarStyle, markerStyle } from '../../ui/charts/chart-markers';
import type { ChartTheme } from '../../ui/charts/chart-palette';
import { logAxis125Hooks } from '../../ui/charts/log-ticks';
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
    marker: { label, data: [point], ...markerStyle('thisStar', theme), order: 0 },
    bars: bars.map((data) => ({ label: `${label} (range)`, data, ...errorBarStyle(theme), order: 0 })),
  };
}

/**
 * Options of a period chart: log period axis with 1–2–5 ticks, the given x axis (a log one gets
 * the same ticks), the charts' one legend style, legend and tooltip without the datasets listed
 * in `hidden` (band edges, error bars).
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
  const logTicks = { callback: (value: number | string) => logTickLabel(value, locale), maxRotation: 0, autoSkip: false };
  // A log x axis gets the 1–2–5 ticks; a linear one no extra labels at its ends (3.0 then 3.4).
  const x = (
    args.x.type === 'logarithmic'
      ? { ...args.x, ...logAxis125Hooks(), ticks: { ...(args.x.ticks ?? {}), ...logTicks } }
      : { ...args.x, ticks: { includeBounds: false, ...(args.x.ticks ?? {}) } }
  ) as LineScale;
  return {
    responsive: true,
    maintainAspectRatio: false,
    animation: false,
    color: theme.text,
    interaction: { mode: 'nearest', intersect: false },
    scales: {
      x: { ...x, grid: { color: theme.grid }, ticks: { ...(x.ticks ?? {}), color: theme.mutedText } } as LineScale,
      y: {
        type: 'logarithmic',
        title: axisTitle('Rotation period (d)'),
        grid: { color: theme.grid },
        ...logAxis125Hooks(),
        ticks: { ...logTicks, color: theme.mutedText },
      },
    },
    plugins: {
      legend: curveChartLegend(theme, (index) => hidden.has(index)),
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
