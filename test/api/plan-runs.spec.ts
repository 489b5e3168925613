/**
 * Paths of a proposal's plan runs that no other test covers:
 * - editing a draft after its call closed (409 not_editable, nothing written);
 * - target inputs changing while a plan run is in progress (its result is not stored as current: the run ends queued, a job is queued);
 * - a plan job that fails while writing (the run records the error, the API reports it, no partial plans);
 * - the worker queuing again, when it starts, the runs left queued or running.
 *
 * `computePlanRows` and `runPlanJob` are wrapped (jest.mock) so that a test can act between
 * the computation and the write, make the write fail, or keep the in-process worker away from
 * runs of other suites that share the test database; by default both call the real code.
 */
import type { Knex } from 'knex';
import type { Logger } from 'pino';
import type { PlanInputs } from '../../server/src/features/proposals/plans/plan-inputs';
import type { PlanRowInsert } from '../../server/src/features/proposals/plans/plan-repository';
import { computeAndStoreProposalPlans, runPlanJob } from '../../server/src/features/proposals/plans/plan-service';
import { startPlanWorker } from '../../server/src/jobs/plan-worker';
import type { PlanQueue } from '../../server/src/jobs/plan-queue';
import { startHarness, type Browser, type Harness } from '../support/api-harness';
import {
  countRows,
  createTestNetwork,
  CSV_HEADER,
  csvLine,
  makeReady,
  proposerWithDraft,
  target,
  tinyPdf,
  uploadFile,
  type TestNetwork,
} from './support/proposal-kit';

type ComputeRows = (inputs: PlanInputs, onTargetDone?: (done: number) => Promise<void> | void) => Promise<PlanRowInsert[]>;
/** When set, wraps the next computations: gets the real rows and returns what the write will get. */
let afterCompute: ((rows: PlanRowInsert[], inputs: PlanInputs) => Promise<PlanRowInsert[]>) | null = null;
/** When set, the plan job of the worker runs only for these proposals (others complete untouched). */
let jobsFor: Set<number> | null = null;

jest.mock('../../server/src/features/proposals/plans/plan-computation', () => {
  const actual = jest.requireActual('../../server/src/features/proposals/plans/plan-computation');
  return {
    ...actual,
    computePlanRows: async (...args: Parameters<ComputeRows>) => {
      const rows = await (actual.computePlanRows as ComputeRows)(...args);
      return afterCompute ? afterCompute(rows, args[0]) : rows;
    },
  };
});
jest.mock('../../server/src/features/proposals/plans/plan-service', () => {
  const actual = jest.requireActual('../../server/src/features/proposals/plans/plan-service');
  return {
    ...actual,
    runPlanJob: (db: Knex, proposalId: number, logger: Logger) =>
      jobsFor && !jobsFor.has(proposalId) ? Promise.resolve() : actual.runPlanJob(db, proposalId, logger),
  };
});

const QUEUE = 'proposal-plans-runs-test';
let h: Harness;
let net: TestNetwork;
const emptyQueue = () => h.created.ctx.db.raw('DELETE FROM pgboss.job WHERE name = ?', [QUEUE]).catch(() => undefined);

beforeAll(async () => {
  h = await startHarness({ PLAN_QUEUE: QUEUE, PLAN_WORKER_POLL_SECONDS: 0.5 });
  net = await createTestNetwork(h, 'PR');
  await emptyQueue();
});
afterEach(() => {
  afterCompute = null;
  jobsFor = null;
  h.created.ctx.now = () => new Date();
});
afterAll(async () => {
  await emptyQueue();
  await net.cleanUp();
  await h.close();
});

interface PlansBody {
  run: { state: string; total: number; done: number; error: string | null; current: boolean; finishedAt: string | null };
  plans: { targetId: number; nodeId: number; nodeHours: number }[];
  errors: unknown[];
}
const plansOf = async (b: Browser, id: number): Promise<PlansBody> => {
  const res = await b.get(`/api/proposals/${id}/plans`);
  expect(res.status).toBe(200);
  return res.body;
};
const storedPlans = (id: number) =>
  h.created.ctx
    .db('target_plans')
    .where({ proposal_id: id })
    .orderBy(['target_id', 'node_id'])
    .select('target_id', 'node_id', 'inputs_hash', 'node_hours');
const jobsOf = async (id: number): Promise<string[]> =>
  (await h.created.ctx.db.raw('SELECT state FROM pgboss.job WHERE name = ? AND singleton_key = ?', [QUEUE, String(id)])).rows.map(
    (r: { state: string }) => r.state,
  );

describe('editing a draft after its call closed', () => {
  it('every edit route answers 409 not_editable naming the closing instant, writes nothing; reads still answer 200', async () => {
    const cycle = await net.createCycle({ closesInMs: 2 * 86400_000 });
    const { browser: pi, proposal } = await proposerWithDraft(h, cycle.id, 'Late edits');
    await makeReady(h, pi, proposal.id, [net.nodeIds[0]]);
    const base = `/api/proposals/${proposal.id}`;
    const before = (await pi.get(base)).body;
    const [t] = (await pi.get(`${base}/targets`)).body;
    const targetsBefore = await countRows(h, 'targets', { proposal_id: proposal.id });
    const plansBefore = await storedPlans(proposal.id);
    const deadline = `${cycle.callClosesAt.toISOString().slice(0, 10)} ${cycle.callClosesAt.toISOString().slice(11, 19)} UTC`;

    h.created.ctx.now = () => new Date(cycle.callClosesAt.getTime() + 60_000);
    expect((await pi.get(base)).body.editable).toBe(false);
    const attempts: [string, () => Promise<{ status: number; body: { code?: string; message?: string } }>][] = [
      ['PATCH', () => pi.patch(base, { version: before.version, title: 'Changed too late' })],
      ['PATCH nodes', () => pi.patch(base, { version: before.version, nodeIds: [net.nodeIds[0], net.nodeIds[1]] })],
      ['POST target', () => pi.post(`${base}/targets`, target())],
      ['PUT target', () => pi.put(`${base}/targets/${t.id}`, { version: t.version, target: target({ magnitude: 9 }) })],
      ['DELETE target', () => pi.delete(`${base}/targets/${t.id}`)],
      [
        'upload targets',
        () => uploadFile(pi, 'post', `${base}/targets/upload`, [CSV_HEADER, csvLine('Star LATE-1')].join('\n'), 'late.csv'),
      ],
      ['PUT justification', () => uploadFile(pi, 'put', `${base}/justification`, tinyPdf('late'), 'late.pdf')],
      ['POST member', () => pi.post(`${base}/members`, { email: 'late-invitee@test.example' })],
      ['recompute', () => pi.post(`${base}/plans/recompute`)],
    ];
    for (const [name, attempt] of attempts) {
      const res = await attempt();
      expect({ name, status: res.status, code: res.body.code }).toEqual({ name, status: 409, code: 'not_editable' });
      expect(res.body.message).toContain(`closed at ${deadline}`);
    }
    const submit = await pi.post(`${base}/submit`);
    expect({ status: submit.status, code: submit.body.code }).toEqual({ status: 422, code: 'call_closed' });

    const after = (await pi.get(base)).body;
    expect({ version: after.version, title: after.title, state: after.state }).toEqual({
      version: before.version,
      title: before.title,
      state: 'draft',
    });
    expect(await countRows(h, 'targets', { proposal_id: proposal.id })).toBe(targetsBefore);
    expect(await storedPlans(proposal.id)).toEqual(plansBefore);
    for (const path of ['', '/targets', '/targets.csv', '/plans', '/readiness', '/justification', '/summary.pdf']) {
      expect({ path, status: (await pi.get(`${base}${path}`)).status }).toEqual({ path, status: 200 });
    }
    // Deleting is not an edit: deleteProposal documents "the PI deletes a draft" (no call check), and the page offers it.
    expect((await pi.delete(base)).status).toBe(204);
  });
});

describe('target inputs changing while a plan run is in progress', () => {
  it('the run ends queued with a job queued, GET /plans says not current; the next run makes them current', async () => {
    const { browser: pi, proposal } = await proposerWithDraft(h, net.cycleId, 'Edited while computing');
    await makeReady(h, pi, proposal.id, [net.nodeIds[0], net.nodeIds[2]]);
    expect((await plansOf(pi, proposal.id)).run).toMatchObject({ state: 'idle', current: true });
    const [t] = (await pi.get(`/api/proposals/${proposal.id}/targets`)).body;
    await emptyQueue();

    let during: PlansBody | undefined;
    afterCompute = async (rows) => {
      afterCompute = null;
      during = await plansOf(pi, proposal.id);
      // A co-worker changes the magnitude while the plans are being computed.
      const edit = await pi.put(`/api/proposals/${proposal.id}/targets/${t.id}`, {
        version: t.version,
        target: { ...target({ name: t.name }), magnitude: 9.5 },
      });
      expect(edit.status).toBe(200);
      return rows;
    };
    const result = await computeAndStoreProposalPlans(h.created.ctx.db, proposal.id);
    expect(result).not.toBeNull();
    expect(during!.run.state).toBe('running');

    const after = await plansOf(pi, proposal.id);
    expect(after.run).toMatchObject({ state: 'queued', current: false, error: null });
    // The edit queued exactly the job that will compute the plans again.
    expect(await jobsOf(proposal.id)).toEqual(['created']);
    const readiness = (await pi.get(`/api/proposals/${proposal.id}/readiness`)).body;
    expect(readiness.ready).toBe(false);

    await computeAndStoreProposalPlans(h.created.ctx.db, proposal.id);
    expect((await plansOf(pi, proposal.id)).run).toMatchObject({ state: 'idle', current: true });
    await emptyQueue();
  }, 30_000);
});

describe('a plan job that fails', () => {
  it('records the error on the run, GET /plans reports it, and the write is all or nothing (the previous plans stay, none half-replaced)', async () => {
    const { browser: pi, proposal } = await proposerWithDraft(h, net.cycleId, 'Failing job');
    expect((await pi.patch(`/api/proposals/${proposal.id}`, { version: 1, nodeIds: net.nodeIds })).status).toBe(200);
    // 34 targets on 3 nodes: 102 rows, more than one insert statement (100 rows each).
    const lines = Array.from({ length: 34 }, (_, i) =>
      csvLine(`Star F-${i + 1}`, { ra: (150 + i * 0.4).toFixed(2), magnitude: (10 + (i % 5)).toFixed(1) }),
    );
    expect(
      (await uploadFile(pi, 'post', `/api/proposals/${proposal.id}/targets/upload`, [CSV_HEADER, ...lines].join('\n'), 'f.csv')).status,
    ).toBe(200);
    await computeAndStoreProposalPlans(h.created.ctx.db, proposal.id);
    const good = await storedPlans(proposal.id);
    expect(good).toHaveLength(102);
    const [first] = (await pi.get(`/api/proposals/${proposal.id}/targets`)).body;
    expect(
      (
        await pi.put(`/api/proposals/${proposal.id}/targets/${first.id}`, {
          version: first.version,
          target: { ...target({ name: first.name }), magnitude: 11.5 },
        })
      ).status,
    ).toBe(200);

    // The last row breaks a database rule, after the first 100 rows were inserted.
    afterCompute = async (rows) => {
      const last = rows[rows.length - 1];
      if (!last.result) throw new Error('expected a computed plan in the last row');
      const broken: PlanRowInsert = { targetId: last.targetId, nodeId: last.nodeId, result: { ...last.result, nodeHours: -1 } };
      return [...rows.slice(0, -1), broken];
    };
    const logger = h.created.ctx.logger;
    await expect(runPlanJob(h.created.ctx.db, proposal.id, logger)).rejects.toThrow(/target_plans_hours_check/);

    const body = await plansOf(pi, proposal.id);
    expect(body.run).toMatchObject({
      state: 'failed',
      current: false,
      error: expect.stringContaining('The plan computation failed unexpectedly'),
    });
    expect(body.run.finishedAt ?? null).not.toBeNull();
    expect(await storedPlans(proposal.id)).toEqual(good);
    expect(new Set(good.map((r: { inputs_hash: string }) => r.inputs_hash)).size).toBe(1);
    const readiness = (await pi.get(`/api/proposals/${proposal.id}/readiness`)).body;
    expect(readiness.ready).toBe(false);

    // Asking again clears the error; the next run stores the plans and makes them current.
    afterCompute = null;
    const again = await pi.post(`/api/proposals/${proposal.id}/plans/recompute`);
    expect(again.status).toBe(202);
    expect(again.body).toMatchObject({ state: 'queued', error: null });
    await runPlanJob(h.created.ctx.db, proposal.id, logger);
    const fixed = await plansOf(pi, proposal.id);
    expect(fixed.run).toMatchObject({ state: 'idle', current: true, error: null });
    expect(await storedPlans(proposal.id)).toHaveLength(102);
    await emptyQueue();
  }, 90_000);
});

describe('the worker at start', () => {
  it('queues again the runs left queued (queue unreachable) or running (a worker that stopped), and computes them', async () => {
    await emptyQueue();
    // A web process that could not reach the queue: the change commits, the run stays queued.
    const original = h.created.ctx.planQueue;
    const down: PlanQueue = { enqueue: async () => Promise.reject(new Error('queue unreachable')), close: async () => undefined };
    h.created.ctx.planQueue = down;
    let queuedId: number;
    let runningId: number;
    let pi: Browser;
    let piB: Browser;
    try {
      const a = await proposerWithDraft(h, net.cycleId, 'Left queued');
      pi = a.browser;
      queuedId = a.proposal.id;
      expect((await pi.patch(`/api/proposals/${queuedId}`, { version: 1, nodeIds: [net.nodeIds[0]] })).status).toBe(200);
      expect((await pi.post(`/api/proposals/${queuedId}/targets`, target())).status).toBe(201);
      const b = await proposerWithDraft(h, net.cycleId, 'Left running');
      runningId = b.proposal.id;
      expect((await b.browser.patch(`/api/proposals/${runningId}`, { version: 1, nodeIds: [net.nodeIds[2]] })).status).toBe(200);
      expect((await b.browser.post(`/api/proposals/${runningId}/targets`, target())).status).toBe(201);
      // A worker took it and stopped half-way.
      await h.created.ctx
        .db('plan_runs')
        .where({ proposal_id: runningId })
        .update({ state: 'running', total: 1, done: 0, started_at: new Date() });
      piB = b.browser;
    } finally {
      h.created.ctx.planQueue = original;
    }
    expect((await plansOf(pi, queuedId)).run).toMatchObject({ state: 'queued', current: false });
    expect((await plansOf(piB, runningId)).run).toMatchObject({ state: 'running', current: false });
    expect(await jobsOf(queuedId)).toEqual([]);
    expect(await jobsOf(runningId)).toEqual([]);

    // Only this test's runs are computed (other suites' runs in the shared database are left alone).
    jobsFor = new Set([queuedId, runningId]);
    const worker = await startPlanWorker({ config: h.created.ctx.config, db: h.created.ctx.db, logger: h.created.ctx.logger });
    try {
      // The worker queued every unfinished run of the database; this test waits for its own two only.
      expect(await jobsOf(queuedId)).toHaveLength(1);
      expect(await jobsOf(runningId)).toHaveLength(1);
      await h.created.ctx.db.raw("DELETE FROM pgboss.job WHERE name = ? AND state = 'created' AND singleton_key NOT IN (?, ?)", [
        QUEUE,
        String(queuedId),
        String(runningId),
      ]);
      const until = Date.now() + 45_000;
      let a: PlansBody | undefined;
      let b: PlansBody | undefined;
      while (Date.now() < until) {
        [a, b] = [await plansOf(pi, queuedId), await plansOf(piB, runningId)];
        if (a.run.state === 'idle' && b.run.state === 'idle') break;
        await new Promise((r) => setTimeout(r, 200));
      }
      expect(a!.run).toMatchObject({ state: 'idle', current: true, total: 1, done: 1 });
      expect(b!.run).toMatchObject({ state: 'idle', current: true, total: 1, done: 1 });
      expect(a!.plans).toHaveLength(1);
      expect(b!.plans).toHaveLength(1);
    } finally {
      await worker.stop(5000);
    }
    expect(await jobsOf(queuedId)).toContain('completed');
    expect(await jobsOf(runningId)).toContain('completed');
    await emptyQueue();
  }, 90_000);
});
