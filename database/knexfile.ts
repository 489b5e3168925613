import path from 'node:path';
import type { Knex } from 'knex';
import { loadSettings } from '../server/src/config';
import { knexConfig as serverKnexConfig, type DbSettings } from '../server/src/db/knex';

/** This folder's migrations and seeds (TypeScript, loaded through tsx). */
export const DATABASE_FOLDERS: Pick<Knex.Config, 'migrations' | 'seeds'> = {
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

/**
 * Knex settings for one database of the cluster (PGDATABASE when not given) with this folder's
 * migrations and seeds. Connection, pool size and pg type parsers come from the server's one
 * Knex module (server/src/db/knex.ts), the settings from server/src/config.ts.
 */
export function knexConfig(database?: string, settings: DbSettings = loadSettings()): Knex.Config {
  return serverKnexConfig(settings, { database, ...DATABASE_FOLDERS });
}

export default knexConfig();
