/**
 * How the planner shows a `TargetPlan`: human labels of its quantities, the source tags as
 * words, number formatting that never prints NaN, the compact key rows, the price of other
 * completeness levels and the search band the analysis must use.
 */
import type { SourceTag, Explained, FlagSeverity } from '@spincycle/shared/science/explained';
import type { ScienceFlag } from '@spincycle/shared/science/explained';
import type { TargetPlan, TargetPlanQuantities } from '@spincycle/shared/science/target-plan';
import { MAG_PER_RELATIVE_FLUX } from '@spincycle/shared/science/visit-precision';
import { QUANTITY_LABELS, SOURCE_TAG_DESCRIPTIONS } from '@spincycle/shared/science/quantity-labels';
import { formatMinorCurrency, formatPercent } from '../../ui/units/format-units';
import { plainText, provenanceOf, type ProvenanceKind } from '../../ui/text/plan-wording';

export { QUANTITY_LABELS, SOURCE_TAG_DESCRIPTIONS as TAG_DESCRIPTIONS };

export type QuantityKey = keyof TargetPlanQuantities;

/** The severity of a science flag, as the page says it. */
export const SEVERITY_LABELS: Readonly<Record<FlagSeverity, string>> = {
  info: 'Note',
  caution: 'Caution',
  blocking: 'Blocking',
};

/** Units as shown beside a value ('' for dimensionless). */
export function displayUnit(unit: string): string {
  if (unit === '1') return '';
  if (/minor units$/.test(unit)) return '';
  return unit;
}

/**
 * A number for display: 3 significant figures (whole numbers for counts), a power of ten
 * below 0.001, an em dash for anything not finite. Never prints NaN.
 */
export function formatValue(
  value: number | null | undefined,
  locale: string,
  options: { integer?: boolean; digits?: number } = {},
): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  if (options.integer) return new Intl.NumberFormat(locale, { maximumFractionDigits: 0 }).format(value);
  const abs = Math.abs(value);
  if (abs !== 0 && abs < 1e-3) {
    const exponent = Math.floor(Math.log10(abs));
    const mantissa = value / 10 ** exponent;
    return `${new Intl.NumberFormat(locale, { maximumSignificantDigits: 2 }).format(mantissa)} × 10${superscript(exponent)}`;
  }
  const digits = options.digits ?? 3;
  if (abs >= 10 ** digits) return new Intl.NumberFormat(locale, { maximumFractionDigits: 0 }).format(value);
  return new Intl.NumberFormat(locale, { maximumSignificantDigits: digits }).format(value);
}

const SUPERSCRIPTS: Record<string, string> = {
  '-': '⁻',
  '0': '⁰',
  '1': '¹',
  '2': '²',
  '3': '³',
  '4': '⁴',
  '5': '⁵',
  '6': '⁶',
  '7': '⁷',
  '8': '⁸',
  '9': '⁹',
};

function superscript(n: number): string {
  return String(n)
    .split('')
    .map((c) => SUPERSCRIPTS[c] ?? c)
    .join('');
}

/** Quantities that are counts (shown without decimals). */
const COUNTS: ReadonlySet<QuantityKey> = new Set<QuantityKey>([
  'visits',
  'visitsForCadence',
  'visitsForCompleteness50',
  'visitsForCompleteness90',
  'visitsForCompleteness99',
  'visitsPerNight',
  'visitNights',
  'independentFrequencies',
  'baselineDays',
  'nightStepDays',
]);

/** Probabilities held as 0–1, shown as percentages (`90 %`). */
const PERCENTS: ReadonlySet<QuantityKey> = new Set<QuantityKey>(['requestedCompleteness', 'completeness']);

/** One quantity of the plan, formatted. */
export interface QuantityRow {
  key: QuantityKey;
  label: string;
  value: string;
  unit: string;
  /** A second reading of the same value (e.g. mmag beside ppm), or null. */
  alternative: string | null;
  /** Why the number has its value, in plain words. */
  why: string;
  /** Where its formula or value comes from, in plain words (a reference, a node parameter, an assumption). */
  source: string;
  tag: SourceTag;
  /** The kind of source as the page says it ("Published relation", "Node parameter"...). */
  tagLabel: string;
  provenance: ProvenanceKind;
  /** What that kind of source means, in a sentence. */
  provenanceDescription: string;
}

/** Formats one explained quantity (the fee as money from minor units). */
export function quantityRow(plan: TargetPlan, key: QuantityKey, locale: string): QuantityRow {
  const q: Explained<number | null> = plan.quantities[key];
  const percent = PERCENTS.has(key);
  const value =
    key === 'feeMinor' && q.value !== null && Number.isFinite(q.value)
      ? formatMinorCurrency(q.value, plan.currency, locale)
      : percent
        ? formatPercent(q.value, locale)
        : formatValue(q.value, locale, { integer: COUNTS.has(key) });
  const provenance = provenanceOf(q);
  const row: QuantityRow = {
    key,
    label: plainText(QUANTITY_LABELS[key]),
    value,
    unit: key === 'feeMinor' || percent ? '' : displayUnit(q.unit),
    alternative: null,
    why: plainText(q.why),
    source: provenance.reference,
    tag: q.tag,
    tagLabel: provenance.label,
    provenance: provenance.kind,
    provenanceDescription: provenance.description,
  };
  const noPeriod = key === 'periodDays' ? noExpectedPeriodFlag(plan) : null;
  if (noPeriod) {
    // The relation's number exists but means nothing here (gyrochronology.ts: "must not be shown").
    row.value = 'No expected period';
    row.unit = '';
    row.why = noExpectedPeriodReason(noPeriod);
    row.source = noPeriod.source ? provenanceOf({ source: noPeriod.source, tag: 'paper' }).reference : row.source;
  }
  return row;
}

/** Every quantity of the plan, in the plan's order (only those with a label: a plan stored by an older model may lack some). */
export function allQuantityRows(plan: TargetPlan, locale: string): QuantityRow[] {
  return (Object.keys(plan.quantities) as QuantityKey[])
    .filter((key) => key in QUANTITY_LABELS)
    .map((key) => quantityRow(plan, key, locale));
}

/** The blocking flag saying that no relation gives the star a period (the proposer must give one), or null. */
export function noExpectedPeriodFlag(plan: TargetPlan): ScienceFlag | null {
  return plan.flags.find((flag) => flag.code === 'noExpectedPeriod' && flag.severity === 'blocking') ?? null;
}

/** Why there is no expected period, as a sentence without the repeated "no expected period:" lead-in. */
export function noExpectedPeriodReason(flag: ScienceFlag): string {
  const reason = plainText(flag.message)
    .replace(/^(\s*no expected period\s*:\s*)+/i, '')
    .trim();
  if (!reason) return 'No relation gives this star a period: enter its expected period to plan it.';
  const capital = reason[0].toUpperCase() + reason.slice(1);
  return /[.!?]$/.test(capital) ? capital : `${capital}.`;
}

/** ppm → mmag for small relative-flux variations: σ(mag) = 2.5/ln 10 · σ(flux)/flux (Howell 2006). */
export function ppmToMmag(ppm: number): number {
  return (ppm * MAG_PER_RELATIVE_FLUX) / 1000;
}

/**
 * The key rows of the results panel: period with its range, Rossby number with its τ scale,
 * amplitude and precision in ppm and mmag, exposure, visits, visits per night, cadence,
 * baseline, node-hours and fee.
 */
export function keyRows(plan: TargetPlan, locale: string): QuantityRow[] {
  const q = plan.quantities;
  const row = (key: QuantityKey) => quantityRow(plan, key, locale);
  const f = (v: number) => formatValue(v, locale);

  const period = row('periodDays');
  if (!noExpectedPeriodFlag(plan)) {
    period.alternative = `plausible ${f(q.shortestPeriodDays.value)}–${f(q.longestPeriodDays.value)} d`;
    period.why = plainText(`${q.periodDays.why}; range: ${q.shortestPeriodDays.why}`);
  }

  const rossby = row('rossbyNumber');
  rossby.label = `Rossby number, ${plan.turnoverScaleLabel} τ scale`;
  rossby.alternative = `τc ${f(q.turnoverTimeDays.value)} d`;
  rossby.why = plainText(`${q.rossbyNumber.why}; τc: ${q.turnoverTimeDays.why}`);

  const amplitude = row('amplitudeRperPpm');
  amplitude.alternative = `${f(ppmToMmag(q.amplitudeRperPpm.value))} mmag`;

  const precision = row('perVisitPrecisionPpm');
  precision.alternative = `${f(q.perVisitPrecisionMmag.value)} mmag`;

  // The cadence in the one set of words of the page (visit nights, visits per night, sample interval).
  const story = cadenceStory(plan, locale);
  const cadence = row('sampleIntervalDays');
  cadence.label = 'Sample interval';
  cadence.why = story.why;
  const perNight = row('visitsPerNight');
  perNight.why = story.why;
  const nights = q.visitNights ? row('visitNights') : null;
  if (nights) {
    nights.alternative = `visit nights ${visitNightWords(q.nightStepDays.value)}`;
    nights.why = story.why;
  }

  const rows = [period, rossby, amplitude, precision, row('exposureSeconds'), row('visits')];
  if (q.completeness) {
    const completeness = row('completeness');
    completeness.label = 'Completeness';
    if (q.requestedCompleteness) completeness.alternative = `asked for ${formatPercent(q.requestedCompleteness.value, locale)}`;
    rows.push(completeness);
  }
  rows.push(perNight);
  if (nights) rows.push(nights);
  rows.push(cadence, row('baselineDays'));
  if (q.skyBrightnessMagPerArcsec2) rows.push(row('skyBrightnessMagPerArcsec2'));
  if (q.worstSkyBrightnessMagPerArcsec2) rows.push(row('worstSkyBrightnessMagPerArcsec2'));
  rows.push(row('nodeHours'), row('feeMinor'));
  return rows;
}

/** One line of the "price of certainty": what another completeness level would cost. */
export interface CompletenessPrice {
  key: 'visitsForCompleteness50' | 'visitsForCompleteness90' | 'visitsForCompleteness99';
  completeness: string;
  visits: string;
  /** False for a level that no campaign on this node reaches. */
  reachable: boolean;
  /** Node-hours scaled from the plan's in proportion to the visits (weather loss included). */
  nodeHours: string;
  why: string;
  /** The level the plan is sized for. */
  current: boolean;
}

const PRICE_LEVELS = [
  ['visitsForCompleteness50', 0.5],
  ['visitsForCompleteness90', 0.9],
  ['visitsForCompleteness99', 0.99],
] as const;

/**
 * Visits (and node-hours, which scale with the visits at a fixed visit length) for 50 %, 90 %
 * and 99 % completeness; empty for a plan that does not carry them.
 */
export function completenessPrices(plan: TargetPlan, locale: string): CompletenessPrice[] {
  const q = plan.quantities;
  const visits = q.visits.value;
  const requested = q.requestedCompleteness?.value;
  return PRICE_LEVELS.filter(([key]) => q[key] !== undefined).map(([key, level]) => {
    // A level no campaign on this node reaches has no visit count (null in newer plans).
    const n: number | null = q[key].value;
    const reachable = n !== null && Number.isFinite(n) && !/out of reach/.test(q[key].why);
    const hours = reachable && visits > 0 ? (q.nodeHours.value * n) / visits : Number.NaN;
    return {
      key,
      completeness: formatPercent(level, locale),
      visits: reachable ? formatValue(n, locale, { integer: true }) : 'Out of reach',
      reachable,
      nodeHours: formatValue(hours, locale),
      why: plainText(q[key].why),
      current: requested !== undefined && Math.abs(requested - level) < 1e-9,
    };
  });
}

/**
 * How the campaign must be analysed, in a sentence: the period range and false-alarm
 * probability the plan was sized with (periods 1/fmax to 1/fmin), so that the analysis
 * searches the same band. Null when the plan does not say (or has no expected period).
 */
export function searchBandSentence(plan: TargetPlan, locale: string): string | null {
  const analysis = plan.analysis;
  if (!analysis || noExpectedPeriodFlag(plan)) return null;
  const { minFrequencyPerDay: fmin, maxFrequencyPerDay: fmax } = analysis;
  if (!(fmin > 0 && fmax > fmin && Number.isFinite(fmax))) return null;
  const f = (v: number) => formatValue(v, locale);
  const series = analysis.series === 'nightlyMeans' ? ', after averaging the visits of each night' : ', using every visit on its own';
  return (
    `Search the light curve for periods between ${f(1 / fmax)} and ${f(1 / fmin)} d at false-alarm probability ` +
    `${formatValue(analysis.falseAlarmProbability, locale)}${series}: the plan's visits were sized for that search.`
  );
}

/** How often a visit night comes: "every night", "every 3 nights". */
export function visitNightWords(nightStepDays: number): string {
  const s = Math.max(1, Math.round(nightStepDays));
  return s === 1 ? 'every night' : `every ${s} nights`;
}

/** The cadence in the product's words: visit nights, visits per night, sample interval. */
export interface CadenceStory {
  /** "Every night" or "Every 3 nights" (how often a visit night comes). */
  visitNights: string;
  /** "2 visits per night · 103 visit nights · sample interval 1.02 d". */
  detail: string;
  /** Why the cadence is what it is, in the same words. */
  why: string;
}

const plural = (n: number, one: string, many: string) => (n === 1 ? one : many);

/**
 * The plan's cadence told once, in the same words wherever it is shown: visit nights (how often
 * a night with visits comes), visits per night, and the sample interval the period needs. The
 * plan's own cadence quantities are read together, so a sample interval of 3.9 d never stands
 * beside visits every night without the reason.
 */
export function cadenceStory(plan: TargetPlan, locale: string): CadenceStory {
  const q = plan.quantities;
  const f = (v: number) => formatValue(v, locale);
  const whole = (v: number) => formatValue(v, locale, { integer: true });
  const k = Math.round(q.visitsPerNight.value);
  const nights = Math.round(q.visitNights?.value ?? Number.NaN);
  const interval = q.sampleIntervalDays.value;
  const every = visitNightWords(q.nightStepDays.value);
  const detail = `${k} ${plural(k, 'visit', 'visits')} per night · ${whole(nights)} visit nights · sample interval ${f(interval)} d`;
  const samples = Math.round(q.shortestPeriodDays.value / interval);
  let why = `The shortest plausible period, ${f(q.shortestPeriodDays.value)} d, needs ${samples} samples per cycle: a sample interval of ${f(interval)} d.`;
  // What the sample interval alone asks for, in the same words.
  const neededStep = interval >= 1 ? Math.floor(interval) : 1;
  const neededPerNight = interval >= 1 ? 1 : Math.ceil(1 / interval - 1e-9);
  const denser = q.nightStepDays.value < neededStep || k > neededPerNight;
  if (denser && q.visitsForCadence && q.visits.value > q.visitsForCadence.value) {
    why += ` That alone asks for ${neededPerNight} ${plural(neededPerNight, 'visit', 'visits')} per night, visit nights ${visitNightWords(neededStep)}; the plan visits more to reach the completeness.`;
  } else if (k > neededPerNight) {
    why += ` ${k} visits per night, spread over the night, also break the one-day alias of short periods.`;
  }
  why += ` Visit nights ${every}, ${k} ${plural(k, 'visit', 'visits')} per night: ${whole(nights)} visit nights over ${whole(q.baselineDays.value)} d (weather adds calendar time).`;
  return { visitNights: every[0].toUpperCase() + every.slice(1), detail, why };
}
