import { signedIn, startHarness, type Browser, type Harness } from '../../../../test/support/api-harness';
import { createTestNetwork, makeReady, proposerWithDraft, target, type TestNetwork } from '../../../../test/api/support/proposal-kit';

let h: Harness;
let net: TestNetwork;
let manager: Browser;
const created: number[] = [];
beforeAll(async () => {
  h = await startHarness();
  net = await createTestNetwork(h, 'CQ');
  manager = (await signedIn(h, ['facility_manager'])).browser;
});
afterAll(async () => {
  await h.created.ctx.db('proposals').whereIn('cycle_id', created).del();
  await h.created.ctx.db('cycles').whereIn('id', created).del();
  await net.cleanUp();
  await h.close();
});

const day = 86400_000;
/** A cycle input whose call is open now; `closesAt` moves the deadline. */
function cycleInput(overrides: Record<string, unknown> = {}) {
  const now = Date.now();
  return {
    code: `${net.tag}Q${created.length}${Math.floor(Math.random() * 1000)}`,
    title: 'Capacity checks',
    callOpensAt: new Date(now - day).toISOString(),
    callClosesAt: new Date(now + 10 * day).toISOString(),
    campaignStart: new Date(now + 40 * day).toISOString().slice(0, 10),
    campaignEnd: new Date(now + 100 * day).toISOString().slice(0, 10),
    anonymousReview: false,
    categories: ['Open clusters'],
    nodes: [
      { nodeId: net.nodeIds[0], nodeHoursAvailable: 500 },
      { nodeId: net.nodeIds[2], nodeHoursAvailable: 300 },
    ],
    ...overrides,
  };
}

async function createCycle(overrides: Record<string, unknown> = {}) {
  const res = await manager.post('/api/cycles', cycleInput(overrides));
  if (res.status !== 201) throw new Error(`cycle: ${res.status} ${JSON.stringify(res.body)}`);
  created.push(res.body.id);
  return res.body as { id: number; version: number; code: string; nodes: { nodeId: number; nodeHoursAvailable: number }[] } & Record<
    string,
    unknown
  >;
}

/** A PUT body re-sending the cycle as read, with other capacities. */
function withCapacity(
  cycle: Awaited<ReturnType<typeof createCycle>>,
  capacity: Record<number, number>,
  extra: Record<string, unknown> = {},
) {
  const { id: _id, status: _s, version, nodes, ...fields } = cycle;
  return {
    version,
    cycle: { ...fields, nodes: nodes.map((n) => ({ nodeId: n.nodeId, nodeHoursAvailable: capacity[n.nodeId] ?? n.nodeHoursAvailable })) },
    ...extra,
  };
}

/** A submitted proposal on node 0 (and optionally node 2) with computed plans; returns its request. */
async function submitted(cycleId: number, nodeIds = [net.nodeIds[0]], targets?: ReturnType<typeof target>[]) {
  const { browser, proposal } = await proposerWithDraft(h, cycleId, `Submitted ${Math.random().toString(36).slice(2, 7)}`);
  await makeReady(h, browser, proposal.id, nodeIds, targets);
  const res = await browser.post(`/api/proposals/${proposal.id}/submit`);
  if (res.status !== 200) throw new Error(`submit: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body as {
    id: number;
    title: string;
    request: { nodeId: number; nodeCode: string; nodeHours: number; infeasibleNodeHours: number; infeasibleTargets: number }[];
  };
}

describe('cycle rules: the campaign starts after the call closes', () => {
  it('a first night before the closing date → 400 naming campaignStart; the day after the closing date → 201', async () => {
    const closes = new Date(Date.now() + 10 * day);
    closes.setUTCHours(12, 0, 0, 0);
    const sameDay = closes.toISOString().slice(0, 10);
    const dayBefore = new Date(closes.getTime() - day).toISOString().slice(0, 10);
    for (const campaignStart of [dayBefore, sameDay]) {
      const res = await manager.post('/api/cycles', cycleInput({ callClosesAt: closes.toISOString(), campaignStart }));
      expect(res.status).toBe(400);
      expect(Object.keys(res.body.fieldErrors)).toEqual(['campaignStart']);
      expect(res.body.fieldErrors.campaignStart[0]).toMatch(
        /^the campaign cannot start before the call closes \(\d{1,2} \w{3} \d{4}, 12:00 UTC\)/,
      );
    }
    const next = new Date(closes.getTime() + day).toISOString().slice(0, 10);
    const ok = await manager.post('/api/cycles', cycleInput({ callClosesAt: closes.toISOString(), campaignStart: next }));
    expect(ok.status).toBe(201);
    created.push(ok.body.id);
  });

  it('PUT applies the same rule under cycle.campaignStart and writes nothing', async () => {
    const cycle = await createCycle();
    const body = withCapacity(cycle, {});
    const res = await manager.put(`/api/cycles/${cycle.id}`, {
      ...body,
      cycle: { ...body.cycle, campaignStart: (cycle.callClosesAt as string).slice(0, 10) },
    });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.fieldErrors)).toEqual(['cycle.campaignStart']);
    expect((await manager.get(`/api/cycles/${cycle.id}`)).body).toMatchObject({ version: 1, campaignStart: cycle.campaignStart });
  });
});

describe('cycle setting capacityOverrun', () => {
  it('defaults to warn, stores block, refuses anything else naming the field', async () => {
    expect((await createCycle()).capacityOverrun).toBe('warn');
    const block = await createCycle({ capacityOverrun: 'block' });
    expect(block.capacityOverrun).toBe('block');
    expect((await manager.get(`/api/cycles/${block.id}`)).body.capacityOverrun).toBe('block');
    const bad = await manager.post('/api/cycles', cycleInput({ capacityOverrun: 'sometimes' }));
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.fieldErrors)).toEqual(['capacityOverrun']);
  });
});

describe('PUT /api/cycles/:id cutting capacity below the submitted requests', () => {
  it('409 capacity_below_requests listing node, request and new capacity, nothing written; confirmCapacityCut saves it', async () => {
    const cycle = await createCycle();
    const proposal = await submitted(cycle.id);
    const requested = proposal.request.find((r) => r.nodeId === net.nodeIds[0])!.nodeHours;
    expect(requested).toBeGreaterThan(0.5);
    // A draft's request does not count: a second, bigger draft changes nothing below.
    const draft = await proposerWithDraft(h, cycle.id, 'A draft');
    await makeReady(h, draft.browser, draft.proposal.id, [net.nodeIds[0]], [target(), target(), target()]);

    const cut = Math.floor(requested / 2);
    const refused = await manager.put(`/api/cycles/${cycle.id}`, withCapacity(cycle, { [net.nodeIds[0]]: cut }));
    expect(refused.status).toBe(409);
    expect(refused.body.code).toBe('capacity_below_requests');
    expect(refused.body.message).toContain(
      `${net.nodes[0].code}: ${Math.round(requested * 100) / 100} node-hours requested, new capacity ${cut}`,
    );
    expect(refused.body.fieldErrors).toEqual({ 'cycle.nodes.0.nodeHoursAvailable': [expect.stringContaining(net.nodes[0].code)] });
    expect(refused.body.nodes).toEqual([{ nodeCode: net.nodes[0].code, requestedNodeHours: requested, nodeHoursAvailable: cut }]);
    expect((await manager.get(`/api/cycles/${cycle.id}`)).body).toMatchObject({
      version: 1,
      nodes: expect.arrayContaining([{ nodeId: net.nodeIds[0], nodeCode: net.nodes[0].code, nodeHoursAvailable: 500 }]),
    });

    // A cut that still covers the request, or a cut of a node nobody submitted on, passes without the flag.
    const covered = await manager.put(
      `/api/cycles/${cycle.id}`,
      withCapacity(cycle, { [net.nodeIds[0]]: Math.ceil(requested), [net.nodeIds[2]]: 0 }),
    );
    expect(covered.status).toBe(200);

    const confirmed = await manager.put(
      `/api/cycles/${cycle.id}`,
      withCapacity({ ...cycle, ...covered.body }, { [net.nodeIds[0]]: cut }, { confirmCapacityCut: true }),
    );
    expect(confirmed.status).toBe(200);
    expect(confirmed.body.nodes).toEqual(
      expect.arrayContaining([{ nodeId: net.nodeIds[0], nodeCode: net.nodes[0].code, nodeHoursAvailable: cut }]),
    );

    // Raising a capacity that is still below the request is no cut: no confirmation needed.
    const raised = await manager.put(
      `/api/cycles/${cycle.id}`,
      withCapacity({ ...cycle, ...confirmed.body }, { [net.nodeIds[0]]: cut + 0.5 }),
    );
    expect(raised.status).toBe(200);
    // And a non-boolean flag is a 400 naming it.
    const bad = await manager.put(`/api/cycles/${cycle.id}`, withCapacity({ ...cycle, ...raised.body }, {}, { confirmCapacityCut: 'yes' }));
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.fieldErrors)).toEqual(['confirmCapacityCut']);
  });
});

describe('GET /api/cycles/:id/proposals (facility managers)', () => {
  it('lists the submitted proposals with their request per node against capacity, the pressure per node, drafts only counted', async () => {
    const cycle = await createCycle();
    // Dec −80° never rises at the northern node: its plan there is infeasible (hours shown apart).
    const big = await submitted(
      cycle.id,
      [net.nodeIds[0], net.nodeIds[2]],
      [target(), target({ colour: 1.2 }), target({ decDeg: -80, raDeg: 90 })],
    );
    const small = await submitted(cycle.id, [net.nodeIds[0]]);
    await proposerWithDraft(h, cycle.id, 'Still a draft');
    const onNorth = big.request.find((r) => r.nodeId === net.nodeIds[0])!;
    expect(onNorth.infeasibleTargets).toBe(1);
    expect(onNorth.infeasibleNodeHours).toBeGreaterThan(0);
    // The northern node offers less than the big proposal asks for there.
    const northCapacity = Math.floor(onNorth.nodeHours / 2);
    await h.created.ctx
      .db('cycle_nodes')
      .where({ cycle_id: cycle.id, node_id: net.nodeIds[0] })
      .update({ node_hours_available: northCapacity });

    const res = await manager.get(`/api/cycles/${cycle.id}/proposals`);
    expect(res.status).toBe(200);
    expect(res.body.cycle).toMatchObject({ id: cycle.id, code: cycle.code });
    expect(res.body.draftCount).toBe(1);
    expect(res.body.proposals.map((p: { id: number }) => p.id)).toEqual([big.id, small.id]);
    const [first, second] = res.body.proposals;
    expect(first).toMatchObject({
      title: big.title,
      state: 'submitted',
      piName: expect.any(String),
      submittedAt: expect.any(String),
      overCapacity: true,
    });
    expect(first.request.find((r: { nodeId: number }) => r.nodeId === net.nodeIds[0])).toEqual({
      nodeId: net.nodeIds[0],
      nodeCode: net.nodes[0].code,
      nodeHours: onNorth.nodeHours,
      infeasibleNodeHours: onNorth.infeasibleNodeHours,
      targets: 3,
      infeasibleTargets: 1,
      nodeHoursAvailable: northCapacity,
      overCapacity: true,
    });
    expect(first.totalNodeHours).toBeCloseTo(
      big.request.reduce((s, r) => s + r.nodeHours, 0),
      2,
    );
    const smallNorth = small.request[0].nodeHours;
    expect(second.overCapacity).toBe(smallNorth > northCapacity);

    const north = res.body.nodes.find((n: { nodeId: number }) => n.nodeId === net.nodeIds[0]);
    const requested = Math.round((onNorth.nodeHours + smallNorth) * 100) / 100;
    expect(north).toEqual({
      nodeId: net.nodeIds[0],
      nodeCode: net.nodes[0].code,
      nodeHoursAvailable: northCapacity,
      requestedNodeHours: requested,
      infeasibleNodeHours: Math.round((onNorth.infeasibleNodeHours + small.request[0].infeasibleNodeHours) * 100) / 100,
      proposals: 2,
      pressure: Math.round((requested / northCapacity) * 1000) / 1000,
    });
    expect(north.pressure).toBeGreaterThan(1);
    const south = res.body.nodes.find((n: { nodeId: number }) => n.nodeId === net.nodeIds[2]);
    expect(south).toMatchObject({ proposals: 1, nodeHoursAvailable: 300 });
    expect(south.pressure).toBeLessThan(1);
  });

  it('an empty cycle lists nothing; an unknown cycle answers 404 cycle_not_found; a bad id 400', async () => {
    const cycle = await createCycle();
    const res = await manager.get(`/api/cycles/${cycle.id}/proposals`);
    expect(res.body).toMatchObject({ proposals: [], draftCount: 0 });
    expect(
      res.body.nodes.every((n: { requestedNodeHours: number; pressure: number }) => n.requestedNodeHours === 0 && n.pressure === 0),
    ).toBe(true);
    const missing = await manager.get('/api/cycles/99999999/proposals');
    expect(missing.status).toBe(404);
    expect(missing.body.code).toBe('cycle_not_found');
    expect((await manager.get('/api/cycles/abc/proposals')).status).toBe(400);
  });
});
