import type { Knex } from 'knex';

/**
 * `review_read_versions`: one counter per cycle, raised in the transaction of every statement
 * that changes something the review's read-heavy answers show (the reviewer's grading table and
 * a panel's assignment matrix): the cycle itself, its panels and their members, its proposals,
 * their assignments, conflicts, team rows and plan versions, and (for every cycle) the names,
 * e-mails, affiliations, expertise, enabled state and roles of accounts. A web process keeps an
 * answer with the counters it read before reading the answer's rows, and sends it again only
 * while the counters are unchanged (server/src/features/review/review-read-version.ts).
 *
 * The triggers are per statement (one bump per statement, not per row), from transition tables.
 * Each counter row is locked by the transaction that raises it until it commits, so writers
 * of one cycle's review data queue on it; they are short (a grade, a conflict, a panel write),
 * and writes about drafts raise nothing (see SHOWN).
 */

/** The cycle ids of a statement's rows, by how a table's rows reach their cycle: for INSERT (`new_rows`), UPDATE (both) and DELETE (`old_rows`). */
type CycleIds = { insert: string; update: string; delete: string };

/** From a query giving the cycle ids of a transition table `rows`. */
const fromRows = (of: (rows: string) => string): CycleIds => ({
  insert: of('new_rows'),
  update: `${of('old_rows')} UNION ${of('new_rows')}`,
  delete: of('old_rows'),
});

/**
 * Neither answer shows a draft (unless it sits in a panel): writes about drafts, which the call
 * is full of (targets, plans, team), raise nothing, so proposers never queue on the counters.
 */
const SHOWN = `(p.state <> 'draft' OR p.panel_id IS NOT NULL)`;
const ofProposals = (ids: string) => `SELECT p.cycle_id FROM proposals p WHERE p.id IN (${ids}) AND ${SHOWN}`;

const CYCLE_OF: Record<string, CycleIds> = {
  self: fromRows((rows) => `SELECT id FROM ${rows}`),
  cycle: fromRows((rows) => `SELECT cycle_id FROM ${rows}`),
  shown_proposal: fromRows((rows) => `SELECT p.cycle_id FROM ${rows} p WHERE ${SHOWN}`),
  proposal: fromRows((rows) => ofProposals(`SELECT proposal_id FROM ${rows}`)),
  panel: fromRows((rows) => `SELECT p.cycle_id FROM panels p WHERE p.id IN (SELECT panel_id FROM ${rows})`),
  // A plan run's progress (state, done) is written often and shown by neither answer: an update
  // counts only when it changes the run's versions (a column list cannot go with transition tables).
  plan_run: {
    ...fromRows((rows) => ofProposals(`SELECT proposal_id FROM ${rows}`)),
    update: ofProposals(`SELECT n.proposal_id FROM new_rows n JOIN old_rows o ON o.proposal_id = n.proposal_id
                          WHERE o.inputs_version IS DISTINCT FROM n.inputs_version OR o.plans_version IS DISTINCT FROM n.plans_version`),
  },
};

/** Table → how its rows reach their cycle (`all`: every cycle), and the columns whose update counts (all when absent). */
const WATCHED: { table: string; via: keyof typeof CYCLE_OF | 'all'; columns?: string[] }[] = [
  { table: 'cycles', via: 'self' },
  { table: 'panels', via: 'cycle' },
  { table: 'panel_members', via: 'panel' },
  { table: 'proposals', via: 'shown_proposal' },
  { table: 'review_assignments', via: 'proposal' },
  { table: 'review_conflicts', via: 'proposal' },
  { table: 'proposal_members', via: 'proposal' },
  { table: 'plan_runs', via: 'plan_run' },
  { table: 'accounts', via: 'all', columns: ['email', 'display_name', 'affiliation', 'expertise', 'disabled_at'] },
  { table: 'account_roles', via: 'all' },
];

/**
 * The statement raising the counters of some cycles. `lock` (migration 20270226000100) takes a
 * key-share lock on the cycles read, so that a cycle deleted by a concurrent transaction is waited
 * for and skipped rather than inserted against its foreign key.
 */
const bump = (cycleIds: string, lock = false) => `
  INSERT INTO review_read_versions AS v (cycle_id, version)
  SELECT c.id, 1 FROM cycles c WHERE c.id IN (${cycleIds})${lock ? ' FOR KEY SHARE OF c' : ''}
  ON CONFLICT (cycle_id) DO UPDATE SET version = v.version + 1`;

/** The trigger functions' definitions (`create`: CREATE, or CREATE OR REPLACE for a later migration). */
export function readVersionFunctions(create: 'CREATE' | 'CREATE OR REPLACE', lock: boolean): string[] {
  const all = `
    ${create} FUNCTION review_read_bump_all() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      ${bump('SELECT id FROM cycles', lock)};
      RETURN NULL;
    END $$;
  `;
  const byVia = Object.entries(CYCLE_OF).map(
    ([via, cycleOf]) => `
      ${create} FUNCTION review_read_bump_by_${via}() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        IF TG_OP = 'INSERT' THEN
          ${bump(cycleOf.insert, lock)};
        ELSIF TG_OP = 'DELETE' THEN
          ${bump(cycleOf.delete, lock)};
        ELSE
          ${bump(cycleOf.update, lock)};
        END IF;
        RETURN NULL;
      END $$;
    `,
  );
  return [all, ...byVia];
}

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('review_read_versions', (t) => {
    t.integer('cycle_id').primary().references('id').inTable('cycles').onDelete('CASCADE');
    t.bigInteger('version').notNullable().defaultTo(1);
  });
  await knex.raw('INSERT INTO review_read_versions (cycle_id) SELECT id FROM cycles');
  for (const sql of readVersionFunctions('CREATE', false)) await knex.raw(sql);
  for (const { table, via, columns } of WATCHED) {
    const fn = via === 'all' ? 'review_read_bump_all' : `review_read_bump_by_${via}`;
    const update = columns ? `UPDATE OF ${columns.join(', ')}` : 'UPDATE';
    const name = `${table}_review_read`;
    if (via === 'all') {
      // No transition tables needed: every cycle is raised. A new account is in nothing shown yet.
      const insert = table === 'accounts' ? '' : 'INSERT OR ';
      await knex.raw(`
        CREATE TRIGGER ${name} AFTER ${insert}${update} OR DELETE OR TRUNCATE ON ${table}
          FOR EACH STATEMENT EXECUTE FUNCTION ${fn}();
      `);
      continue;
    }
    await knex.raw(`
      CREATE TRIGGER ${name}_insert AFTER INSERT ON ${table} REFERENCING NEW TABLE AS new_rows
        FOR EACH STATEMENT EXECUTE FUNCTION ${fn}();
      CREATE TRIGGER ${name}_update AFTER ${update} ON ${table} REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows
        FOR EACH STATEMENT EXECUTE FUNCTION ${fn}();
      CREATE TRIGGER ${name}_delete AFTER DELETE ON ${table} REFERENCING OLD TABLE AS old_rows
        FOR EACH STATEMENT EXECUTE FUNCTION ${fn}();
      CREATE TRIGGER ${name}_truncate AFTER TRUNCATE ON ${table}
        FOR EACH STATEMENT EXECUTE FUNCTION review_read_bump_all();
    `);
  }
}

export async function down(knex: Knex): Promise<void> {
  for (const { table, via } of WATCHED) {
    const name = `${table}_review_read`;
    const triggers = via === 'all' ? [name] : ['insert', 'update', 'delete', 'truncate'].map((e) => `${name}_${e}`);
    for (const t of triggers) await knex.raw(`DROP TRIGGER ${t} ON ${table}`);
  }
  for (const via of Object.keys(CYCLE_OF)) await knex.raw(`DROP FUNCTION review_read_bump_by_${via}()`);
  await knex.raw('DROP FUNCTION review_read_bump_all()');
  await knex.schema.dropTable('review_read_versions');
}
