import { execFileSync } from 'node:child_process';
import path from 'node:path';

const root = path.resolve(__dirname, '../..');
const MARK = 'SPINCYCLE_TEST_CLUSTER ';

/** What bringUpTestCluster found or did. */
export interface TestCluster {
  /** True when this call started the cluster. */
  started: boolean;
  /** The lease this run holds (`<pid>-<what>`): give it back with releaseTestCluster. */
  lease: string;
  /** PGHOST/PGPORT/PGUSER/PGPASSWORD of the test cluster, also copied into process.env. */
  env: Record<string, string>;
}

/**
 * The test cluster (database/cluster.mjs, profile `test`: `.data/pg-test`, port 54339, fsync
 * off), never the development cluster of `npm start`. Brings it up if needed, creates the given
 * databases if missing, and points this process and every process started after this (jest's
 * workers, the browser suite's servers) at it through PGHOST/PGPORT/PGUSER/PGPASSWORD. Holds a
 * lease for this process (`what` tells the suites of one jest run apart) so that the cluster is
 * stopped by the last run to leave, not under another run's feet. Runs the plain-Node cluster
 * module in a child process (jest's module loader cannot import .mjs).
 */
export function bringUpTestCluster(databases: string[], what: string): TestCluster {
  const lease = `${process.pid}-${what}`;
  const script = [
    "const c = await import('./database/cluster.mjs');",
    `const h = c.bringUpCluster({ profile: 'test', lease: ${JSON.stringify(lease)}, log: (m) => console.error(m) });`,
    `for (const d of ${JSON.stringify(databases)}) h.ensureDatabase(d);`,
    `console.log(${JSON.stringify(MARK)} + JSON.stringify({ started: h.started, lease: ${JSON.stringify(lease)}, env: c.clusterEnv(h.settings) }));`,
  ].join('\n');
  let out: string;
  try {
    out = execFileSync(process.execPath, ['--input-type=module', '-e', script], {
      cwd: root,
      encoding: 'utf8',
      stdio: ['ignore', 'pipe', 'pipe'],
    });
  } catch (err) {
    const e = err as { stderr?: string; stdout?: string; message: string };
    throw new Error(`the test cluster did not come up: ${e.message}\n${e.stderr ?? ''}${e.stdout ?? ''}`);
  }
  const line = out.split('\n').find((l) => l.startsWith(MARK));
  if (!line) throw new Error(`the test cluster did not come up:\n${out}`);
  const result = JSON.parse(line.slice(MARK.length)) as TestCluster;
  Object.assign(process.env, result.env);
  return result;
}

/**
 * Gives the lease back: the test cluster stops when no other run holds a lease and one of the
 * lease-holders started it (never a cluster `npm test` or another jest run still uses).
 */
export function releaseTestCluster(lease: string): void {
  execFileSync(
    process.execPath,
    ['--input-type=module', '-e', `const c = await import('./database/cluster.mjs'); c.releaseLease('test', ${JSON.stringify(lease)});`],
    {
      cwd: root,
      stdio: 'inherit',
    },
  );
}

/**
 * Gives the lease back on Ctrl-C too (jest runs no global teardown when interrupted), then lets
 * the signal end the process as it would have. Returns a function that removes the handlers.
 */
export function releaseTestClusterOnSignal(lease: string): () => void {
  const handler = (signal: NodeJS.Signals) => {
    remove();
    try {
      releaseTestCluster(lease);
    } finally {
      process.kill(process.pid, signal);
    }
  };
  const remove = () => {
    process.off('SIGINT', handler);
    process.off('SIGTERM', handler);
  };
  process.once('SIGINT', handler);
  process.once('SIGTERM', handler);
  return remove;
}
