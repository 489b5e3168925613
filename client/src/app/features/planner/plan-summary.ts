/**
 * The summary of a target plan: the handful of numbers a proposer decides on (period and its
 * range, spot amplitude, per-visit precision, visits, cadence, baseline, node-hours, fee,
 * completeness), the verdict, the reasons a plan cannot be carried out and the ways out, each
 * said once. The cadence is told one way everywhere (see {@link cadenceStory}).
 */
import type { TelescopeNode } from '@spincycle/shared/facility/facility-types';
import type { NodeTargetPlan } from '@spincycle/shared/planning/node-target-plan';
import type { TargetPlan } from '@spincycle/shared/science/target-plan';
import { formatMinorCurrency, formatPercent } from '../../ui/units/format-units';
import {
  cadenceStory,
  type CadenceStory,
  completenessPrices,
  formatValue,
  noExpectedPeriodFlag,
  noExpectedPeriodReason,
  ppmToMmag,
} from './plan-display';

export { cadenceStory, type CadenceStory, visitNightWords } from './plan-display';
import { plainSentence } from '../../ui/text/plan-wording';

/**
 * Thresholds past which a plan that the science allows is still not a sensible request for one
 * star (Spincycle's assumptions, said to the proposer as warnings): more than this many hours of
 * one visit night spent on the star, or more than this many visits in all.
 */
export const HOURS_PER_NIGHT_WARNING = 2;
export const VISITS_WARNING = 1000;

/**
 * Cautions of the science core that say a plan reaches its goal only at a price the proposer
 * must see: shown as the summary's warnings (not again among the notices).
 */
export const SUMMARY_WARNING_FLAGS: ReadonlySet<string> = new Set(['visitsBeyondFloor', 'nightsFilled']);

/** A caution's text without the cheaper options it lists (the ways out say them, once). */
function withoutWaysOut(message: string): string {
  return message.split(/;\s*\d+ % completeness needs|\.?\s*Cheaper ways? out:/)[0];
}

export type SummaryTone = 'feasible' | 'warning' | 'infeasible' | 'invalid';

/** One decision number of the summary. */
export interface SummaryFigure {
  key: 'period' | 'amplitude' | 'precision' | 'visits' | 'cadence' | 'baseline' | 'nodeHours' | 'fee' | 'completeness';
  label: string;
  value: string;
  unit: string;
  /** A second line: the range, the other unit, what it is made of. */
  detail: string | null;
}

export interface PlanSummary {
  tone: SummaryTone;
  title: string;
  /** For an invalid form: what to fix. */
  lead: string | null;
  figures: SummaryFigure[];
  cadence: CadenceStory | null;
  /** Warnings that a plan the science allows is still hard to justify. */
  warnings: string[];
  /** Every reason the plan cannot be carried out, each once. */
  reasons: string[];
  /** What would make it work (the cheapest first), each once. */
  wayOut: string[];
  /** The sky window's word on the plan, or where it stands. */
  sky: string | null;
}

/** The summary of a form that gives no plan. */
export function invalidSummary(lead: string): PlanSummary {
  return { tone: 'invalid', title: 'No plan yet', lead, figures: [], cadence: null, warnings: [], reasons: [], wayOut: [], sky: null };
}

const plural = (n: number, one: string, many: string) => (n === 1 ? one : many);

/** Sentences said once: the same text (case and final stop aside) is kept at its first place. */
export function uniqueSentences(texts: readonly string[]): string[] {
  const seen = new Set<string>();
  const out: string[] = [];
  for (const text of texts) {
    const sentence = plainSentence(text);
    const key = sentence.toLowerCase().replace(/[.!?\s]+$/, '');
    if (!sentence || seen.has(key)) continue;
    seen.add(key);
    out.push(sentence);
  }
  return out;
}

export interface SummaryInput {
  /** The plan shown (the proposal's plan on the sky windows once they are loaded). */
  plan: TargetPlan;
  node: Pick<TelescopeNode, 'code' | 'weatherLossFraction' | 'rateMinorPerHour' | 'currency'> & { site: { name: string } };
  /** The plan against the chosen node's sky windows, once loaded. */
  combined: NodeTargetPlan | null;
  /** Where the sky window stands when it is not loaded ("Sky window not checked: …"). */
  skyStatus: string | null;
  locale: string;
}

/** The summary of a computed plan. */
export function buildPlanSummary({ plan, node, combined, skyStatus, locale }: SummaryInput): PlanSummary {
  const q = plan.quantities;
  const f = (v: number) => formatValue(v, locale);
  const whole = (v: number) => formatValue(v, locale, { integer: true });
  const noPeriod = noExpectedPeriodFlag(plan);
  const sky = combined
    ? `Sky window from ${node.site.name}: ${combined.sky.fits ? 'the nights carry the cadence' : 'the nights do not carry the cadence'}.`
    : skyStatus;

  if (noPeriod) {
    // The visits and hours follow from a period the relation cannot give: they are not stated.
    return {
      tone: 'infeasible',
      title: `Not feasible on ${node.code}: no expected period`,
      lead: null,
      figures: [{ key: 'period', label: 'Expected period', value: 'None', unit: '', detail: 'no relation gives one for this star' }],
      cadence: null,
      warnings: [],
      reasons: uniqueSentences([noExpectedPeriodReason(noPeriod)]),
      wayOut: uniqueSentences(['Enter its expected period (from the literature or an earlier season) in the Period field under Star.']),
      sky,
    };
  }

  const cadence = cadenceStory(plan, locale);
  const k = Math.round(q.visitsPerNight.value);
  const hoursPerNight = (k * q.visitSeconds.value) / 3600;
  const completeness = q.completeness ?? null;
  const requested = q.requestedCompleteness ?? null;
  const figures: SummaryFigure[] = [
    {
      key: 'period',
      label: 'Expected period',
      value: f(q.periodDays.value),
      unit: 'd',
      detail: `plausible ${f(q.shortestPeriodDays.value)}–${f(q.longestPeriodDays.value)} d`,
    },
    {
      key: 'amplitude',
      label: 'Spot amplitude',
      value: whole(q.amplitudeRperPpm.value),
      unit: 'ppm',
      detail: `${f(ppmToMmag(q.amplitudeRperPpm.value))} mmag, smallest plausible`,
    },
    {
      key: 'precision',
      label: 'Per-visit precision',
      value: whole(q.perVisitPrecisionPpm.value),
      unit: 'ppm',
      detail: `${f(q.perVisitPrecisionMmag.value)} mmag`,
    },
    {
      key: 'visits',
      label: 'Visits',
      value: whole(q.visits.value),
      unit: '',
      detail: `${k} per night on ${whole(q.visitNights.value)} visit nights`,
    },
    {
      key: 'cadence',
      label: 'Cadence',
      value: cadence.visitNights,
      unit: '',
      detail: `${k} ${plural(k, 'visit', 'visits')} per night · sample interval ${f(q.sampleIntervalDays.value)} d`,
    },
    {
      key: 'baseline',
      label: 'Baseline',
      value: whole(q.baselineDays.value),
      unit: 'd',
      detail: `${f(q.baselineDays.value / q.longestPeriodDays.value)} rotations of the longest plausible period`,
    },
    {
      key: 'nodeHours',
      label: 'Node-hours',
      value: f(q.nodeHours.value),
      unit: 'h',
      detail: `with ${formatPercent(node.weatherLossFraction, locale)} weather loss`,
    },
    {
      key: 'fee',
      label: 'Fee',
      value: formatMinorCurrency(q.feeMinor.value, plan.currency, locale),
      unit: '',
      detail: `at ${formatMinorCurrency(node.rateMinorPerHour, node.currency, locale)} per node-hour`,
    },
  ];
  if (completeness) {
    figures.push({
      key: 'completeness',
      label: 'Completeness',
      value: formatPercent(completeness.value, locale),
      unit: '',
      detail: requested
        ? `chance of recovering the period; ${formatPercent(requested.value, locale)} asked for`
        : 'chance of recovering the period',
    });
  }

  const warnings: string[] = plan.flags.filter((flag) => SUMMARY_WARNING_FLAGS.has(flag.code)).map((flag) => withoutWaysOut(flag.message));
  const coreSaysNightsFilled = plan.flags.some((flag) => flag.code === 'nightsFilled');
  if (hoursPerNight > HOURS_PER_NIGHT_WARNING && !coreSaysNightsFilled) {
    warnings.push(`${k} visits per night keep ${node.code} on this one star for ${f(hoursPerNight)} h of every visit night.`);
  }
  if (q.visits.value > VISITS_WARNING) {
    warnings.push(
      `${whole(q.visits.value)} visits (${f(q.nodeHours.value)} node-hours) for one star: far more than a period search usually needs.`,
    );
  }

  const feasible = combined ? combined.feasible : plan.feasible;
  const blocking = plan.flags.filter((flag) => flag.severity === 'blocking').map((flag) => flag.message);
  const reasons = feasible ? [] : uniqueSentences(combined ? combined.reasons : blocking);
  const warningSentences = uniqueSentences(warnings);

  const ways: string[] = [];
  if (!feasible || warningSentences.length) {
    // The cheapest way out first: a lower completeness that is still reachable and costs less.
    const cheaper = completenessPrices(plan, locale).find((price) => {
      const n = q[price.key].value;
      return !price.current && price.reachable && n !== null && n < q.visits.value;
    });
    if (cheaper)
      ways.push(`Ask for ${cheaper.completeness} completeness: ${cheaper.visits} visits, about ${cheaper.nodeHours} node-hours.`);
  }
  if (combined) {
    ways.push(...combined.suggestions.map((s) => s.message));
  } else if (!feasible) {
    for (const flag of plan.flags) {
      if (flag.code === 'saturatesAtMinExposure')
        ways.push('A node with a smaller aperture or a redder band: the star saturates on this one even at the shortest exposure.');
      if (flag.code === 'saturatesAtChosenExposure') ways.push('A shorter exposure, or the automatic one.');
      if (flag.code === 'amplitudeBelowFloor') ways.push('A node with a lower systematic floor, or a lower completeness.');
      if (flag.code === 'nightlyVisitsDoNotFit') ways.push('Fewer visits per night: a node with a shorter visit (exposure and overhead).');
    }
  }
  if (warningSentences.length && ways.length < 2)
    ways.push('A node with a larger aperture or a lower systematic floor needs fewer visits.');

  const tone: SummaryTone = !feasible ? 'infeasible' : warningSentences.length ? 'warning' : 'feasible';
  const title =
    tone === 'infeasible'
      ? `Not feasible on ${node.code}`
      : tone === 'warning'
        ? `Feasible on ${node.code} only at a high cost`
        : `Feasible on ${node.code}`;
  return { tone, title, lead: null, figures, cadence, warnings: warningSentences, reasons, wayOut: uniqueSentences(ways), sky };
}
