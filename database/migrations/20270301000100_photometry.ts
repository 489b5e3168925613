import type { Knex } from 'knex';

/**
 * Returned photometry (shared/src/photometry/photometry.ts, server/src/features/photometry):
 *
 * - `light_curve_uploads`: one row per upload (who, when, the files and their row counts).
 * - `light_curves`: a target's stored light curve, replaced whole by the next upload that
 *   carries the target. Times (BJD TDB), values and errors are little-endian float64 arrays in
 *   `bytea` (10⁵ points are 800 kB each, written and read whole, never queried inside); `node_index`
 *   is a uint16 array indexing `node_codes` (0xffff: no node given).
 * - `photometry_runs`: one analysis of a program's stored curves (the progress bar), with the
 *   detrending choices it used; the newest run of a proposal is the one shown.
 * - `rotation_measurements`: a target's latest measurement; the table's columns are copied out
 *   of `result` so that the program's table is read without it; `light_curve_upload_id` says
 *   which curve was measured.
 *
 * The lists copy shared/src/photometry/photometry.ts on purpose (see 20261201000300_proposals.ts).
 */
const RUN_STATES = ['queued', 'running', 'done', 'failed'];
const VERDICTS = ['measured', 'tentative', 'not_detected'];
const VALUE_KINDS = ['mag', 'flux'];

const list = (values: string[]) => values.map((v) => `'${v}'`).join(', ');

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('light_curve_uploads', (t) => {
    t.increments('id').primary();
    t.integer('proposal_id').notNullable().references('proposals.id').onDelete('CASCADE');
    t.integer('uploaded_by').references('accounts.id').onDelete('SET NULL');
    t.timestamp('uploaded_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    // [{ fileName, rows }]
    t.jsonb('files').notNullable();
    t.integer('points').notNullable();
    t.index(['proposal_id']);
    t.index(['uploaded_by']);
    t.check('points >= 1', [], 'light_curve_uploads_points_check');
  });

  await knex.schema.createTable('light_curves', (t) => {
    t.integer('target_id').primary().references('targets.id').onDelete('CASCADE');
    t.integer('proposal_id').notNullable().references('proposals.id').onDelete('CASCADE');
    t.integer('upload_id').notNullable().references('light_curve_uploads.id').onDelete('CASCADE');
    t.integer('point_count').notNullable();
    t.text('value_kind').notNullable();
    t.specificType('time_systems', 'text[]').notNullable();
    t.specificType('node_codes', 'text[]').notNullable();
    t.specificType('file_names', 'text[]').notNullable();
    t.double('first_bjd').notNullable();
    t.double('last_bjd').notNullable();
    t.binary('bjd').notNullable();
    t.binary('values').notNullable();
    t.binary('errors');
    t.binary('node_index');
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['proposal_id']);
    t.index(['upload_id']);
    t.check('point_count >= 1', [], 'light_curves_points_check');
    t.check(`value_kind IN (${list(VALUE_KINDS)})`, [], 'light_curves_value_kind_check');
    t.check('octet_length(bjd) = 8 * point_count', [], 'light_curves_bjd_length_check');
    t.check('octet_length("values") = 8 * point_count', [], 'light_curves_values_length_check');
    t.check('errors IS NULL OR octet_length(errors) = 8 * point_count', [], 'light_curves_errors_length_check');
    t.check('node_index IS NULL OR octet_length(node_index) = 2 * point_count', [], 'light_curves_node_index_length_check');
  });

  await knex.schema.createTable('photometry_runs', (t) => {
    t.increments('id').primary();
    t.integer('proposal_id').notNullable().references('proposals.id').onDelete('CASCADE');
    t.text('state').notNullable().defaultTo('queued');
    t.integer('total').notNullable();
    t.integer('done').notNullable().defaultTo(0);
    t.jsonb('detrend').notNullable();
    t.integer('requested_by').references('accounts.id').onDelete('SET NULL');
    t.timestamp('requested_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('started_at', { useTz: true });
    t.timestamp('finished_at', { useTz: true });
    t.text('error');
    t.index(['proposal_id', 'id']);
    t.index(['requested_by']);
    t.check(`state IN (${list(RUN_STATES)})`, [], 'photometry_runs_state_check');
    t.check('done >= 0 AND total >= 0 AND done <= total', [], 'photometry_runs_progress_check');
  });

  await knex.schema.createTable('rotation_measurements', (t) => {
    t.integer('target_id').primary().references('targets.id').onDelete('CASCADE');
    t.integer('proposal_id').notNullable().references('proposals.id').onDelete('CASCADE');
    t.integer('run_id').notNullable().references('photometry_runs.id').onDelete('CASCADE');
    t.integer('light_curve_upload_id').notNullable().references('light_curve_uploads.id').onDelete('CASCADE');
    t.text('verdict').notNullable();
    t.double('period_days');
    t.double('period_uncertainty_days');
    t.double('false_alarm_probability');
    t.double('semi_amplitude_ppm');
    t.double('semi_amplitude_mmag');
    t.boolean('alias_flagged').notNullable();
    // The implied age (ImpliedAge of photometry.ts), or null when not detected; the cluster fit reads it.
    t.json('age');
    // The whole RotationMeasurement (charts included), read only by the target's page.
    t.json('result').notNullable();
    t.timestamp('analysed_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['proposal_id']);
    t.index(['run_id']);
    t.index(['light_curve_upload_id']);
    t.check(`verdict IN (${list(VERDICTS)})`, [], 'rotation_measurements_verdict_check');
  });
  await knex.raw(`DO $$ BEGIN
    EXECUTE 'ALTER TABLE rotation_measurements ALTER COLUMN result SET COMPRESSION lz4';
  EXCEPTION WHEN OTHERS THEN NULL;
  END $$`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('rotation_measurements');
  await knex.schema.dropTable('photometry_runs');
  await knex.schema.dropTable('light_curves');
  await knex.schema.dropTable('light_curve_uploads');
}
