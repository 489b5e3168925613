import { Pipe, PipeTransform } from '@angular/core';
import { formatHundredths, type PaymentAttemptView } from '@spincycle/shared/billing/billing';
import { formatMinorUnits } from '@spincycle/shared/proposals/money';

/**
 * `{{ invoice.totalMinor | minorUnits: invoice.currency }}` → `EUR 804.15`: the fees' one way of
 * writing money, the same as on the invoice PDFs and in the mails (the code, never a symbol).
 */
@Pipe({ name: 'minorUnits' })
export class MinorUnitsPipe implements PipeTransform {
  transform(amountMinor: number | null | undefined, currency: string | null | undefined): string {
    if (amountMinor === null || amountMinor === undefined || !Number.isSafeInteger(amountMinor) || !currency) return '—';
    return formatMinorUnits(amountMinor, currency);
  }
}

/** `{{ line.hoursHundredths | hundredths }}` → `12.50` (node-hours, exact, two decimals). */
@Pipe({ name: 'hundredths' })
export class HundredthsPipe implements PipeTransform {
  transform(hoursHundredths: number | null | undefined): string {
    return hoursHundredths === null || hoursHundredths === undefined ? '—' : formatHundredths(hoursHundredths);
  }
}

/** A payment attempt's outcome in words. */
export const PAYMENT_STATE_LABELS: Record<PaymentAttemptView['state'], string> = {
  processing: 'Waiting for the card processor',
  succeeded: 'Paid',
  declined: 'Declined',
  needs_authentication: 'Refused: the bank asked for an extra check',
  failed: 'Card processor not reached',
};

/** "Visa ending 4242", or what is known of the card. */
export function cardText(p: Pick<PaymentAttemptView, 'cardBrand' | 'cardLast4'>): string {
  const brand = p.cardBrand ?? 'Card';
  return p.cardLast4 ? `${brand} ending ${p.cardLast4}` : brand;
}

/** An invoice's name in a sentence or a heading: its number, or "Draft" before it has one. */
export function invoiceName(i: { number: string | null }): string {
  return i.number ?? 'Draft';
}

/** `1 draft` / `3 drafts`. */
export function count(n: number, one: string, many: string): string {
  return `${n} ${n === 1 ? one : many}`;
}
