import type { Knex } from 'knex';
import type { ListOutboxQuery, MailState, OutboxMail, OutboxPage } from '@spincycle/shared/mail/mail-outbox';
import { FIRST_SWEEP_AFTER_SECONDS } from '../../mail/outbox';

interface OutboxListRow {
  id: number;
  created_at: Date;
  kind: string;
  to_addresses: string[];
  subject: string;
  state: MailState;
  attempts: number;
  next_attempt_at: Date;
  last_error: string | null;
  sent_at: Date | null;
}

/** The columns an administrator may see: never the bodies or attachments (reset and invitation links). */
const LIST_COLUMNS = [
  'id',
  'created_at',
  'kind',
  'to_addresses',
  'subject',
  'state',
  'attempts',
  'next_attempt_at',
  'last_error',
  'sent_at',
];

function toOutboxMail(r: OutboxListRow): OutboxMail {
  return {
    id: r.id,
    createdAt: r.created_at.toISOString(),
    kind: r.kind,
    to: r.to_addresses,
    subject: r.subject,
    state: r.state,
    attempts: r.attempts,
    nextAttemptAt: r.state === 'pending' ? r.next_attempt_at.toISOString() : null,
    lastError: r.state === 'sent' ? null : r.last_error,
    sentAt: r.sent_at?.toISOString() ?? null,
  };
}

function statesOf(filter: ListOutboxQuery['state']): MailState[] | null {
  if (filter === 'all') return null;
  if (filter === 'unsent') return ['pending', 'sending', 'failed'];
  return [filter];
}

export async function listOutboxMails(db: Knex, query: ListOutboxQuery): Promise<OutboxPage> {
  const states = statesOf(query.state);
  const filtered = () => {
    const q = db('mail_outbox');
    if (states) q.whereIn('state', states);
    return q;
  };
  const [rows, [{ count }]] = await Promise.all([
    filtered()
      .select(LIST_COLUMNS)
      .orderBy([
        { column: 'created_at', order: 'desc' },
        { column: 'id', order: 'desc' },
      ])
      .limit(query.pageSize)
      .offset((query.page - 1) * query.pageSize),
    filtered().count<{ count: number }[]>({ count: '*' }),
  ]);
  return { items: (rows as OutboxListRow[]).map(toOutboxMail), total: Number(count) };
}

export async function findOutboxMail(db: Knex, id: number): Promise<OutboxMail | undefined> {
  const row: OutboxListRow | undefined = await db('mail_outbox').where('id', id).first(LIST_COLUMNS);
  return row && toOutboxMail(row);
}

/**
 * A failed mail back to pending with its attempts counted afresh (the last error stays until the
 * next attempt). Like a fresh mail it is the web process's to deliver at once; a sweep takes it
 * only after FIRST_SWEEP_AFTER_SECONDS. One conditional UPDATE, so two administrators pressing
 * at once requeue it once. Answers what was done, or the state that prevented it.
 */
export async function requeueFailedMail(db: Knex, id: number): Promise<'requeued' | 'unknown' | MailState> {
  const n = await db('mail_outbox')
    .where({ id, state: 'failed' })
    .update({ state: 'pending', attempts: 0, next_attempt_at: db.raw("now() + (? * interval '1 second')", [FIRST_SWEEP_AFTER_SECONDS]) });
  if (n) return 'requeued';
  const row: { state: MailState } | undefined = await db('mail_outbox').where('id', id).first('state');
  return row?.state ?? 'unknown';
}
