import type { Knex } from 'knex';

/**
 * Inputs of the target plan that the proposer may now give:
 * - `targets.period_days` / `period_uncertainty_days`: an expected rotation period for stars
 *   where no gyrochronology relation gives one (fast rotators, colours beyond a relation's
 *   calibrated range, ages above the age of the universe); the plan uses it instead of the
 *   relation's period. An uncertainty without a period means nothing, so it needs one.
 * - `proposals.completeness`: the probability that each plan recovers the period (0.5–0.99;
 *   0.9 for existing proposals, as the plans assumed until now).
 * And the Osborn et al. (2015) corrected Young formula becomes the default scintillation model
 * of new nodes (existing nodes keep theirs; 'young1967' stays allowed).
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('targets', (t) => {
    t.double('period_days');
    t.double('period_uncertainty_days');
    t.check('period_days IS NULL OR (period_days >= 0.05 AND period_days <= 1000)', [], 'targets_period_check');
    t.check('period_uncertainty_days IS NULL OR period_uncertainty_days >= 0', [], 'targets_period_uncertainty_check');
    t.check('period_uncertainty_days IS NULL OR period_days IS NOT NULL', [], 'targets_period_uncertainty_needs_period_check');
  });
  await knex.schema.alterTable('proposals', (t) => {
    t.double('completeness').notNullable().defaultTo(0.9);
    t.check('completeness BETWEEN 0.5 AND 0.99', [], 'proposals_completeness_check');
  });
  await knex.raw("ALTER TABLE nodes ALTER COLUMN scintillation_model SET DEFAULT 'osborn2015'");
}

/** Drops the columns and the default again. */
export async function down(knex: Knex): Promise<void> {
  await knex.raw('ALTER TABLE nodes ALTER COLUMN scintillation_model DROP DEFAULT');
  await knex.schema.alterTable('proposals', (t) => {
    t.dropChecks(['proposals_completeness_check']);
    t.dropColumn('completeness');
  });
  await knex.schema.alterTable('targets', (t) => {
    t.dropChecks(['targets_period_check', 'targets_period_uncertainty_check', 'targets_period_uncertainty_needs_period_check']);
    t.dropColumn('period_days');
    t.dropColumn('period_uncertainty_days');
  });
}
