/** Small formatting helpers shared by the charts' ticks, tooltips and text alternatives. */

const SHORT_DATE = new Map<string, Intl.DateTimeFormat>();

/**
 * `2026-03-04` → `4 Mar` (`4 Mar 2026` with the year): the product's one date format (see
 * ui/time/date-format), whatever order the locale would give; a calendar date, no time zone.
 */
export function formatNightDate(nightDate: string, locale: string, withYear = false): string {
  const key = `${locale}|${withYear}`;
  let format = SHORT_DATE.get(key);
  if (!format) {
    format = new Intl.DateTimeFormat(locale, { day: 'numeric', month: 'short', ...(withYear ? { year: 'numeric' } : {}), timeZone: 'UTC' });
    SHORT_DATE.set(key, format);
  }
  const ms = Date.parse(`${nightDate}T00:00:00Z`);
  if (!Number.isFinite(ms)) return nightDate;
  const parts = format.formatToParts(ms);
  const part = (type: Intl.DateTimeFormatPartTypes) => parts.find((p) => p.type === type)?.value ?? '';
  const dayMonth = `${part('day')} ${part('month').replace(/\.$/, '')}`;
  return withYear ? `${dayMonth} ${part('year')}` : dayMonth;
}

/**
 * Tick labels of a log axis: 1, 2, 5 × powers of ten only, plainly written (no `1e+3`, no
 * `0.30000000000000004`); any other value gets no label. Pairs with `logAxis125Hooks`.
 */
export function logTickLabel(value: number | string, locale: string): string {
  const v = Number(value);
  if (!(v > 0)) return '';
  const mantissa = v / 10 ** Math.floor(Math.log10(v) + 1e-9);
  const keep = [1, 2, 5].some((m) => Math.abs(mantissa - m) < 1e-6);
  return keep ? new Intl.NumberFormat(locale, { maximumSignificantDigits: 3 }).format(v) : '';
}
