import type { Knex } from 'knex';

/**
 * Proposals and their parts: team, requested nodes, justification PDF, targets, target plans
 * and the background plan run. Shaped for the issues that follow: review panels and grades
 * hang off `proposals.id`; awards (awarded / reserve / not awarded) off `proposal_nodes`
 * (proposal_id, node_id); programs and night plans off the awarded proposal and its nodes;
 * invoices off the program and the team's billing contact.
 *
 * The CHECK lists below copy the shared constants on purpose: a migration must not change
 * when the code's lists change later (a new state gets its own migration).
 */
const PROPOSAL_STATES = ['draft', 'submitted', 'in_review', 'ranked', 'awarded', 'reserve', 'not_awarded'];
const BANDS = ['B', 'V', 'R', 'I', 'G'];
const COLOUR_SYSTEMS = ['BV', 'BPRP'];
const PLAN_RUN_STATES = ['idle', 'queued', 'running', 'failed'];

const list = (values: string[]) => values.map((v) => `'${v}'`).join(', ');

/** Creates the proposal tables. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('proposals', (t) => {
    t.increments('id').primary();
    // RESTRICT: a cycle with proposals, or the PI's account, cannot simply vanish.
    t.integer('cycle_id').notNullable().references('cycles.id').onDelete('RESTRICT');
    t.integer('pi_account_id').notNullable().references('accounts.id').onDelete('RESTRICT');
    t.text('title').notNullable();
    t.text('abstract').notNullable().defaultTo('');
    t.text('category');
    t.text('state').notNullable().defaultTo('draft');
    // Optimistic concurrency of the autosaving editor: every save names the version it read.
    t.integer('version').notNullable().defaultTo(1);
    t.timestamp('submitted_at', { useTz: true });
    t.timestamps(true, true);
    t.index(['cycle_id']);
    t.index(['pi_account_id']);
    t.check(`state IN (${list(PROPOSAL_STATES)})`, [], 'proposals_state_check');
    t.check('char_length(title) BETWEEN 1 AND 200', [], 'proposals_title_check');
    t.check('char_length(abstract) <= 4000', [], 'proposals_abstract_check');
    t.check('version >= 1', [], 'proposals_version_check');
    t.check("(state = 'draft') = (submitted_at IS NULL)", [], 'proposals_submitted_at_check');
  });

  await knex.schema.createTable('proposal_members', (t) => {
    t.increments('id').primary();
    t.integer('proposal_id').notNullable().references('proposals.id').onDelete('CASCADE');
    // Null until the invitee has an account and accepted.
    t.integer('account_id').references('accounts.id').onDelete('CASCADE');
    t.text('email').notNullable();
    t.text('role').notNullable();
    // Only a SHA-256 of the invitation token is kept; cleared once accepted (single use).
    t.text('invite_token_hash').unique();
    t.integer('invited_by').references('accounts.id').onDelete('SET NULL');
    t.timestamp('invited_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('accepted_at', { useTz: true });
    t.index(['proposal_id']);
    t.index(['account_id']);
    t.index(['invited_by']);
    t.check("role IN ('pi', 'coi')", [], 'proposal_members_role_check');
    t.check("role <> 'pi' OR (account_id IS NOT NULL AND accepted_at IS NOT NULL)", [], 'proposal_members_pi_check');
    t.check('accepted_at IS NULL OR account_id IS NOT NULL', [], 'proposal_members_accepted_check');
  });
  await knex.raw('CREATE UNIQUE INDEX proposal_members_email_unique ON proposal_members (proposal_id, lower(email))');
  await knex.raw(
    'CREATE UNIQUE INDEX proposal_members_account_unique ON proposal_members (proposal_id, account_id) WHERE account_id IS NOT NULL',
  );
  await knex.raw("CREATE UNIQUE INDEX proposal_members_one_pi ON proposal_members (proposal_id) WHERE role = 'pi'");

  // Requested nodes; awards of a later issue are per (proposal, node).
  await knex.schema.createTable('proposal_nodes', (t) => {
    t.integer('proposal_id').notNullable().references('proposals.id').onDelete('CASCADE');
    t.integer('node_id').notNullable().references('nodes.id').onDelete('RESTRICT');
    t.primary(['proposal_id', 'node_id']);
    t.index(['node_id']);
  });

  await knex.schema.createTable('proposal_files', (t) => {
    t.increments('id').primary();
    t.integer('proposal_id').notNullable().references('proposals.id').onDelete('CASCADE');
    t.text('kind').notNullable().defaultTo('justification');
    t.binary('content').notNullable();
    t.text('filename').notNullable();
    t.text('content_type').notNullable();
    t.integer('size_bytes').notNullable();
    t.text('sha256').notNullable();
    t.integer('uploaded_by').references('accounts.id').onDelete('SET NULL');
    t.timestamp('uploaded_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    // One current file of each kind per proposal (a new upload replaces it).
    t.unique(['proposal_id', 'kind']);
    t.index(['uploaded_by']);
    t.check("kind IN ('justification')", [], 'proposal_files_kind_check');
    t.check('size_bytes = octet_length(content)', [], 'proposal_files_size_check');
  });

  await knex.schema.createTable('targets', (t) => {
    t.increments('id').primary();
    t.integer('proposal_id').notNullable().references('proposals.id').onDelete('CASCADE');
    t.integer('position').notNullable();
    t.text('name').notNullable();
    t.double('ra_deg').notNullable();
    t.double('dec_deg').notNullable();
    t.double('magnitude').notNullable();
    t.text('magnitude_band').notNullable();
    t.double('colour').notNullable();
    t.text('colour_system').notNullable();
    t.double('reddening_ebv');
    t.double('age_myr').notNullable();
    t.double('age_uncertainty_myr');
    t.double('period_precision_days');
    t.text('notes').notNullable().defaultTo('');
    t.integer('version').notNullable().defaultTo(1);
    t.timestamps(true, true);
    t.index(['proposal_id', 'position']);
    t.check('char_length(name) BETWEEN 1 AND 80', [], 'targets_name_check');
    t.check('ra_deg >= 0 AND ra_deg < 360', [], 'targets_ra_check');
    t.check('dec_deg BETWEEN -90 AND 90', [], 'targets_dec_check');
    t.check('magnitude BETWEEN -2 AND 22', [], 'targets_magnitude_check');
    t.check(`magnitude_band IN (${list(BANDS)})`, [], 'targets_band_check');
    t.check('colour BETWEEN -0.5 AND 6', [], 'targets_colour_check');
    t.check(`colour_system IN (${list(COLOUR_SYSTEMS)})`, [], 'targets_colour_system_check');
    t.check('reddening_ebv IS NULL OR reddening_ebv BETWEEN 0 AND 3', [], 'targets_ebv_check');
    t.check('age_myr > 0 AND age_myr <= 14000', [], 'targets_age_check');
    t.check('age_uncertainty_myr IS NULL OR age_uncertainty_myr >= 0', [], 'targets_age_uncertainty_check');
    t.check('period_precision_days IS NULL OR period_precision_days > 0', [], 'targets_period_precision_check');
    t.check('char_length(notes) <= 500', [], 'targets_notes_check');
  });
  await knex.raw('CREATE UNIQUE INDEX targets_name_unique ON targets (proposal_id, lower(name))');

  // The computed plan of one target on one node; `error` rows mark targets whose science input
  // cannot be planned (their numbers stay null).
  await knex.schema.createTable('target_plans', (t) => {
    t.integer('target_id').notNullable().references('targets.id').onDelete('CASCADE');
    t.integer('node_id').notNullable().references('nodes.id').onDelete('CASCADE');
    // Denormalized so that a proposal's plans are replaced and summed without a join.
    t.integer('proposal_id').notNullable().references('proposals.id').onDelete('CASCADE');
    t.text('inputs_hash').notNullable();
    t.boolean('feasible');
    t.decimal('node_hours', 12, 2);
    t.bigInteger('fee_minor');
    t.string('currency', 3);
    // `json`, not `jsonb`: the result is written whole and read whole, never queried inside,
    // and storing it as text is 3–4 times quicker to write (1500 plans of ~10 kB each).
    t.json('result');
    t.text('error');
    t.timestamp('computed_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.primary(['target_id', 'node_id']);
    t.index(['proposal_id']);
    t.index(['node_id']);
    t.check('(error IS NULL) = (result IS NOT NULL)', [], 'target_plans_result_or_error_check');
    t.check('node_hours IS NULL OR node_hours >= 0', [], 'target_plans_hours_check');
    t.check('fee_minor IS NULL OR fee_minor >= 0', [], 'target_plans_fee_check');
  });
  // lz4 compresses the large results far quicker than the default pglz; skipped where the
  // server was built without it (the column then keeps the default compression).
  await knex.raw(`DO $$ BEGIN
    EXECUTE 'ALTER TABLE target_plans ALTER COLUMN result SET COMPRESSION lz4';
  EXCEPTION WHEN OTHERS THEN NULL;
  END $$`);

  // One row per proposal: the state of its background plan computation.
  await knex.schema.createTable('plan_runs', (t) => {
    t.integer('proposal_id').primary().references('proposals.id').onDelete('CASCADE');
    t.text('state').notNullable().defaultTo('idle');
    t.integer('total').notNullable().defaultTo(0);
    t.integer('done').notNullable().defaultTo(0);
    // Last time a change asked for a computation; a run that started before it is stale.
    t.timestamp('requested_at', { useTz: true });
    t.timestamp('started_at', { useTz: true });
    t.timestamp('finished_at', { useTz: true });
    t.text('error');
    // Hash of the inputs (targets, nodes, campaign) of the stored plans; null before the first run.
    t.text('inputs_hash');
    t.check(`state IN (${list(PLAN_RUN_STATES)})`, [], 'plan_runs_state_check');
    t.check('done >= 0 AND total >= 0 AND done <= total', [], 'plan_runs_progress_check');
  });
}

/** Drops them again (children first). */
export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('plan_runs');
  await knex.schema.dropTable('target_plans');
  await knex.schema.dropTable('targets');
  await knex.schema.dropTable('proposal_files');
  await knex.schema.dropTable('proposal_nodes');
  await knex.schema.dropTable('proposal_members');
  await knex.schema.dropTable('proposals');
}
