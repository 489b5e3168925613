// The private PostgreSQL cluster: find or install Debian's server binaries, create the
// cluster once, start it on 127.0.0.1 on a non-default port, create databases, stop it.
// Plain Node (no dependencies) so that it runs before `npm ci` has finished.
import { execFileSync, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { chownSync, existsSync, mkdirSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { ensureDebianPackages } from '../server/scripts/debian-packages.mjs';

const projectDir = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const isRoot = process.getuid?.() === 0;

/** Connection settings shared by every script and the server (all overridable by env). */
export function clusterSettings(env = process.env) {
  return {
    host: env.PGHOST ?? '127.0.0.1',
    port: Number(env.PGPORT ?? 54329),
    user: env.PGUSER ?? 'spincycle',
    password: env.PGPASSWORD ?? 'spincycle-local',
  };
}

function findBinDir() {
  const base = '/usr/lib/postgresql';
  if (!existsSync(base)) return null;
  const versions = readdirSync(base)
    .filter((v) => existsSync(join(base, v, 'bin', 'initdb')) && existsSync(join(base, v, 'bin', 'pg_ctl')))
    .sort((a, b) => Number(b) - Number(a));
  return versions.length ? join(base, versions[0], 'bin') : null;
}

/** Installs Debian's postgresql package when its server binaries are missing. */
export function ensurePostgresInstalled(log = console.log) {
  ensureDebianPackages([{ name: 'postgresql', present: () => findBinDir() !== null }], log);
  return findBinDir();
}

/** Runs a PostgreSQL program as the cluster's owner (the `postgres` system user when we are root). */
function runAsOwner(bin, args, options = {}) {
  const [cmd, full] = isRoot ? ['runuser', ['-u', 'postgres', '--', bin, ...args]] : [bin, args];
  return spawnSync(cmd, full, { encoding: 'utf8', ...options });
}

function canOwnerReach(dir) {
  if (!isRoot) return true;
  return spawnSync('runuser', ['-u', 'postgres', '--', 'test', '-x', dir]).status === 0;
}

/**
 * Where the cluster lives: `.data/pg` inside the checkout when the cluster's owner can reach
 * it; otherwise (a checkout under a mode-700 home while running as root) a folder under
 * /var/tmp named after a hash of the checkout path, so two checkouts never share a cluster.
 */
export function clusterPaths() {
  if (process.env.SPINCYCLE_PG_DIR) return pathsUnder(process.env.SPINCYCLE_PG_DIR);
  const local = join(projectDir, '.data');
  mkdirSync(local, { recursive: true });
  if (canOwnerReach(local)) return pathsUnder(join(local, 'pg'));
  const hash = createHash('sha256').update(projectDir).digest('hex').slice(0, 12);
  return pathsUnder(join('/var/tmp', `spincycle-${hash}`));
}

function pathsUnder(root) {
  return { root, data: join(root, 'data'), log: join(root, 'postgres.log') };
}

function ownedDir(dir) {
  mkdirSync(dir, { recursive: true, mode: 0o700 });
  if (isRoot) {
    const uid = Number(execFileSync('id', ['-u', 'postgres'], { encoding: 'utf8' }).trim());
    const gid = Number(execFileSync('id', ['-g', 'postgres'], { encoding: 'utf8' }).trim());
    chownSync(dir, uid, gid);
  }
}

/** Creates the cluster once (idempotent). */
export function ensureCluster(binDir, paths, settings, log = console.log) {
  if (existsSync(join(paths.data, 'PG_VERSION'))) return false;
  log(`creating a private PostgreSQL cluster in ${paths.data}`);
  ownedDir(paths.root);
  ownedDir(paths.data);
  const pwfile = join(paths.root, 'pwfile');
  writeFileSync(pwfile, `${settings.password}\n`, { mode: 0o600 });
  if (isRoot) execFileSync('chown', ['postgres:postgres', pwfile]);
  const result = runAsOwner(join(binDir, 'initdb'), [
    '-D', paths.data,
    '-U', settings.user,
    '--pwfile', pwfile,
    '--auth-local=trust',
    '--auth-host=scram-sha-256',
    '-E', 'UTF8',
    '--locale=C.UTF-8',
  ]);
  rmSync(pwfile);
  if (result.status !== 0) throw new Error(`initdb failed:\n${result.stderr || result.stdout}`);
  return true;
}

/** True when the cluster's postmaster is running. */
export function isRunning(binDir, paths) {
  return runAsOwner(join(binDir, 'pg_ctl'), ['status', '-D', paths.data]).status === 0;
}

/**
 * Starts the cluster unless it runs already. Returns true when this call started it (so the
 * caller knows to stop it). `fast` turns off durability: only for throw-away test runs.
 */
export function startCluster(binDir, paths, settings, { fast = false } = {}) {
  if (isRunning(binDir, paths)) return false;
  const opts = [
    `-c listen_addresses=${settings.host}`,
    `-p ${settings.port}`,
    // TCP on loopback only: no Unix socket, so deep checkout paths cannot exceed its length limit.
    "-c unix_socket_directories=''",
    '-c max_connections=100',
  ];
  if (fast) opts.push('-c fsync=off', '-c synchronous_commit=off', '-c full_page_writes=off');
  const result = runAsOwner(join(binDir, 'pg_ctl'), ['start', '-w', '-t', '60', '-D', paths.data, '-l', paths.log, '-o', opts.join(' ')]);
  if (result.status !== 0) {
    const tail = existsSync(paths.log) ? readFileSync(paths.log, 'utf8').split('\n').slice(-15).join('\n') : '';
    throw new Error(`PostgreSQL did not start on ${settings.host}:${settings.port}:\n${result.stderr || result.stdout}\n${tail}`);
  }
  return true;
}

export function stopCluster(binDir, paths) {
  if (!isRunning(binDir, paths)) return;
  runAsOwner(join(binDir, 'pg_ctl'), ['stop', '-w', '-m', 'fast', '-D', paths.data]);
}

function psql(binDir, settings, sql, database = 'postgres') {
  const args = ['-h', settings.host, '-p', String(settings.port), '-U', settings.user, '-d', database, '-v', 'ON_ERROR_STOP=1', '-qAtc', sql];
  return spawnSync(join(binDir, 'psql'), args, { encoding: 'utf8', env: { ...process.env, PGPASSWORD: settings.password } });
}

const safeName = (name) => {
  if (!/^[a-z_][a-z0-9_]*$/.test(name)) throw new Error(`unsafe database name ${name}`);
  return name;
};

/** Creates a database if missing; with `fresh`, drops it first (test runs start clean). */
export function ensureDatabase(binDir, paths, settings, name, { fresh = false } = {}) {
  safeName(name);
  if (fresh) {
    const drop = psql(binDir, settings, `DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
    if (drop.status !== 0) throw new Error(`could not drop ${name}: ${drop.stderr}`);
  }
  const exists = psql(binDir, settings, `SELECT 1 FROM pg_database WHERE datname = '${name}'`);
  if (exists.status !== 0) throw new Error(`could not query databases: ${exists.stderr}`);
  if (exists.stdout.trim() === '1') return false;
  const create = psql(binDir, settings, `CREATE DATABASE ${name}`);
  if (create.status !== 0) throw new Error(`could not create ${name}: ${create.stderr}`);
  return true;
}

/**
 * Everything up to a running cluster: install if needed, create, start. Returns a handle
 * with `stop()` that stops the cluster only when this call started it.
 */
export function bringUpCluster({ log = console.log, fast = false } = {}) {
  const binDir = ensurePostgresInstalled(log);
  const paths = clusterPaths();
  const settings = clusterSettings();
  ensureCluster(binDir, paths, settings, log);
  const started = startCluster(binDir, paths, settings, { fast });
  log(`PostgreSQL ${started ? 'started' : 'already running'} on ${settings.host}:${settings.port} (${paths.data})`);
  return {
    binDir,
    paths,
    settings,
    started,
    ensureDatabase: (name, opts) => ensureDatabase(binDir, paths, settings, name, opts),
    stop: () => {
      if (started) stopCluster(binDir, paths);
    },
  };
}
