import { randomBytes, randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import type { Logger } from 'pino';
import type { MailKind } from '@spincycle/shared/mail/mail-outbox';
import type { Config } from '../config';
import type { Mailer, OutgoingMail } from './mailer';

/*
 * The mail outbox. Every e-mail of the product is first a row of `mail_outbox`, written by
 * enqueueMail in the transaction of the change that causes it: a change that rolls back leaves
 * no mail, and a committed change always has its mail. Delivery hands rows to the SMTP relay:
 *
 * - right after the commit, the web process delivers the rows it has just written
 *   (deliverMail; best effort, a failure never fails the request);
 * - the worker's sweep (outbox-worker.ts) delivers every row that is due: pending rows whose next
 *   attempt has come (a fresh row becomes due FIRST_SWEEP_AFTER_SECONDS after it is written, the
 *   web process's turn), and rows claimed so long ago that their process must have stopped.
 *
 * A process claims rows (state 'sending', a claim token of its own) with one UPDATE of rows
 * picked `FOR UPDATE SKIP LOCKED`, so two processes never hand the same row to the relay at once,
 * and only the claim's holder records the outcome; it renews the claim's time just before it
 * hands each row over, so a claim goes stale only when one send outlives
 * MAIL_CLAIM_STALE_SECONDS (the transport's timeouts keep a send far shorter). A failed attempt waits
 * MAIL_RETRY_BASE_SECONDS × 2^(attempts − 1), at most MAIL_RETRY_MAX_SECONDS; after
 * MAIL_MAX_ATTEMPTS attempts, or at once when the relay refuses the message for good (a 5xx
 * reply), the row is failed and waits for an administrator to send it again.
 *
 * SMTP gives at least once, not exactly once: a process that stops after the relay accepted a
 * mail and before it recorded 'sent' leaves the row claimed, and the mail goes out a second time
 * once the claim is stale. Both copies carry the Message-ID fixed at enqueue, so they are
 * recognisable as one mail (the development mail fake keeps the first and drops the second).
 */

/** Largest total size of a mail's attachments, bytes (the row keeps them as base64 JSON). */
export const MAX_ATTACHMENT_BYTES = 10 * 1024 * 1024;

/**
 * A fresh row waits this long before a sweep may take it: the web process that wrote it delivers
 * it right after its commit, and a sweep taking it first would only race it.
 */
export const FIRST_SWEEP_AFTER_SECONDS = 60;

/** Rows one claim takes. */
const SWEEP_BATCH = 50;

/** What a sent secret-bearing mail keeps of its body. */
export const SECRET_BODY_REMOVED = '(Removed once sent: this mail held a single-use link.)';

/**
 * A record the delivery makes in the same transaction as it marks the mail sent: when a
 * feature shows "mailed at", that means "handed to the relay", whoever delivered it.
 */
export type SentMark = { mark: 'award_mailed'; proposalId: number } | { mark: 'assignments_notified'; assignmentIds: number[] };

async function applySentMark(trx: Knex.Transaction, mark: SentMark): Promise<void> {
  switch (mark.mark) {
    case 'award_mailed':
      await trx('awards').where('proposal_id', mark.proposalId).update({ mailed_at: trx.fn.now() });
      return;
    case 'assignments_notified':
      await trx('review_assignments').whereIn('id', mark.assignmentIds).update({ notified_at: trx.fn.now() });
      return;
  }
}

export interface EnqueueOptions {
  /** The body holds a credential (a password-reset or invitation link): blanked once sent. */
  holdsSecret?: boolean;
  onSent?: SentMark;
}

/**
 * Writes one mail to the outbox inside the caller's transaction (the one that makes the change
 * the mail tells about) and answers its id: call deliverMail with it after the commit, or the
 * mail waits for a sweep (FIRST_SWEEP_AFTER_SECONDS). Its Message-ID is fixed here. Throws
 * (rolling the change back) outside a transaction, on a mail without recipients, or with more
 * than MAX_ATTACHMENT_BYTES of attachments: all mistakes of the code, not of the user.
 */
export async function enqueueMail(trx: Knex, mail: OutgoingMail, kind: MailKind, options: EnqueueOptions = {}): Promise<number> {
  if (!(trx as Knex & { isTransaction?: boolean }).isTransaction) {
    throw new Error(`a ${kind} mail must be written in the transaction of the change that causes it`);
  }
  const to = ([] as string[])
    .concat(mail.to)
    .map((a) => a.trim())
    .filter(Boolean);
  if (!to.length) throw new Error(`a ${kind} mail needs at least one recipient`);
  const attachmentBytes = (mail.attachments ?? []).reduce((n, a) => n + a.content.length, 0);
  if (attachmentBytes > MAX_ATTACHMENT_BYTES) {
    throw new Error(`the attachments of a ${kind} mail take ${attachmentBytes} bytes, more than the ${MAX_ATTACHMENT_BYTES} allowed`);
  }
  const attachments = mail.attachments?.length
    ? mail.attachments.map((a) => ({ filename: a.filename, contentType: a.contentType, contentBase64: a.content.toString('base64') }))
    : null;
  const next = await trx.raw<{ rows: { id: number | string }[] }>("SELECT nextval(pg_get_serial_sequence('mail_outbox', 'id')) AS id");
  const id = Number(next.rows[0].id);
  await trx('mail_outbox').insert({
    id,
    kind,
    to_addresses: to,
    subject: mail.subject,
    text_body: mail.text,
    html_body: mail.html ?? null,
    attachments: attachments && JSON.stringify(attachments),
    message_id: `<outbox-${id}-${randomBytes(8).toString('hex')}@spincycle>`,
    next_attempt_at: trx.raw("now() + (? * interval '1 second')", [FIRST_SWEEP_AFTER_SECONDS]),
    holds_secret: options.holdsSecret ?? false,
    on_sent: options.onSent ? JSON.stringify(options.onSent) : null,
  });
  return id;
}

/** What delivery needs: an AppContext has it all; the worker builds its own. */
export interface OutboxDeps {
  db: Knex;
  mailer: Mailer;
  logger: Logger;
  config: Pick<Config, 'MAIL_RETRY_BASE_SECONDS' | 'MAIL_RETRY_MAX_SECONDS' | 'MAIL_MAX_ATTEMPTS' | 'MAIL_CLAIM_STALE_SECONDS'>;
}

/** Ids of the rows an attempt sent, left pending for a later attempt, or failed for good. */
export interface DeliveryResult {
  sent: number[];
  retrying: number[];
  failed: number[];
}

interface ClaimedRow {
  id: number;
  kind: string;
  to_addresses: string[];
  subject: string;
  text_body: string;
  html_body: string | null;
  attachments: { filename: string; contentType: string; contentBase64: string }[] | null;
  message_id: string;
  attempts: number;
  claim_token: string;
  holds_secret: boolean;
}

const CLAIMED_COLUMNS = [
  'id',
  'kind',
  'to_addresses',
  'subject',
  'text_body',
  'html_body',
  'attachments',
  'message_id',
  'attempts',
  'claim_token',
  'holds_secret',
];

/**
 * Claims up to `limit` rows for this process: the pending rows among `ids`, or (a sweep) the due
 * ones not in `exclude`. One statement: the MATERIALIZED CTE picks and locks the rows once,
 * skipping rows another process is claiming at that moment, and the UPDATE checks the condition
 * again on each row it writes, so each row goes to one claimant. (Not `WHERE id IN (SELECT …
 * LIMIT … FOR UPDATE SKIP LOCKED)`: PostgreSQL may run such a subquery more than once per
 * statement, each time skipping what it locked before, and claim more than `limit` rows.)
 */
async function claim(db: Knex, which: { ids: number[] } | { due: { staleSeconds: number; exclude: number[] } }, limit: number) {
  const token = randomUUID();
  const claimable = (q: Knex.QueryBuilder) => {
    if ('ids' in which) return q.whereIn('id', which.ids).where('state', 'pending');
    return q
      .where((c) =>
        c
          .where((p) => p.where('state', 'pending').where('next_attempt_at', '<=', db.fn.now()))
          .orWhere((s) =>
            s.where('state', 'sending').where('claimed_at', '<', db.raw("now() - (? * interval '1 second')", [which.due.staleSeconds])),
          ),
      )
      .whereNotIn('id', which.due.exclude);
  };
  const picked = claimable(db('mail_outbox').select('id'))
    .orderBy([{ column: 'next_attempt_at' }, { column: 'id' }])
    .limit(limit)
    .forUpdate()
    .skipLocked();
  const rows: ClaimedRow[] = await claimable(
    db.withMaterialized('picked', picked).table('mail_outbox').whereIn('id', db.select('id').from('picked')),
  )
    .update({ state: 'sending', claimed_at: db.fn.now(), claim_token: token, attempts: db.raw('attempts + 1') })
    .returning(CLAIMED_COLUMNS);
  return rows.sort((a, b) => a.id - b.id);
}

function toOutgoing(row: ClaimedRow): OutgoingMail {
  return {
    to: row.to_addresses,
    subject: row.subject,
    text: row.text_body,
    ...(row.html_body !== null && { html: row.html_body }),
    ...(row.attachments?.length && {
      attachments: row.attachments.map((a) => ({
        filename: a.filename,
        contentType: a.contentType,
        content: Buffer.from(a.contentBase64, 'base64'),
      })),
    }),
    messageId: row.message_id,
  };
}

/** Seconds to wait after the `attempts`-th failed attempt. */
export function retryDelaySeconds(attempts: number, config: Pick<Config, 'MAIL_RETRY_BASE_SECONDS' | 'MAIL_RETRY_MAX_SECONDS'>): number {
  return Math.min(config.MAIL_RETRY_MAX_SECONDS, config.MAIL_RETRY_BASE_SECONDS * 2 ** Math.max(0, attempts - 1));
}

interface SendError {
  code?: string;
  responseCode?: number;
  response?: string;
  message?: string;
}

/** A refusal that no retry changes: the relay answered 5xx (unknown recipient, message refused). */
function isPermanentRefusal(err: unknown): boolean {
  const code = (err as SendError | null)?.responseCode;
  return typeof code === 'number' && code >= 500 && code < 600;
}

const oneLine = (s: string) => s.replace(/\s+/g, ' ').trim();

/**
 * Why an attempt failed, in words an administrator can act on (never a stack trace), at most
 * 500 characters. Exported for tests.
 */
export function plainSendError(err: unknown): string {
  const e = (err ?? {}) as SendError;
  const message = oneLine(String(e.message ?? err ?? ''));
  const reply = e.response ? oneLine(e.response) : '';
  let text: string;
  if (/ECONNREFUSED/.test(message) || e.code === 'ECONNREFUSED') {
    text = 'The mail server could not be reached (it refused the connection).';
  } else if (e.code === 'ETIMEDOUT' || /timeout|timed out/i.test(message)) {
    text = 'The mail server did not answer in time.';
  } else if (e.code === 'EDNS' || /ENOTFOUND|EAI_AGAIN/.test(message)) {
    text = 'The mail server’s address could not be found.';
  } else if (e.code === 'EAUTH') {
    text = 'The mail server refused our sign-in.';
  } else if (typeof e.responseCode === 'number' && e.responseCode >= 500) {
    text = `The mail server refused the message for good: ${reply || message}`;
  } else if (typeof e.responseCode === 'number' && e.responseCode >= 400) {
    text = `The mail server asked us to try again later: ${reply || message}`;
  } else if (e.code === 'ESOCKET' || e.code === 'ECONNECTION') {
    text = `The connection to the mail server failed: ${message}`;
  } else {
    text = `Sending failed: ${message || 'no reason given'}`;
  }
  return text.length > 500 ? `${text.slice(0, 499)}…` : text;
}

async function recordSent(deps: OutboxDeps, row: ClaimedRow): Promise<boolean> {
  return deps.db.transaction(async (trx) => {
    const [updated] = await trx('mail_outbox')
      .where({ id: row.id, claim_token: row.claim_token })
      .update({
        state: 'sent',
        sent_at: trx.fn.now(),
        claimed_at: null,
        claim_token: null,
        last_error: null,
        ...(row.holds_secret && { text_body: SECRET_BODY_REMOVED, html_body: null }),
      })
      .returning(['id', 'on_sent']);
    if (!updated) {
      // Our claim went stale and another process claimed the row: it records the outcome.
      deps.logger.warn({ mailId: row.id, messageId: row.message_id }, 'an outbox mail was sent under a claim that had been taken over');
      return false;
    }
    if (updated.on_sent) await applySentMark(trx, updated.on_sent as SentMark);
    return true;
  });
}

async function recordFailure(deps: OutboxDeps, row: ClaimedRow, err: unknown): Promise<'retrying' | 'failed' | null> {
  const { config } = deps;
  const final = isPermanentRefusal(err) || row.attempts >= config.MAIL_MAX_ATTEMPTS;
  const delay = retryDelaySeconds(row.attempts, config);
  const n = await deps
    .db('mail_outbox')
    .where({ id: row.id, claim_token: row.claim_token })
    .update({
      state: final ? 'failed' : 'pending',
      next_attempt_at: deps.db.raw("now() + (? * interval '1 second')", [delay]),
      last_error: plainSendError(err),
      claimed_at: null,
      claim_token: null,
    });
  deps.logger.warn(
    { err, mailId: row.id, kind: row.kind, attempts: row.attempts, retryInSeconds: final ? null : delay },
    final ? 'an outbox mail failed for good' : 'an outbox mail failed; it will be tried again',
  );
  if (!n) return null;
  return final ? 'failed' : 'retrying';
}

/** Hands claimed rows to the relay one after the other and records each outcome. */
async function sendClaimed(deps: OutboxDeps, rows: ClaimedRow[], result: DeliveryResult): Promise<void> {
  for (const row of rows) {
    // Still ours? (A long batch before it could have let the claim go stale.) The claim's time starts again now.
    const ours = await deps.db('mail_outbox').where({ id: row.id, claim_token: row.claim_token }).update({ claimed_at: deps.db.fn.now() });
    if (!ours) continue;
    try {
      await deps.mailer.send(toOutgoing(row));
    } catch (err) {
      const outcome = await recordFailure(deps, row, err);
      if (outcome) result[outcome === 'failed' ? 'failed' : 'retrying'].push(row.id);
      continue;
    }
    if (await recordSent(deps, row)) result.sent.push(row.id);
  }
}

/**
 * Delivers the given rows now (the web process, right after the commit that wrote them, or
 * after an administrator's "send again"). Best effort: never throws; what fails stays in the
 * outbox for the sweep. Rows another process has claimed meanwhile are left to it.
 */
export async function deliverMail(deps: OutboxDeps, ids: number[]): Promise<DeliveryResult> {
  const result: DeliveryResult = { sent: [], retrying: [], failed: [] };
  if (!ids.length) return result;
  try {
    await sendClaimed(deps, await claim(deps.db, { ids }, ids.length), result);
  } catch (err) {
    deps.logger.error({ err, mailIds: ids }, 'outbox mails could not be delivered now; the sweep will');
  }
  return result;
}

/**
 * The worker's sweep: delivers every due row, in batches, each row at most once per sweep (a
 * row that fails waits for its next attempt even when the wait is 0). Rows whose claim is older
 * than MAIL_CLAIM_STALE_SECONDS are taken again, or failed when that was their last attempt.
 */
export async function sweepOutbox(deps: OutboxDeps, options: { batchSize?: number } = {}): Promise<DeliveryResult> {
  const { config, db } = deps;
  const batchSize = options.batchSize ?? SWEEP_BATCH;
  const result: DeliveryResult = { sent: [], retrying: [], failed: [] };
  const abandoned = await db('mail_outbox')
    .where('state', 'sending')
    .where('claimed_at', '<', db.raw("now() - (? * interval '1 second')", [config.MAIL_CLAIM_STALE_SECONDS]))
    .where('attempts', '>=', config.MAIL_MAX_ATTEMPTS)
    .update({
      state: 'failed',
      claimed_at: null,
      claim_token: null,
      last_error: 'The process sending it stopped before the mail server answered, on the last attempt: it may or may not have arrived.',
    })
    .returning('id');
  result.failed.push(...abandoned.map((r: { id: number }) => r.id));
  const seen: number[] = [];
  for (;;) {
    const rows = await claim(db, { due: { staleSeconds: config.MAIL_CLAIM_STALE_SECONDS, exclude: seen } }, batchSize);
    if (!rows.length) break;
    seen.push(...rows.map((r) => r.id));
    await sendClaimed(deps, rows, result);
    if (rows.length < batchSize) break;
  }
  return result;
}
