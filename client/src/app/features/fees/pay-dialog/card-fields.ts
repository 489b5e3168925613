import { AbstractControl, ValidationErrors, ValidatorFn } from '@angular/forms';
import { payInvoiceSchema } from '@spincycle/shared/billing/billing';
import type { CardPayment } from '../billing-api';

/**
 * The pay dialog's checks, mirroring payInvoiceSchema (shared) with its words, so that a card
 * field is refused here as the server would refuse it. Each check reads the text typed; empty
 * fields are left to `Validators.required` (the optional name on the card excepted).
 */
const schemaMessage = (result: { success: boolean; error?: { issues: { message: string }[] } }): ValidationErrors | null =>
  result.success ? null : { schema: result.error?.issues[0]?.message ?? 'Check this value' };

const text = (control: AbstractControl): string => String(control.value ?? '').trim();

/** The digits of a card number as typed with spaces or dashes ("4242 4242 4242 4242"). */
export const cardDigits = (typed: string): string => typed.replace(/[\s-]/g, '');

/** The expiry month as a number ("07" → 7), or NaN when it is not one or two digits. */
export function parseExpMonth(typed: string): number {
  return /^\d{1,2}$/.test(typed.trim()) ? Number(typed.trim()) : Number.NaN;
}

/** The expiry year as four digits ("29" → 2029, "2029" → 2029), or NaN otherwise. */
export function parseExpYear(typed: string): number {
  const t = typed.trim();
  if (/^\d{2}$/.test(t)) return 2000 + Number(t);
  return /^\d{4}$/.test(t) ? Number(t) : Number.NaN;
}

export const cardNumberCheck: ValidatorFn = (c) => (text(c) ? schemaMessage(payInvoiceSchema.shape.cardNumber.safeParse(text(c))) : null);

export const expMonthCheck: ValidatorFn = (c) => {
  if (!text(c)) return null;
  const month = parseExpMonth(text(c));
  return Number.isNaN(month) ? { schema: 'must be a month from 1 to 12' } : schemaMessage(payInvoiceSchema.shape.expMonth.safeParse(month));
};

export const expYearCheck: ValidatorFn = (c) => {
  if (!text(c)) return null;
  const ok = payInvoiceSchema.shape.expYear.safeParse(parseExpYear(text(c))).success;
  return ok ? null : { schema: 'must be a year such as 2029' };
};

export const cvcCheck: ValidatorFn = (c) => (text(c) ? schemaMessage(payInvoiceSchema.shape.cvc.safeParse(text(c))) : null);

export const nameOnCardCheck: ValidatorFn = (c) =>
  text(c) ? schemaMessage(payInvoiceSchema.shape.nameOnCard.safeParse(String(c.value))) : null;

/** The typed card fields. */
export interface CardFieldValues {
  cardNumber: string;
  expMonth: string;
  expYear: string;
  cvc: string;
  nameOnCard: string;
}

/** The request body from the form's text (checked by the form first); the name only when given. */
export function cardPayment(version: number, v: CardFieldValues): CardPayment {
  const name = v.nameOnCard.trim();
  return {
    version,
    cardNumber: cardDigits(v.cardNumber),
    expMonth: parseExpMonth(v.expMonth),
    expYear: parseExpYear(v.expYear),
    cvc: v.cvc.trim(),
    ...(name ? { nameOnCard: name } : {}),
  };
}
