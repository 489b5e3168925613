/**
 * The charts of one target's measurement, built as chart.js data and options from the
 * measurement the server computed (pure; the component only draws): the detrended light curve
 * (magnitudes drawn brighter up), the periodogram against period on a log axis with the
 * expected range shaded, the false-alarm levels and the best peak, the spectral window, and the
 * curve folded at the best period with its phase bins and the fitted sinusoid. Each comes with
 * a sentence that says what it shows, for its text alternative.
 */
import type { RotationMeasurement } from '@spincycle/shared/photometry/photometry';
import type { ChartData, ChartDataset, ChartOptions } from 'chart.js';
import { logTickLabel } from '../../../ui/charts/chart-format';
import { curveChartLegend, curveStyle } from '../../../ui/charts/chart-markers';
import { type ChartTheme, OKABE_ITO, withAlpha } from '../../../ui/charts/chart-palette';
import { logAxis125Hooks } from '../../../ui/charts/log-ticks';
import {
  formatFap,
  formatFapLevel,
  formatNumber,
  foldedModel,
  spectrumByPeriod,
  thinEvenly,
  thinKeepingPeaks,
  type XY,
} from '../photometry-format';

/** Most points drawn in one series (the server already thins to a few thousand). */
export const MAX_DRAWN_POINTS = 4000;

export type LineDataset = ChartDataset<'line', XY[]>;

/** One chart: what to draw and its text alternative. */
export interface MeasurementChart {
  data: ChartData<'line', XY[]>;
  options: ChartOptions<'line'>;
  summary: string;
}

/** The y-axis title of the light curve's values. */
export function valueAxisTitle(m: RotationMeasurement): string {
  return m.input.valueKind === 'mag' ? 'Magnitude, detrended (mag)' : 'Relative flux, detrended';
}

const scatterStyle = (colour: string, radius = 1.8) =>
  ({
    showLine: false,
    pointRadius: radius,
    pointHoverRadius: radius + 2,
    pointBorderWidth: 0,
    pointBackgroundColor: colour,
    backgroundColor: colour,
    borderColor: colour,
  }) as const;

/** Chart options shared by the four charts: axis titles in the theme's text colour, no animation. */
function baseOptions(
  theme: ChartTheme,
  x: { title: string; type: 'linear' | 'logarithmic'; min?: number; max?: number; locale: string },
  y: { title: string; reverse?: boolean; min?: number; max?: number },
  leaveOut: (index: number) => boolean = () => false,
): ChartOptions<'line'> {
  const axisTitle = (text: string) => ({ display: true, text, color: theme.text });
  const xScale =
    x.type === 'logarithmic'
      ? {
          type: 'logarithmic' as const,
          min: x.min,
          max: x.max,
          title: axisTitle(x.title),
          grid: { color: theme.grid },
          ...logAxis125Hooks(),
          ticks: { color: theme.mutedText, callback: (v: number | string) => logTickLabel(v, x.locale), maxRotation: 0, autoSkip: false },
        }
      : {
          type: 'linear' as const,
          min: x.min,
          max: x.max,
          title: axisTitle(x.title),
          grid: { color: theme.grid },
          ticks: { color: theme.mutedText, includeBounds: false },
        };
  return {
    responsive: true,
    maintainAspectRatio: false,
    animation: false,
    color: theme.text,
    parsing: false,
    interaction: { mode: 'nearest', intersect: false },
    scales: {
      x: xScale,
      y: {
        type: 'linear',
        reverse: y.reverse ?? false,
        min: y.min,
        max: y.max,
        title: axisTitle(y.title),
        grid: { color: theme.grid },
        ticks: { color: theme.mutedText },
      },
    },
    plugins: {
      legend: curveChartLegend(theme, leaveOut),
      tooltip: { filter: (item) => !leaveOut(item.datasetIndex) },
    },
  };
}

/** The detrended light curve: time since the epoch against value, magnitudes brighter up. */
export function lightCurveChart(m: RotationMeasurement, theme: ChartTheme, locale: string): MeasurementChart {
  const { timeDays, values } = m.charts.lightCurve;
  const points = thinEvenly(
    timeDays.map((x, i) => ({ x, y: values[i] })).filter((p) => Number.isFinite(p.x) && Number.isFinite(p.y)),
    MAX_DRAWN_POINTS,
  );
  const mag = m.input.valueKind === 'mag';
  const span = timeDays.length ? timeDays[timeDays.length - 1] - timeDays[0] : 0;
  const ys = points.map((p) => p.y);
  const summary =
    `Light curve: ${formatNumber(m.input.points, locale, 0)} points over ${formatNumber(span, locale, 1)} days` +
    (points.length < timeDays.length ? ` (${formatNumber(points.length, locale, 0)} drawn)` : '') +
    (ys.length ? `, values from ${formatNumber(Math.min(...ys), locale, 4)} to ${formatNumber(Math.max(...ys), locale, 4)}` : '') +
    (mag ? ' magnitudes, brighter up.' : ' in relative flux.');
  return {
    data: { datasets: [{ label: 'Measurements', data: points, ...scatterStyle(OKABE_ITO.blue) }] },
    options: baseOptions(
      theme,
      { title: `Time since BJD ${formatNumber(m.epochBjd, locale, 3)} (d)`, type: 'linear', locale },
      { title: valueAxisTitle(m), reverse: mag },
    ),
    summary,
  };
}

/** The periodogram against period (log axis), the expected range, the false-alarm levels and the best peak. */
export function periodogramChart(m: RotationMeasurement, theme: ChartTheme, locale: string): MeasurementChart {
  const spectrum = thinKeepingPeaks(spectrumByPeriod(m.charts.periodogram.frequencyPerDay, m.charts.periodogram.power), MAX_DRAWN_POINTS);
  const minP = spectrum.length ? spectrum[0].x : 0.1;
  const maxP = spectrum.length ? spectrum[spectrum.length - 1].x : 100;
  const levels = m.charts.falseAlarmLevels;
  const top = Math.max(...spectrum.map((p) => p.y), ...levels.map((l) => l.power), m.best?.power ?? 0, 0.01) * 1.08;
  const datasets: LineDataset[] = [];
  const hidden = new Set<number>();
  if (m.expected) {
    const low = Math.max(m.expected.lowDays, minP);
    const high = Math.min(m.expected.highDays, maxP);
    if (high > low) {
      datasets.push({
        label: `Expected range (${formatNumber(m.expected.lowDays, locale, 1)}–${formatNumber(m.expected.highDays, locale, 1)} d)`,
        data: [
          { x: low, y: top },
          { x: high, y: top },
        ],
        borderWidth: 0,
        borderColor: withAlpha(OKABE_ITO.skyBlue, 0.22),
        backgroundColor: withAlpha(OKABE_ITO.skyBlue, 0.22),
        pointRadius: 0,
        pointHitRadius: 0,
        fill: 'origin',
      });
      hidden.add(datasets.length - 1);
    }
  }
  datasets.push({ label: 'Periodogram', data: spectrum, ...curveStyle(OKABE_ITO.blue), borderWidth: 1.25 });
  const levelColours = [theme.mutedText, OKABE_ITO.orange, OKABE_ITO.reddishPurple, OKABE_ITO.bluishGreen];
  levels.forEach((level, k) => {
    datasets.push({
      label: `FAP ${formatFapLevel(level.falseAlarmProbability, locale)}`,
      data: [
        { x: minP, y: level.power },
        { x: maxP, y: level.power },
      ],
      ...curveStyle(levelColours[k % levelColours.length], { dashed: true }),
    });
  });
  if (m.best) {
    datasets.push({
      label: `Best peak: ${formatNumber(m.best.periodDays, locale, 3)} d`,
      data: [{ x: m.best.periodDays, y: m.best.power }],
      showLine: false,
      pointStyle: 'rectRot',
      pointRadius: 7,
      pointHoverRadius: 9,
      pointBorderWidth: 2,
      pointBackgroundColor: OKABE_ITO.vermillion,
      pointBorderColor: theme.emphasis,
      backgroundColor: OKABE_ITO.vermillion,
      borderColor: theme.emphasis,
    });
  }
  const options = baseOptions(
    theme,
    { title: 'Period (d)', type: 'logarithmic', min: minP, max: maxP, locale },
    { title: 'Lomb–Scargle power', min: 0, max: top },
  );
  // The expected range is a shaded area: in the legend (a swatch), not in the tooltips.
  options.plugins!.tooltip = {
    filter: (item) => !hidden.has(item.datasetIndex),
    callbacks: {
      label: (item) => {
        const p = item.raw as XY;
        return `${item.dataset.label}: power ${formatNumber(p.y, locale, 3)} at ${formatNumber(p.x, locale, 3)} d`;
      },
    },
  };
  const levelsText = levels.length
    ? ` Dashed lines: the power a peak needs for a false-alarm probability of ${levels.map((l) => formatFapLevel(l.falseAlarmProbability, locale)).join(', ')}.`
    : '';
  const best = m.best
    ? ` Best peak at ${formatNumber(m.best.periodDays, locale, 3)} days, power ${formatNumber(m.best.power, locale, 3)}, false-alarm probability ${formatFap(m.best.falseAlarmProbability, locale)}.`
    : ' No peak was measured.';
  const expected = m.expected
    ? ` Shaded: the expected range, ${formatNumber(m.expected.lowDays, locale, 1)} to ${formatNumber(m.expected.highDays, locale, 1)} days.`
    : '';
  return {
    data: { datasets },
    options,
    summary: `Periodogram from ${formatNumber(minP, locale, 2)} to ${formatNumber(maxP, locale, 1)} days.${best}${expected}${levelsText}`,
  };
}

/** The spectral window against frequency: the peaks the sampling alone makes (a one-day rhythm at 1 d⁻¹). */
export function windowChart(m: RotationMeasurement, theme: ChartTheme, locale: string): MeasurementChart {
  const { frequencyPerDay, power } = m.charts.window;
  const points = thinKeepingPeaks(
    frequencyPerDay.map((x, i) => ({ x, y: power[i] })).filter((p) => Number.isFinite(p.x) && Number.isFinite(p.y)),
    MAX_DRAWN_POINTS,
  );
  const peaks = m.alias.windowPeaks.slice(0, 3).map((p) => `${formatNumber(p.frequencyPerDay, locale, 4)} per day`);
  return {
    data: { datasets: [{ label: 'Spectral window', data: points, ...curveStyle(theme.mutedText), borderWidth: 1.25 }] },
    options: {
      ...baseOptions(theme, { title: 'Frequency (1/d)', type: 'linear', locale }, { title: 'Window power', min: 0 }),
      plugins: { legend: { display: false } },
    },
    summary:
      'Spectral window: the power the sampling alone makes at each frequency.' +
      (peaks.length ? ` Strongest peaks at ${peaks.join(', ')}.` : ''),
  };
}

/** The light curve folded at the best period: points, their phase-bin means and the fitted sinusoid. */
export function foldedChart(m: RotationMeasurement, theme: ChartTheme, locale: string): MeasurementChart | null {
  if (!m.best) return null;
  const { phase, values, bins } = m.charts.folded;
  const points = thinEvenly(
    phase.map((x, i) => ({ x, y: values[i] })).filter((p) => Number.isFinite(p.x) && Number.isFinite(p.y)),
    MAX_DRAWN_POINTS,
  );
  const binned = bins.filter((b) => b.count > 0).map((b) => ({ x: b.phase, y: b.mean }));
  const mag = m.input.valueKind === 'mag';
  const amplitude = mag
    ? `${formatNumber(m.best.semiAmplitudeMmag, locale, 1)} mmag`
    : `${formatNumber(m.best.semiAmplitudePpm, locale, 0)} ppm`;
  const datasets: LineDataset[] = [
    { label: 'Measurements', data: points, ...scatterStyle(withAlpha(OKABE_ITO.skyBlue, 0.55), 1.6) },
    {
      label: 'Mean in phase bins',
      data: binned,
      showLine: false,
      pointStyle: 'rect',
      pointRadius: 4,
      pointHoverRadius: 6,
      pointBorderWidth: 1.5,
      pointBackgroundColor: OKABE_ITO.blue,
      pointBorderColor: theme.emphasis,
      backgroundColor: OKABE_ITO.blue,
      borderColor: theme.emphasis,
    },
    { label: 'Fitted sinusoid', data: foldedModel(m.best.fit), ...curveStyle(OKABE_ITO.vermillion, { main: true }) },
  ];
  return {
    data: { datasets },
    options: baseOptions(
      theme,
      { title: `Phase at ${formatNumber(m.best.periodDays, locale, 3)} d (0–1)`, type: 'linear', min: 0, max: 1, locale },
      { title: valueAxisTitle(m), reverse: mag },
    ),
    summary:
      `Light curve folded at ${formatNumber(m.best.periodDays, locale, 3)} days: ${formatNumber(phase.length, locale, 0)} points, ` +
      `the mean of ${binned.length} phase bins, and the fitted sinusoid of semi-amplitude ${amplitude}` +
      (mag ? ', brighter up.' : '.'),
  };
}
