import type { Knex } from 'knex';

/**
 * Calendar subscription links of a node's night plan (server/src/features/night-plans/calendar-feed-*.ts):
 * a facility manager makes a link that a calendar application polls without signing in. Only
 * the SHA-256 (hex) of the link's secret is stored, so that a database leak does not leak
 * usable links. A link is stopped by setting `revoked_at`; at most one link of a node in a
 * cycle is active (a partial unique index). The audit log learns the entity 'calendar_feed'
 * (entity_id the link's id).
 *
 * The CHECK list copies the earlier migrations' on purpose (see 20261201000300_proposals.ts).
 */
const AUDIT_ENTITIES_BEFORE = ['award', 'release', 'program', 'night_plan', 'lost_night', 'visit'];
const AUDIT_ENTITIES = [...AUDIT_ENTITIES_BEFORE, 'calendar_feed'];

const list = (values: string[]) => values.map((v) => `'${v}'`).join(', ');

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('calendar_feeds', (t) => {
    t.increments('id').primary();
    t.integer('cycle_id').notNullable().references('cycles.id').onDelete('CASCADE');
    t.integer('node_id').notNullable().references('nodes.id').onDelete('CASCADE');
    t.text('token_hash').notNullable().unique();
    t.integer('created_by').references('accounts.id').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('revoked_at', { useTz: true });
    t.integer('revoked_by').references('accounts.id').onDelete('SET NULL');
    t.index(['cycle_id', 'node_id']);
    t.index(['node_id']);
    t.index(['created_by']);
    t.index(['revoked_by']);
    t.check("token_hash ~ '^[0-9a-f]{64}$'", [], 'calendar_feeds_token_hash_check');
    t.check('revoked_at IS NULL OR revoked_at >= created_at', [], 'calendar_feeds_revoked_check');
  });
  await knex.raw('CREATE UNIQUE INDEX calendar_feeds_one_active ON calendar_feeds (cycle_id, node_id) WHERE revoked_at IS NULL');

  await knex.raw('ALTER TABLE audit_log DROP CONSTRAINT audit_log_entity_check');
  await knex.raw(`ALTER TABLE audit_log ADD CONSTRAINT audit_log_entity_check CHECK (entity IN (${list(AUDIT_ENTITIES)}))`);
}

export async function down(knex: Knex): Promise<void> {
  await knex('audit_log').where('entity', 'calendar_feed').del();
  await knex.raw('ALTER TABLE audit_log DROP CONSTRAINT audit_log_entity_check');
  await knex.raw(`ALTER TABLE audit_log ADD CONSTRAINT audit_log_entity_check CHECK (entity IN (${list(AUDIT_ENTITIES_BEFORE)}))`);
  await knex.schema.dropTable('calendar_feeds');
}
