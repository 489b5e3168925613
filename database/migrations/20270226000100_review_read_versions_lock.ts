import type { Knex } from 'knex';
import { readVersionFunctions } from './20270125000100_review_read_versions';

/**
 * The review read-version triggers lock the cycles they raise (FOR KEY SHARE): a statement that
 * raised every cycle (e.g. a role granted) while another transaction deleted a cycle could insert
 * a counter for the deleted cycle and fail on the foreign key. With the lock it waits for the
 * deletion and skips the cycle.
 */
export async function up(knex: Knex): Promise<void> {
  for (const sql of readVersionFunctions('CREATE OR REPLACE', true)) await knex.raw(sql);
}

export async function down(knex: Knex): Promise<void> {
  for (const sql of readVersionFunctions('CREATE OR REPLACE', false)) await knex.raw(sql);
}
