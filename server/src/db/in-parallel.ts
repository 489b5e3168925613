import type { Knex } from 'knex';

type Thunks = readonly (() => Promise<unknown>)[];
type Results<T extends Thunks> = { -readonly [K in keyof T]: Awaited<ReturnType<T[K]>> };

/**
 * Runs independent reads in parallel on a pool, one after the other inside a transaction (a
 * transaction is one connection, and pg does not take overlapping queries on one client).
 */
export async function inParallel<T extends Thunks>(db: Knex, thunks: T): Promise<Results<T>> {
  if ((db as Knex & { isTransaction?: boolean }).isTransaction) {
    const out: unknown[] = [];
    for (const t of thunks) out.push(await t());
    return out as Results<T>;
  }
  return (await Promise.all(thunks.map((t) => t()))) as Results<T>;
}
