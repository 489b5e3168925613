import knexFactory, { type Knex } from 'knex';
import pg from 'pg';
import type { Logger } from 'pino';
import type { Config } from '../config';

// COUNT(*) and BIGINT come back as strings by default; our counts fit in a double.
pg.types.setTypeParser(pg.types.builtins.INT8, (v) => Number(v));
// NUMERIC (node-hours, money) as numbers: values are small with 2 decimals.
pg.types.setTypeParser(pg.types.builtins.NUMERIC, (v) => Number(v));
// DATE stays a `YYYY-MM-DD` string: a local calendar date has no time zone.
pg.types.setTypeParser(pg.types.builtins.DATE, (v) => v);

export type Db = Knex;

export function createDb(config: Config, logger?: Logger): Db {
  return knexFactory({
    client: 'pg',
    connection: {
      host: config.PGHOST,
      port: config.PGPORT,
      user: config.PGUSER,
      password: config.PGPASSWORD,
      database: config.PGDATABASE,
    },
    pool: { min: 0, max: 10 },
    acquireConnectionTimeout: 10_000,
    // knex logs through console by default; keep everything in the structured log.
    log: {
      warn: (m: unknown) => logger?.warn({ knex: m }, 'knex warning'),
      error: (m: unknown) => logger?.error({ knex: m }, 'knex error'),
      deprecate: (m: unknown) => logger?.warn({ knex: m }, 'knex deprecation'),
      debug: (m: unknown) => logger?.debug({ knex: m }, 'knex debug'),
    },
  });
}
