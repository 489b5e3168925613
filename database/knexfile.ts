import path from 'node:path';
import type { Knex } from 'knex';

/** Knex settings for one database of the private cluster (env PGHOST/PGPORT/PGUSER/PGPASSWORD). */
export function knexConfig(database = process.env.PGDATABASE ?? 'spincycle'): Knex.Config {
  return {
    client: 'pg',
    connection: {
      host: process.env.PGHOST ?? '127.0.0.1',
      port: Number(process.env.PGPORT ?? 54329),
      user: process.env.PGUSER ?? 'spincycle',
      password: process.env.PGPASSWORD ?? 'spincycle-local',
      database,
    },
    pool: { min: 0, max: Number(process.env.PG_POOL_MAX ?? 10) },
    migrations: {
      directory: path.join(__dirname, 'migrations'),
      tableName: 'knex_migrations',
      loadExtensions: ['.ts'],
    },
    seeds: {
      directory: path.join(__dirname, 'seeds'),
      loadExtensions: ['.ts'],
    },
  };
}

export default knexConfig();
