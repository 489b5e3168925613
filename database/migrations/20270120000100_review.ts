import type { Knex } from 'knex';

/**
 * Review (DESIGN.md, "reviewer" and "facility manager"): a cycle's review settings; panels with
 * members and one chair; proposals assigned to a panel; reviewer assignments carrying the
 * reviewer's grade and comments; conflicts declared by reviewers; the reviewer each team names
 * in distributed review; the standing of each panel with every move and its reason.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('cycles', (t) => {
    // 'panel': the manager's panels review; 'distributed': each submitting team names a reviewer.
    t.text('review_mode').notNullable().defaultTo('panel');
    t.integer('reviewers_per_proposal').notNullable().defaultTo(3);
    // Grades lock at this instant; null until the manager sets it.
    t.timestamp('review_deadline', { useTz: true });
    // Distributed review: a team whose reviewer missed the deadline has its own proposal set aside.
    t.boolean('set_aside_late_teams').notNullable().defaultTo(false);
    t.check("review_mode IN ('panel', 'distributed')", [], 'cycles_review_mode_check');
    t.check('reviewers_per_proposal BETWEEN 1 AND 10', [], 'cycles_reviewers_per_proposal_check');
  });

  // What a reviewer declares they know (the cycle's category names); matched to proposal categories.
  await knex.schema.alterTable('accounts', (t) => {
    t.specificType('expertise', 'text[]').notNullable().defaultTo('{}');
  });

  await knex.schema.createTable('panels', (t) => {
    t.increments('id').primary();
    t.integer('cycle_id').notNullable().references('cycles.id').onDelete('CASCADE');
    t.text('name').notNullable();
    t.integer('chair_account_id').references('accounts.id').onDelete('SET NULL');
    // Proposals whose grades spread (max − min, raw grades) more than this are flagged for discussion.
    t.double('spread_threshold').notNullable().defaultTo(3);
    // Share of the panel's proposals (lowest normalised mean) marked "not discussed"; 0 = none.
    t.double('triage_fraction').notNullable().defaultTo(0);
    t.timestamp('standing_locked_at', { useTz: true });
    t.integer('standing_locked_by').references('accounts.id').onDelete('SET NULL');
    t.integer('version').notNullable().defaultTo(1);
    t.timestamps(true, true);
    t.unique(['cycle_id', 'name']);
    t.index(['chair_account_id']);
    t.index(['standing_locked_by']);
    t.check('char_length(name) BETWEEN 1 AND 80', [], 'panels_name_check');
    t.check('spread_threshold >= 0 AND spread_threshold <= 10', [], 'panels_spread_threshold_check');
    t.check('triage_fraction >= 0 AND triage_fraction <= 0.9', [], 'panels_triage_fraction_check');
  });

  await knex.schema.createTable('panel_members', (t) => {
    t.integer('panel_id').notNullable().references('panels.id').onDelete('CASCADE');
    t.integer('account_id').notNullable().references('accounts.id').onDelete('CASCADE');
    t.timestamp('added_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.primary(['panel_id', 'account_id']);
    t.index(['account_id']);
  });

  await knex.schema.alterTable('proposals', (t) => {
    t.integer('panel_id').references('panels.id').onDelete('SET NULL');
    // Triage: the panel will not discuss it (lowest normalised means); set by the manager.
    t.boolean('not_discussed').notNullable().defaultTo(false);
    // Distributed review: set aside because the team's reviewer missed the deadline.
    t.boolean('set_aside').notNullable().defaultTo(false);
    t.index(['panel_id']);
  });

  await knex.schema.createTable('review_assignments', (t) => {
    t.increments('id').primary();
    t.integer('proposal_id').notNullable().references('proposals.id').onDelete('CASCADE');
    t.integer('reviewer_account_id').notNullable().references('accounts.id').onDelete('CASCADE');
    // 'manual' (the manager), 'automatic' (the solver), 'team' (distributed review).
    t.text('source').notNullable();
    t.integer('assigned_by').references('accounts.id').onDelete('SET NULL');
    t.timestamp('assigned_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('notified_at', { useTz: true });
    // The review itself: a grade 0.0–10.0 (one decimal), comments, saved and submitted instants.
    t.decimal('grade', 3, 1);
    t.text('strengths').notNullable().defaultTo('');
    t.text('weaknesses').notNullable().defaultTo('');
    t.text('committee_note').notNullable().defaultTo('');
    t.timestamp('saved_at', { useTz: true });
    t.timestamp('submitted_at', { useTz: true });
    t.integer('version').notNullable().defaultTo(1);
    t.unique(['proposal_id', 'reviewer_account_id']);
    t.index(['reviewer_account_id']);
    t.index(['assigned_by']);
    t.check("source IN ('manual', 'automatic', 'team')", [], 'review_assignments_source_check');
    t.check('grade IS NULL OR (grade >= 0 AND grade <= 10)', [], 'review_assignments_grade_check');
    t.check(
      'char_length(strengths) <= 4000 AND char_length(weaknesses) <= 4000 AND char_length(committee_note) <= 2000',
      [],
      'review_assignments_text_check',
    );
  });

  await knex.schema.createTable('review_conflicts', (t) => {
    t.increments('id').primary();
    t.integer('proposal_id').notNullable().references('proposals.id').onDelete('CASCADE');
    t.integer('reviewer_account_id').notNullable().references('accounts.id').onDelete('CASCADE');
    t.text('reason').notNullable();
    t.timestamp('declared_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(['proposal_id', 'reviewer_account_id']);
    t.index(['reviewer_account_id']);
    t.check('char_length(reason) BETWEEN 1 AND 500', [], 'review_conflicts_reason_check');
  });

  // Distributed review: the reviewer a submitting team names (one per proposal).
  await knex.schema.createTable('team_reviewers', (t) => {
    t.integer('proposal_id').primary().references('proposals.id').onDelete('CASCADE');
    t.integer('reviewer_account_id').notNullable().references('accounts.id').onDelete('CASCADE');
    t.integer('named_by').references('accounts.id').onDelete('SET NULL');
    t.timestamp('named_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['reviewer_account_id']);
    t.index(['named_by']);
  });

  // The standing of a panel: position 1 is the best. Every reorder is recorded with its reason.
  await knex.schema.createTable('standing_positions', (t) => {
    t.integer('proposal_id').primary().references('proposals.id').onDelete('CASCADE');
    t.integer('panel_id').notNullable().references('panels.id').onDelete('CASCADE');
    t.integer('position').notNullable();
    t.index(['panel_id']);
    t.check('position >= 1', [], 'standing_positions_position_check');
  });
  await knex.raw(
    'ALTER TABLE standing_positions ADD CONSTRAINT standing_positions_panel_position_unique UNIQUE (panel_id, position) DEFERRABLE INITIALLY DEFERRED',
  );
  await knex.schema.createTable('standing_moves', (t) => {
    t.increments('id').primary();
    t.integer('panel_id').notNullable().references('panels.id').onDelete('CASCADE');
    t.integer('proposal_id').notNullable().references('proposals.id').onDelete('CASCADE');
    t.integer('from_position').notNullable();
    t.integer('to_position').notNullable();
    t.text('reason').notNullable();
    t.integer('moved_by').references('accounts.id').onDelete('SET NULL');
    t.timestamp('moved_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['panel_id']);
    t.index(['proposal_id']);
    t.index(['moved_by']);
    t.check('char_length(reason) BETWEEN 1 AND 500', [], 'standing_moves_reason_check');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('standing_moves');
  await knex.schema.dropTable('standing_positions');
  await knex.schema.dropTable('team_reviewers');
  await knex.schema.dropTable('review_conflicts');
  await knex.schema.dropTable('review_assignments');
  await knex.schema.alterTable('proposals', (t) => {
    t.dropIndex(['panel_id']);
    t.dropColumn('set_aside');
    t.dropColumn('not_discussed');
    t.dropColumn('panel_id');
  });
  await knex.schema.dropTable('panel_members');
  await knex.schema.dropTable('panels');
  await knex.schema.alterTable('accounts', (t) => {
    t.dropColumn('expertise');
  });
  await knex.schema.alterTable('cycles', (t) => {
    t.dropChecks(['cycles_review_mode_check', 'cycles_reviewers_per_proposal_check']);
    t.dropColumn('set_aside_late_teams');
    t.dropColumn('review_deadline');
    t.dropColumn('reviewers_per_proposal');
    t.dropColumn('review_mode');
  });
}
