/**
 * How the planner shows a `TargetPlan`: human labels of the 36 quantities, the source tags
 * as words, number formatting that never prints NaN, and the compact key rows.
 */
import type { SourceTag, Explained, FlagSeverity } from '@spincycle/shared/science/explained';
import type { TargetPlan, TargetPlanQuantities } from '@spincycle/shared/science/target-plan';
import { MAG_PER_RELATIVE_FLUX } from '@spincycle/shared/science/visit-precision';
import { QUANTITY_LABELS, SOURCE_TAG_DESCRIPTIONS, SOURCE_TAG_LABELS } from '@spincycle/shared/science/quantity-labels';
import { formatMinorCurrency } from '../../ui/units/format-units';

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
export function formatValue(value: number | null | undefined, locale: string, options: { integer?: boolean; digits?: number } = {}): string {
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

const SUPERSCRIPTS: Record<string, string> = { '-': '⁻', '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹' };

function superscript(n: number): string {
  return String(n)
    .split('')
    .map((c) => SUPERSCRIPTS[c] ?? c)
    .join('');
}

/** Quantities that are counts (shown without decimals). */
const COUNTS: ReadonlySet<QuantityKey> = new Set<QuantityKey>([
  'visits',
  'visitsForDetection',
  'visitsForCadence',
  'visitsPerNight',
  'independentFrequencies',
  'baselineDays',
  'nightStepDays',
]);

/** One quantity of the plan, formatted. */
export interface QuantityRow {
  key: QuantityKey;
  label: string;
  value: string;
  unit: string;
  /** A second reading of the same value (e.g. mmag beside ppm), or null. */
  alternative: string | null;
  why: string;
  source: string;
  tag: SourceTag;
  tagLabel: string;
}

/** Formats one explained quantity (the fee as money from minor units). */
export function quantityRow(plan: TargetPlan, key: QuantityKey, locale: string): QuantityRow {
  const q: Explained<number | null> = plan.quantities[key];
  const value =
    key === 'feeMinor' && q.value !== null && Number.isFinite(q.value)
      ? formatMinorCurrency(q.value, plan.currency, locale)
      : formatValue(q.value, locale, { integer: COUNTS.has(key) });
  return {
    key,
    label: QUANTITY_LABELS[key],
    value,
    unit: key === 'feeMinor' ? '' : displayUnit(q.unit),
    alternative: null,
    why: q.why,
    source: q.source,
    tag: q.tag,
    tagLabel: SOURCE_TAG_LABELS[q.tag],
  };
}

/** Every quantity of the plan, in the plan's order. */
export function allQuantityRows(plan: TargetPlan, locale: string): QuantityRow[] {
  return (Object.keys(plan.quantities) as QuantityKey[]).map((key) => quantityRow(plan, key, locale));
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
  period.alternative = `plausible ${f(q.shortestPeriodDays.value)}–${f(q.longestPeriodDays.value)} d`;
  period.why = `${q.periodDays.why}; range: ${q.shortestPeriodDays.why}`;

  const rossby = row('rossbyNumber');
  rossby.label = `Rossby number, ${plan.turnoverScaleLabel} τ scale`;
  rossby.alternative = `τc ${f(q.turnoverTimeDays.value)} d`;
  rossby.why = `${q.rossbyNumber.why}; τc: ${q.turnoverTimeDays.why}`;

  const amplitude = row('amplitudeRperPpm');
  amplitude.alternative = `${f(ppmToMmag(q.amplitudeRperPpm.value))} mmag`;

  const precision = row('perVisitPrecisionPpm');
  precision.alternative = `${f(q.perVisitPrecisionMmag.value)} mmag`;

  const cadence = row('sampleIntervalDays');
  cadence.label = 'Cadence (sample interval)';
  cadence.alternative = q.nightStepDays.why;

  return [
    period,
    rossby,
    amplitude,
    precision,
    row('exposureSeconds'),
    row('visits'),
    row('visitsPerNight'),
    cadence,
    row('baselineDays'),
    row('nodeHours'),
    row('feeMinor'),
  ];
}
