// `npm test`: the same set-up as `npm start` on separate databases, then every suite:
// type checks, shared (science core), reference (outside oracles), server (API against the
// real PostgreSQL), client (Angular unit tests) and browser (Debian's chromium). Ends with
// one line `N passed, N failed` summed over all suites; exits non-zero on any failure.
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { bringUpCluster } from '../database/cluster.mjs';
import { ensureDebianPackages, fileExists, pythonModule } from '../server/scripts/debian-packages.mjs';
import { ensureClientBuild, ensureDependencies, projectDir, setUpDatabase, step } from '../server/scripts/setup.mjs';

const TEST_DB = process.env.SPINCYCLE_TEST_DB ?? 'spincycle_test';
const E2E_DB = process.env.SPINCYCLE_E2E_DB ?? 'spincycle_e2e';
const resultsDir = join(projectDir, '.data', 'test-results');
const bin = (name) => join(projectDir, 'node_modules', '.bin', name);

/** @type {{ suite: string, passed: number, failed: number, seconds: number, note?: string }[]} */
const rows = [];

function record(suite, passed, failed, seconds, note) {
  rows.push({ suite, passed, failed, seconds, note });
}

function typeCheck(label, project) {
  const t0 = performance.now();
  console.log(`\n── ${label} (tsc --noEmit -p ${project})`);
  const r = spawnSync(bin('tsc'), ['--noEmit', '-p', project], { cwd: projectDir, stdio: 'inherit' });
  const ok = r.status === 0;
  if (ok) console.log('   no type errors');
  record(label, ok ? 1 : 0, ok ? 0 : 1, (performance.now() - t0) / 1000);
}

function jestSuite(project, extraArgs = []) {
  const t0 = performance.now();
  const out = join(resultsDir, `${project}.json`);
  rmSync(out, { force: true });
  console.log(`\n── ${project} suite (jest --selectProjects ${project})`);
  const r = spawnSync(bin('jest'), ['--selectProjects', project, '--json', `--outputFile=${out}`, '--ci', ...extraArgs], {
    cwd: projectDir,
    stdio: 'inherit',
    env: { ...process.env, SPINCYCLE_TEST_DB: TEST_DB, SPINCYCLE_E2E_DB: E2E_DB, FORCE_COLOR: process.env.FORCE_COLOR ?? '1' },
  });
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
  // Durability off only if this run starts the cluster (a running `npm start` keeps its own).
  const cluster = await step('PostgreSQL', () => bringUpCluster({ fast: true, log: (m) => console.log(`  ${m}`) }));
  try {
    await step(`databases ${TEST_DB} (empty) and ${E2E_DB} (demo data), fresh`, () => {
      cluster.ensureDatabase(TEST_DB, { fresh: true });
      setUpDatabase(TEST_DB);
      cluster.ensureDatabase(E2E_DB, { fresh: true });
      setUpDatabase(E2E_DB, '--seed');
    });

    let built = true;
    await step('client production build', () => {
      const t = performance.now();
      try {
        if (!ensureClientBuild()) console.log('  unchanged since the last build');
        record('client build', 1, 0, (performance.now() - t) / 1000);
      } catch (err) {
        console.error(`  ${err.message}`);
        record('client build', 0, 1, (performance.now() - t) / 1000);
        built = false;
      }
    });

    typeCheck('types: server, shared, database, tests', 'tsconfig.json');
    typeCheck('types: client app', 'client/tsconfig.app.json');
    typeCheck('types: client tests', 'client/tsconfig.spec.json');
    jestSuite('shared');
    jestSuite('reference');
    jestSuite('server');
    jestSuite('client');
    if (built) jestSuite('browser', ['--runInBand']);
    else record('browser', 0, 1, 0, 'not run: the client build failed');
  } finally {
    cluster.stop();
  }

  const passed = rows.reduce((s, r) => s + r.passed, 0);
  const failed = rows.reduce((s, r) => s + r.failed, 0);
  const w = Math.max(...rows.map((r) => r.suite.length));
  console.log('\n══ Summary');
  for (const r of rows) {
    const mark = r.failed ? '✗' : '✓';
    console.log(`${mark} ${r.suite.padEnd(w)}  ${String(r.passed).padStart(5)} passed  ${String(r.failed).padStart(3)} failed  ${r.seconds.toFixed(1).padStart(6)} s${r.note ? `  (${r.note})` : ''}`);
  }
  console.log(`total time ${((performance.now() - t0) / 1000).toFixed(0)} s`);
  console.log(`${passed} passed, ${failed} failed`);
  process.exitCode = failed ? 1 : 0;
}

main().catch((err) => {
  console.error(`\nnpm test could not run: ${err.stack ?? err.message}`);
  const passed = rows.reduce((s, r) => s + r.passed, 0);
  const failed = rows.reduce((s, r) => s + r.failed, 0) + 1;
  console.log(`${passed} passed, ${failed} failed`);
  process.exitCode = 1;
});
