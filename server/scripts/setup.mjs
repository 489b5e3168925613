// Set-up steps shared by `npm start` (server/scripts/start.mjs) and `npm test`
// (test/run-all.mjs). Plain Node with no dependencies: it runs before `npm ci`.
import { spawn, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

export const projectDir = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
const bin = (name) => join(projectDir, 'node_modules', '.bin', name);

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
export function ensureDependencies() {
  const lock = join(projectDir, 'package-lock.json');
  const stamp = join(projectDir, 'node_modules', '.spincycle-lock-hash');
  const want = sha256(readFileSync(lock));
  if (existsSync(stamp) && readFileSync(stamp, 'utf8') === want && existsSync(bin('tsx'))) return false;
  console.log('  installing dependencies with npm ci (first run on this machine, or package-lock.json changed)');
  const r = spawnSync('npm', ['ci', '--no-audit', '--no-fund'], { cwd: projectDir, stdio: 'inherit' });
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
export function ensureClientBuild({ force = false } = {}) {
  const stamp = join(projectDir, 'dist', 'client', '.source-hash');
  const want = clientSourceHash();
  if (!force && existsSync(stamp) && readFileSync(stamp, 'utf8') === want && existsSync(join(clientDist, 'index.html'))) return false;
  const r = spawnSync(bin('ng'), ['build', '--configuration', 'production'], {
    cwd: projectDir,
    stdio: ['ignore', 'inherit', 'inherit'],
    env: { ...process.env, NG_CLI_ANALYTICS: 'false', NG_FORCE_TTY: 'false' },
  });
  if (r.status !== 0) throw new Error('the client build failed (see above)');
  mkdirSync(dirname(stamp), { recursive: true });
  writeFileSync(stamp, want);
  return true;
}

/** Migrations (and demo data) for one database, through tsx. */
export function setUpDatabase(database, seedFlag) {
  const args = [join(projectDir, 'database', 'setup.ts'), database];
  if (seedFlag) args.push(seedFlag);
  const r = spawnSync(bin('tsx'), args, { cwd: projectDir, stdio: 'inherit' });
  if (r.status !== 0) throw new Error(`setting up database ${database} failed`);
}

/** Starts a TypeScript entry point with tsx as a child process that shares our terminal. */
export function startTs(entry, env, { name, quiet = false } = {}) {
  const child = spawn(process.execPath, ['--import', 'tsx', join(projectDir, entry)], {
    cwd: projectDir,
    env: { ...process.env, ...env },
    stdio: ['ignore', quiet ? 'ignore' : 'inherit', 'inherit'],
  });
  child.name = name ?? entry;
  return child;
}

/** Waits until an HTTP URL answers (any status), or fails after `timeoutMs`. */
export async function waitForHttp(url, timeoutMs = 30_000, child) {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    if (child && child.exitCode !== null) throw new Error(`${child.name} exited with code ${child.exitCode}`);
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

