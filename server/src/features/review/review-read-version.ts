import type { Knex } from 'knex';

/**
 * The review's read versions (migration 20270125000100_review_read_versions): one counter per
 * cycle, raised in the transaction of every write of anything the grading table or a panel's
 * matrix shows. Read as one text of every cycle's counter (a few dozen cycles at most), so a
 * key made of it changes with any such write, in any cycle, including a cycle's first.
 *
 * Read it BEFORE the rows an answer is built from: an answer built from rows read later can only
 * be newer than its key (the next request then sees a newer key and builds again), never older.
 */
export async function readReviewVersions(db: Knex): Promise<string> {
  const { rows } = await db.raw<{ rows: { versions: string | null }[] }>(
    `SELECT string_agg(cycle_id || ':' || version, ',' ORDER BY cycle_id) AS versions FROM review_read_versions`,
  );
  return rows[0]?.versions ?? '';
}
