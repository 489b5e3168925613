import type { Knex } from 'knex';

/**
 * Night plans (docs/night-plans.md): builds of a released cycle's night plans (one worker job
 * per node), the planned visits with their execution status, each awarded target's figures on
 * its node (what is needed, planned, the cadence achieved and the science yield), and the nights
 * a facility manager marked lost. The audit log learns three entities: 'night_plan' (a build
 * asked for; entity_id the build's id), 'lost_night' (entity_id the node's id) and 'visit'
 * (entity_id the visit's id, or the cycle's for an execution upload).
 *
 * The CHECK lists copy the shared constants on purpose (see 20261201000300_proposals.ts).
 */
const BUILD_KINDS = ['build', 'replan'];
const BUILD_STATES = ['queued', 'running', 'done', 'failed'];
const VISIT_STATUSES = ['planned', 'done', 'missed'];
const AUDIT_ENTITIES_BEFORE = ['award', 'release', 'program'];
const AUDIT_ENTITIES = [...AUDIT_ENTITIES_BEFORE, 'night_plan', 'lost_night', 'visit'];

const list = (values: string[]) => values.map((v) => `'${v}'`).join(', ');

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('night_plan_builds', (t) => {
    t.increments('id').primary();
    t.integer('cycle_id').notNullable().references('cycles.id').onDelete('CASCADE');
    t.text('kind').notNullable();
    t.text('state').notNullable().defaultTo('queued');
    // Progress in work units (nights scheduled, then targets whose yield is computed).
    t.integer('total').notNullable().defaultTo(0);
    t.integer('done').notNullable().defaultTo(0);
    // Node jobs of the build and how many have finished (the last one sets the build done).
    t.integer('node_jobs').notNullable().defaultTo(0);
    t.integer('node_jobs_finished').notNullable().defaultTo(0);
    // A re-plan plans from this night on (and, when set, only this node).
    t.date('from_night');
    t.integer('node_id').references('nodes.id').onDelete('CASCADE');
    t.integer('requested_by').references('accounts.id').onDelete('SET NULL');
    t.timestamp('requested_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('started_at', { useTz: true });
    t.timestamp('finished_at', { useTz: true });
    t.text('error');
    t.index(['cycle_id', 'requested_at']);
    t.index(['requested_by']);
    t.index(['node_id']);
    t.check(`kind IN (${list(BUILD_KINDS)})`, [], 'night_plan_builds_kind_check');
    t.check(`state IN (${list(BUILD_STATES)})`, [], 'night_plan_builds_state_check');
    t.check('total >= 0 AND done >= 0 AND done <= total', [], 'night_plan_builds_progress_check');
    t.check('node_jobs >= 0 AND node_jobs_finished >= 0 AND node_jobs_finished <= node_jobs', [], 'night_plan_builds_jobs_check');
    t.check("kind = 'build' OR from_night IS NOT NULL", [], 'night_plan_builds_from_night_check');
    t.check('error IS NULL OR char_length(error) <= 2000', [], 'night_plan_builds_error_check');
  });

  await knex.schema.createTable('night_plan_visits', (t) => {
    t.bigIncrements('id').primary();
    t.integer('cycle_id').notNullable().references('cycles.id').onDelete('CASCADE');
    t.integer('node_id').notNullable().references('nodes.id').onDelete('CASCADE');
    t.integer('proposal_id').notNullable().references('proposals.id').onDelete('CASCADE');
    t.integer('target_id').notNullable().references('targets.id').onDelete('CASCADE');
    t.date('night_date').notNullable();
    t.timestamp('start_at', { useTz: true }).notNullable();
    t.timestamp('end_at', { useTz: true }).notNullable();
    t.text('status').notNullable().defaultTo('planned');
    t.integer('build_id').references('night_plan_builds.id').onDelete('SET NULL');
    t.double('altitude_deg').notNullable();
    t.double('airmass').notNullable();
    t.integer('status_changed_by').references('accounts.id').onDelete('SET NULL');
    t.timestamp('status_changed_at', { useTz: true });
    t.integer('version').notNullable().defaultTo(1);
    t.index(['cycle_id', 'node_id', 'night_date']);
    t.index(['proposal_id']);
    t.index(['target_id']);
    t.index(['build_id']);
    t.index(['status_changed_by']);
    t.check(`status IN (${list(VISIT_STATUSES)})`, [], 'night_plan_visits_status_check');
    t.check('end_at > start_at', [], 'night_plan_visits_span_check');
    t.check('altitude_deg BETWEEN -90 AND 90', [], 'night_plan_visits_altitude_check');
    t.check('airmass >= 1', [], 'night_plan_visits_airmass_check');
    t.check('version >= 1', [], 'night_plan_visits_version_check');
  });

  await knex.schema.createTable('night_plan_targets', (t) => {
    t.integer('cycle_id').notNullable().references('cycles.id').onDelete('CASCADE');
    t.integer('proposal_id').notNullable().references('proposals.id').onDelete('CASCADE');
    t.integer('target_id').notNullable().references('targets.id').onDelete('CASCADE');
    t.integer('node_id').notNullable().references('nodes.id').onDelete('CASCADE');
    t.integer('visits_required').notNullable();
    t.integer('visit_nights_required').notNullable();
    t.integer('step_nights').notNullable();
    t.integer('tolerance_nights').notNullable();
    t.integer('visits_planned').notNullable();
    t.integer('visit_nights_planned').notNullable();
    t.double('median_gap');
    t.integer('largest_gap');
    t.double('recovery_fraction');
    t.text('recovery_explanation');
    t.jsonb('at_risk').notNullable().defaultTo('[]');
    t.integer('build_id').references('night_plan_builds.id').onDelete('SET NULL');
    t.primary(['target_id', 'node_id']);
    t.index(['cycle_id', 'node_id']);
    t.index(['proposal_id']);
    t.index(['node_id']);
    t.index(['build_id']);
    t.check(
      'visits_required >= 0 AND visit_nights_required >= 0 AND visits_planned >= 0 AND visit_nights_planned >= 0',
      [],
      'night_plan_targets_counts_check',
    );
    t.check('step_nights >= 1 AND tolerance_nights >= 0 AND tolerance_nights < step_nights', [], 'night_plan_targets_cadence_check');
    t.check('recovery_fraction IS NULL OR recovery_fraction BETWEEN 0 AND 1', [], 'night_plan_targets_recovery_check');
    t.check("jsonb_typeof(at_risk) = 'array'", [], 'night_plan_targets_at_risk_check');
  });

  await knex.schema.createTable('lost_nights', (t) => {
    t.integer('cycle_id').notNullable().references('cycles.id').onDelete('CASCADE');
    t.integer('node_id').notNullable().references('nodes.id').onDelete('CASCADE');
    t.date('night_date').notNullable();
    t.text('reason').notNullable();
    t.integer('marked_by').references('accounts.id').onDelete('SET NULL');
    t.timestamp('marked_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.primary(['cycle_id', 'node_id', 'night_date']);
    t.index(['node_id']);
    t.index(['marked_by']);
    t.check('char_length(reason) BETWEEN 1 AND 500', [], 'lost_nights_reason_check');
  });

  await knex.raw('ALTER TABLE audit_log DROP CONSTRAINT audit_log_entity_check');
  await knex.raw(`ALTER TABLE audit_log ADD CONSTRAINT audit_log_entity_check CHECK (entity IN (${list(AUDIT_ENTITIES)}))`);
}

export async function down(knex: Knex): Promise<void> {
  await knex('audit_log').whereIn('entity', ['night_plan', 'lost_night', 'visit']).del();
  await knex.raw('ALTER TABLE audit_log DROP CONSTRAINT audit_log_entity_check');
  await knex.raw(`ALTER TABLE audit_log ADD CONSTRAINT audit_log_entity_check CHECK (entity IN (${list(AUDIT_ENTITIES_BEFORE)}))`);
  await knex.schema.dropTable('lost_nights');
  await knex.schema.dropTable('night_plan_targets');
  await knex.schema.dropTable('night_plan_visits');
  await knex.schema.dropTable('night_plan_builds');
}
