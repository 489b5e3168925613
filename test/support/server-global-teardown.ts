import { SERVER_CLUSTER_STATE } from './server-global-setup';
import { releaseTestCluster } from './test-cluster';

/**
 * After the server suites: gives the global set-up's lease on the test cluster back, which stops
 * the cluster if a run started it and no other run (`npm test`, another jest) still uses it.
 */
export default async function globalTeardown(): Promise<void> {
  const state = (globalThis as Record<string, unknown>)[SERVER_CLUSTER_STATE] as
    { lease: string; removeSignalHandlers: () => void } | undefined;
  if (!state) return;
  delete (globalThis as Record<string, unknown>)[SERVER_CLUSTER_STATE];
  state.removeSignalHandlers();
  releaseTestCluster(state.lease);
}
