/**
 * One target's rotation measurement from its returned photometry: detrending, the
 * Lomb–Scargle search over the expected band, the best period with its uncertainty,
 * false-alarm probability and amplitude, the spectral window and the alias check, the
 * verdict, the implied gyrochronological age, and the series of the charts.
 */
import type {
  DetrendOptions,
  ExpectedPeriod,
  LightCurveValueKind,
  MeasurementCharts,
  RotationMeasurement,
  SpectrumPeak,
  TimeSystem,
} from '../../photometry/photometry';
import { countOf } from '../explained';
import { BALUEV_SOURCE, baluevFalseAlarmProbability } from '../lomb-scargle/false-alarm';
import { FREQUENCY_GRID_SOURCE } from '../lomb-scargle/frequency-grid';
import { type PreparedLightCurve, prepareLightCurve } from '../lomb-scargle/light-curve';
import { FAST_METHOD_SOURCE, LOMB_SCARGLE_SOURCE, lombScarglePower } from '../lomb-scargle/lomb-scargle-power';
import { fitSinusoid, refinePeak, topPeaks } from '../lomb-scargle/periodogram';
import { isScienceInputError } from '../science-input-error';
import { PPM_PER_MMAG } from '../spot-amplitude';
import { ALIAS_RULE_TEXT, checkAliases, windowPeaksOf } from './alias-check';
import { CHART_LIMITS, FALSE_ALARM_LEVELS, displayLightCurve, foldedCurve, powerForFalseAlarm, thinSpectrum } from './charts';
import { DETREND_SOURCES, type Series, detrendSeries, mergeEqualTimes } from './detrend';
import { type StarForAge, impliedAge } from './implied-age';
import { searchBand } from './search-band';
import { BJD_SOURCE } from './time-systems';
import { VERDICT_RULE_TEXT, rotationVerdict } from './verdict';
import { WINDOW_SOURCE, spectralWindow } from './window-function';
import { checkDoublePeriod, DOUBLE_PERIOD_RULE_TEXT } from './double-period';

export type { StarForAge } from './implied-age';

/** Bumped when the measurement changes for the same input (stored measurements then say which model made them). */
export const ROTATION_MODEL_VERSION = 2;

/** Points needed before a period is searched for. */
export const MIN_MEASURE_POINTS = 10;
/** Peaks listed. */
const LISTED_PEAKS = 5;
/** Frequencies up to which the spectral window is always evaluated (the daily alias and its neighbours), 1/d. */
const WINDOW_MIN_FMAX = 1.2;

export interface MeasureInput {
  bjd: ArrayLike<number>;
  values: ArrayLike<number>;
  errors: ArrayLike<number> | null;
  nodes: readonly (string | null)[] | null;
  valueKind: LightCurveValueKind;
  timeSystems: TimeSystem[];
}

export interface MeasureContext {
  expected: ExpectedPeriod | null;
  /** The plan's search band, when the target has a plan. */
  band?: { minFrequencyPerDay: number; maxFrequencyPerDay: number } | null;
  star: StarForAge | null;
}

export const PERIOD_UNCERTAINTY_SOURCE =
  'σP = P²·σf, σf = sqrt(6/N)·σ/(π·A·T): Montgomery & O’Donoghue (1999), Delta Scuti Star Newsletter 13, 28; Kovács (1981) (from memory)';

const SOURCES = {
  periodogram: LOMB_SCARGLE_SOURCE,
  fastMethod: FAST_METHOD_SOURCE,
  grid: FREQUENCY_GRID_SOURCE,
  falseAlarm: BALUEV_SOURCE,
  periodUncertainty: PERIOD_UNCERTAINTY_SOURCE,
  window: WINDOW_SOURCE,
  alias: ALIAS_RULE_TEXT,
  verdict: 'A rule of this product; thresholds: common practice, no single source',
  clipping: DETREND_SOURCES.clipping,
  offsets: DETREND_SOURCES.offsets,
  binning: DETREND_SOURCES.binning,
  times: BJD_SOURCE,
  amplitude: '1 mmag = 920.6 ppm (SCIENCE.md §3, derived); for flux, relative to the mean',
};

/** Sorted copy of the input (times ascending). */
function sortedSeries(input: MeasureInput): Series {
  const n = input.bjd.length;
  const order = new Uint32Array(n);
  for (let i = 0; i < n; i++) order[i] = i;
  let sorted = true;
  for (let i = 1; i < n; i++) {
    if (input.bjd[i] < input.bjd[i - 1]) {
      sorted = false;
      break;
    }
  }
  if (!sorted) order.sort((a, b) => input.bjd[a] - input.bjd[b]);
  const t = new Float64Array(n);
  const y = new Float64Array(n);
  const e = input.errors ? new Float64Array(n) : null;
  const nodes: (string | null)[] = new Array<string | null>(n);
  for (let i = 0; i < n; i++) {
    const k = order[i];
    t[i] = input.bjd[k];
    y[i] = input.values[k];
    if (e && input.errors) e[i] = input.errors[k];
    nodes[i] = input.nodes ? (input.nodes[k] ?? null) : null;
  }
  return { t, y, e, nodes };
}

function emptyCharts(): MeasurementCharts {
  return {
    lightCurve: { timeDays: [], values: [], errors: null },
    periodogram: { frequencyPerDay: [], power: [] },
    window: { frequencyPerDay: [], power: [] },
    falseAlarmLevels: [],
    folded: { phase: [], values: [], bins: [] },
  };
}

/** Measures one target's rotation (see the module comment). Never throws on bad data: the verdict says what failed. */
export function measureRotation(input: MeasureInput, context: MeasureContext, detrend: DetrendOptions): RotationMeasurement {
  const raw = sortedSeries(input);
  const n0 = raw.t.length;
  const nodeSet = new Set<string>();
  for (const node of raw.nodes) if (node !== null) nodeSet.add(node);
  const inputInfo: RotationMeasurement['input'] = {
    points: n0,
    valueKind: input.valueKind,
    timeSystems: [...input.timeSystems],
    nodes: [...nodeSet].sort(),
    firstBjd: n0 > 0 ? raw.t[0] : 0,
    lastBjd: n0 > 0 ? raw.t[n0 - 1] : 0,
    hasErrors: input.errors !== null,
  };

  const d = detrendSeries(raw, input.valueKind, detrend);
  const merged = mergeEqualTimes(d);
  const s = merged.series;
  const steps = [...d.steps];
  if (merged.merged > 0) {
    steps.push(
      `${countOf(merged.merged, 'point')} shared ${merged.merged === 1 ? 'its' : 'their'} time with another and ${merged.merged === 1 ? 'was' : 'were'} averaged with it.`,
    );
  }
  const detrendInfo: RotationMeasurement['detrend'] = {
    options: { ...detrend },
    pointsUsed: s.t.length,
    pointsClipped: d.pointsClipped,
    offsets: d.offsets,
    offsetCount: d.offsetCount,
    binnedPoints: d.binnedPoints,
    steps,
  };
  const epochBjd = s.t.length > 0 ? s.t[0] : inputInfo.firstBjd;

  const nothing = (why: string): RotationMeasurement => {
    const v = rotationVerdict(null, why);
    return {
      modelVersion: ROTATION_MODEL_VERSION,
      input: inputInfo,
      detrend: detrendInfo,
      search: { minFrequencyPerDay: 0, maxFrequencyPerDay: 0, frequencies: 0, why },
      expected: context.expected,
      best: null,
      peaks: [],
      alias: { flagged: false, windowPeaks: [], candidates: [], message: null },
      verdict: v.verdict,
      verdictReasons: v.reasons,
      verdictRule: VERDICT_RULE_TEXT,
      age: null,
      epochBjd,
      charts: { ...emptyCharts(), lightCurve: displayLightCurve(s.t, s.y, s.e, epochBjd) },
      sources: SOURCES,
    };
  };

  if (s.t.length < MIN_MEASURE_POINTS) {
    return nothing(
      `Only ${countOf(s.t.length, 'point')} left after detrending: at least ${MIN_MEASURE_POINTS} are needed to search for a period.`,
    );
  }
  let data: PreparedLightCurve;
  try {
    data = prepareLightCurve({ timeDays: s.t, values: s.y, uncertainties: s.e ?? undefined });
  } catch (err) {
    if (!isScienceInputError(err)) throw err;
    return nothing(`The points cannot be searched: ${err.reason}.`);
  }
  if (!(data.baselineDays > 0)) return nothing('All points share one time: there is no time span to search.');
  try {
    return analyse(data, input, context, s, epochBjd, inputInfo, detrendInfo);
  } catch (err) {
    // A degenerate fit (e.g. times that make the sinusoid singular) is a verdict, not a crash of the worker.
    if (!isScienceInputError(err)) throw err;
    return nothing(`The points cannot be searched: ${err.reason}.`);
  }
}

/** The search, the best period, the window and alias check, the verdict, the age and the charts. */
function analyse(
  data: PreparedLightCurve,
  input: MeasureInput,
  context: MeasureContext,
  s: Series,
  epochBjd: number,
  inputInfo: RotationMeasurement['input'],
  detrendInfo: RotationMeasurement['detrend'],
): RotationMeasurement {
  const T = data.baselineDays;

  // Search.
  const band = searchBand(T, data.n, context.expected, context.band);
  const grid = { minFrequencyPerDay: band.minFrequencyPerDay, stepPerDay: band.stepPerDay, count: band.count };
  const power = lombScarglePower(data, grid, { method: 'fast' });
  const fmax = band.maxFrequencyPerDay;
  const baluev = { pointCount: data.n, maximumFrequencyPerDay: fmax, timeVarianceDays2: data.timeVariance };
  const fap = (z: number) => baluevFalseAlarmProbability(z, baluev);
  const freqAt = (k: number) => grid.minFrequencyPerDay + grid.stepPerDay * k;
  const peakIdx = topPeaks(power, LISTED_PEAKS);
  const peaks: SpectrumPeak[] = peakIdx.map((k) => ({
    frequencyPerDay: freqAt(k),
    periodDays: 1 / freqAt(k),
    power: power[k],
    falseAlarmProbability: fap(power[k]),
  }));
  const search: RotationMeasurement['search'] = {
    minFrequencyPerDay: band.minFrequencyPerDay,
    maxFrequencyPerDay: fmax,
    frequencies: band.count,
    why: band.why,
  };

  // Best peak, refined on the exact power.
  const gridBest = peakIdx[0];
  const refined = refinePeak(data, freqAt(gridBest), grid.stepPerDay);
  const f = refined.frequencyPerDay;
  const P = 1 / f;
  const fit = fitSinusoid(data, f);
  const residualRms = residualRmsOf(data, f, fit.offset - data.weightedMean, fit.sinCoefficient, fit.cosCoefficient);
  const A = fit.semiAmplitude;
  const sigmaF = A > 0 ? (Math.sqrt(6 / data.n) * residualRms) / (Math.PI * A * T) : Infinity;
  const sigmaP = Number.isFinite(sigmaF) ? sigmaF * P * P : null;
  const ppm = input.valueKind === 'mag' ? A * 1000 * PPM_PER_MMAG : (A / Math.abs(fit.offset)) * 1e6;
  const semiAmplitudePpm = Number.isFinite(ppm) ? ppm : 0;
  const semiAmplitudeMmag = input.valueKind === 'mag' ? A * 1000 : semiAmplitudePpm / PPM_PER_MMAG;
  const bestFap = fap(refined.power);
  const cyclesCovered = T / P;
  const expected = context.expected;

  // Spectral window from its first step up to max(fmax, 1.2 d⁻¹), same step.
  const wCount = Math.max(3, Math.ceil(Math.max(fmax, WINDOW_MIN_FMAX) / grid.stepPerDay));
  const window = spectralWindow(data.t, grid.stepPerDay, grid.stepPerDay, wCount);
  const windowPeaks = windowPeaksOf(window, grid.stepPerDay, grid.stepPerDay, T);
  const alias = checkAliases({
    data,
    f0: grid.minFrequencyPerDay,
    df: grid.stepPerDay,
    power,
    best: { frequencyPerDay: f, periodDays: P, power: refined.power, gridPower: power[gridBest] },
    windowPeaks,
    falseAlarm: fap,
  });

  const double = checkDoublePeriod(data, f);
  const v = rotationVerdict({ falseAlarmProbability: bestFap, cyclesCovered, aliasFlagged: alias.flagged, aliasNote: alias.note });
  const age = impliedAge(context.star, P, sigmaP, v.verdict, alias.flagged);

  // Charts.
  const freqs = new Float64Array(band.count);
  for (let k = 0; k < band.count; k++) freqs[k] = freqAt(k);
  // The window is drawn from zero to past the daily alias, whatever the band: its peaks are where aliases come from.
  const wFrom = 0;
  const wTo = wCount - 1;
  const wFreqs = new Float64Array(Math.max(0, wTo - wFrom + 1));
  for (let k = wFrom; k <= wTo; k++) wFreqs[k - wFrom] = (k + 1) * grid.stepPerDay;
  const charts: MeasurementCharts = {
    lightCurve: displayLightCurve(s.t, s.y, s.e, epochBjd),
    periodogram: thinSpectrum(freqs, power, CHART_LIMITS.spectrum),
    window: thinSpectrum(wFreqs, window.subarray(wFrom, wTo + 1), CHART_LIMITS.spectrum),
    falseAlarmLevels: FALSE_ALARM_LEVELS.map((p) => ({ falseAlarmProbability: p, power: powerForFalseAlarm(p, baluev) })),
    folded: foldedCurve(s.t, s.y, epochBjd, f),
  };

  return {
    modelVersion: ROTATION_MODEL_VERSION,
    input: inputInfo,
    detrend: detrendInfo,
    search,
    expected,
    best: {
      periodDays: P,
      frequencyPerDay: f,
      periodUncertaintyDays: sigmaP,
      power: refined.power,
      falseAlarmProbability: bestFap,
      semiAmplitude: A,
      semiAmplitudePpm,
      semiAmplitudeMmag,
      residualRms,
      cyclesCovered,
      withinExpected: expected ? P >= expected.lowDays && P <= expected.highDays : null,
      fit: { offset: fit.offset, sinCoefficient: fit.sinCoefficient, cosCoefficient: fit.cosCoefficient },
    },
    peaks,
    alias: { flagged: alias.flagged, windowPeaks: alias.windowPeaks, candidates: alias.candidates, message: alias.message },
    doublePeriod: {
      flagged: double.flagged && v.verdict !== 'not_detected',
      doublePeriodDays: double.doublePeriodDays,
      likelihoodRatio: double.likelihoodRatio,
      message: v.verdict !== 'not_detected' ? double.message : null,
      rule: DOUBLE_PERIOD_RULE_TEXT,
    },
    verdict: v.verdict,
    verdictReasons: v.reasons,
    verdictRule: VERDICT_RULE_TEXT,
    age,
    epochBjd,
    charts,
    sources: age ? { ...SOURCES, gyrochronology: age.source } : SOURCES,
  };
}

/** Rms of the residuals from offset + a·sin + b·cos (centred values, times from the earliest). */
function residualRmsOf(data: PreparedLightCurve, f: number, c0: number, a: number, b: number): number {
  const omega = 2 * Math.PI * f;
  let s = 0;
  for (let i = 0; i < data.n; i++) {
    const x = omega * data.t[i];
    const r = data.y[i] - (c0 + a * Math.sin(x) + b * Math.cos(x));
    s += r * r;
  }
  return Math.sqrt(s / data.n);
}
