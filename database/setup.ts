/**
 * Brings one database of the private cluster up to date: `tsx database/setup.ts <db> [--seed | --seed-if-empty]`.
 * Migrations always run; `--seed` reloads the demo data, `--seed-if-empty` only when there
 * are no accounts yet (so a second `npm start` keeps what people entered).
 */
import { loadSettings } from '../server/src/config';
import { createDb, type DbSettings } from '../server/src/db/knex';
import { DATABASE_FOLDERS } from './knexfile';

/** Migrates (and maybe seeds) `database` on the cluster of `settings` (PGHOST, PGPORT, … of config.ts). */
export async function setUpDatabase(
  database: string,
  seed: 'always' | 'if-empty' | 'never',
  settings: DbSettings = loadSettings(),
): Promise<{ migrated: string[]; seeded: boolean }> {
  const db = createDb(settings, undefined, { database, ...DATABASE_FOLDERS });
  try {
    const [, migrated] = (await db.migrate.latest()) as [number, string[]];
    let seeded = false;
    if (seed !== 'never') {
      const [{ count }] = await db('accounts').count<{ count: number }[]>({ count: '*' });
      if (seed === 'always' || count === 0) {
        await db.seed.run();
        seeded = true;
      }
    }
    return { migrated, seeded };
  } finally {
    await db.destroy();
  }
}

if (require.main === module) {
  const [database, flag] = process.argv.slice(2);
  if (!database) {
    console.error('usage: tsx database/setup.ts <database> [--seed | --seed-if-empty]');
    process.exit(2);
  }
  const mode = flag === '--seed' ? 'always' : flag === '--seed-if-empty' ? 'if-empty' : 'never';
  setUpDatabase(database, mode)
    .then(({ migrated, seeded }) => {
      console.log(
        `database ${database}: ${migrated.length ? `applied ${migrated.length} migration(s)` : 'schema up to date'}${seeded ? ', demo data loaded' : ''}`,
      );
    })
    .catch((err) => {
      console.error(`database ${database}: ${err.message}`);
      process.exit(1);
    });
}
