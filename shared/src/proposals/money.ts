/**
 * Money is carried in integer minor units (cents) with an ISO 4217 code; these turn it into
 * text for mails, printed summaries and tables.
 */

/** Digits after the decimal point of a currency (2 for EUR, 0 for JPY), per Intl. */
export function currencyDigits(currency: string): number {
  try {
    return (
      new Intl.NumberFormat('en-GB', { style: 'currency', currency: currency.toUpperCase() }).resolvedOptions().maximumFractionDigits ?? 2
    );
  } catch {
    return 2;
  }
}

/** `452550, 'eur'` → `EUR 4,525.50` (code rather than symbol: unambiguous in every context). */
export function formatMinorUnits(minor: number, currency: string): string {
  const digits = currencyDigits(currency);
  const amount = minor / 10 ** digits;
  const number = amount.toLocaleString('en-GB', { minimumFractionDigits: digits, maximumFractionDigits: digits });
  return `${currency.toUpperCase()} ${number}`;
}
