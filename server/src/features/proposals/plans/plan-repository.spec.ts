import { startHarness, type Harness } from '../../../../../test/support/api-harness';
import { createTestNetwork, proposerWithDraft, target, type TestNetwork } from '../../../../../test/api/support/proposal-kit';
import { computeAndStoreProposalPlans } from './plan-service';

// The list queries of plan-repository.ts (page, filters, sort, markers, stored summaries, the
// request per node), called through the plan routes against the real database.

let h: Harness;
let net: TestNetwork;
beforeAll(async () => {
  h = await startHarness();
  net = await createTestNetwork(h, 'PG');
});
afterAll(async () => {
  await net.cleanUp();
  await h.close();
});

interface Row {
  targetId: number;
  targetName: string;
  nodeId: number;
  nodeCode: string;
  feasible: boolean;
  nodeHours: number;
  periodDays: number;
}

/** A draft on the north V node and the south node with five targets; Star G-5 (Dec −80°) never rises from the north. */
async function computedDraft() {
  const d = await proposerWithDraft(h, net.cycleId, 'Paged plans');
  expect((await d.browser.patch(`/api/proposals/${d.proposal.id}`, { version: 1, nodeIds: [net.nodeIds[0], net.nodeIds[2]] })).status).toBe(
    200,
  );
  for (let i = 1; i <= 5; i++) {
    const extra = i === 5 ? { decDeg: -80 } : { colour: 0.8 + i * 0.3, magnitude: 10 + i };
    expect((await d.browser.post(`/api/proposals/${d.proposal.id}/targets`, target({ name: `Star G-${i}`, ...extra }))).status).toBe(201);
  }
  await computeAndStoreProposalPlans(h.created.ctx.db, d.proposal.id);
  return d;
}

describe('GET /api/proposals/:id/plans: pages, filters and sort on the server', () => {
  it('pages in list order, counts the matches and the proposal’s plans, and keeps the explanation endpoint', async () => {
    const { browser, proposal } = await computedDraft();
    const all = (await browser.get(`/api/proposals/${proposal.id}/plans`)).body;
    expect(all).toMatchObject({ page: 1, pageSize: 50, matched: 10, errors: [] });
    expect(all.plans).toHaveLength(10);
    expect(all.counts.plans).toBe(10);
    expect(all.counts.infeasible).toBe(all.plans.filter((p: Row) => !p.feasible).length);
    expect(all.counts.infeasible).toBeGreaterThanOrEqual(1);

    const second = (await browser.get(`/api/proposals/${proposal.id}/plans?page=2&pageSize=3`)).body;
    expect(second).toMatchObject({ page: 2, pageSize: 3, matched: 10, counts: all.counts });
    expect(second.plans).toEqual(all.plans.slice(3, 6));
    const last = (await browser.get(`/api/proposals/${proposal.id}/plans?page=4&pageSize=3`)).body;
    expect(last.plans).toEqual(all.plans.slice(9));
    // Past the end: no rows, the match count still right.
    expect((await browser.get(`/api/proposals/${proposal.id}/plans?page=9&pageSize=3`)).body).toMatchObject({ plans: [], matched: 10 });

    const row = second.plans[0] as Row;
    const explained = await browser.get(`/api/proposals/${proposal.id}/targets/${row.targetId}/plan?nodeId=${row.nodeId}`);
    expect(explained.status).toBe(200);
    expect(explained.body.quantities.nodeHours.value).toBe(row.nodeHours);
  });

  it('filters by feasibility, node and name, and sorts by a column either way', async () => {
    const { browser, proposal } = await computedDraft();
    const url = (query: string) => `/api/proposals/${proposal.id}/plans?${query}`;
    const all: Row[] = (await browser.get(url('pageSize=200'))).body.plans;

    const infeasible = (await browser.get(url('feasible=false'))).body;
    expect(infeasible.plans.map((p: Row) => p.targetId)).toEqual(all.filter((p) => !p.feasible).map((p) => p.targetId));
    expect(infeasible.matched).toBe(all.filter((p) => !p.feasible).length);
    expect(infeasible.plans).toContainEqual(expect.objectContaining({ targetName: 'Star G-5', nodeId: net.nodeIds[0], feasible: false }));
    const feasible = (await browser.get(url('feasible=true'))).body;
    expect(feasible.matched + infeasible.matched).toBe(10);
    expect(feasible.plans.every((p: Row) => p.feasible)).toBe(true);

    const south = (await browser.get(url(`nodeId=${net.nodeIds[2]}`))).body;
    expect(south.matched).toBe(5);
    expect(south.plans.every((p: Row) => p.nodeId === net.nodeIds[2])).toBe(true);
    expect((await browser.get(url(`nodeId=${net.nodeIds[2]}&feasible=false&q=g-5`))).body.matched).toBe(
      all.filter((p) => p.nodeId === net.nodeIds[2] && !p.feasible && p.targetName === 'Star G-5').length,
    );

    const named = (await browser.get(url('q=g-3'))).body;
    expect(named.plans.map((p: Row) => p.targetName)).toEqual(['Star G-3', 'Star G-3']);
    // Text with LIKE wildcards is matched as text.
    expect((await browser.get(url('q=%25'))).body.matched).toBe(0);

    const byHoursDown: Row[] = (await browser.get(url('sort=-nodeHours&pageSize=200'))).body.plans;
    expect(byHoursDown.map((p) => p.nodeHours)).toEqual([...all.map((p) => p.nodeHours)].sort((a, b) => b - a));
    const byPeriod: Row[] = (await browser.get(url('sort=period&pageSize=200'))).body.plans;
    expect(byPeriod.map((p) => p.periodDays)).toEqual([...all.map((p) => p.periodDays)].sort((a, b) => a - b));
    const byNode: Row[] = (await browser.get(url('sort=-node&pageSize=200'))).body.plans;
    expect(byNode.map((p) => p.nodeCode)).toEqual([...all.map((p) => p.nodeCode)].sort().reverse());
  });

  it.each([
    ['page=0', 'page'],
    ['page=-1', 'page'],
    ['page=abc', 'page'],
    ['page=1.5', 'page'],
    ['pageSize=0', 'pageSize'],
    ['pageSize=201', 'pageSize'],
    ['pageSize=ten', 'pageSize'],
    ['page=1&page=2', 'page'],
    ['feasible=maybe', 'feasible'],
    ['nodeId=x', 'nodeId'],
    ['sort=name;drop', 'sort'],
  ])('400 naming the field for %s', async (query, field) => {
    const { browser, proposal } = await proposerWithDraft(h, net.cycleId, 'Bad query');
    const res = await browser.get(`/api/proposals/${proposal.id}/plans?${query}`);
    expect(res.status).toBe(400);
    expect(res.body.code).toBe('validation_failed');
    expect(res.body.fieldErrors[field]).toEqual([expect.any(String)]);
    expect(res.body.message).toMatch(new RegExp(`^${field}: `));
  });

  it('404 for someone outside the team, for the list, the status and the markers alike', async () => {
    const { proposal } = await proposerWithDraft(h, net.cycleId, 'Private');
    const other = await proposerWithDraft(h, net.cycleId, 'Other');
    expect((await other.browser.get(`/api/proposals/${proposal.id}/plans`)).status).toBe(404);
    expect((await other.browser.get(`/api/proposals/${proposal.id}/plans/status`)).status).toBe(404);
    expect((await other.browser.get(`/api/proposals/${proposal.id}/plans/markers`)).status).toBe(404);
  });
});

describe('GET /api/proposals/:id/plans/markers: every plan for the chart, unpaged', () => {
  it('lists each stored plan once with its feasibility and period, whatever the list page', async () => {
    const { browser, proposal } = await computedDraft();
    const all = (await browser.get(`/api/proposals/${proposal.id}/plans?pageSize=200`)).body.plans as Row[];
    const markers = (await browser.get(`/api/proposals/${proposal.id}/plans/markers`)).body as {
      targetId: number;
      nodeId: number;
      feasible: boolean;
      periodDays: number;
    }[];
    expect(markers).toHaveLength(all.length);
    const key = (r: { targetId: number; nodeId: number }) => `${r.targetId}:${r.nodeId}`;
    const byKey = new Map(all.map((r) => [key(r), r]));
    for (const m of markers) {
      const row = byKey.get(key(m));
      expect(row).toBeDefined();
      expect(m.feasible).toBe(row!.feasible);
      expect(m.periodDays).toBeCloseTo(row!.periodDays, 9);
    }
  });
});

describe('GET /api/proposals/:id/plans/status', () => {
  it('gives the run alone; stale after a target change, a node’s or the campaign’s change made in the database, current again after a run', async () => {
    const { browser, proposal } = await computedDraft();
    const status = async () => {
      const res = await browser.get(`/api/proposals/${proposal.id}/plans/status`);
      expect(res.status).toBe(200);
      return res.body;
    };
    const list = (await browser.get(`/api/proposals/${proposal.id}/plans?pageSize=1`)).body;
    expect(await status()).toEqual(list.run);
    expect(await status()).toEqual({
      state: 'idle',
      total: 5,
      done: 5,
      startedAt: expect.any(String),
      finishedAt: expect.any(String),
      error: null,
      current: true,
    });

    const [t] = (await browser.get(`/api/proposals/${proposal.id}/targets`)).body;
    await browser.put(`/api/proposals/${proposal.id}/targets/${t.id}`, {
      version: t.version,
      target: target({ name: t.name, ageMyr: 1500 }),
    });
    expect(await status()).toMatchObject({ state: 'queued', current: false });
    // Asked again (the cached hash now at hand): the same answer.
    expect(await status()).toMatchObject({ state: 'queued', current: false });
    await computeAndStoreProposalPlans(h.created.ctx.db, proposal.id);
    expect(await status()).toMatchObject({ state: 'idle', current: true });

    // A node's value changed behind the API's back (no markPlansRequested): the trigger still clears the cache.
    const db = h.created.ctx.db;
    const [{ throughput }] = await db('nodes').where({ id: net.nodeIds[0] }).select('throughput');
    await db('nodes')
      .where({ id: net.nodeIds[0] })
      .update({ throughput: throughput * 0.9 });
    try {
      expect(await status()).toMatchObject({ current: false });
    } finally {
      await db('nodes').where({ id: net.nodeIds[0] }).update({ throughput });
    }
    expect(await status()).toMatchObject({ current: true });

    const [{ campaign_end: end }] = await db('cycles').where({ id: net.cycleId }).select('campaign_end');
    await db('cycles')
      .where({ id: net.cycleId })
      .update({ campaign_end: db.raw("campaign_end - interval '1 day'") });
    try {
      expect(await status()).toMatchObject({ current: false });
    } finally {
      await db('cycles').where({ id: net.cycleId }).update({ campaign_end: end });
    }
    expect(await status()).toMatchObject({ current: true });
  });

  it('the worker path stores each plan’s summary (the table row) apart from its explained numbers', async () => {
    const { browser, proposal } = await computedDraft();
    const rows = await h.created.ctx
      .db('target_plans')
      .where({ proposal_id: proposal.id })
      .select('target_id', 'node_id', 'summary', 'result');
    expect(rows).toHaveLength(10);
    const listed: Row[] = (await browser.get(`/api/proposals/${proposal.id}/plans?pageSize=200`)).body.plans;
    for (const r of rows) {
      expect(r.summary).not.toHaveProperty('quantities');
      expect(r.result).toHaveProperty('quantities');
      const { quantities: _q, ...rest } = r.result;
      expect(r.summary).toEqual(rest);
      const row = listed.find((p) => p.targetId === r.target_id && p.nodeId === r.node_id)!;
      expect(row).toMatchObject(r.summary);
    }
    // The run carries the hash of its inputs, and the cache the hash of today's: equal after the run.
    const [run] = await h.created.ctx.db('plan_runs').where({ proposal_id: proposal.id }).select('inputs_hash', 'current_hash');
    expect(run.current_hash).toBe(run.inputs_hash);
  });
});

describe('the request per node counts only feasible plans', () => {
  it('an infeasible plan (here a target that never rises from the north) adds no node-hours and no fee', async () => {
    const { browser, proposal } = await computedDraft();
    const plans = (await browser.get(`/api/proposals/${proposal.id}/plans?pageSize=200`)).body.plans as Row[];
    expect(plans.some((p) => !p.feasible)).toBe(true);
    const request = (await browser.get(`/api/proposals/${proposal.id}`)).body.request as {
      nodeId: number;
      nodeHours: number;
      infeasibleTargets: number;
    }[];
    for (const r of request) {
      const feasibleHours = plans.filter((p) => p.nodeId === r.nodeId && p.feasible).reduce((sum, p) => sum + p.nodeHours, 0);
      expect(r.nodeHours).toBeCloseTo(feasibleHours, 2);
    }
    expect(request.reduce((n, r) => n + r.infeasibleTargets, 0)).toBe(plans.filter((p) => !p.feasible).length);
  });
});
