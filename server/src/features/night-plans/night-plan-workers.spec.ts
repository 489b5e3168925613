/**
 * Two real worker processes (server/src/worker.ts) on one night-plan queue of their own share a
 * build of six node jobs: every node job is done exactly once, both processes do some, and the
 * build ends done. The workers run with PLAN_WORKER=off, so that they never pick up (or queue
 * again) the target-plan runs that other suites leave unfinished in the shared test database,
 * and with a PLAN_QUEUE of their own in any case. Which process did which job comes from their
 * log lines ("night plan node job done", with the process id).
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import path from 'node:path';
import { startHarness, type Harness } from '../../../../test/support/api-harness';
import { createTestNetwork, type TestNetwork } from '../../../../test/api/support/proposal-kit';
import { account, browserFor } from '../awards/testing/award-fixtures';
import { createNightPlanFixture, type NightPlanFixture } from './testing/night-plan-fixtures';

const root = path.resolve(__dirname, '../../../..');
const queueName = `night-plans-test-${randomUUID().slice(0, 8)}`;
const planQueueName = `plans-test-${randomUUID().slice(0, 8)}`;

let h: Harness;
const nets: TestNetwork[] = [];
let f: NightPlanFixture;
const workers: { child: ChildProcess; lines: string[]; id: string }[] = [];

function startWorker(): Promise<void> {
  const id = randomUUID();
  const child = spawn(process.execPath, ['--import', 'tsx', path.join(root, 'server/src/worker.ts')], {
    cwd: root,
    env: {
      ...process.env,
      NIGHT_PLAN_QUEUE: queueName,
      PLAN_QUEUE: planQueueName,
      PLAN_WORKER: 'off',
      PLAN_WORKER_POLL_SECONDS: '0.5',
      LOG_LEVEL: 'info',
      SPINCYCLE_INSTANCE_ID: id,
    },
    stdio: ['ignore', 'pipe', 'pipe', 'ipc'],
  });
  const w = { child, lines: [] as string[], id };
  workers.push(w);
  let rest = '';
  child.stdout!.on('data', (chunk: Buffer) => {
    const parts = (rest + chunk.toString('utf8')).split('\n');
    rest = parts.pop() ?? '';
    w.lines.push(...parts);
  });
  const errors: string[] = [];
  child.stderr!.on('data', (chunk: Buffer) => errors.push(chunk.toString('utf8')));
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error('a night-plan worker did not report ready within 60 s')), 60_000);
    child.on('message', (m: { type?: string; instanceId?: string }) => {
      if (m.type === 'ready' && m.instanceId === id) {
        clearTimeout(timer);
        resolve();
      }
    });
    child.once('exit', (code) => {
      clearTimeout(timer);
      reject(
        new Error(`a night-plan worker exited (code ${code}) before it was ready:\n${[...w.lines, ...errors].join('\n').slice(-2000)}`),
      );
    });
  });
}

beforeAll(async () => {
  h = await startHarness({ NIGHT_PLAN_QUEUE: queueName, PLAN_QUEUE: planQueueName });
  nets.push(await createTestNetwork(h, 'NW'), await createTestNetwork(h, 'NW'));
  const nodes = nets.flatMap((n) => n.nodes);
  // Six nodes, a program on each (three targets), and one on two nodes.
  f = await createNightPlanFixture(h, nets[0], {
    nodes,
    programs: nodes.map((_, k) => ({ targets: 3, hours: nodes.map((__, j) => (j === k || (k === 0 && j === 1) ? 6 : 0)) })),
  });
  await Promise.all([startWorker(), startWorker()]);
}, 180_000);

afterAll(async () => {
  for (const w of workers) {
    w.child.channel?.unref();
    w.child.kill('SIGTERM');
  }
  await Promise.all(
    workers.map((w) => new Promise((resolve) => (w.child.exitCode !== null ? resolve(null) : w.child.once('exit', resolve)))),
  );
  await h.created.ctx.db.raw('DELETE FROM pgboss.job WHERE name IN (?, ?)', [queueName, planQueueName]).catch(() => undefined);
  for (const n of nets) await n.cleanUp();
  await h.close();
}, 60_000);

it('shares a build’s node jobs between two worker processes, each job done exactly once', async () => {
  const manager = await browserFor(h, await account(h, ['facility_manager'], 'Night Worker Manager'));
  const res = await manager.post(`/api/night-plans/cycles/${f.cycleId}/builds`);
  expect(res.status).toBe(202);
  const buildId = res.body.id as number;

  const deadline = Date.now() + 240_000;
  let build = await h.created.ctx.db('night_plan_builds').where('id', buildId).first();
  while (!['done', 'failed'].includes(build.state) && Date.now() < deadline) {
    await new Promise((r) => setTimeout(r, 500));
    build = await h.created.ctx.db('night_plan_builds').where('id', buildId).first();
  }
  expect(build).toEqual(expect.objectContaining({ state: 'done', node_jobs: 6, node_jobs_finished: 6, error: null }));
  expect(build.done).toBe(build.total);

  const doneBy = workers.map((w) =>
    w.lines
      .filter((l) => l.startsWith('{'))
      .map((l) => JSON.parse(l) as { msg?: string; buildId?: number; nodeId?: number; pid?: number })
      .filter((l) => l.msg === 'night plan node job done' && l.buildId === buildId),
  );
  const nodesDone = doneBy.flat().map((l) => l.nodeId);
  expect([...nodesDone].sort()).toEqual([...f.nodeIds].sort());
  expect(new Set(nodesDone).size).toBe(6);
  // Both processes took jobs; each line names its own process.
  doneBy.forEach((lines, i) => {
    expect(lines.length).toBeGreaterThan(0);
    for (const l of lines) expect(l.pid).toBe(workers[i].child.pid);
  });
  // PLAN_WORKER=off: neither process started the target-plan worker (which would queue again
  // the plan runs other suites leave unfinished), both started the night-plan worker.
  for (const w of workers) {
    expect(w.lines.some((l) => l.includes('"msg":"night-plan worker ready"'))).toBe(true);
    expect(w.lines.some((l) => l.includes('"msg":"plan worker ready"') || l.includes('unfinished plan runs'))).toBe(false);
  }
  // pg-boss agrees: six jobs of this build, all completed.
  const jobs = await h.created.ctx.db.raw("SELECT state, data FROM pgboss.job WHERE name = ? AND (data->>'buildId')::int = ?", [
    queueName,
    buildId,
  ]);
  expect(jobs.rows).toHaveLength(6);
  expect(jobs.rows.every((j: { state: string }) => j.state === 'completed')).toBe(true);
  // Each node's visits were written by this build.
  const perNode = await h.created.ctx.db('night_plan_targets').where('cycle_id', f.cycleId).groupBy('node_id').select('node_id');
  expect(perNode).toHaveLength(6);
}, 300_000);
