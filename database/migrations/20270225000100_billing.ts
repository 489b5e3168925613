import type { Knex } from 'knex';

/**
 * Billing (docs/billing.md): node-hour fees for awarded programs.
 *
 * - nodes.external_rate_minor_per_hour: the rate for programs billed at the external rate (null:
 *   the same as the node's rate, which is the academic one).
 * - programs.rate_class ('academic' | 'external') and the payment provider's customer of the program.
 * - program_billing_contacts: who receives and pays a program's invoices (invited by e-mail; the
 *   link carries a token of which only the SHA-256 is stored, as for team invitations).
 * - invoices and invoice_lines (one line per node and currency: awarded hours × rate), amounts in
 *   integer minor units; invoice_number_counters gives gapless numbers per year, allocated in the
 *   issuing transaction (a row lock, so two issues never get the same number and a rolled-back
 *   issue leaves no gap).
 * - payment_attempts (each card payment asked for, with its idempotency key) and payment_events
 *   (each provider event id handled once: a replayed webhook changes nothing).
 * The audit log learns the entity 'invoice' (entity_id the invoice's id).
 *
 * The CHECK lists copy the shared constants on purpose (see 20261201000300_proposals.ts).
 */
const INVOICE_STATES = ['draft', 'issued', 'paid', 'void', 'refunded'];
const RATE_CLASSES = ['academic', 'external'];
const ATTEMPT_STATES = ['processing', 'succeeded', 'declined', 'needs_authentication', 'failed'];
const AUDIT_ENTITIES_BEFORE = ['award', 'release', 'program', 'night_plan', 'lost_night', 'visit', 'calendar_feed'];
const AUDIT_ENTITIES = [...AUDIT_ENTITIES_BEFORE, 'invoice'];

const list = (values: string[]) => values.map((v) => `'${v}'`).join(', ');

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('nodes', (t) => {
    t.integer('external_rate_minor_per_hour');
    t.check('external_rate_minor_per_hour IS NULL OR external_rate_minor_per_hour >= 0', [], 'nodes_external_rate_check');
  });

  await knex.schema.alterTable('programs', (t) => {
    t.text('rate_class').notNullable().defaultTo('academic');
    t.text('payment_customer_id');
    t.check(`rate_class IN (${list(RATE_CLASSES)})`, [], 'programs_rate_class_check');
  });

  await knex.schema.createTable('program_billing_contacts', (t) => {
    t.increments('id').primary();
    t.integer('proposal_id').notNullable().references('programs.proposal_id').onDelete('CASCADE');
    // Lower-cased address the invitation went to.
    t.text('email').notNullable();
    t.integer('account_id').references('accounts.id').onDelete('CASCADE');
    t.text('token_hash').unique();
    t.integer('invited_by').references('accounts.id').onDelete('SET NULL');
    t.timestamp('invited_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('accepted_at', { useTz: true });
    t.unique(['proposal_id', 'email']);
    t.index(['account_id']);
    t.index(['invited_by']);
    t.check('email = lower(email) AND char_length(email) BETWEEN 3 AND 254', [], 'program_billing_contacts_email_check');
    t.check('(accepted_at IS NULL) = (account_id IS NULL)', [], 'program_billing_contacts_accepted_check');
  });

  await knex.schema.createTable('invoice_number_counters', (t) => {
    t.integer('year').primary();
    t.integer('last_number').notNullable();
    t.check('last_number >= 1', [], 'invoice_number_counters_last_check');
  });

  await knex.schema.createTable('invoices', (t) => {
    t.increments('id').primary();
    // Invoices are financial records: a program's proposal cannot be deleted while it has one.
    t.integer('proposal_id').notNullable().references('programs.proposal_id').onDelete('RESTRICT');
    t.integer('cycle_id').notNullable().references('cycles.id').onDelete('RESTRICT');
    t.text('number').unique();
    t.text('state').notNullable().defaultTo('draft');
    t.text('rate_class').notNullable();
    t.string('currency', 3).notNullable();
    t.bigInteger('total_minor').notNullable();
    t.date('due_date');
    t.timestamp('issued_at', { useTz: true });
    t.integer('issued_by').references('accounts.id').onDelete('SET NULL');
    t.timestamp('paid_at', { useTz: true });
    t.timestamp('voided_at', { useTz: true });
    t.integer('voided_by').references('accounts.id').onDelete('SET NULL');
    t.text('void_reason');
    t.timestamp('refund_requested_at', { useTz: true });
    t.integer('refund_requested_by').references('accounts.id').onDelete('SET NULL');
    t.text('refund_reason');
    t.timestamp('refunded_at', { useTz: true });
    // The provider's payment that paid it, and the charge a refund goes against.
    t.text('payment_intent_id').unique();
    t.text('charge_id');
    t.integer('created_by').references('accounts.id').onDelete('SET NULL');
    // Optimistic concurrency, and part of the idempotency key of a payment.
    t.integer('version').notNullable().defaultTo(1);
    t.timestamps(true, true);
    t.index(['proposal_id']);
    t.index(['cycle_id', 'state']);
    t.index(['issued_by']);
    t.index(['voided_by']);
    t.index(['refund_requested_by']);
    t.index(['created_by']);
    t.check(`state IN (${list(INVOICE_STATES)})`, [], 'invoices_state_check');
    t.check(`rate_class IN (${list(RATE_CLASSES)})`, [], 'invoices_rate_class_check');
    t.check("currency ~ '^[A-Z]{3}$'", [], 'invoices_currency_check');
    t.check('total_minor >= 0', [], 'invoices_total_check');
    t.check("(state = 'draft') = (number IS NULL)", [], 'invoices_number_check');
    t.check("state = 'draft' OR (issued_at IS NOT NULL AND due_date IS NOT NULL)", [], 'invoices_issued_check');
    t.check("state NOT IN ('paid', 'refunded') OR paid_at IS NOT NULL", [], 'invoices_paid_check');
    t.check("state <> 'void' OR (voided_at IS NOT NULL AND void_reason IS NOT NULL)", [], 'invoices_void_check');
    t.check("state <> 'refunded' OR refunded_at IS NOT NULL", [], 'invoices_refunded_check');
    t.check('void_reason IS NULL OR char_length(void_reason) BETWEEN 1 AND 1000', [], 'invoices_void_reason_check');
    t.check('refund_reason IS NULL OR char_length(refund_reason) BETWEEN 1 AND 1000', [], 'invoices_refund_reason_check');
    t.check('version >= 1', [], 'invoices_version_check');
  });
  // One open invoice (draft or issued) per program and currency.
  await knex.raw(
    "CREATE UNIQUE INDEX invoices_one_open_per_currency ON invoices (proposal_id, currency) WHERE state IN ('draft', 'issued')",
  );

  await knex.schema.createTable('invoice_lines', (t) => {
    t.increments('id').primary();
    t.integer('invoice_id').notNullable().references('invoices.id').onDelete('CASCADE');
    t.integer('position').notNullable();
    t.integer('node_id').references('nodes.id').onDelete('SET NULL');
    t.text('description').notNullable();
    // Awarded hours in hundredths (award_nodes.node_hours is numeric(10,2)): exact, no floating point.
    t.bigInteger('hours_hundredths').notNullable();
    t.integer('rate_minor_per_hour').notNullable();
    t.bigInteger('amount_minor').notNullable();
    t.unique(['invoice_id', 'position']);
    t.index(['node_id']);
    t.check('hours_hundredths > 0 AND rate_minor_per_hour >= 0 AND amount_minor >= 0', [], 'invoice_lines_amounts_check');
    t.check('char_length(description) BETWEEN 1 AND 300', [], 'invoice_lines_description_check');
  });

  await knex.schema.createTable('payment_attempts', (t) => {
    t.increments('id').primary();
    t.integer('invoice_id').notNullable().references('invoices.id').onDelete('CASCADE');
    t.text('idempotency_key').notNullable();
    t.text('payment_intent_id');
    t.text('state').notNullable();
    // The provider's words for a decline, shown to the payer.
    t.text('message');
    t.text('decline_code');
    t.text('card_brand');
    t.string('card_last4', 4);
    t.bigInteger('amount_minor').notNullable();
    t.integer('created_by').references('accounts.id').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['invoice_id', 'created_at']);
    t.index(['payment_intent_id']);
    t.index(['created_by']);
    t.check(`state IN (${list(ATTEMPT_STATES)})`, [], 'payment_attempts_state_check');
    t.check('message IS NULL OR char_length(message) <= 1000', [], 'payment_attempts_message_check');
  });

  await knex.schema.createTable('payment_events', (t) => {
    t.text('event_id').primary();
    t.text('type').notNullable();
    t.integer('invoice_id').references('invoices.id').onDelete('SET NULL');
    // What handling it did, in words for the audit ('paid', 'ignored: …').
    t.text('outcome').notNullable();
    t.timestamp('received_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['invoice_id']);
  });

  await knex.raw('ALTER TABLE audit_log DROP CONSTRAINT audit_log_entity_check');
  await knex.raw(`ALTER TABLE audit_log ADD CONSTRAINT audit_log_entity_check CHECK (entity IN (${list(AUDIT_ENTITIES)}))`);
}

export async function down(knex: Knex): Promise<void> {
  await knex('audit_log').where('entity', 'invoice').del();
  await knex.raw('ALTER TABLE audit_log DROP CONSTRAINT audit_log_entity_check');
  await knex.raw(`ALTER TABLE audit_log ADD CONSTRAINT audit_log_entity_check CHECK (entity IN (${list(AUDIT_ENTITIES_BEFORE)}))`);
  await knex.schema.dropTable('payment_events');
  await knex.schema.dropTable('payment_attempts');
  await knex.schema.dropTable('invoice_lines');
  await knex.schema.dropTable('invoices');
  await knex.schema.dropTable('invoice_number_counters');
  await knex.schema.dropTable('program_billing_contacts');
  await knex.schema.alterTable('programs', (t) => {
    t.dropChecks(['programs_rate_class_check']);
    t.dropColumn('rate_class');
    t.dropColumn('payment_customer_id');
  });
  await knex.schema.alterTable('nodes', (t) => {
    t.dropChecks(['nodes_external_rate_check']);
    t.dropColumn('external_rate_minor_per_hour');
  });
}
