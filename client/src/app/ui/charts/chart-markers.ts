/**
 * One marker and legend style for every chart that places stars on gyrochronology curves (the
 * planner's period–age and period–colour charts, a proposal's cluster chart): the same shape,
 * size and fill for the same meaning, curves drawn as lines and bands as swatches in the legend,
 * legend at the bottom. Shapes carry the meaning as well as colours (Okabe & Ito 2008), so the
 * charts read in any colour vision and in print.
 */
import type { Chart, ChartDataset, ChartOptions, LegendItem, PointStyle } from 'chart.js';
import { type ChartTheme, OKABE_ITO, withAlpha } from './chart-palette';

/** The legend options of a line chart (chart.js's deep-partial plugin options). */
export type LineLegendOptions = NonNullable<NonNullable<ChartOptions<'line'>['plugins']>['legend']>;

/** What a marker stands for. */
export type MarkerKind = 'thisStar' | 'feasible' | 'partly' | 'infeasible' | 'unplanned';

/** Radius of every marker, px (hover: two more). */
export const MARKER_RADIUS = 6;

/** Shape and colour of each kind of marker; the star being planned is the one solid diamond. */
export function markerLook(kind: MarkerKind, theme: ChartTheme): { pointStyle: PointStyle; colour: string; fill: string } {
  switch (kind) {
    case 'thisStar':
      return { pointStyle: 'rectRot', colour: theme.emphasis, fill: theme.emphasis };
    case 'feasible':
      return { pointStyle: 'circle', colour: theme.emphasis, fill: withAlpha('#808080', 0.6) };
    case 'partly':
      // Okabe–Ito yellow is too pale for an outline on a light ground: yellow inside, the text colour around it.
      return { pointStyle: 'triangle', colour: theme.mutedText, fill: withAlpha(OKABE_ITO.yellow, 0.85) };
    case 'infeasible':
      return { pointStyle: 'crossRot', colour: OKABE_ITO.vermillion, fill: withAlpha(OKABE_ITO.vermillion, 0.6) };
    case 'unplanned':
      return { pointStyle: 'rect', colour: OKABE_ITO.skyBlue, fill: withAlpha(OKABE_ITO.skyBlue, 0.6) };
  }
}

/** Dataset options of a group of markers (no line between them). */
export function markerStyle(kind: MarkerKind, theme: ChartTheme) {
  const look = markerLook(kind, theme);
  return {
    showLine: false,
    pointStyle: look.pointStyle,
    pointRadius: MARKER_RADIUS,
    pointHoverRadius: MARKER_RADIUS + 2,
    pointBorderWidth: 2,
    pointBackgroundColor: look.fill,
    pointBorderColor: look.colour,
    backgroundColor: look.fill,
    borderColor: look.colour,
  } as const;
}

/** Dataset options of an error bar (a range of the star), in the star's colour; keep it out of the legend. */
export function errorBarStyle(theme: ChartTheme) {
  return { borderColor: theme.emphasis, borderWidth: 2, pointRadius: 0, pointHitRadius: 0, fill: false } as const;
}

/** Dataset options of a relation's curve: the main one thicker, others dashed when asked. */
export function curveStyle(colour: string, options: { main?: boolean; dashed?: boolean } = {}) {
  return {
    borderColor: colour,
    backgroundColor: colour,
    borderWidth: options.main ? 3 : 1.75,
    borderDash: options.dashed ? [6, 4] : [],
    pointRadius: 0,
    pointHitRadius: 0,
    fill: false,
  };
}

/** Dataset options of the upper edge of a shaded ±1σ band (filled down to the next dataset, its lower edge). */
export function bandStyle(colour: string) {
  return {
    borderWidth: 0,
    borderColor: withAlpha(colour, 0.18),
    backgroundColor: withAlpha(colour, 0.18),
    pointRadius: 0,
    pointHitRadius: 0,
    fill: '+1' as const,
  };
}

/** The parts of a dataset its legend entry is drawn from. */
type LegendSource = Partial<{
  label: string;
  showLine: boolean;
  fill: unknown;
  borderWidth: number;
  borderColor: unknown;
  backgroundColor: unknown;
  borderDash: number[];
  pointStyle: unknown;
  pointBackgroundColor: unknown;
  pointBorderColor: unknown;
  pointBorderWidth: unknown;
}>;

const asColour = (value: unknown, fallback: string): string => (typeof value === 'string' ? value : fallback);

/**
 * The legend entry of one dataset: markers show their own shape, a shaded band a swatch, and a
 * curve a short line in its colour, width and dash.
 */
export function legendItemFor(dataset: LegendSource, datasetIndex: number, theme: ChartTheme, hidden = false): LegendItem {
  const base = { text: dataset.label ?? '', datasetIndex, hidden, fontColor: theme.text };
  if (dataset.showLine === false) {
    return {
      ...base,
      pointStyle: (typeof dataset.pointStyle === 'string' ? dataset.pointStyle : 'circle') as PointStyle,
      fillStyle: asColour(dataset.pointBackgroundColor, theme.emphasis),
      strokeStyle: asColour(dataset.pointBorderColor, theme.emphasis),
      lineWidth: typeof dataset.pointBorderWidth === 'number' ? dataset.pointBorderWidth : 1,
      lineDash: [],
    };
  }
  if (dataset.fill && !dataset.borderWidth) {
    const colour = asColour(dataset.backgroundColor, theme.grid);
    return { ...base, pointStyle: 'rect', fillStyle: colour, strokeStyle: colour, lineWidth: 0, lineDash: [] };
  }
  const colour = asColour(dataset.borderColor, theme.text);
  return {
    ...base,
    pointStyle: 'line',
    fillStyle: colour,
    strokeStyle: colour,
    lineWidth: Math.max(2, dataset.borderWidth ?? 2),
    lineDash: dataset.borderDash ?? [],
  };
}

/**
 * Legend options of every curve-and-marker chart: at the bottom, one entry per dataset
 * (`legendItemFor`), leaving out datasets without a label and those `leaveOut` names (band
 * edges, error bars). A click hides or shows the dataset, as chart.js's default does.
 */
export function curveChartLegend(theme: ChartTheme, leaveOut: (datasetIndex: number) => boolean = () => false): LineLegendOptions {
  return {
    position: 'bottom',
    labels: {
      color: theme.text,
      usePointStyle: true,
      boxHeight: 10,
      padding: 14,
      generateLabels: (chart: Chart) =>
        (chart.data.datasets as ChartDataset[]).map((dataset, index) =>
          legendItemFor(dataset as LegendSource, index, theme, !chart.isDatasetVisible(index)),
        ),
      filter: (item: LegendItem) => item.text !== '' && !leaveOut(item.datasetIndex ?? -1),
    },
  };
}
