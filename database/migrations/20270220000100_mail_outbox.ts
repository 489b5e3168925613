import type { Knex } from 'knex';

/**
 * The mail outbox (server/src/mail/outbox.ts): every e-mail of the product is a row written in
 * the same transaction as the change that causes it, then handed to the SMTP relay by the web
 * process right after the commit or by the worker's sweep, with retries and backoff.
 *
 * - `message_id` is the Message-ID header, fixed when the row is written, so that a second copy
 *   after a crash between the relay's "accepted" and our "sent" is recognisable as the same mail.
 * - `claim_token` is set with `state = 'sending'` by the one process handing the row to the relay;
 *   only that claim may record the outcome.
 * - `holds_secret`: the body carries a credential (a password-reset or invitation link), blanked
 *   once the mail is sent.
 * - `on_sent`: a mark the delivery sets in the same transaction as `state = 'sent'` (e.g. the
 *   award's `mailed_at`); the names are listed in outbox.ts.
 * - `attachments`: `[{ filename, contentType, contentBase64 }]`.
 *
 * The state list copies MAIL_STATES of shared/src/mail/mail-outbox.ts on purpose (see
 * 20261201000300_proposals.ts); kinds are free snake_case words so that features add their own.
 */
const STATES = ['pending', 'sending', 'sent', 'failed'];

const list = (values: string[]) => values.map((v) => `'${v}'`).join(', ');

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('mail_outbox', (t) => {
    t.bigIncrements('id').primary();
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.text('kind').notNullable();
    t.specificType('to_addresses', 'text[]').notNullable();
    t.text('subject').notNullable();
    t.text('text_body').notNullable();
    t.text('html_body');
    t.jsonb('attachments');
    t.text('message_id').notNullable().unique();
    t.text('state').notNullable().defaultTo('pending');
    t.integer('attempts').notNullable().defaultTo(0);
    t.timestamp('next_attempt_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.text('last_error');
    t.timestamp('sent_at', { useTz: true });
    t.timestamp('claimed_at', { useTz: true });
    t.text('claim_token');
    t.boolean('holds_secret').notNullable().defaultTo(false);
    t.jsonb('on_sent');
    t.check("kind ~ '^[a-z][a-z0-9_]{0,39}$'", [], 'mail_outbox_kind_check');
    t.check('cardinality(to_addresses) >= 1', [], 'mail_outbox_to_check');
    t.check('char_length(subject) <= 998', [], 'mail_outbox_subject_check');
    t.check(`state IN (${list(STATES)})`, [], 'mail_outbox_state_check');
    t.check('attempts >= 0', [], 'mail_outbox_attempts_check');
    t.check('last_error IS NULL OR char_length(last_error) <= 500', [], 'mail_outbox_error_check');
    t.check("(state = 'sent') = (sent_at IS NOT NULL)", [], 'mail_outbox_sent_check');
    t.check("(state = 'sending') = (claim_token IS NOT NULL AND claimed_at IS NOT NULL)", [], 'mail_outbox_claim_check');
    t.check(
      "attachments IS NULL OR (jsonb_typeof(attachments) = 'array' AND octet_length(attachments::text) <= 15000000)",
      [],
      'mail_outbox_attachments_check',
    );
    t.check("message_id ~ '^<[^<>@\\s]+@[^<>@\\s]+>$'", [], 'mail_outbox_message_id_check');
  });
  // The sweep: due pending rows, and sending rows whose claim may have been abandoned.
  await knex.raw("CREATE INDEX mail_outbox_due_idx ON mail_outbox (next_attempt_at) WHERE state = 'pending'");
  await knex.raw("CREATE INDEX mail_outbox_claimed_idx ON mail_outbox (claimed_at) WHERE state = 'sending'");
  // The administrator's list: newest first, by state.
  await knex.raw('CREATE INDEX mail_outbox_state_created_idx ON mail_outbox (state, created_at DESC, id DESC)');
  await knex.raw('CREATE INDEX mail_outbox_created_idx ON mail_outbox (created_at DESC, id DESC)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('mail_outbox');
}
