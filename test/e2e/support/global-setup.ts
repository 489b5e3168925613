import { spawn, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import path from 'node:path';
import { BASE_URL, E2E_DB, E2E_MAIL_HTTP_PORT, E2E_PORT, E2E_SMTP_PORT } from './e2e-env';

const root = path.resolve(__dirname, '../../..');

async function waitFor(url: string, child: ChildProcess, name: string): Promise<void> {
  const until = Date.now() + 30_000;
  while (Date.now() < until) {
    if (child.exitCode !== null) throw new Error(`${name} exited with code ${child.exitCode}`);
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
 * Starts the fakes, the web server (serving the production client build) and the plan worker against the
 * demo-seeded e2e database. `npm test` prepares that database; run alone, the suite expects
 * `npm test` to have run once (or `tsx database/setup.ts spincycle_e2e --seed`).
 */
export default async function globalSetup(): Promise<void> {
  // The mailbox answers only with this token; the test workers (started after this) read it.
  process.env.SPINCYCLE_E2E_MAILBOX_TOKEN ||= randomBytes(24).toString('base64url');
  const env = {
    ...process.env,
    NODE_ENV: 'development',
    PORT: String(E2E_PORT),
    PGDATABASE: E2E_DB,
    SMTP_PORT: String(E2E_SMTP_PORT),
    MAIL_FAKE_HTTP_PORT: String(E2E_MAIL_HTTP_PORT),
    MAILBOX_TOKEN: process.env.SPINCYCLE_E2E_MAILBOX_TOKEN,
    LOG_LEVEL: 'warn',
    LOGIN_RATE_LIMIT: '50',
  };
  const start = (entry: string) =>
    spawn(process.execPath, ['--import', 'tsx', path.join(root, entry)], { cwd: root, env, stdio: ['ignore', 'ignore', 'inherit'] });
  const fakes = start('fakes/run.ts');
  const server = start('server/src/server.ts');
  // The plan worker (pg-boss) computes target plans, as beside `npm start`.
  const worker = start('server/src/worker.ts');
  (globalThis as Record<string, unknown>).__spincycleE2eChildren = [fakes, server, worker];
  await waitFor(`http://127.0.0.1:${E2E_MAIL_HTTP_PORT}/`, fakes, 'mail fake');
  await waitFor(`${BASE_URL}/api/health`, server, 'web server');
  if (worker.exitCode !== null) throw new Error(`plan worker exited with code ${worker.exitCode}`);
}
