import { spawn, type ChildProcess } from 'node:child_process';
import { randomBytes, randomUUID } from 'node:crypto';
import path from 'node:path';
import { rmSync } from 'node:fs';
// The launcher's set-up runs database/setup.ts under tsx (a child): the demo seeds import the
// shared code through its path alias, which jest's global set-up would not resolve.
// @ts-expect-error plain ES module of the launcher scripts, without type declarations
import { setUpDatabase } from '../../../server/scripts/setup.mjs';
import { assertPortFree, waitForOwnServer, waitForReadyMessage } from '../../../server/scripts/processes.cjs';
import { bringUpTestCluster, releaseTestClusterOnSignal } from '../../support/test-cluster';
import { BASE_URL, E2E_DB, E2E_MAIL_HTTP_PORT, E2E_PAYMENT_PORT, E2E_PORT, E2E_SMTP_PORT } from './e2e-env';

const root = path.resolve(__dirname, '../../..');

/** Shared with global-teardown.ts (jest runs both in its main process). */
export const E2E_STATE = '__spincycleE2e';
export interface E2eState {
  children: ChildProcess[];
  /** This run's lease on the test cluster (given back by the teardown). */
  lease: string;
  removeSignalHandlers: () => void;
}

async function waitForHttp(url: string, child: ChildProcess, name: string): Promise<void> {
  const until = Date.now() + 30_000;
  while (Date.now() < until) {
    if (child.exitCode !== null || child.signalCode !== null)
      throw new Error(`${name} exited with ${child.signalCode ?? `code ${child.exitCode}`}`);
    try {
      await fetch(url);
      return;
    } catch {
      await new Promise((r) => setTimeout(r, 150));
    }
  }
  throw new Error(`${name} did not answer at ${url}`);
}

/**
 * Starts the fakes, the web server (serving the production client build) and the plan worker
 * against the demo-seeded e2e database of the test cluster (port 54339, never the cluster of
 * `npm start`). `npm test` prepares that database fresh; run alone, the suite brings the test
 * cluster up itself (holding a lease that the teardown gives back, which stops the cluster when
 * no other run uses it) and loads the demo data if the database is empty. Ports are checked free first, and the server must answer with the instance id given
 * to it, so that a stale server on port 4310 is never taken for ours.
 */
export default async function globalSetup(): Promise<void> {
  await assertPortFree(E2E_PORT, { what: "the browser suite's web server", envName: 'E2E_PORT' });
  await assertPortFree(E2E_SMTP_PORT, { what: "the browser suite's SMTP fake", envName: 'E2E_SMTP_PORT' });
  await assertPortFree(E2E_MAIL_HTTP_PORT, { what: "the browser suite's mailbox", envName: 'E2E_MAIL_HTTP_PORT' });
  await assertPortFree(E2E_PAYMENT_PORT, { what: "the browser suite's payment fake", envName: 'E2E_PAYMENT_PORT' });

  const cluster = bringUpTestCluster([E2E_DB], 'e2e');
  const state: E2eState = { children: [], lease: cluster.lease, removeSignalHandlers: releaseTestClusterOnSignal(cluster.lease) };
  (globalThis as Record<string, unknown>)[E2E_STATE] = state;
  await setUpDatabase(E2E_DB, '--seed-if-empty', cluster.env);

  // The mailbox answers only with this token; the test workers (started after this) read it.
  process.env.SPINCYCLE_E2E_MAILBOX_TOKEN ||= randomBytes(24).toString('base64url');
  const env = {
    ...process.env,
    ...cluster.env,
    NODE_ENV: 'development',
    PORT: String(E2E_PORT),
    PGDATABASE: E2E_DB,
    SMTP_PORT: String(E2E_SMTP_PORT),
    MAIL_FAKE_HTTP_PORT: String(E2E_MAIL_HTTP_PORT),
    PAYMENT_FAKE_PORT: String(E2E_PAYMENT_PORT),
    PAYMENT_API_URL: `http://127.0.0.1:${E2E_PAYMENT_PORT}`,
    // Its own state, begun afresh with each run (the provider's objects belong to this run's database).
    PAYMENT_FAKE_STATE: path.join(root, '.data', 'e2e-payment-fake.json'),
    PAYMENT_WEBHOOK_RETRY_BASE_MS: '200',
    MAILBOX_TOKEN: process.env.SPINCYCLE_E2E_MAILBOX_TOKEN,
    LOG_LEVEL: 'warn',
    LOGIN_RATE_LIMIT: '50',
  };
  const start = (entry: string, name: string, extra: Record<string, string> = {}, ipc = false) => {
    const child = spawn(process.execPath, ['--import', 'tsx', path.join(root, entry)], {
      cwd: root,
      env: { ...env, ...extra },
      stdio: ['ignore', 'ignore', 'inherit', ...(ipc ? (['ipc'] as const) : [])],
    });
    state.children.push(child);
    // Watched from its first moment: an exit nobody asked for is reported at once.
    child.once('exit', (code, signal) => {
      if (!(child as ChildProcess & { stopping?: boolean }).stopping) console.error(`e2e ${name} exited (${signal ?? `code ${code}`})`);
    });
    child.channel?.unref();
    return child;
  };
  try {
    const serverId = randomUUID();
    const workerId = randomUUID();
    rmSync(path.join(root, '.data', 'e2e-payment-fake.json'), { force: true });
    const fakes = start('fakes/run.ts', 'fakes');
    const server = start('server/src/server.ts', 'web server', { SPINCYCLE_INSTANCE_ID: serverId });
    // The plan worker (pg-boss) computes target plans, as beside `npm start`; it reports ready over IPC.
    const worker = start('server/src/worker.ts', 'plan worker', { SPINCYCLE_INSTANCE_ID: workerId }, true);
    await waitForHttp(`http://127.0.0.1:${E2E_MAIL_HTTP_PORT}/`, fakes, 'mail fake');
    await waitForHttp(`http://127.0.0.1:${E2E_PAYMENT_PORT}/_fake/health`, fakes, 'payment fake');
    await waitForOwnServer(`${BASE_URL}/api/health`, serverId, { timeoutMs: 30_000, child: server, name: 'e2e web server' });
    await waitForReadyMessage(worker, workerId, { timeoutMs: 30_000, name: 'e2e plan worker' });
  } catch (err) {
    // jest runs no global teardown when the set-up fails: stop what was started here.
    delete (globalThis as Record<string, unknown>)[E2E_STATE];
    const { stopE2e } = await import('./global-teardown');
    await stopE2e(state);
    throw err;
  }
}
