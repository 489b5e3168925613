import type { Knex } from 'knex';

/**
 * The double-period check of a rotation measurement (shared/src/science/rotation/double-period.ts):
 * twice the best period when the light curve suggests two spot groups (null otherwise), copied out
 * of `result` so that the program's table can caution without reading it.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('rotation_measurements', (t) => {
    t.double('double_period_days');
    t.check('double_period_days IS NULL OR double_period_days > 0', [], 'rotation_measurements_double_period_check');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('rotation_measurements', (t) => {
    t.dropChecks(['rotation_measurements_double_period_check']);
    t.dropColumn('double_period_days');
  });
}
