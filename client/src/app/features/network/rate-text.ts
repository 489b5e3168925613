import { MAX_RATE_MINOR_PER_HOUR } from '@spincycle/shared/facility/node-schemas';
import { currencyDigits } from '@spincycle/shared/proposals/money';

/**
 * A rate typed into a field and back. Rates are held in whole minor units (cents for EUR, yen
 * for JPY, with the currency's own number of decimals from ISO 4217 through Intl, as the rate
 * is shown everywhere else); the conversion works on the digits as text, so `77.60` is exactly
 * 7760 and never 7759.999….
 */

/** `7760, 'eur'` → `77.60`; `720000, 'jpy'` → `720000` (no grouping: the text goes back into a field). */
export function rateToText(minor: number, currency: string): string {
  const digits = currencyDigits(currency);
  if (digits === 0) return String(minor);
  const text = String(minor).padStart(digits + 1, '0');
  return `${text.slice(0, -digits)}.${text.slice(-digits)}`;
}

/** What a rate field holds: a rate in minor units, nothing (`null`), or why it is not a rate. */
export type ParsedRate = { ok: true; minor: number | null } | { ok: false; message: string };

/**
 * `'77.6', 'eur'` → 7760; `''` → null (no rate). Digits with at most one decimal point and
 * at most the currency's decimals; no signs, exponents or group separators (a comma could be a
 * decimal comma or a thousands separator, and a rate is money: better to ask than to guess).
 */
export function parseRateText(text: string, currency: string): ParsedRate {
  const trimmed = text.trim();
  if (!trimmed) return { ok: true, minor: null };
  const digits = currencyDigits(currency);
  const code = currency.toUpperCase();
  const example = digits === 0 ? '7200' : rateToText(7760 * 10 ** Math.max(0, digits - 2), currency);
  const match = /^(\d*)(?:\.(\d*))?$/.exec(trimmed);
  if (!match || !/\d/.test(trimmed)) return { ok: false, message: `Give an amount in digits, e.g. ${example}` };
  const [, whole, fraction = ''] = match;
  if (digits === 0 && /[1-9]/.test(fraction))
    return { ok: false, message: `${code} has no smaller unit: give a whole amount, e.g. ${example}` };
  if (fraction.replace(/0+$/, '').length > digits)
    return { ok: false, message: `Give at most ${digits} digit${digits === 1 ? '' : 's'} after the decimal point, e.g. ${example}` };
  const minorText = `${whole}${fraction.padEnd(digits, '0').slice(0, digits)}`.replace(/^0+(?=\d)/, '') || '0';
  if (minorText.length > String(MAX_RATE_MINOR_PER_HOUR).length || Number(minorText) > MAX_RATE_MINOR_PER_HOUR)
    return { ok: false, message: `That rate is too large: at most ${rateToText(MAX_RATE_MINOR_PER_HOUR, currency)}` };
  return { ok: true, minor: Number(minorText) };
}
