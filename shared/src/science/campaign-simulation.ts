/**
 * Simulates the campaign a target plan prescribes and analyses it the way the plan says it
 * will be analysed, so that the plan's promise ("the period is recovered with probability
 * c") can be checked by injection and recovery rather than by re-deriving its formula.
 *
 * The simulated campaign: the plan's visit nights (one every `nightStepDays`, clear — the
 * plan counts clear visits, weather adds calendar time), `visitsPerNight` visits spread over
 * an observing window of the night, a sinusoid of the plan's semi-amplitude at the injected
 * period with a random phase, white noise per visit (photon, sky, read, scintillation) and
 * the systematic floor as one offset per night (correlated within the night).
 * The analysis: the product's own Lomb–Scargle over the plan's search band, on nightly means
 * (or on single visits for short periods, as `plan.analysis.series` says), with the Baluev
 * false-alarm probability; the period counts as recovered when the best peak lies within
 * half a resolution element (1/(2T)) of the injected frequency and its false-alarm
 * probability is at most the plan's.
 */
import type { LightCurve } from './lomb-scargle/light-curve';
import { analyzePeriodogram } from './lomb-scargle/periodogram';
import type { SeededRandom } from './seeded-random';
import type { TargetPlan } from './target-plan';

export interface SimulationOptions {
  /** Injected period, days (default: the plan's expected period). */
  periodDays?: number;
  /** Injected semi-amplitude, ppm (default: the plan's sizing amplitude). */
  semiAmplitudePpm?: number;
  /** Hours of the night over which a night's visits are spread (default 6). */
  nightWindowHours?: number;
  /** Visit times to use instead of the plan's idealised nights, days (e.g. from a site's sky windows). */
  visitTimesDays?: ArrayLike<number>;
}

export interface SimulatedCampaign {
  /** Every visit (relative flux, 1 = mean). */
  visits: LightCurve;
  /** Nightly means of the visits, with σ_night. */
  nightlyMeans: LightCurve;
  injected: { periodDays: number; semiAmplitudePpm: number; phaseRad: number };
}

/** One simulated campaign of the plan. */
export function simulatePlanCampaign(plan: TargetPlan, rng: SeededRandom, options: SimulationOptions = {}): SimulatedCampaign {
  const q = plan.quantities;
  const periodDays = options.periodDays ?? q.periodDays.value;
  const amplitude = (options.semiAmplitudePpm ?? q.semiAmplitudePpm.value) * 1e-6;
  const sigmaVisit = q.perVisitPrecisionPpm.value * 1e-6;
  const floor = plan.precision.components.floorPpm * 1e-6;
  const white = Math.sqrt(Math.max(0, sigmaVisit ** 2 - floor ** 2));
  const phase = rng.uniform(0, 2 * Math.PI);
  const times = options.visitTimesDays ? Array.from(options.visitTimesDays) : idealisedVisitTimes(plan, rng, options.nightWindowHours ?? 6);
  const n = times.length;
  const t = new Float64Array(n);
  const y = new Float64Array(n);
  const dy = new Float64Array(n).fill(sigmaVisit);
  const nightOf = new Int32Array(n);
  const offsets = new Map<number, number>();
  for (let i = 0; i < n; i++) {
    const night = Math.floor(times[i] + 0.5);
    let offset = offsets.get(night);
    if (offset === undefined) {
      offset = rng.normal(0, floor);
      offsets.set(night, offset);
    }
    t[i] = times[i];
    nightOf[i] = night;
    y[i] = 1 + amplitude * Math.sin((2 * Math.PI * times[i]) / periodDays + phase) + offset + rng.normal(0, white);
  }
  return {
    visits: { timeDays: t, values: y, uncertainties: dy },
    nightlyMeans: nightlyMeansOf(t, y, nightOf, white, floor),
    injected: { periodDays, semiAmplitudePpm: amplitude * 1e6, phaseRad: phase },
  };
}

/** The plan's visit nights, clear, with the night's visits spread over a window of the night. */
function idealisedVisitTimes(plan: TargetPlan, rng: SeededRandom, windowHours: number): number[] {
  const q = plan.quantities;
  const nights = Math.round(q.visitNights.value);
  const step = q.nightStepDays.value;
  const k = Math.round(q.visitsPerNight.value);
  const windowDays = windowHours / 24;
  const out: number[] = [];
  for (let i = 0; i < nights; i++) {
    // The window's start drifts through the season (the target rises earlier each night);
    // the visits sit at random places within their share of the window.
    const start = i * step - windowDays / 2 + rng.uniform(-0.05, 0.05);
    for (let j = 0; j < k; j++) out.push(start + ((j + rng.next()) / k) * windowDays);
  }
  return out;
}

function nightlyMeansOf(t: Float64Array, y: Float64Array, nightOf: Int32Array, white: number, floor: number): LightCurve {
  const sums = new Map<number, { t: number; y: number; k: number }>();
  for (let i = 0; i < t.length; i++) {
    const s = sums.get(nightOf[i]) ?? { t: 0, y: 0, k: 0 };
    s.t += t[i];
    s.y += y[i];
    s.k += 1;
    sums.set(nightOf[i], s);
  }
  const rows = [...sums.values()].sort((a, b) => a.t / a.k - b.t / b.k);
  return {
    timeDays: Float64Array.from(rows, (r) => r.t / r.k),
    values: Float64Array.from(rows, (r) => r.y / r.k),
    uncertainties: Float64Array.from(rows, (r) => Math.sqrt(white ** 2 / r.k + floor ** 2)),
  };
}

export interface RecoveryResult {
  recovered: boolean;
  bestPeriodDays: number;
  falseAlarmProbability: number;
}

/** Analyses a simulated campaign as the plan prescribes (band, series, false-alarm level). */
export function analysePlanCampaign(plan: TargetPlan, campaign: SimulatedCampaign): RecoveryResult {
  const series = plan.analysis.series === 'nightlyMeans' ? campaign.nightlyMeans : campaign.visits;
  const result = analyzePeriodogram(series, {
    valueKind: 'flux',
    minimumFrequencyPerDay: plan.analysis.minFrequencyPerDay,
    maximumFrequencyPerDay: plan.analysis.maxFrequencyPerDay,
    top: 1,
  });
  const fTrue = 1 / campaign.injected.periodDays;
  const tolerance = 0.5 / result.baselineDays;
  return {
    recovered:
      Math.abs(result.best.frequencyPerDay - fTrue) <= tolerance &&
      result.best.falseAlarmProbability <= plan.analysis.falseAlarmProbability,
    bestPeriodDays: result.best.periodDays,
    falseAlarmProbability: result.best.falseAlarmProbability,
  };
}

/** Fraction of `trials` simulated campaigns in which the period is recovered. */
export function recoveryFraction(plan: TargetPlan, rng: SeededRandom, trials: number, options: SimulationOptions = {}): number {
  let hits = 0;
  for (let i = 0; i < trials; i++) if (analysePlanCampaign(plan, simulatePlanCampaign(plan, rng, options)).recovered) hits++;
  return hits / trials;
}
