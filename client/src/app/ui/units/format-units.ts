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

/**
 * An amount held in the currency's smallest unit (cents for EUR, yen for JPY), shown as money.
 * The number of minor digits comes from ISO 4217 through Intl, not from a guess of 2.
 */
export function formatMinorCurrency(amountMinor: number, currency: string, locale: string): string {
  const format = new Intl.NumberFormat(locale, { style: 'currency', currency: currency.toUpperCase() });
  const digits = format.resolvedOptions().maximumFractionDigits ?? 2;
  return format.format(amountMinor / 10 ** digits);
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
