// The private PostgreSQL clusters: find or install Debian's server binaries, create a
// cluster once, start it on 127.0.0.1 on a non-default port, create databases, stop it.
// Plain Node (no dependencies) so that it runs before `npm ci` has finished.
//
// Two clusters that never touch each other, so that `npm start` and `npm test` can run on the
// same machine at the same time:
//   dev  — `npm start` (and the benches): `.data/pg`, port 54329 (PGPORT), durable.
//   test — `npm test` and the jest suites: `.data/pg-test`, port 54339 (SPINCYCLE_TEST_PGPORT),
//          fsync off (throw-away data, fast).
import { execFileSync, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { chownSync, existsSync, mkdirSync, readdirSync, readFileSync, rmSync, unlinkSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { ensureDebianPackages } from '../server/scripts/debian-packages.mjs';

const projectDir = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const isRoot = process.getuid?.() === 0;

/** What tells the two clusters apart: folder, port (and the env that overrides it), durability. */
export const PROFILES = {
  dev: { folder: 'pg', suffix: '', port: 54329, portEnv: 'PGPORT', dirEnv: 'SPINCYCLE_PG_DIR', fast: false },
  test: { folder: 'pg-test', suffix: '-test', port: 54339, portEnv: 'SPINCYCLE_TEST_PGPORT', dirEnv: 'SPINCYCLE_TEST_PG_DIR', fast: true },
};

function profileOf(name) {
  const profile = PROFILES[name];
  if (!profile) throw new Error(`unknown cluster profile ${name} (dev or test)`);
  return profile;
}

/**
 * Connection settings of one cluster (overridable by env). The test cluster's port comes from
 * SPINCYCLE_TEST_PGPORT only, never from PGPORT, so that a PGPORT meant for `npm start` cannot
 * point the tests at the development cluster (the launchers then set PGPORT for their children
 * from `clusterEnv`).
 */
export function clusterSettings(env = process.env, profileName = 'dev') {
  const profile = profileOf(profileName);
  const port = Number(env[profile.portEnv] ?? profile.port);
  if (profileName === 'test' && port === PROFILES.dev.port) {
    throw new Error(`the test cluster's port ${port} is the development cluster's default port: set SPINCYCLE_TEST_PGPORT to another port`);
  }
  return {
    host: env.PGHOST ?? '127.0.0.1',
    port,
    user: env.PGUSER ?? 'spincycle',
    password: env.PGPASSWORD ?? 'spincycle-local',
  };
}

/** The libpq-style environment that points a child process (server, knex, jest) at a cluster. */
export function clusterEnv(settings) {
  return { PGHOST: settings.host, PGPORT: String(settings.port), PGUSER: settings.user, PGPASSWORD: settings.password };
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
export function clusterPaths(profileName = 'dev') {
  const profile = profileOf(profileName);
  if (process.env[profile.dirEnv]) return pathsUnder(process.env[profile.dirEnv]);
  const local = join(projectDir, '.data');
  mkdirSync(local, { recursive: true });
  if (canOwnerReach(local)) return pathsUnder(join(local, profile.folder));
  const hash = createHash('sha256').update(projectDir).digest('hex').slice(0, 12);
  return pathsUnder(join('/var/tmp', `spincycle-${hash}${profile.suffix}`));
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
    '-D',
    paths.data,
    '-U',
    settings.user,
    '--pwfile',
    pwfile,
    '--auth-local=trust',
    '--auth-host=scram-sha-256',
    '-E',
    'UTF8',
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

/** `SHOW fsync` of the running cluster: 'on', 'off', or null when it does not answer on its port. */
export function fsyncSetting(binDir, settings) {
  const r = psql(binDir, settings, 'SHOW fsync');
  return r.status === 0 ? r.stdout.trim() : null;
}

function psql(binDir, settings, sql, database = 'postgres') {
  const args = [
    '-h',
    settings.host,
    '-p',
    String(settings.port),
    '-U',
    settings.user,
    '-d',
    database,
    '-v',
    'ON_ERROR_STOP=1',
    '-qAtc',
    sql,
  ];
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
 * Everything up to a running cluster of one profile (`dev` or `test`): install if needed,
 * create, start. Returns a handle with `stop()` that stops the cluster only when this call
 * started it. A development cluster found running without durability (left by an older test
 * runner that shared it) is restarted durable; a cluster that runs but does not answer on its
 * port is an error that says how to stop it.
 */
export function bringUpCluster({ log = console.log, profile = 'dev', lease } = {}) {
  const { fast } = profileOf(profile);
  const binDir = ensurePostgresInstalled(log);
  const paths = clusterPaths(profile);
  const settings = clusterSettings(process.env, profile);
  ensureCluster(binDir, paths, settings, log);
  // The lease comes before the start: a user leaving at this moment then sees us and keeps it up.
  if (lease) takeLease(paths, lease);
  let started = startCluster(binDir, paths, settings, { fast });
  if (!started) {
    const fsync = fsyncSetting(binDir, settings);
    if (fsync === null) {
      throw new Error(
        `the ${profile} cluster in ${paths.data} is running but does not answer on ${settings.host}:${settings.port} ` +
          `(started with another port?): stop it with \`pg_ctl stop -D ${paths.data}\`${isRoot ? ' (as the postgres user)' : ''} and try again`,
      );
    }
    if (!fast && fsync !== 'on') {
      log(`the ${profile} cluster was running without durability (fsync ${fsync}); restarting it durable`);
      stopCluster(binDir, paths);
      started = startCluster(binDir, paths, settings, { fast });
    }
  }
  if (started && lease) writeFileSync(startedMarker(paths), `${lease}\n`);
  log(
    `PostgreSQL (${profile}${fast ? ', fsync off' : ''}) ${started ? 'started' : 'already running'} on ${settings.host}:${settings.port} (${paths.data})`,
  );
  return {
    binDir,
    paths,
    settings,
    started,
    ensureDatabase: (name, opts) => ensureDatabase(binDir, paths, settings, name, opts),
    stop: () => {
      if (started) stopCluster(binDir, paths);
    },
    /** Gives the lease back; see releaseLease. */
    release: () => (lease ? releaseLease(profile, lease) : false),
  };
}

// Leases: several runs share the test cluster at once (`npm test` and a `npx jest` beside it, or
// two engineers' jest runs in one checkout). Each run holds a lease named `<pid>-<what>` while
// it uses the cluster; a cluster that some lease-holder started is stopped by the last one to
// leave, never while another still uses it. Leases of processes that died (killed runs) are
// dropped, so their cluster is stopped by the next run that leaves.
const leaseDir = (paths) => join(paths.root, 'leases');
const startedMarker = (paths) => join(paths.root, 'started-by-lease');

function takeLease(paths, lease) {
  if (!/^\d+(-[a-z0-9-]+)?$/.test(String(lease))) throw new Error(`bad lease name ${lease} (<pid>-<what>)`);
  mkdirSync(leaseDir(paths), { recursive: true });
  writeFileSync(join(leaseDir(paths), String(lease)), '');
}

function alive(pid) {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return err.code === 'EPERM';
  }
}

/** The leases of living processes (dead ones are removed on the way). */
export function liveLeases(paths) {
  if (!existsSync(leaseDir(paths))) return [];
  return readdirSync(leaseDir(paths)).filter((name) => {
    if (alive(Number.parseInt(name, 10))) return true;
    rmSync(join(leaseDir(paths), name), { force: true });
    return false;
  });
}

/**
 * Gives a lease back. When no living lease remains and a lease-holder started the cluster, it
 * is stopped. Returns true when this call stopped it.
 */
export function releaseLease(profile, lease) {
  const paths = clusterPaths(profile);
  try {
    unlinkSync(join(leaseDir(paths), String(lease)));
  } catch {
    // not held
  }
  if (liveLeases(paths).length > 0 || !existsSync(startedMarker(paths))) return false;
  rmSync(startedMarker(paths), { force: true });
  const binDir = findBinDir();
  if (!binDir || !isRunning(binDir, paths)) return false;
  stopCluster(binDir, paths);
  return true;
}
