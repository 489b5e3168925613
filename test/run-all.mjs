// `npm test`: the same set-up as `npm start` on separate databases, then every suite:
// type checks, shared (science core), reference (outside oracles), server (API against the
// real PostgreSQL), client (Angular unit tests) and browser (Debian's chromium). Ends with
// one line `N passed, N failed` summed over all suites; exits non-zero on any failure.
//
// It uses the test cluster (`.data/pg-test`, port 54339, fsync off), never the development
// cluster of `npm start`, so both can run at once. Ctrl-C (SIGINT) or SIGTERM stops the running
// command's whole process group (jest, its workers, the browser suite's servers) and then the
// test cluster (unless another run, such as a `npx jest` beside it, still holds a lease on it).
import { existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs';
import { join, relative } from 'node:path';
import { bringUpCluster, clusterEnv } from '../database/cluster.mjs';
import { ensureDebianPackages, fileExists, pythonModule } from '../server/scripts/debian-packages.mjs';
import { stopChild } from '../server/scripts/processes.cjs';
import {
  ensureClientBuild,
  ensureDependencies,
  projectDir,
  runCommand,
  runningCommands,
  setUpDatabase,
  step,
} from '../server/scripts/setup.mjs';

const TEST_DB = process.env.SPINCYCLE_TEST_DB ?? 'spincycle_test';
const E2E_DB = process.env.SPINCYCLE_E2E_DB ?? 'spincycle_e2e';
const resultsDir = join(projectDir, '.data', 'test-results');
const bin = (name) => join(projectDir, 'node_modules', '.bin', name);

/** @type {string[]} failed tests, named, for the summary */
const failures = [];
/** @type {{ suite: string, passed: number, failed: number, seconds: number, note?: string }[]} */
const rows = [];

/** The test cluster's handle once this run has brought it up (`release()` gives our lease back). */
let cluster;
let interrupted = false;
let firstSignalAt = 0;

async function onSignal(signal) {
  if (interrupted) {
    // Ctrl-C in a terminal reaches us twice at once (from the terminal and forwarded by npm):
    // only a second Ctrl-C a moment later means "no more waiting for the suites to wind down".
    if (Date.now() - firstSignalAt < 1000) return;
    for (const c of runningCommands) {
      try {
        process.kill(-c.pid, 'SIGKILL');
      } catch {
        // gone
      }
    }
    return;
  }
  interrupted = true;
  firstSignalAt = Date.now();
  console.error(`\n${signal}: stopping the running suite…`);
  // The browser suite's plan worker may finish a running job: allow it the worker's own grace.
  await Promise.all([...runningCommands].map((c) => stopChild(c, { group: true, graceMs: 30_000 })));
  if (cluster?.release()) console.error('test cluster stopped');
  process.exit(signal === 'SIGINT' ? 130 : 143);
}
process.on('SIGINT', () => void onSignal('SIGINT'));
process.on('SIGTERM', () => void onSignal('SIGTERM'));

/** Resolves never once interrupted: the signal handler ends the process. */
const unlessInterrupted = async (promise) => {
  const result = await promise;
  if (interrupted) await new Promise(() => {});
  return result;
};

function record(suite, passed, failed, seconds, note) {
  rows.push({ suite, passed, failed, seconds, note });
}

async function typeCheck(label, project) {
  const t0 = performance.now();
  console.log(`\n── ${label} (tsc --noEmit -p ${project})`);
  const r = await unlessInterrupted(runCommand(bin('tsc'), ['--noEmit', '-p', project]));
  const ok = r.status === 0;
  if (ok) console.log('   no type errors');
  record(label, ok ? 1 : 0, ok ? 0 : 1, (performance.now() - t0) / 1000);
}

/** A lint step: the command's exit status is the verdict (its own output names each problem). */
async function lint(label, command, args) {
  const t0 = performance.now();
  console.log(`\n── ${label} (${[command, ...args].join(' ')})`);
  const r = await unlessInterrupted(runCommand(bin(command), args));
  const ok = r.status === 0;
  if (ok) console.log('   clean');
  record(label, ok ? 1 : 0, ok ? 0 : 1, (performance.now() - t0) / 1000);
}

async function jestSuite(project, extraArgs = []) {
  const t0 = performance.now();
  const out = join(resultsDir, `${project}.json`);
  rmSync(out, { force: true });
  console.log(`\n── ${project} suite (jest --selectProjects ${project})`);
  const r = await unlessInterrupted(
    runCommand(bin('jest'), ['--selectProjects', project, '--json', `--outputFile=${out}`, '--ci', ...extraArgs], {
      env: { ...process.env, SPINCYCLE_TEST_DB: TEST_DB, SPINCYCLE_E2E_DB: E2E_DB, FORCE_COLOR: process.env.FORCE_COLOR ?? '1' },
    }),
  );
  const seconds = (performance.now() - t0) / 1000;
  if (!existsSync(out)) {
    record(project, 0, 1, seconds, `jest exited with ${r.status} before reporting`);
    return;
  }
  const json = JSON.parse(readFileSync(out, 'utf8'));
  // A suite that fails to load counts as one failure even though none of its tests ran.
  const brokenFiles = json.testResults.filter((f) => f.status === 'failed' && f.assertionResults.length === 0).length;
  // A suite that finds no tests is a failure too: something was misconfigured.
  const empty = json.numTotalTests === 0;
  record(project, json.numPassedTests, json.numFailedTests + brokenFiles + (empty ? 1 : 0), seconds, empty ? 'no tests found' : undefined);
  // Failures are repeated in the summary (CI may keep only the end of the output).
  for (const file of json.testResults) {
    const where = relative(projectDir, file.name);
    if (file.status === 'failed' && file.assertionResults.length === 0) failures.push(`${project}: ${where}: ${firstLines(file.message)}`);
    for (const a of file.assertionResults)
      if (a.status === 'failed') failures.push(`${project}: ${where}: ${a.fullName}: ${firstLines(a.failureMessages.join('\n'))}`);
  }
}

/** The first few lines of a failure message, without colour codes. */
function firstLines(text, lines = 6) {
  return (
    (text ?? '')
      // eslint-disable-next-line no-control-regex -- colour codes start with ESC
      .replace(/\x1b\[[0-9;]*m/g, '')
      .split('\n')
      .filter((l) => l.trim() !== '')
      .slice(0, lines)
      .join('\n    ')
  );
}

async function main() {
  const t0 = performance.now();
  mkdirSync(resultsDir, { recursive: true });
  await step('dependencies', () => ensureDependencies());
  await step('Debian packages for the tests (chromium, python3-astropy, python3-scipy)', () =>
    ensureDebianPackages(
      [
        { name: 'chromium', present: fileExists('/usr/bin/chromium') },
        { name: 'python3-astropy', present: pythonModule('astropy') },
        { name: 'python3-scipy', present: pythonModule('scipy') },
      ],
      (m) => console.log(`  ${m}`),
    ),
  );
  // The test cluster (its own folder and port, durability off), never the one `npm start` uses.
  await step('PostgreSQL (test cluster)', () => {
    // A lease: a jest run beside us never stops the cluster while we use it, and the last run
    // to leave stops it.
    cluster = bringUpCluster({ profile: 'test', lease: `${process.pid}-npm-test`, log: (m) => console.log(`  ${m}`) });
  });
  if (interrupted) await new Promise(() => {});
  // Every child from here on (database set-up, jest and what its global set-ups start) reaches
  // the test cluster through these variables.
  Object.assign(process.env, clusterEnv(cluster.settings));
  try {
    await step(`databases ${TEST_DB} (empty) and ${E2E_DB} (demo data), fresh`, async () => {
      cluster.ensureDatabase(TEST_DB, { fresh: true });
      await unlessInterrupted(setUpDatabase(TEST_DB));
      cluster.ensureDatabase(E2E_DB, { fresh: true });
      await unlessInterrupted(setUpDatabase(E2E_DB, '--seed'));
    });

    let built = true;
    await step('client production build', async () => {
      const t = performance.now();
      try {
        if (!(await unlessInterrupted(ensureClientBuild()))) console.log('  unchanged since the last build');
        record('client build', 1, 0, (performance.now() - t) / 1000);
      } catch (err) {
        console.error(`  ${err.message}`);
        record('client build', 0, 1, (performance.now() - t) / 1000);
        built = false;
      }
    });

    await typeCheck('types: server, shared, database, tests', 'tsconfig.json');
    await typeCheck('types: client app', 'client/tsconfig.app.json');
    await typeCheck('types: client tests', 'client/tsconfig.spec.json');
    await lint('lint: ESLint', 'eslint', ['--max-warnings', '0', '.']);
    await lint('format: Prettier', 'prettier', ['--check', '--log-level', 'warn', '.']);
    await jestSuite('shared');
    await jestSuite('reference');
    await jestSuite('server');
    await jestSuite('client');
    if (built) await jestSuite('browser', ['--runInBand']);
    else record('browser', 0, 1, 0, 'not run: the client build failed');
  } finally {
    if (cluster.release()) console.log('test cluster stopped');
  }

  const passed = rows.reduce((s, r) => s + r.passed, 0);
  const failed = rows.reduce((s, r) => s + r.failed, 0);
  const w = Math.max(...rows.map((r) => r.suite.length));
  console.log('\n══ Summary');
  for (const r of rows) {
    const mark = r.failed ? '✗' : '✓';
    console.log(
      `${mark} ${r.suite.padEnd(w)}  ${String(r.passed).padStart(5)} passed  ${String(r.failed).padStart(3)} failed  ${r.seconds.toFixed(1).padStart(6)} s${r.note ? `  (${r.note})` : ''}`,
    );
  }
  if (failures.length) {
    console.log('\n══ Failed');
    for (const f of failures) console.log(`✗ ${f}`);
  }
  console.log(`total time ${((performance.now() - t0) / 1000).toFixed(0)} s`);
  console.log(`${passed} passed, ${failed} failed`);
  process.exitCode = failed ? 1 : 0;
}

main().catch((err) => {
  if (interrupted) return;
  console.error(`\nnpm test could not run: ${err.stack ?? err.message}`);
  const passed = rows.reduce((s, r) => s + r.passed, 0);
  const failed = rows.reduce((s, r) => s + r.failed, 0) + 1;
  console.log(`${passed} passed, ${failed} failed`);
  process.exitCode = 1;
});
