import type { Knex } from 'knex';

/**
 * Awards (DESIGN.md, "facility manager"): the decision on each ranked proposal (awarded,
 * reserve, not awarded) with its node-hours per node and, for a partial award, the targets
 * awarded; when the cycle's decisions were released to the teams; the program an awarded
 * proposal becomes; and an audit log of who changed what and why.
 *
 * `audit_log` is meant for later features too (night plans, execution): each adds its entity
 * to `audit_log_entity_check` in a migration of its own.
 *
 * The CHECK lists copy the shared constants on purpose (see 20261201000300_proposals.ts).
 */
const OUTCOMES = ['awarded', 'reserve', 'not_awarded'];
const PROGRAM_STATES = ['scheduled', 'observing', 'complete', 'withdrawn'];
const AUDIT_ENTITIES = ['award', 'release', 'program'];

const list = (values: string[]) => values.map((v) => `'${v}'`).join(', ');

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('awards', (t) => {
    t.integer('proposal_id').primary().references('proposals.id').onDelete('CASCADE');
    t.integer('cycle_id').notNullable().references('cycles.id').onDelete('CASCADE');
    t.text('outcome').notNullable();
    // Null: every target of the proposal; otherwise the targets awarded (a partial award).
    t.specificType('target_ids', 'integer[]');
    // Why the award may take a node past what the cycle offers there.
    t.text('override_reason');
    t.integer('decided_by').references('accounts.id').onDelete('SET NULL');
    t.timestamp('decided_at', { useTz: true }).notNullable();
    // When the team was told (at the release, or of a change after it).
    t.timestamp('mailed_at', { useTz: true });
    // Optimistic concurrency: every change names the version it read.
    t.integer('version').notNullable().defaultTo(1);
    t.timestamps(true, true);
    t.index(['cycle_id']);
    t.index(['decided_by']);
    t.check(`outcome IN (${list(OUTCOMES)})`, [], 'awards_outcome_check');
    t.check("outcome <> 'not_awarded' OR target_ids IS NULL", [], 'awards_not_awarded_targets_check');
    t.check('target_ids IS NULL OR cardinality(target_ids) >= 1', [], 'awards_target_ids_check');
    t.check('override_reason IS NULL OR char_length(override_reason) BETWEEN 1 AND 1000', [], 'awards_override_reason_check');
    t.check('version >= 1', [], 'awards_version_check');
  });

  await knex.schema.createTable('award_nodes', (t) => {
    t.integer('proposal_id').notNullable().references('awards.proposal_id').onDelete('CASCADE');
    t.integer('node_id').notNullable().references('nodes.id').onDelete('RESTRICT');
    t.decimal('node_hours', 10, 2).notNullable();
    t.primary(['proposal_id', 'node_id']);
    t.index(['node_id']);
    t.check('node_hours > 0', [], 'award_nodes_hours_check');
  });

  await knex.schema.alterTable('cycles', (t) => {
    // When the manager released the cycle's decisions to the teams; null before.
    t.timestamp('awards_released_at', { useTz: true });
    t.integer('awards_released_by').references('accounts.id').onDelete('SET NULL');
    t.index(['awards_released_by']);
  });

  // An awarded proposal's program: scheduled → observing → complete, or withdrawn.
  await knex.schema.createTable('programs', (t) => {
    t.integer('proposal_id').primary().references('proposals.id').onDelete('CASCADE');
    t.integer('cycle_id').notNullable().references('cycles.id').onDelete('CASCADE');
    t.text('state').notNullable().defaultTo('scheduled');
    t.integer('version').notNullable().defaultTo(1);
    t.timestamps(true, true);
    t.index(['cycle_id']);
    t.check(`state IN (${list(PROGRAM_STATES)})`, [], 'programs_state_check');
    t.check('version >= 1', [], 'programs_version_check');
  });

  await knex.schema.createTable('audit_log', (t) => {
    t.bigIncrements('id').primary();
    t.timestamp('at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.integer('actor_account_id').references('accounts.id').onDelete('SET NULL');
    t.integer('cycle_id').notNullable().references('cycles.id').onDelete('CASCADE');
    // What the entry is about; `entity_id` is that entity's id (a proposal's for 'award' and 'program', the cycle's for 'release').
    t.text('entity').notNullable();
    t.integer('entity_id').notNullable();
    t.text('action').notNullable();
    t.jsonb('before');
    t.jsonb('after');
    t.text('reason');
    t.index(['cycle_id', 'at']);
    t.index(['actor_account_id']);
    t.check(`entity IN (${list(AUDIT_ENTITIES)})`, [], 'audit_log_entity_check');
    t.check('char_length(action) BETWEEN 1 AND 40', [], 'audit_log_action_check');
    t.check('reason IS NULL OR char_length(reason) <= 4000', [], 'audit_log_reason_check');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('audit_log');
  await knex.schema.dropTable('programs');
  await knex.schema.alterTable('cycles', (t) => {
    t.dropIndex(['awards_released_by']);
    t.dropColumn('awards_released_by');
    t.dropColumn('awards_released_at');
  });
  await knex.schema.dropTable('award_nodes');
  await knex.schema.dropTable('awards');
}
