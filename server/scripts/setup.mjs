// Set-up steps shared by `npm start` (server/scripts/start.mjs) and `npm test`
// (test/run-all.mjs). Plain Node with no dependencies: it runs before `npm ci`.
import { spawn } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

export const projectDir = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
const bin = (name) => join(projectDir, 'node_modules', '.bin', name);

/** Short-lived commands running right now (npm ci, tsx database/setup.ts, ng build, jest, tsc). */
export const runningCommands = new Set();

/**
 * Runs a command to its end without blocking the event loop (so that a Ctrl-C handler can run
 * meanwhile and stop it). Each runs in its own process group (`detached`), which the handler
 * signals as a whole (jest's workers and the browser suite's servers included). Resolves to
 * { status, signal }.
 */
export function runCommand(cmd, args, options = {}) {
  return new Promise((resolve, reject) => {
    const child = spawn(cmd, args, { cwd: projectDir, stdio: ['ignore', 'inherit', 'inherit'], detached: true, ...options });
    runningCommands.add(child);
    child.once('error', (err) => {
      runningCommands.delete(child);
      reject(err);
    });
    child.once('exit', (status, signal) => {
      runningCommands.delete(child);
      resolve({ status, signal });
    });
  });
}

/** Prints a step with its duration. */
export async function step(label, fn) {
  const t0 = performance.now();
  process.stdout.write(`▸ ${label}\n`);
  const result = await fn();
  process.stdout.write(`  done in ${((performance.now() - t0) / 1000).toFixed(1)} s\n`);
  return result;
}

const sha256 = (data) => createHash('sha256').update(data).digest('hex');

/** `npm ci` when node_modules is missing or was installed from another package-lock.json. */
export async function ensureDependencies() {
  const lock = join(projectDir, 'package-lock.json');
  const stamp = join(projectDir, 'node_modules', '.spincycle-lock-hash');
  const want = sha256(readFileSync(lock));
  if (existsSync(stamp) && readFileSync(stamp, 'utf8') === want && existsSync(bin('tsx'))) return false;
  console.log('  installing dependencies with npm ci (first run on this machine, or package-lock.json changed)');
  const r = await runCommand('npm', ['ci', '--no-audit', '--no-fund']);
  if (r.status !== 0) throw new Error('npm ci failed');
  writeFileSync(stamp, want);
  return true;
}

function listFiles(dir, out = []) {
  if (!existsSync(dir)) return out;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const full = join(dir, entry.name);
    if (entry.isDirectory()) listFiles(full, out);
    else if (!entry.name.endsWith('.spec.ts')) out.push(full);
  }
  return out;
}

/** Hash of everything the client build reads: a second start with no change skips the build. */
function clientSourceHash() {
  const files = [
    ...listFiles(join(projectDir, 'client')),
    ...listFiles(join(projectDir, 'shared', 'src')),
    join(projectDir, 'angular.json'),
    join(projectDir, 'package-lock.json'),
  ].sort();
  const h = createHash('sha256');
  for (const f of files) {
    h.update(relative(projectDir, f));
    h.update(readFileSync(f));
  }
  return h.digest('hex');
}

export const clientDist = join(projectDir, 'dist', 'client', 'browser');

/** Production build of the Angular client, skipped when its sources did not change. */
export async function ensureClientBuild({ force = false } = {}) {
  const stamp = join(projectDir, 'dist', 'client', '.source-hash');
  const want = clientSourceHash();
  if (!force && existsSync(stamp) && readFileSync(stamp, 'utf8') === want && existsSync(join(clientDist, 'index.html'))) return false;
  const r = await runCommand(bin('ng'), ['build', '--configuration', 'production'], {
    env: { ...process.env, NG_CLI_ANALYTICS: 'false', NG_FORCE_TTY: 'false' },
  });
  if (r.status !== 0) throw new Error('the client build failed (see above)');
  mkdirSync(dirname(stamp), { recursive: true });
  writeFileSync(stamp, want);
  return true;
}

/** Migrations (and demo data) for one database, through tsx; `env` points it at a cluster. */
export async function setUpDatabase(database, seedFlag, env = {}) {
  const args = [join(projectDir, 'database', 'setup.ts'), database];
  if (seedFlag) args.push(seedFlag);
  const r = await runCommand(bin('tsx'), args, { env: { ...process.env, ...env } });
  if (r.status !== 0) throw new Error(`setting up database ${database} failed`);
}

/**
 * Starts a TypeScript entry point with tsx as a child process that shares our terminal; with
 * `ipc`, it also gets a message channel (the plan worker reports ready through it). `onExit` is
 * attached at once, so that an early exit is never missed.
 */
export function startTs(entry, env, { name, quiet = false, ipc = false, onExit } = {}) {
  const child = spawn(process.execPath, ['--import', 'tsx', join(projectDir, entry)], {
    cwd: projectDir,
    env: { ...process.env, ...env },
    stdio: ['ignore', quiet ? 'ignore' : 'inherit', 'inherit', ...(ipc ? ['ipc'] : [])],
  });
  child.name = name ?? entry;
  if (onExit) child.once('exit', (code, signal) => onExit(child, code, signal));
  return child;
}

/**
 * Waits until an HTTP URL answers (any status), or fails after `timeoutMs`. Only for a port
 * checked free just before the child started (the mail fake); the web server is checked by
 * its instance id (waitForOwnServer in processes.cjs).
 */
export async function waitForHttp(url, timeoutMs = 30_000, child) {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    if (child && (child.exitCode !== null || child.signalCode !== null))
      throw new Error(`${child.name} exited with ${child.signalCode ?? `code ${child.exitCode}`}`);
    try {
      await fetch(url);
      return;
    } catch {
      await new Promise((r) => setTimeout(r, 150));
    }
  }
  throw new Error(`${url} did not answer within ${timeoutMs / 1000} s`);
}

export function readDemoAccounts() {
  return JSON.parse(readFileSync(join(projectDir, 'database', 'demo-accounts.json'), 'utf8'));
}
