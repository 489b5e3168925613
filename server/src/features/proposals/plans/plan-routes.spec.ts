import { PLAN_TABLE_QUANTITIES } from '@spincycle/shared/proposals/plan-types';
import { startPlanWorker } from '../../../jobs/plan-worker';
import { startHarness, type Harness } from '../../../../../test/support/api-harness';
import {
  createTestNetwork,
  CSV_HEADER,
  proposerWithDraft,
  target,
  uploadFile,
  type TestNetwork,
} from '../../../../../test/api/support/proposal-kit';
import { computeAndStoreProposalPlans, PROGRESS_EVERY_TARGETS } from './plan-service';

let h: Harness;
let net: TestNetwork;
beforeAll(async () => {
  h = await startHarness();
  net = await createTestNetwork(h, 'PL');
});
afterAll(async () => {
  await net.cleanUp();
  await h.close();
});

const TARGET_PLAN_ROW_KEYS = [
  'targetId',
  'targetName',
  'nodeId',
  'nodeCode',
  'feasible',
  'reasons',
  'suggestions',
  'skyVerdict',
  'periodDays',
  'shortestPeriodDays',
  'longestPeriodDays',
  'amplitudePpm',
  'perVisitPrecisionPpm',
  'exposureSeconds',
  'visits',
  'completeness',
  'visitsPerNight',
  'cadenceDays',
  'baselineDays',
  'usableNights',
  'nodeHours',
  'feeMinor',
  'currency',
  'why',
  'flags',
  'relationLabel',
].sort();

async function draftWithTargets(names: string[], nodeIds = [net.nodeIds[0], net.nodeIds[2]], extra: Parameters<typeof target>[0] = {}) {
  const d = await proposerWithDraft(h, net.cycleId, 'Plans');
  expect((await d.browser.patch(`/api/proposals/${d.proposal.id}`, { version: 1, nodeIds })).status).toBe(200);
  for (const name of names)
    expect((await d.browser.post(`/api/proposals/${d.proposal.id}/targets`, target({ name, ...extra }))).status).toBe(201);
  return d;
}

describe('plan service called in-process', () => {
  it('stores one plan per target and node with every field filled; GET shows the run current and done = total', async () => {
    const { browser, proposal } = await draftWithTargets(['Star P-1', 'Star P-2', 'Star P-3']);
    const before = (await browser.get(`/api/proposals/${proposal.id}/plans`)).body;
    expect(before.run).toMatchObject({ state: 'queued', current: false });
    const result = await computeAndStoreProposalPlans(h.created.ctx.db, proposal.id);
    expect(result).toMatchObject({ targets: 3, nodes: 2, plans: 6, errors: 0 });

    const res = await browser.get(`/api/proposals/${proposal.id}/plans`);
    expect(res.status).toBe(200);
    expect(res.body.run).toEqual({
      state: 'idle',
      total: 3,
      done: 3,
      startedAt: expect.any(String),
      finishedAt: expect.any(String),
      error: null,
      current: true,
    });
    expect(res.body.errors).toEqual([]);
    expect(res.body.plans).toHaveLength(6);
    const first = res.body.plans[0];
    expect(Object.keys(first).sort()).toEqual(TARGET_PLAN_ROW_KEYS);
    expect(first).toMatchObject({
      targetName: 'Star P-1',
      currency: 'eur',
      relationLabel: expect.any(String),
      skyVerdict: expect.stringMatching(/\d+ of 60 nights can hold the/),
    });
    for (const key of [
      'periodDays',
      'shortestPeriodDays',
      'longestPeriodDays',
      'amplitudePpm',
      'perVisitPrecisionPpm',
      'exposureSeconds',
      'visits',
      'visitsPerNight',
      'cadenceDays',
      'baselineDays',
      'nodeHours',
    ]) {
      expect(Number.isFinite(first[key]) && first[key] > 0).toBe(true);
    }
    expect(Number.isInteger(first.feeMinor)).toBe(true);
    expect(first.shortestPeriodDays).toBeLessThan(first.periodDays);
    expect(first.longestPeriodDays).toBeGreaterThan(first.periodDays);
    // The list carries the why lines of the table's numbers; the explanation carries every number.
    expect(Object.keys(first.why).sort()).toEqual([...PLAN_TABLE_QUANTITIES].sort());
    const explained = await browser.get(`/api/proposals/${proposal.id}/targets/${first.targetId}/plan?nodeId=${first.nodeId}`);
    expect(explained.status).toBe(200);
    expect(explained.body).toMatchObject({
      targetId: first.targetId,
      nodeId: first.nodeId,
      targetName: 'Star P-1',
      currency: 'eur',
      relationLabel: first.relationLabel,
    });
    expect(explained.body.quantities.periodDays).toEqual({
      value: first.periodDays,
      unit: 'd',
      why: first.why.periodDays,
      source: expect.any(String),
      tag: expect.any(String),
    });
    expect(explained.body.quantities.nodeHours.value).toBe(first.nodeHours);
    expect(Object.keys(explained.body.quantities).length).toBeGreaterThan(30);
    // Not computed (another node of the cycle, not requested) → 404.
    expect((await browser.get(`/api/proposals/${proposal.id}/targets/${first.targetId}/plan?nodeId=${net.nodeIds[1]}`)).status).toBe(404);
    // Ordered by list position, then node code.
    expect(res.body.plans.map((p: { targetName: string }) => p.targetName)).toEqual([
      'Star P-1',
      'Star P-1',
      'Star P-2',
      'Star P-2',
      'Star P-3',
      'Star P-3',
    ]);

    // The proposal's request sums the plans per node.
    const proposalBody = (await browser.get(`/api/proposals/${proposal.id}`)).body;
    for (const r of proposalBody.request) {
      const onNode = res.body.plans.filter((p: { nodeId: number }) => p.nodeId === r.nodeId);
      expect(r.targets).toBe(3);
      expect(r.nodeHours).toBeCloseTo(
        onNode.reduce((s: number, p: { nodeHours: number }) => s + p.nodeHours, 0),
        6,
      );
      expect(r.feeMinor).toBe(onNode.reduce((s: number, p: { feeMinor: number }) => s + p.feeMinor, 0));
      expect(r.infeasibleTargets).toBe(onNode.filter((p: { feasible: boolean }) => !p.feasible).length);
    }
    const summary = (await browser.get('/api/proposals')).body[0];
    expect(summary.requestedNodeHours).toBeCloseTo(
      proposalBody.request.reduce((s: number, r: { nodeHours: number }) => s + r.nodeHours, 0),
      6,
    );
  });

  it('stores a target the science core refuses as an error row, not a failed run', async () => {
    const { browser, proposal } = await draftWithTargets(['Star P-ok']);
    // BP−RP 5.5 is within the form's range but outside every gyrochronology relation.
    await browser.post(`/api/proposals/${proposal.id}/targets`, target({ name: 'Star P-red', colour: 5.5 }));
    await computeAndStoreProposalPlans(h.created.ctx.db, proposal.id);
    const res = (await browser.get(`/api/proposals/${proposal.id}/plans`)).body;
    expect(res.run).toMatchObject({ state: 'idle', current: true, error: null });
    expect(res.plans.map((p: { targetName: string }) => p.targetName)).toEqual(['Star P-ok', 'Star P-ok']);
    expect(res.errors).toEqual([
      {
        targetId: expect.any(Number),
        nodeId: expect.any(Number),
        message: expect.stringMatching(/^target\.colour\.value: BP−RP 5\.5 is outside all supported relations/),
      },
      expect.objectContaining({ message: expect.stringContaining('BP−RP 5.5') }),
    ]);
    const readiness = (await browser.get(`/api/proposals/${proposal.id}/readiness`)).body;
    expect(readiness.problems).toContainEqual({ field: 'plans', message: expect.stringMatching(/2 target plans could not be computed/) });
  });

  it('marks the plans stale when a target changes, and current again after the next computation', async () => {
    const { browser, proposal } = await draftWithTargets(['Star P-4']);
    await computeAndStoreProposalPlans(h.created.ctx.db, proposal.id);
    const [t] = (await browser.get(`/api/proposals/${proposal.id}/targets`)).body;
    await browser.put(`/api/proposals/${proposal.id}/targets/${t.id}`, {
      version: t.version,
      target: target({ name: 'Star P-4', ageMyr: 2000 }),
    });
    expect((await browser.get(`/api/proposals/${proposal.id}/plans`)).body.run).toMatchObject({ state: 'queued', current: false });
    // Renaming changes no number: the stored plans stay current.
    await computeAndStoreProposalPlans(h.created.ctx.db, proposal.id);
    const [t2] = (await browser.get(`/api/proposals/${proposal.id}/targets`)).body;
    await browser.put(`/api/proposals/${proposal.id}/targets/${t2.id}`, {
      version: t2.version,
      target: target({ name: 'Star P-4 renamed', ageMyr: 2000 }),
    });
    expect((await browser.get(`/api/proposals/${proposal.id}/plans`)).body.run.current).toBe(true);
  });

  it('a completeness change marks the plans stale and queues a run, like a target change; the next computation makes them current', async () => {
    const { browser, proposal } = await draftWithTargets(['Star P-c']);
    await computeAndStoreProposalPlans(h.created.ctx.db, proposal.id);
    expect((await browser.get(`/api/proposals/${proposal.id}/plans`)).body.run).toMatchObject({ state: 'idle', current: true });
    const enqueue = jest.spyOn(h.created.ctx.planQueue, 'enqueue');
    try {
      const { version } = (await browser.get(`/api/proposals/${proposal.id}`)).body;
      const res = await browser.patch(`/api/proposals/${proposal.id}`, { version, completeness: 0.75 });
      expect(res.status).toBe(200);
      expect(enqueue).toHaveBeenCalledWith(proposal.id);
      expect((await browser.get(`/api/proposals/${proposal.id}/plans`)).body.run).toMatchObject({ state: 'queued', current: false });
      // A refused completeness queues nothing.
      enqueue.mockClear();
      expect((await browser.patch(`/api/proposals/${proposal.id}`, { version: res.body.version, completeness: 0.3 })).status).toBe(400);
      expect(enqueue).not.toHaveBeenCalled();
    } finally {
      enqueue.mockRestore();
    }
    await computeAndStoreProposalPlans(h.created.ctx.db, proposal.id);
    expect((await browser.get(`/api/proposals/${proposal.id}/plans`)).body.run).toMatchObject({ state: 'idle', current: true });
  });

  it('an expected period given for a target marks the plans stale; the next run plans with it', async () => {
    const { browser, proposal } = await draftWithTargets(['Star P-m']);
    await computeAndStoreProposalPlans(h.created.ctx.db, proposal.id);
    const [t] = (await browser.get(`/api/proposals/${proposal.id}/targets`)).body;
    const put = await browser.put(`/api/proposals/${proposal.id}/targets/${t.id}`, {
      version: t.version,
      target: target({ name: 'Star P-m', periodDays: 0.8, periodUncertaintyDays: 0.05 }),
    });
    expect(put.status).toBe(200);
    expect((await browser.get(`/api/proposals/${proposal.id}/plans`)).body.run).toMatchObject({ state: 'queued', current: false });
    const result = await computeAndStoreProposalPlans(h.created.ctx.db, proposal.id);
    expect(result).toMatchObject({ targets: 1, errors: 0 });
    const after = (await browser.get(`/api/proposals/${proposal.id}/plans`)).body;
    expect(after.run).toMatchObject({ state: 'idle', current: true });
    for (const plan of after.plans) expect(plan.periodDays).toBeCloseTo(0.8, 6);
  });

  it('POST /plans/recompute queues a run (202 with the status)', async () => {
    const { browser, proposal } = await draftWithTargets(['Star P-5']);
    await computeAndStoreProposalPlans(h.created.ctx.db, proposal.id);
    const res = await browser.post(`/api/proposals/${proposal.id}/plans/recompute`);
    expect(res.status).toBe(202);
    expect(res.body).toMatchObject({ state: 'queued', current: true });
  });
});

describe('the plans list kept by the web process', () => {
  it('answers an unchanged list from the kept page (same ETag; 304 when the client holds it)', async () => {
    const { browser, proposal } = await draftWithTargets(['Star P-k1', 'Star P-k2']);
    await computeAndStoreProposalPlans(h.created.ctx.db, proposal.id);
    const url = `/api/proposals/${proposal.id}/plans`;
    const first = await browser.get(url);
    const again = await browser.get(url);
    expect(again.status).toBe(200);
    expect(again.headers.etag).toBe(first.headers.etag);
    expect(again.body).toEqual(first.body);
    expect((await browser.get(url).set('If-None-Match', first.headers.etag)).status).toBe(304);
    // Another query is another page.
    const page2 = await browser.get(`${url}?pageSize=1&page=2`);
    expect(page2.body.plans).toHaveLength(1);
    expect(page2.headers.etag).not.toBe(first.headers.etag);
  });

  it('shows at once a renamed target, a renamed node, a deleted target and a new run, never the kept page', async () => {
    const { browser, proposal } = await draftWithTargets(['Star P-r1', 'Star P-r2']);
    await computeAndStoreProposalPlans(h.created.ctx.db, proposal.id);
    const url = `/api/proposals/${proposal.id}/plans`;
    const names = async () => [...new Set((await browser.get(url)).body.plans.map((p: { targetName: string }) => p.targetName))].sort();
    const nodeCodes = async () => [...new Set((await browser.get(url)).body.plans.map((p: { nodeCode: string }) => p.nodeCode))].sort();
    expect(await names()).toEqual(['Star P-r1', 'Star P-r2']);

    const targets = (await browser.get(`/api/proposals/${proposal.id}/targets`)).body;
    const put = await browser.put(`/api/proposals/${proposal.id}/targets/${targets[0].id}`, {
      version: targets[0].version,
      target: target({ name: 'Star P-r1 renamed' }),
    });
    expect(put.status).toBe(200);
    expect(await names()).toEqual(['Star P-r1 renamed', 'Star P-r2']);

    const db = h.created.ctx.db;
    const node = await db('nodes').where({ id: net.nodeIds[0] }).first('code');
    try {
      await db('nodes')
        .where({ id: net.nodeIds[0] })
        .update({ code: `${node.code}-X` });
      expect(await nodeCodes()).toContain(`${node.code}-X`);
    } finally {
      await db('nodes').where({ id: net.nodeIds[0] }).update({ code: node.code });
    }
    expect(await nodeCodes()).toContain(node.code);

    expect((await browser.delete(`/api/proposals/${proposal.id}/targets/${targets[1].id}`)).status).toBe(204);
    expect(await names()).toEqual(['Star P-r1 renamed']);

    // A run that writes the plans again (its inputs unchanged, so only the plans' own version moves).
    const before = (await browser.get(url)).body.run.finishedAt;
    await computeAndStoreProposalPlans(db, proposal.id);
    const after = (await browser.get(url)).body.run;
    expect(after.finishedAt).not.toBe(before);
    expect(after).toMatchObject({ state: 'idle', current: true });
  });
});

describe('GET /api/proposals/:id/targets/:targetId/sky?nodeId=', () => {
  it('returns the target’s windows night by night from the node’s site, with the plan’s cadence assessed', async () => {
    const { browser, proposal } = await draftWithTargets(['Star P-sky']);
    const [t] = (await browser.get(`/api/proposals/${proposal.id}/targets`)).body;
    const res = await browser.get(`/api/proposals/${proposal.id}/targets/${t.id}/sky?nodeId=${net.nodeIds[0]}`);
    expect(res.status).toBe(200);
    expect(res.body.limits.altitudeLimitDeg).toBe(25);
    expect(res.body.nights).toHaveLength(60);
    expect(res.body.targets).toHaveLength(1);
    expect(res.body.targets[0]).toMatchObject({ name: 'Star P-sky', raDeg: 163.2, decDeg: 31.6, summary: { totalNights: 60 } });
    expect(res.body.targets[0].nights).toHaveLength(60);
    expect(res.body.targets[0].assessment).toMatchObject({ fits: expect.any(Boolean), verdict: expect.any(String) });
    // Any node of the cycle may be asked (to compare before requesting it).
    expect((await browser.get(`/api/proposals/${proposal.id}/targets/${t.id}/sky?nodeId=${net.nodeIds[1]}`)).status).toBe(200);
  });

  it('400 without a node of the cycle, 404 for a target of another proposal', async () => {
    const { browser, proposal } = await draftWithTargets(['Star P-sky2']);
    const [t] = (await browser.get(`/api/proposals/${proposal.id}/targets`)).body;
    const missing = await browser.get(`/api/proposals/${proposal.id}/targets/${t.id}/sky`);
    expect(missing.status).toBe(400);
    expect(missing.body.fieldErrors.nodeId).toBeDefined();
    const foreignNode = await browser.get(`/api/proposals/${proposal.id}/targets/${t.id}/sky?nodeId=99999999`);
    expect(foreignNode.status).toBe(400);
    expect(foreignNode.body.fieldErrors.nodeId).toBeDefined();
    expect((await browser.get(`/api/proposals/${proposal.id}/targets/99999999/sky?nodeId=${net.nodeIds[0]}`)).status).toBe(404);
  });
});

describe('the plan job through pg-boss', () => {
  it('a target upload queues a job; the worker (in-process) stores the plans; GET shows the run current with done = total', async () => {
    // A queue of this test's own, so that jobs queued by other suites stay out of it; emptied
    // before and after (pg-boss's deleteQueue cannot drop a queue that ever held jobs).
    const queue = 'proposal-plans-test';
    const app = await startHarness({ PLAN_QUEUE: queue, PLAN_WORKER_POLL_SECONDS: 0.5 });
    const emptyQueue = () => app.created.ctx.db.raw('DELETE FROM pgboss.job WHERE name = ?', [queue]).catch(() => undefined);
    await emptyQueue();
    const worker = await startPlanWorker({ config: app.created.ctx.config, db: app.created.ctx.db, logger: app.created.ctx.logger });
    try {
      const count = PROGRESS_EVERY_TARGETS * 2 + 5;
      const { browser, proposal } = await proposerWithDraft(app, net.cycleId, 'Queued plans');
      expect((await browser.patch(`/api/proposals/${proposal.id}`, { version: 1, nodeIds: net.nodeIds })).status).toBe(200);
      const lines = Array.from(
        { length: count },
        (_, i) =>
          `Star Q-${i + 1},${(150 + i * 0.3).toFixed(2)},${(20 + (i % 30)).toFixed(1)},${(10 + (i % 6)).toFixed(1)},V,${(0.7 + (i % 15) * 0.12).toFixed(2)},BPRP,,650,60,,,,`,
      );
      const up = await uploadFile(
        browser,
        'post',
        `/api/proposals/${proposal.id}/targets/upload`,
        [CSV_HEADER, ...lines].join('\n'),
        'q.csv',
      );
      expect(up.status).toBe(200);

      const seen = new Set<string>();
      let run: { state: string; done: number; total: number; current: boolean } | undefined;
      const until = Date.now() + 30_000;
      // As the plans tab does: the small status while the run is in progress, the list once at the end.
      while (Date.now() < until) {
        run = (await browser.get(`/api/proposals/${proposal.id}/plans/status`)).body;
        seen.add(run!.state);
        if (run!.state === 'idle' && run!.current) break;
        await new Promise((r) => setTimeout(r, 100));
      }
      expect(run).toMatchObject({ state: 'idle', current: true, total: count, done: count });
      const plans = (await browser.get(`/api/proposals/${proposal.id}/plans?pageSize=200`)).body;
      expect(plans.run).toEqual(run);
      expect(plans.plans).toHaveLength(count * 3);
      expect(plans.matched).toBe(count * 3);
      // The worker stored each row's summary beside its explained result.
      const stored = await app.created.ctx
        .db('target_plans')
        .where({ proposal_id: proposal.id })
        .whereNull('summary')
        .count<{ n: string }[]>({ n: '*' });
      expect(Number(stored[0].n)).toBe(0);
      expect(seen.has('queued') || seen.has('running')).toBe(true);

      // pg-boss recorded a completed job for this proposal.
      const rows = await app.created.ctx.db.raw('SELECT state FROM pgboss.job WHERE name = ? AND singleton_key = ?', [
        queue,
        String(proposal.id),
      ]);
      expect(rows.rows.map((r: { state: string }) => r.state)).toContain('completed');
    } finally {
      await worker.stop(5000);
      await emptyQueue();
      await app.close();
    }
  }, 60_000);
});
