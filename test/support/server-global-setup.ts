import { execFileSync } from 'node:child_process';
import path from 'node:path';
import { setUpDatabase } from '../../database/setup';

/**
 * Before the server suites: the private cluster runs and the test database has the latest
 * schema. `npm test` has already done this (with a fresh database); running jest alone
 * (`npx jest --selectProjects server`) gets the same guarantee here.
 */
export default async function globalSetup(): Promise<void> {
  const database = process.env.SPINCYCLE_TEST_DB ?? 'spincycle_test';
  const root = path.resolve(__dirname, '../..');
  execFileSync(
    process.execPath,
    ['--input-type=module', '-e', `const c = await import('./database/cluster.mjs'); const h = c.bringUpCluster({ log: () => {} }); h.ensureDatabase(${JSON.stringify(database)});`],
    { cwd: root, stdio: 'inherit' },
  );
  await setUpDatabase(database, 'never');
}
