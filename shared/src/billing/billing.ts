/**
 * Billing (docs/billing.md): node-hour fees of awarded programs. Request schemas and response
 * shapes of /api/billing/…, the invoice arithmetic (integer minor units only) and money formatting.
 *
 * Invoice states (ours): draft (a manager's working copy, seen by managers only) → issued
 * (numbered, sent, awaiting payment) → paid (the payment provider confirmed it) → refunded; an
 * issued invoice may be voided instead (it keeps its number, so the numbers have no gaps).
 */
import { z } from 'zod';
import { safeMultiLineText } from '../http/text';

export const INVOICE_STATES = ['draft', 'issued', 'paid', 'void', 'refunded'] as const;
export type InvoiceState = (typeof INVOICE_STATES)[number];

export const INVOICE_STATE_LABELS: Record<InvoiceState, string> = {
  draft: 'Draft',
  issued: 'Awaiting payment',
  paid: 'Paid',
  void: 'Voided',
  refunded: 'Refunded',
};

/** Which rate of each node a program pays. */
export const RATE_CLASSES = ['academic', 'external'] as const;
export type RateClass = (typeof RATE_CLASSES)[number];
export const RATE_CLASS_LABELS: Record<RateClass, string> = { academic: 'Academic rate', external: 'External rate' };

/** Days from issue to the due date (the consortium's own terms may say otherwise; common practice, no source). */
export const INVOICE_PAYMENT_DAYS = 30;

/** The caution every invoice and receipt carries (DESIGN.md, "Cautions shown in the product"). */
export const BILLING_CAUTION =
  'Amounts are computed from the published rate card for the node-hours awarded. The consortium’s own terms and local tax rules govern this invoice; no tax is included.';

/**
 * Amount of one line: hours (in hundredths, exact) × rate (minor units per hour), rounded half up
 * to a whole minor unit, in integer arithmetic (BigInt: no floating-point money).
 */
export function lineAmountMinor(hoursHundredths: number, rateMinorPerHour: number): number {
  if (!Number.isSafeInteger(hoursHundredths) || hoursHundredths < 0) throw new RangeError('hoursHundredths must be a whole number ≥ 0');
  if (!Number.isSafeInteger(rateMinorPerHour) || rateMinorPerHour < 0) throw new RangeError('rateMinorPerHour must be a whole number ≥ 0');
  const product = BigInt(hoursHundredths) * BigInt(rateMinorPerHour);
  const amount = (product + 50n) / 100n;
  if (amount > BigInt(Number.MAX_SAFE_INTEGER)) throw new RangeError('amount too large');
  return Number(amount);
}

/** Node-hours as stored (numeric(10,2), read as a number) to exact hundredths. */
export function hoursToHundredths(hours: number): number {
  return Math.round(hours * 100);
}

/** Sum of whole minor units (throws past the safe-integer range rather than lose a cent). */
export function sumMinor(amounts: readonly number[]): number {
  let total = 0n;
  for (const a of amounts) total += BigInt(a);
  if (total > BigInt(Number.MAX_SAFE_INTEGER)) throw new RangeError('total too large');
  return Number(total);
}

/** Hours in hundredths shown with two decimals ("12.50"). */
export function formatHundredths(h: number): string {
  const sign = h < 0 ? '-' : '';
  const a = Math.abs(h);
  return `${sign}${Math.floor(a / 100)}.${String(a % 100).padStart(2, '0')}`;
}

// ---------------------------------------------------------------- requests

/** Luhn check digit (ISO/IEC 7812-1; common practice, no source). */
export function luhnValid(digits: string): boolean {
  if (!/^\d+$/.test(digits)) return false;
  let sum = 0;
  for (let i = 0; i < digits.length; i++) {
    let d = Number(digits[digits.length - 1 - i]);
    if (i % 2 === 1) {
      d *= 2;
      if (d > 9) d -= 9;
    }
    sum += d;
  }
  return sum % 10 === 0;
}

const version = z.number().int().min(1);

/** Card fields of a payment: sent to our server and on to the payment provider only, never stored or logged. */
export const payInvoiceSchema = z.strictObject({
  version,
  cardNumber: z
    .string()
    .transform((s) => s.replace(/[\s-]/g, ''))
    .refine((s) => /^\d{12,19}$/.test(s), 'must be 12 to 19 digits')
    .refine((s) => luhnValid(s), 'is not a valid card number (check the digits)'),
  expMonth: z.number().int().min(1, 'must be a month from 1 to 12').max(12, 'must be a month from 1 to 12'),
  expYear: z.number().int().min(2000).max(2100),
  cvc: z.string().regex(/^\d{3,4}$/, 'must be 3 or 4 digits'),
  nameOnCard: z.string().trim().min(1).max(200).optional(),
});
export type PayInvoiceInput = z.infer<typeof payInvoiceSchema>;

export const versionedReasonSchema = z.strictObject({
  version,
  reason: safeMultiLineText(z.string().trim().min(1, 'say why').max(1000, 'at most 1000 characters')),
});
export type VersionedReasonInput = z.infer<typeof versionedReasonSchema>;

export const issueInvoiceSchema = z.strictObject({ version });
export const rateClassSchema = z.strictObject({ rateClass: z.enum(RATE_CLASSES) });
export const inviteBillingContactSchema = z.strictObject({
  email: z
    .string({ message: 'must be text' })
    .trim()
    .toLowerCase()
    .max(254, 'at most 254 characters')
    .pipe(z.email({ message: 'must be an e-mail address' })),
});

// ---------------------------------------------------------------- responses

export interface InvoiceLine {
  position: number;
  nodeId: number | null;
  description: string;
  hoursHundredths: number;
  rateMinorPerHour: number;
  amountMinor: number;
}

export interface InvoiceSummary {
  id: number;
  /** Null while a draft. */
  number: string | null;
  state: InvoiceState;
  proposalId: number;
  programTitle: string;
  piName: string;
  cycleId: number;
  cycleCode: string;
  rateClass: RateClass;
  currency: string;
  totalMinor: number;
  dueDate: string | null;
  issuedAt: string | null;
  paidAt: string | null;
  /** Issued and past its due date. */
  overdue: boolean;
  /** A refund was asked for and the provider has not confirmed it yet. */
  refundPending: boolean;
  version: number;
}

export interface PaymentAttemptView {
  id: number;
  state: 'processing' | 'succeeded' | 'declined' | 'needs_authentication' | 'failed';
  message: string | null;
  cardBrand: string | null;
  cardLast4: string | null;
  amountMinor: number;
  createdAt: string;
}

export interface BillingContactView {
  id: number;
  email: string;
  /** Display name once the invitation is accepted. */
  name: string | null;
  acceptedAt: string | null;
  invitedAt: string;
}

export interface InvoiceDetail extends InvoiceSummary {
  lines: InvoiceLine[];
  billTo: { programTitle: string; piName: string; piAffiliation: string | null; contacts: BillingContactView[] };
  payments: PaymentAttemptView[];
  voidReason: string | null;
  refundReason: string | null;
  refundedAt: string | null;
  /** The viewer may pay it (a billing contact of the program, invoice issued). */
  canPay: boolean;
  /** The viewer may void, refund or issue it (a facility manager). */
  canManage: boolean;
  caution: string;
}

/** What a payment request came to (the invoice is paid only when the provider's signed event arrives). */
export interface PaymentOutcome {
  state: 'processing' | 'succeeded';
  message: string;
  invoice: InvoiceDetail;
}

export interface FeeTotals {
  currency: string;
  draftMinor: number;
  issuedMinor: number;
  paidMinor: number;
  outstandingMinor: number;
  overdueMinor: number;
  refundedMinor: number;
  invoices: number;
}

export interface FeesCycleSummary {
  id: number;
  code: string;
  title: string;
  /** When awards were released (invoices bill released awards only). */
  awardsReleasedAt: string | null;
}

export interface FeesSummary {
  cycle: FeesCycleSummary;
  totals: FeeTotals[];
  invoices: InvoiceSummary[];
  /** Awarded programs with node-hours and no invoice yet in some currency. */
  programsToInvoice: number;
  rateCard: RateCardRow[];
}

export interface RateCardRow {
  nodeId: number;
  code: string;
  name: string;
  currency: string;
  academicMinorPerHour: number;
  externalMinorPerHour: number;
}

export interface ProgramBilling {
  proposalId: number;
  programTitle: string;
  rateClass: RateClass;
  contacts: BillingContactView[];
  /** The viewer may invite and remove contacts (the PI or a facility manager). */
  canManageContacts: boolean;
}
