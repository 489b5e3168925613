import knexFactory, { type Knex } from 'knex';
import pg from 'pg';
import type { Logger } from 'pino';
import type { Settings } from '../config';

export type Db = Knex;

/** The settings a Knex needs (a `Config` has them; so has `loadSettings()` for scripts). */
export type DbSettings = Pick<Settings, 'PGHOST' | 'PGPORT' | 'PGUSER' | 'PGPASSWORD' | 'PGDATABASE' | 'PG_POOL_MAX'>;

/** What differs between the Knex of the server, the worker and the database scripts. */
export interface KnexOptions {
  /** Another database of the same cluster than PGDATABASE (database/setup.ts, tests). */
  database?: string;
  /** Where knex's own warnings go; without one, knex prints them on the console. */
  logger?: Logger;
  migrations?: Knex.MigratorConfig;
  seeds?: Knex.SeederConfig;
}

let typeParsersInstalled = false;

/**
 * Makes pg return our column types as the code expects them. Process-wide (pg keeps one table of
 * parsers), so it runs inside knexConfig: every Knex is built from there, none can miss it.
 */
function installTypeParsers(): void {
  if (typeParsersInstalled) return;
  // COUNT(*) and BIGINT come back as strings by default; our counts fit in a double.
  pg.types.setTypeParser(pg.types.builtins.INT8, (v) => Number(v));
  // NUMERIC (node-hours, money) as numbers: values are small with 2 decimals.
  pg.types.setTypeParser(pg.types.builtins.NUMERIC, (v) => Number(v));
  // DATE stays a `YYYY-MM-DD` string: a local calendar date has no time zone.
  pg.types.setTypeParser(pg.types.builtins.DATE, (v) => v);
  typeParsersInstalled = true;
}

/**
 * The configuration of every Knex in the project (web server, worker, database/knexfile.ts and
 * so setup.ts, seeds and tests): connection and pool size from the settings of config.ts, and the
 * pg type parsers installed before it returns.
 */
export function knexConfig(settings: DbSettings, options: KnexOptions = {}): Knex.Config {
  installTypeParsers();
  const { logger } = options;
  return {
    client: 'pg',
    connection: {
      host: settings.PGHOST,
      port: settings.PGPORT,
      user: settings.PGUSER,
      password: settings.PGPASSWORD,
      database: options.database ?? settings.PGDATABASE,
    },
    pool: { min: 0, max: settings.PG_POOL_MAX },
    acquireConnectionTimeout: 10_000,
    ...(options.migrations && { migrations: options.migrations }),
    ...(options.seeds && { seeds: options.seeds }),
    // knex logs through console by default; with a logger, keep everything in the structured log.
    ...(logger && {
      log: {
        warn: (m: unknown) => logger.warn({ knex: m }, 'knex warning'),
        error: (m: unknown) => logger.error({ knex: m }, 'knex error'),
        deprecate: (m: unknown) => logger.warn({ knex: m }, 'knex deprecation'),
        debug: (m: unknown) => logger.debug({ knex: m }, 'knex debug'),
      },
    }),
  };
}

/** A Knex (pool) from the settings; the only place in the project that makes one. */
export function createDb(settings: DbSettings, logger?: Logger, options: Omit<KnexOptions, 'logger'> = {}): Db {
  return knexFactory(knexConfig(settings, { ...options, logger }));
}
