import { setUpDatabase } from '../../database/setup';
import { bringUpTestCluster, releaseTestClusterOnSignal } from './test-cluster';

/** Shared with server-global-teardown.ts (jest runs both in its main process). */
export const SERVER_CLUSTER_STATE = '__spincycleServerTestCluster';

/**
 * Before the server suites: the test cluster (port 54339, its own folder, fsync off; never the
 * development cluster of `npm start`) runs and the test database has the latest schema.
 * `npm test` has already done this (with a fresh database); running jest alone
 * (`npx jest --selectProjects server`) gets the same guarantee here. It holds a lease on the
 * cluster until the global teardown (or Ctrl-C): the last run to leave stops a cluster that a
 * run started, so `npx jest` alone leaves nothing running, and never stops one `npm test` uses.
 */
export default async function globalSetup(): Promise<void> {
  const database = process.env.SPINCYCLE_TEST_DB ?? 'spincycle_test';
  // Points this process and the test workers (started after this) at the test cluster.
  const cluster = bringUpTestCluster([database], 'server');
  const removeSignalHandlers = releaseTestClusterOnSignal(cluster.lease);
  (globalThis as Record<string, unknown>)[SERVER_CLUSTER_STATE] = { lease: cluster.lease, removeSignalHandlers };
  await setUpDatabase(database, 'never');
}
