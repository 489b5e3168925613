import { chartTheme, OKABE_ITO } from '../../../ui/charts/chart-palette';
import { testAliasMeasurement, testMeasurement } from '../testing/photometry-fixtures';
import { foldedChart, lightCurveChart, MAX_DRAWN_POINTS, periodogramChart, windowChart } from './measurement-charts';

type Scales = Record<string, { type: string; reverse?: boolean; min?: number; max?: number; title: { text: string } }>;

describe('measurement charts', () => {
  const theme = chartTheme(false);

  it('light curve: time since the epoch against value, magnitudes drawn brighter up', () => {
    const chart = lightCurveChart(testMeasurement(), theme, 'en-US');
    const scales = chart.options.scales as Scales;
    expect(scales['x'].title.text).toBe('Time since BJD 2,461,400.6 (d)');
    expect(scales['y'].title.text).toBe('Magnitude, detrended (mag)');
    expect(scales['y'].reverse).toBe(true);
    expect(chart.data.datasets[0].data).toHaveLength(40);
    expect(chart.summary).toContain('412 points over 39.4 days');
    expect(chart.summary).toContain('brighter up');
  });

  it('light curve in flux: not reversed; a long series is thinned for drawing', () => {
    const m = testMeasurement();
    const n = MAX_DRAWN_POINTS * 2 + 1;
    const flux = {
      ...m,
      input: { ...m.input, valueKind: 'flux' as const },
      charts: {
        ...m.charts,
        lightCurve: { timeDays: Array.from({ length: n }, (_, i) => i / 100), values: Array(n).fill(1), errors: null },
      },
    };
    const chart = lightCurveChart(flux, theme, 'en-US');
    expect((chart.options.scales as Scales)['y'].reverse).toBe(false);
    expect((chart.options.scales as Scales)['y'].title.text).toBe('Relative flux, detrended');
    expect(chart.data.datasets[0].data).toHaveLength(MAX_DRAWN_POINTS);
  });

  it('periodogram: period on a log axis, the expected range shaded, FAP levels dashed and labelled, the best peak marked', () => {
    const chart = periodogramChart(testMeasurement(), theme, 'en-US');
    const scales = chart.options.scales as Scales;
    expect(scales['x'].type).toBe('logarithmic');
    expect(scales['x'].title.text).toBe('Period (d)');
    expect(scales['y'].title.text).toBe('Lomb–Scargle power');
    const labels = chart.data.datasets.map((d) => d.label);
    expect(labels).toEqual(['Expected range (6.9–10.4 d)', 'Periodogram', 'FAP 1 %', 'FAP 0.1 %', 'Best peak: 8.214 d']);
    const [range, spectrum, fap1] = chart.data.datasets as { data: { x: number; y: number }[]; fill?: unknown; borderDash?: number[] }[];
    expect(range.fill).toBe('origin');
    expect(range.data.map((p) => p.x)).toEqual([6.9, 10.4]);
    // Periods ascending: 1/f of the fixture's 0.02…2.01 per day grid (worked by hand: 1/2.01 ≈ 0.4975, 1/0.02 = 50).
    expect(spectrum.data[0].x).toBeCloseTo(1 / 2.01, 6);
    expect(spectrum.data.at(-1)!.x).toBeCloseTo(50, 6);
    expect(fap1.borderDash).toEqual([6, 4]);
    expect(fap1.data.map((p) => p.y)).toEqual([0.3, 0.3]);
    const best = chart.data.datasets[4] as { data: { x: number; y: number }[]; pointBackgroundColor?: string };
    expect(best.data).toEqual([{ x: 8.214, y: 0.65 }]);
    expect(best.pointBackgroundColor).toBe(OKABE_ITO.vermillion);
    expect(chart.summary).toContain('Best peak at 8.214 days, power 0.65, false-alarm probability 3×10⁻⁵.');
    expect(chart.summary).toContain('Shaded: the expected range, 6.9 to 10.4 days.');
    expect(chart.summary).toContain('false-alarm probability of 1 %, 0.1 %');
  });

  it('window: frequency against window power, its strongest peaks in words', () => {
    const chart = windowChart(testMeasurement(), theme, 'en-US');
    expect((chart.options.scales as Scales)['x'].title.text).toBe('Frequency (1/d)');
    expect(chart.summary).toContain('Strongest peaks at 1.0027 per day.');
  });

  it('folded: points, phase-bin means and the fitted sinusoid over phase 0–1, brighter up', () => {
    const m = testMeasurement();
    const chart = foldedChart(m, theme, 'en-US')!;
    const scales = chart.options.scales as Scales;
    expect([scales['x'].min, scales['x'].max]).toEqual([0, 1]);
    expect(scales['y'].reverse).toBe(true);
    expect(chart.data.datasets.map((d) => d.label)).toEqual(['Measurements', 'Mean in phase bins', 'Fitted sinusoid']);
    const model = chart.data.datasets[2].data as { x: number; y: number }[];
    // At phase 0.25 the model is offset + s (worked by hand: sin(π/2) = 1, cos(π/2) = 0).
    const quarter = model.find((p) => Math.abs(p.x - 0.25) < 1e-9)!;
    expect(quarter.y).toBeCloseTo(m.best!.fit.offset + m.best!.fit.sinCoefficient, 12);
    expect(chart.summary).toContain('fitted sinusoid of semi-amplitude 4.2 mmag');
  });

  it('folded: none without a best period', () => {
    expect(foldedChart({ ...testMeasurement(), best: null }, theme, 'en-US')).toBeNull();
  });

  it('the alias-flagged measurement marks its best peak at the short period', () => {
    const chart = periodogramChart(testAliasMeasurement(), theme, 'en-US');
    expect(chart.data.datasets.at(-1)!.label).toBe('Best peak: 1.14 d');
  });

  it('dark scheme: the same charts with the dark theme’s text colours', () => {
    const dark = chartTheme(true);
    const chart = periodogramChart(testMeasurement(), dark, 'en-US');
    expect((chart.options.scales as Record<string, { title: { color: string } }>)['x'].title.color).toBe(dark.text);
  });
});
