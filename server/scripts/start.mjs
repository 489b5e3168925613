// `npm start`: everything from a fresh machine to a running app, idempotent and quick the
// second time. Ctrl-C stops what it started (PostgreSQL included, if this run started it).
import { randomBytes } from 'node:crypto';
import { bringUpCluster } from '../../database/cluster.mjs';
import { ensureClientBuild, ensureDependencies, readDemoAccounts, setUpDatabase, startTs, step, waitForHttp } from './setup.mjs';

const env = {
  PORT: process.env.PORT ?? '4300',
  HOST: process.env.HOST ?? '127.0.0.1',
  PGDATABASE: process.env.PGDATABASE ?? 'spincycle',
  SMTP_PORT: process.env.SMTP_PORT ?? '2525',
  MAIL_FAKE_HTTP_PORT: process.env.MAIL_FAKE_HTTP_PORT ?? '4399',
};
// The development mailbox (fakes/mail) shows reset links: it listens on 127.0.0.1 only, on its own
// port, and answers only with this token, new at every start and given to the fakes alone.
const mailboxToken = process.env.MAILBOX_TOKEN || randomBytes(24).toString('base64url');
const mailboxUrl = `http://127.0.0.1:${env.MAIL_FAKE_HTTP_PORT}/?token=${mailboxToken}`;
const url = `http://${env.HOST}:${env.PORT}`;

const children = [];
let cluster;
let stopping = false;

function stopAll(code = 0) {
  if (stopping) return;
  stopping = true;
  console.log('\nstopping Spincycle…');
  for (const c of children) if (c.exitCode === null) c.kill('SIGTERM');
  const wait = children.map((c) => (c.exitCode === null ? new Promise((r) => c.once('exit', r)) : null)).filter(Boolean);
  Promise.race([Promise.all(wait), new Promise((r) => setTimeout(r, 6000))]).then(() => {
    if (cluster?.started) {
      cluster.stop();
      console.log('PostgreSQL stopped');
    }
    process.exit(code);
  });
}
process.on('SIGINT', () => stopAll(0));
process.on('SIGTERM', () => stopAll(0));

async function main() {
  const t0 = performance.now();
  await step('dependencies', () => ensureDependencies());
  cluster = await step('PostgreSQL', () => bringUpCluster({ log: (m) => console.log(`  ${m}`) }));
  await step(`database ${env.PGDATABASE}: migrations and demo data`, () => {
    cluster.ensureDatabase(env.PGDATABASE);
    setUpDatabase(env.PGDATABASE, '--seed-if-empty');
  });
  await step('client build', () => {
    if (!ensureClientBuild()) console.log('  unchanged since the last build');
  });
  await step('local fakes (SMTP)', async () => {
    const fakes = startTs('fakes/run.ts', { ...env, MAILBOX_TOKEN: mailboxToken }, { name: 'fakes' });
    children.push(fakes);
    await waitForHttp(`http://127.0.0.1:${env.MAIL_FAKE_HTTP_PORT}/`, 20_000, fakes);
  });
  await step('web server', async () => {
    const server = startTs('server/src/server.ts', env, { name: 'web server' });
    children.push(server);
    await waitForHttp(`${url}/api/health`, 30_000, server);
  });
  await step('plan worker', async () => {
    // Computes target plans from the queue in PostgreSQL (pg-boss); it has no HTTP port.
    const worker = startTs('server/src/worker.ts', env, { name: 'plan worker' });
    children.push(worker);
    await new Promise((resolve) => setTimeout(resolve, 300));
    if (worker.exitCode !== null) throw new Error(`the plan worker exited with code ${worker.exitCode}`);
  });
  for (const c of children) {
    c.on('exit', (code) => {
      if (!stopping) {
        console.error(`${c.name} exited (code ${code}); stopping everything`);
        stopAll(1);
      }
    });
  }

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
  console.error(`\nnpm start failed: ${err.message}`);
  stopAll(1);
});
