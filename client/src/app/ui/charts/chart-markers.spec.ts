import type { Chart } from 'chart.js';
import {
  bandStyle,
  curveChartLegend,
  curveStyle,
  legendItemFor,
  MARKER_RADIUS,
  markerLook,
  type MarkerKind,
  markerStyle,
} from './chart-markers';
import { chartTheme, OKABE_ITO } from './chart-palette';

const light = chartTheme(false);

describe('chart markers', () => {
  it('one shape per meaning, all distinct, all the same size', () => {
    const kinds: MarkerKind[] = ['thisStar', 'feasible', 'partly', 'infeasible', 'unplanned'];
    const shapes = kinds.map((k) => markerLook(k, light).pointStyle);
    expect(new Set(shapes).size).toBe(kinds.length);
    for (const kind of kinds)
      expect(markerStyle(kind, light)).toMatchObject({ showLine: false, pointRadius: MARKER_RADIUS, pointBorderWidth: 2 });
    expect(markerStyle('thisStar', light)).toMatchObject({ pointStyle: 'rectRot', pointBackgroundColor: light.emphasis });
    expect(markerStyle('infeasible', light)).toMatchObject({ pointStyle: 'crossRot', pointBorderColor: OKABE_ITO.vermillion });
  });

  it('the star stands out in either scheme', () => {
    expect(markerLook('thisStar', chartTheme(true)).colour).toBe('#ffffff');
    expect(markerLook('thisStar', light).colour).toBe('#000000');
  });
});

describe('legend entries', () => {
  it('a marker group shows its own shape and colours', () => {
    const item = legendItemFor({ label: 'Target: infeasible on every node', ...markerStyle('infeasible', light) }, 4, light);
    expect(item).toMatchObject({
      text: 'Target: infeasible on every node',
      datasetIndex: 4,
      pointStyle: 'crossRot',
      strokeStyle: OKABE_ITO.vermillion,
      lineWidth: 2,
      hidden: false,
    });
  });

  it('a curve shows a line in its colour, width and dash; a band a swatch', () => {
    expect(legendItemFor({ label: 'Barnes (2007)', ...curveStyle(OKABE_ITO.blue, { main: true }) }, 0, light)).toMatchObject({
      pointStyle: 'line',
      strokeStyle: OKABE_ITO.blue,
      lineWidth: 3,
      lineDash: [],
    });
    expect(legendItemFor({ label: 'Other', ...curveStyle(OKABE_ITO.orange, { dashed: true }) }, 1, light)).toMatchObject({
      pointStyle: 'line',
      lineDash: [6, 4],
      lineWidth: 2,
    });
    expect(legendItemFor({ label: '±1σ', ...bandStyle(OKABE_ITO.blue) }, 2, light)).toMatchObject({
      pointStyle: 'rect',
      lineWidth: 0,
      fillStyle: 'rgba(0, 114, 178, 0.18)',
    });
  });

  it('curveChartLegend: at the bottom, point styles, one entry per dataset, unlabelled and left-out datasets filtered', () => {
    const legend = curveChartLegend(light, (index) => index === 2);
    expect(legend.position).toBe('bottom');
    expect(legend.labels?.usePointStyle).toBe(true);
    const chart = {
      data: {
        datasets: [
          { label: 'Curve', ...curveStyle('#000000') },
          { label: '', borderWidth: 0 },
          { label: 'Bar', borderWidth: 2 },
          { label: 'Star', ...markerStyle('thisStar', light) },
        ],
      },
      isDatasetVisible: (i: number) => i !== 3,
    } as unknown as Chart;
    const items = (legend.labels!.generateLabels as (c: Chart) => ReturnType<typeof legendItemFor>[])(chart);
    expect(items.map((i) => [i.text, i.pointStyle, i.hidden])).toEqual([
      ['Curve', 'line', false],
      ['', 'line', false],
      ['Bar', 'line', false],
      ['Star', 'rectRot', true],
    ]);
    const filter = legend.labels!.filter as (item: ReturnType<typeof legendItemFor>) => boolean;
    expect(items.filter((i) => filter(i)).map((i) => i.text)).toEqual(['Curve', 'Star']);
  });
});
