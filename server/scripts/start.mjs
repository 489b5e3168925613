// `npm start`: everything from a fresh machine to a running app, idempotent and quick the
// second time. It uses the development cluster (durable, port 54329), never the test one, so
// `npm test` may run beside it. Ctrl-C stops what it started: the web server and the fakes, the
// plan worker once its running job has finished (or stopped cleanly), then PostgreSQL if this
// run started it. A second Ctrl-C stops at once.
import { randomBytes, randomUUID } from 'node:crypto';
import { bringUpCluster, clusterEnv } from '../../database/cluster.mjs';
import { assertPortFree, stopChild, waitForOwnServer, waitForReadyMessage } from './processes.cjs';
import {
  ensureClientBuild,
  ensureDependencies,
  readDemoAccounts,
  runningCommands,
  setUpDatabase,
  startTs,
  step,
  waitForHttp,
} from './setup.mjs';

const env = {
  PORT: process.env.PORT ?? '4300',
  HOST: process.env.HOST ?? '127.0.0.1',
  PGDATABASE: process.env.PGDATABASE ?? 'spincycle',
  SMTP_PORT: process.env.SMTP_PORT ?? '2525',
  MAIL_FAKE_HTTP_PORT: process.env.MAIL_FAKE_HTTP_PORT ?? '4399',
  PAYMENT_FAKE_PORT: process.env.PAYMENT_FAKE_PORT ?? '4397',
};
// The web server reaches the payment fake (fakes/payments) through the provider SDK at this URL.
env.PAYMENT_API_URL = process.env.PAYMENT_API_URL ?? `http://127.0.0.1:${env.PAYMENT_FAKE_PORT}`;
// The development mailbox (fakes/mail) shows reset links: it listens on 127.0.0.1 only, on its own
// port, and answers only with this token, new at every start and given to the fakes alone.
const mailboxToken = process.env.MAILBOX_TOKEN || randomBytes(24).toString('base64url');
const mailboxUrl = `http://127.0.0.1:${env.MAIL_FAKE_HTTP_PORT}/?token=${mailboxToken}`;
const url = `http://${env.HOST}:${env.PORT}`;

/** How long each child may take to stop after SIGTERM before it is killed. */
const GRACE_MS = { 'plan worker': 30_000 };
const DEFAULT_GRACE_MS = 6000;

const children = [];
let cluster;
let stopping = false;

/** Starts a child and watches it from its first moment: an exit we did not ask for stops everything. */
function startChild(entry, childEnv, name, options = {}) {
  const child = startTs(entry, childEnv, {
    name,
    ...options,
    onExit: (c, code, signal) => {
      if (!stopping) {
        console.error(`${c.name} exited (${signal ?? `code ${code}`}); stopping everything`);
        void stopAll(1);
      }
    },
  });
  children.push(child);
  return child;
}

async function stopAll(code = 0) {
  if (stopping) return;
  stopping = true;
  console.log('\nstopping Spincycle…');
  for (const c of runningCommands) stopChild(c, { group: true, graceMs: 5000 });
  const running = children.filter((c) => c.exitCode === null && c.signalCode === null);
  if (running.some((c) => c.name === 'plan worker'))
    console.log('  the plan worker finishes its running job first (Ctrl-C again to stop at once)');
  await Promise.all(running.map((c) => stopChild(c, { graceMs: GRACE_MS[c.name] ?? DEFAULT_GRACE_MS })));
  while (runningCommands.size) await new Promise((r) => setTimeout(r, 100));
  if (cluster?.started) {
    cluster.stop();
    console.log('PostgreSQL stopped');
  }
  process.exit(code);
}

let firstSignalAt = 0;
function onSignal() {
  if (!stopping) {
    firstSignalAt = Date.now();
    return void stopAll(0);
  }
  // Ctrl-C in a terminal reaches us twice at once (from the terminal and forwarded by npm): only
  // a second Ctrl-C a moment later means "no more waiting".
  if (Date.now() - firstSignalAt < 1000) return;
  for (const c of [...children, ...runningCommands]) if (c.exitCode === null && c.signalCode === null) c.kill('SIGKILL');
}
process.on('SIGINT', onSignal);
process.on('SIGTERM', onSignal);

async function main() {
  const t0 = performance.now();
  await step('dependencies', () => ensureDependencies());
  await step('ports', async () => {
    await assertPortFree(Number(env.PORT), { host: env.HOST, what: 'the web server', envName: 'PORT' });
    await assertPortFree(Number(env.SMTP_PORT), { what: 'the SMTP fake', envName: 'SMTP_PORT' });
    await assertPortFree(Number(env.MAIL_FAKE_HTTP_PORT), { what: 'the development mailbox', envName: 'MAIL_FAKE_HTTP_PORT' });
    await assertPortFree(Number(env.PAYMENT_FAKE_PORT), { what: 'the payment fake', envName: 'PAYMENT_FAKE_PORT' });
  });
  await step('PostgreSQL', () => {
    cluster = bringUpCluster({ profile: 'dev', log: (m) => console.log(`  ${m}`) });
  });
  if (stopping) return;
  Object.assign(env, clusterEnv(cluster.settings));
  await step(`database ${env.PGDATABASE}: migrations and demo data`, async () => {
    cluster.ensureDatabase(env.PGDATABASE);
    await setUpDatabase(env.PGDATABASE, '--seed-if-empty', env);
  });
  if (stopping) return;
  await step('client build', async () => {
    if (!(await ensureClientBuild())) console.log('  unchanged since the last build');
  });
  if (stopping) return;
  await step('local fakes (SMTP, payments)', async () => {
    const fakes = startChild('fakes/run.ts', { ...env, MAILBOX_TOKEN: mailboxToken }, 'fakes');
    await waitForHttp(`http://127.0.0.1:${env.MAIL_FAKE_HTTP_PORT}/`, 20_000, fakes);
    await waitForHttp(`http://127.0.0.1:${env.PAYMENT_FAKE_PORT}/_fake/health`, 20_000, fakes);
  });
  await step('web server', async () => {
    const instanceId = randomUUID();
    const server = startChild('server/src/server.ts', { ...env, SPINCYCLE_INSTANCE_ID: instanceId }, 'web server');
    await waitForOwnServer(`${url}/api/health`, instanceId, { timeoutMs: 30_000, child: server, name: 'web server' });
  });
  await step('plan worker', async () => {
    // Computes target plans from the queue in PostgreSQL (pg-boss); it has no HTTP port and
    // reports ready over its IPC channel once it works the queue.
    const instanceId = randomUUID();
    const worker = startChild('server/src/worker.ts', { ...env, SPINCYCLE_INSTANCE_ID: instanceId }, 'plan worker', { ipc: true });
    await waitForReadyMessage(worker, instanceId, { timeoutMs: 30_000, name: 'the plan worker' });
  });

  const demo = readDemoAccounts();
  const width = Math.max(...demo.accounts.map((a) => a.email.length));
  console.log(`
Spincycle is running at ${url}   (ready in ${((performance.now() - t0) / 1000).toFixed(1)} s)
Development mailbox (this machine only): ${mailboxUrl}
Demo accounts (password for all: ${demo.password}):
${demo.accounts.map((a) => `  ${a.email.padEnd(width)}  ${a.roles.join(', ')}`).join('\n')}
Press Ctrl-C to stop.`);
}

main().catch((err) => {
  if (stopping) return;
  console.error(`\nnpm start failed: ${err.message}`);
  void stopAll(1);
});
