import type { ChildProcess } from 'node:child_process';
import { stopChild } from '../../../server/scripts/processes.cjs';
import { releaseTestCluster } from '../../support/test-cluster';
import { E2E_STATE, type E2eState } from './global-setup';

/**
 * Stops what the global set-up started: the web server and the fakes (6 s), the plan worker
 * once its running job has finished or was stopped cleanly (pg-boss graceful stop, up to 30 s),
 * then gives the lease on the test cluster back (stopping it when no other run uses it).
 */
export default async function globalTeardown(): Promise<void> {
  const state = (globalThis as Record<string, unknown>)[E2E_STATE] as E2eState | undefined;
  if (!state) return;
  delete (globalThis as Record<string, unknown>)[E2E_STATE];
  await stopE2e(state);
}

/** Also used by the set-up itself when it fails half-way (jest then runs no teardown). */
export async function stopE2e(state: E2eState): Promise<void> {
  for (const c of state.children) (c as ChildProcess & { stopping?: boolean }).stopping = true;
  const isWorker = (c: ChildProcess) => c.spawnargs.some((a) => a.endsWith('worker.ts'));
  await Promise.all(state.children.map((c) => stopChild(c, { graceMs: isWorker(c) ? 30_000 : 6000 })));
  state.removeSignalHandlers();
  releaseTestCluster(state.lease);
}
