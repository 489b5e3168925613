/** Formatting of the physical and money quantities shown in tables. Pure functions; pipes wrap them. */

/** `28.761° N` from a signed latitude in degrees. */
export function formatLatitude(latitudeDeg: number, locale: string, fractionDigits = 3): string {
  return `${formatFixed(Math.abs(latitudeDeg), locale, fractionDigits)}° ${latitudeDeg < 0 ? 'S' : 'N'}`;
}

/** `17.879° W` from an east-positive longitude in degrees. */
export function formatLongitude(longitudeDeg: number, locale: string, fractionDigits = 3): string {
  return `${formatFixed(Math.abs(longitudeDeg), locale, fractionDigits)}° ${longitudeDeg < 0 ? 'W' : 'E'}`;
}

/** A number with exactly `fractionDigits` decimals, grouped the locale's way. */
export function formatFixed(value: number, locale: string, fractionDigits: number): string {
  return new Intl.NumberFormat(locale, {
    minimumFractionDigits: fractionDigits,
    maximumFractionDigits: fractionDigits,
  }).format(value);
}

/** The Intl money format of one currency (ISO 4217 code, any case) in one locale. */
function moneyFormat(currency: string, locale: string): Intl.NumberFormat {
  return new Intl.NumberFormat(locale, { style: 'currency', currency: currency.toUpperCase() });
}

/**
 * An amount held in the currency's smallest unit (cents for EUR, yen for JPY), shown as money:
 * the one way the product shows an amount, always with its currency (the code comes from the
 * data, never assumed). The number of minor digits comes from ISO 4217 through Intl, not from
 * a guess of 2. An em dash when the amount or the currency is missing or not valid.
 */
export function formatMinorCurrency(amountMinor: number | null | undefined, currency: string | null | undefined, locale: string): string {
  if (amountMinor === null || amountMinor === undefined || !Number.isFinite(amountMinor) || !currency) return '—';
  let format: Intl.NumberFormat;
  try {
    format = moneyFormat(currency, locale);
  } catch {
    return '—';
  }
  const digits = format.resolvedOptions().maximumFractionDigits ?? 2;
  // Rounding in minor units first keeps -0.4 cents from reading as "-€0.00".
  const amount = Math.round(amountMinor) / 10 ** digits;
  return format.format(amount === 0 ? 0 : amount);
}

/** Node-hours as the fee explanations write them: `1.83 h` (at most two decimals). */
export function formatHours(hours: number, locale: string): string {
  return `${new Intl.NumberFormat(locale, { maximumFractionDigits: 2 }).format(hours)} h`;
}

/**
 * The fee explained: `1.83 h × €45.00 per hour`, and `= €82.35` after it when the fee is given.
 * The rate is held in minor units per hour, like the node's rate card.
 */
export function formatHoursTimesRate(
  hours: number,
  rateMinorPerHour: number,
  currency: string,
  locale: string,
  feeMinor?: number | null,
): string {
  const product = `${formatHours(hours, locale)} × ${formatMinorCurrency(rateMinorPerHour, currency, locale)} per hour`;
  return feeMinor === undefined || feeMinor === null ? product : `${product} = ${formatMinorCurrency(feeMinor, currency, locale)}`;
}

/**
 * A fee's "why" line from the science core ("1.83 h × 4500 per hour, rounded to the unit": the
 * rate in minor units) with the hours and the rate written as money in the plan's currency; any
 * other line is returned as it is.
 */
export function explainFee(why: string | null | undefined, currency: string, locale: string): string {
  if (!why) return '';
  const m = /([\d.,eE+-]+) h × (\d+(?:\.\d+)?) per hour(, rounded to the unit)?/.exec(why);
  if (!m) return why;
  const hours = Number(m[1].replace(/,/g, ''));
  if (!Number.isFinite(hours)) return why;
  const text = `${formatHoursTimesRate(hours, Number(m[2]), currency, locale)}${m[3] ? ', rounded to the smallest unit of the currency' : ''}`;
  return why.slice(0, m.index) + text + why.slice(m.index + m[0].length);
}

/**
 * A probability (0–1) as a percentage with a space before the sign, `90 %`: whole percent,
 * one decimal above 99 % (cut, not rounded, so 0.9996 never reads as a certain 100 %) and two
 * significant figures below 10 %. An em dash for anything not finite.
 */
export function formatPercent(fraction: number | null | undefined, locale: string): string {
  if (fraction === null || fraction === undefined || !Number.isFinite(fraction)) return '—';
  let percent = fraction * 100;
  let options: Intl.NumberFormatOptions = { maximumFractionDigits: 0 };
  if (percent > 99 && percent < 100) {
    percent = Math.floor(percent * 10) / 10;
    options = { maximumFractionDigits: 1 };
  } else if (percent > 0 && percent < 10) {
    options = { maximumSignificantDigits: 2 };
  }
  return `${new Intl.NumberFormat(locale, options).format(percent)} %`;
}
