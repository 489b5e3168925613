/**
 * The science yield of a night plan: how often the planned visits recover the target's period.
 *
 * Injection and recovery on the planned visit times: each trial simulates the target's light
 * curve at its expected period and semi-amplitude (random phase), with the node's per-visit
 * precision and its systematic floor as one offset per night (campaign-simulation.ts), drops
 * whole nights at the node's weather-loss rate, runs the product's Lomb–Scargle over the plan's
 * search band on the plan's series (nightly means or single visits), and counts the trial as
 * recovered when the best period lies within 10 % of the injected one and its Baluev
 * false-alarm probability is below 1 %. The generator is seeded: the same plan and seed give
 * the same fraction.
 */
import { analyzePeriodogram } from '../science/lomb-scargle/periodogram';
import { simulatePlanCampaign } from '../science/campaign-simulation';
import { seededRandom } from '../science/seeded-random';
import type { TargetPlan } from '../science/target-plan';

/** Relative distance of the best period from the injected one that still counts (10 %). */
export const YIELD_PERIOD_TOLERANCE = 0.1;
/** Largest Baluev false-alarm probability that counts (1 %). */
export const YIELD_FALSE_ALARM = 0.01;

export interface YieldOptions {
  trials: number;
  seed: number;
  /** Share of nights lost to weather (the node's), 0 ≤ f < 1. */
  weatherLossFraction: number;
  /** Injected period, days (default: the plan's expected period). */
  periodDays?: number;
  /** Injected semi-amplitude, ppm (default: the plan's sizing amplitude); 0 injects pure noise. */
  semiAmplitudePpm?: number;
  /** Visits already done (same days as the planned ones): their nights are never dropped for weather. */
  observedTimesDays?: readonly number[];
}

export interface TargetYield {
  trials: number;
  recovered: number;
  /** recovered / trials; null without trials or visits. */
  fraction: number | null;
  /** Visit nights and visits in the plan (before weather). */
  visitNights: number;
  visits: number;
  /** One plain sentence for users. */
  explanation: string;
}

/**
 * Injection–recovery on planned visit times (see the file comment).
 * @param visitTimesDays the planned visits, in days from a reference at the middle of the first
 *   night's dark time, so that night n's visits lie within half a day of n.
 */
export function scienceYield(plan: TargetPlan, visitTimesDays: readonly number[], options: YieldOptions): TargetYield {
  const nightsOf = new Map<number, number[]>();
  const observedNights = new Set((options.observedTimesDays ?? []).map((t) => Math.floor(t + 0.5)));
  for (const t of visitTimesDays) {
    const night = Math.floor(t + 0.5);
    const list = nightsOf.get(night) ?? [];
    list.push(t);
    nightsOf.set(night, list);
  }
  const nights = [...nightsOf.keys()].sort((a, b) => a - b);
  const base = { visitNights: nights.length, visits: visitTimesDays.length };
  if (!visitTimesDays.length || options.trials <= 0) {
    return { ...base, trials: 0, recovered: 0, fraction: null, explanation: 'No visits are planned, so the period cannot be measured.' };
  }
  const rng = seededRandom(options.seed);
  const periodDays = options.periodDays ?? plan.quantities.periodDays.value;
  let recovered = 0;
  for (let i = 0; i < options.trials; i++) {
    const kept: number[] = [];
    for (const n of nights) {
      // One draw per night whatever happens, so that the draws do not depend on which nights were observed.
      const clear = rng.next() >= options.weatherLossFraction;
      if (clear || observedNights.has(n)) kept.push(...nightsOf.get(n)!);
    }
    // The periodogram needs four points at least: a trial left with fewer by the weather finds nothing.
    if (kept.length < 4) continue;
    const campaign = simulatePlanCampaign(plan, rng, { visitTimesDays: kept, periodDays, semiAmplitudePpm: options.semiAmplitudePpm });
    const series = plan.analysis.series === 'nightlyMeans' ? campaign.nightlyMeans : campaign.visits;
    if (series.timeDays.length < 4) continue;
    const result = analyzePeriodogram(series, {
      valueKind: 'flux',
      minimumFrequencyPerDay: plan.analysis.minFrequencyPerDay,
      maximumFrequencyPerDay: plan.analysis.maxFrequencyPerDay,
      top: 1,
    });
    const best = result.best;
    if (Math.abs(best.periodDays - periodDays) <= YIELD_PERIOD_TOLERANCE * periodDays && best.falseAlarmProbability < YIELD_FALSE_ALARM) {
      recovered++;
    }
  }
  const fraction = recovered / options.trials;
  const percent = Math.round(fraction * 100);
  const weather = Math.round(options.weatherLossFraction * 100);
  const observed = nights.filter((n) => observedNights.has(n)).length;
  return {
    ...base,
    trials: options.trials,
    recovered,
    fraction,
    explanation:
      `In ${options.trials} simulated campaigns on these ${base.visits} planned visits over ${base.visitNights} nights, ` +
      `with ${weather} % of ${observed ? `the nights still to come (not the ${observed} already observed)` : 'nights'} lost to weather, ` +
      `the period of ${formatDays(periodDays)} was found within 10 % ` +
      `and with a false-alarm probability below 1 % in ${recovered} (${percent} %).`,
  };
}

const formatDays = (d: number) => `${d < 10 ? d.toFixed(2) : d.toFixed(1)} days`;
