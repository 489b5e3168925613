import { z } from 'zod';

/**
 * What kind of mail an outbox row is (what caused it). The database accepts any short snake_case
 * word, so a feature can add a kind here without a migration; the list names those we know.
 */
export const MAIL_KINDS = [
  'welcome',
  'sign_up_attempt',
  'password_reset',
  'invitation',
  'submission',
  'review_assignment',
  'conflict_declared',
  'decision',
  'invoice',
  'invoice_notice',
  'receipt',
  'billing_invitation',
] as const;
export type MailKind = (typeof MAIL_KINDS)[number];

/** Kinds in words, for the administrator's list. */
export const MAIL_KIND_LABELS: Record<MailKind, string> = {
  welcome: 'Welcome to a new account',
  sign_up_attempt: 'Sign-up with an address that has an account',
  password_reset: 'Password reset link',
  invitation: 'Invitation to a proposal team',
  submission: 'Proposal submission receipt',
  review_assignment: 'Proposals to review',
  conflict_declared: 'Conflict of interest declared',
  decision: 'Award decision',
  invoice: 'Invoice',
  invoice_notice: 'Invoice voided or refunded',
  receipt: 'Payment receipt',
  billing_invitation: 'Invitation to be a billing contact',
};

/** A kind in words; an unknown kind (added later on the server) reads as "Other mail". */
export function mailKindLabel(kind: string): string {
  return (MAIL_KIND_LABELS as Record<string, string>)[kind] ?? 'Other mail';
}

/**
 * Where an outbox row stands: `pending` waits for its (next) attempt, `sending` is being handed
 * to the mail server by one process, `sent` was accepted by it, `failed` gave up after the last
 * attempt (or a refusal that no retry can change) and waits for an administrator.
 */
export const MAIL_STATES = ['pending', 'sending', 'sent', 'failed'] as const;
export type MailState = (typeof MAIL_STATES)[number];

export const MAIL_STATE_LABELS: Record<MailState, string> = {
  pending: 'Waiting to be sent',
  sending: 'Being sent',
  sent: 'Sent',
  failed: 'Not sent',
};

/** Filters of the list: one state, every mail not sent yet (the default), or everything. */
export const MAIL_STATE_FILTERS = ['unsent', ...MAIL_STATES, 'all'] as const;
export type MailStateFilter = (typeof MAIL_STATE_FILTERS)[number];

/** GET /api/admin/mail-outbox query. */
export const listOutboxQuerySchema = z.object({
  state: z.enum(MAIL_STATE_FILTERS).default('unsent'),
  page: z.coerce.number().int().min(1).max(1_000_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
});
export type ListOutboxQuery = z.infer<typeof listOutboxQuerySchema>;

/**
 * One mail of the outbox as the administrator sees it: who it is for and its subject, never its
 * body (password-reset and invitation links are credentials).
 */
export interface OutboxMail {
  id: number;
  /** When the change that caused it was committed. */
  createdAt: string;
  /** A MailKind, or a kind this client does not know yet. */
  kind: string;
  to: string[];
  subject: string;
  state: MailState;
  /** Attempts made so far (an administrator's "send again" starts over from 0). */
  attempts: number;
  /** When the next attempt is due (pending rows). */
  nextAttemptAt: string | null;
  /** Why the last attempt failed, in words; null once sent. */
  lastError: string | null;
  sentAt: string | null;
}

/** Body of GET /api/admin/mail-outbox. */
export interface OutboxPage {
  items: OutboxMail[];
  total: number;
}
