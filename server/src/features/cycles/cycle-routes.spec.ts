import { signedIn, startHarness, type Harness } from '../../../../test/support/api-harness';
import { createTestNetwork, proposerWithDraft, target, type TestNetwork } from '../../../../test/api/support/proposal-kit';
import { computeAndStoreProposalPlans } from '../proposals/plans/plan-service';

let h: Harness;
let net: TestNetwork;
const created: number[] = [];
beforeAll(async () => {
  h = await startHarness();
  net = await createTestNetwork(h, 'CY');
});
afterAll(async () => {
  await h.created.ctx.db('cycles').whereIn('id', created).del();
  await net.cleanUp();
  await h.close();
});

function cycleInput(overrides: Record<string, unknown> = {}) {
  const day = 86400_000;
  const now = Date.now();
  return {
    code: `${net.tag}X${created.length}${Math.floor(Math.random() * 1000)}`,
    title: 'A managed cycle',
    callOpensAt: new Date(now - day).toISOString(),
    callClosesAt: new Date(now + 10 * day).toISOString(),
    campaignStart: new Date(now + 40 * day).toISOString().slice(0, 10),
    campaignEnd: new Date(now + 100 * day).toISOString().slice(0, 10),
    anonymousReview: true,
    categories: ['Open clusters', 'Field stars'],
    nodes: [
      { nodeId: net.nodeIds[0], nodeHoursAvailable: 120.5 },
      { nodeId: net.nodeIds[1], nodeHoursAvailable: 80 },
    ],
    ...overrides,
  };
}

describe('POST /api/cycles (facility managers)', () => {
  it('creates a cycle with its nodes and capacity (201 CycleSummary)', async () => {
    const { browser } = await signedIn(h, ['facility_manager']);
    const input = cycleInput();
    const res = await browser.post('/api/cycles', input);
    expect(res.status).toBe(201);
    created.push(res.body.id);
    expect(res.body).toMatchObject({
      code: input.code,
      status: 'open',
      version: 1,
      anonymousReview: true,
      callClosesAt: input.callClosesAt,
      nodes: expect.arrayContaining([
        { nodeId: net.nodeIds[0], nodeCode: net.nodes[0].code, nodeHoursAvailable: 120.5 },
        { nodeId: net.nodeIds[1], nodeCode: net.nodes[1].code, nodeHoursAvailable: 80 },
      ]),
    });
    expect((await browser.get(`/api/cycles/${res.body.id}`)).body).toEqual(res.body);
  });

  it('validates: dates in order, unknown node (400 naming nodes.1.nodeId), a taken code (409 on code)', async () => {
    const { browser } = await signedIn(h, ['facility_manager']);
    const dates = await browser.post('/api/cycles', cycleInput({ callClosesAt: new Date(Date.now() - 5 * 86400_000).toISOString() }));
    expect(dates.status).toBe(400);
    expect(dates.body.fieldErrors.callClosesAt).toBeDefined();
    const node = await browser.post(
      '/api/cycles',
      cycleInput({
        nodes: [
          { nodeId: net.nodeIds[0], nodeHoursAvailable: 1 },
          { nodeId: 99999999, nodeHoursAvailable: 1 },
        ],
      }),
    );
    expect(node.status).toBe(400);
    expect(Object.keys(node.body.fieldErrors)).toEqual(['nodes.1.nodeId']);
    const first = await browser.post('/api/cycles', cycleInput());
    created.push(first.body.id);
    const again = await browser.post('/api/cycles', cycleInput({ code: first.body.code }));
    expect(again.status).toBe(409);
    expect(again.body).toMatchObject({ code: 'code_taken', fieldErrors: { code: expect.any(Array) } });
  });
});

describe('PUT /api/cycles/:id', () => {
  it('updates fields and replaces the nodes in one go; a stale version answers 409 version_conflict and changes nothing', async () => {
    const { browser } = await signedIn(h, ['facility_manager']);
    const made = (await browser.post('/api/cycles', cycleInput())).body;
    created.push(made.id);
    const { id: _id, status: _s, version: _v, nodes: _n, ...fields } = made;
    const res = await browser.put(`/api/cycles/${made.id}`, {
      version: 1,
      cycle: { ...fields, title: 'Renamed cycle', nodes: [{ nodeId: net.nodeIds[2], nodeHoursAvailable: 300 }] },
    });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ title: 'Renamed cycle', version: 2, nodes: [{ nodeId: net.nodeIds[2], nodeHoursAvailable: 300 }] });
    const stale = await browser.put(`/api/cycles/${made.id}`, {
      version: 1,
      cycle: { ...fields, title: 'Overwrite', nodes: [{ nodeId: net.nodeIds[0], nodeHoursAvailable: 1 }] },
    });
    expect(stale.status).toBe(409);
    expect(stale.body).toMatchObject({
      code: 'version_conflict',
      message: expect.stringMatching(/^Someone else saved cycle .* at \d\d:\d\d UTC; reload to see their changes$/),
    });
    expect((await browser.get(`/api/cycles/${made.id}`)).body).toMatchObject({
      title: 'Renamed cycle',
      version: 2,
      nodes: [{ nodeId: net.nodeIds[2] }],
    });
    expect(
      (
        await browser.put('/api/cycles/99999999', {
          version: 1,
          cycle: { ...fields, nodes: [{ nodeId: net.nodeIds[0], nodeHoursAvailable: 1 }] },
        })
      ).status,
    ).toBe(404);
  });

  it('refuses to drop a node that proposals request (409 node_in_use); a new campaign queues the drafts’ plans', async () => {
    const { browser } = await signedIn(h, ['facility_manager']);
    const made = (await browser.post('/api/cycles', cycleInput())).body;
    created.push(made.id);
    const { browser: pi, proposal } = await proposerWithDraft(h, made.id);
    await pi.patch(`/api/proposals/${proposal.id}`, { version: 1, nodeIds: [net.nodeIds[0]] });
    await pi.post(`/api/proposals/${proposal.id}/targets`, target());
    await computeAndStoreProposalPlans(h.created.ctx.db, proposal.id);
    expect((await pi.get(`/api/proposals/${proposal.id}/plans`)).body.run.current).toBe(true);
    const { id: _id, status: _s, version: _v, nodes: _n, ...fields } = made;
    const drop = await browser.put(`/api/cycles/${made.id}`, {
      version: 1,
      cycle: { ...fields, nodes: [{ nodeId: net.nodeIds[1], nodeHoursAvailable: 10 }] },
    });
    expect(drop.status).toBe(409);
    expect(drop.body.code).toBe('node_in_use');
    expect(drop.body.message).toContain(net.nodes[0].code);
    const moved = await browser.put(`/api/cycles/${made.id}`, {
      version: 1,
      cycle: {
        ...fields,
        campaignEnd: new Date(Date.parse(fields.campaignEnd) + 10 * 86400_000).toISOString().slice(0, 10),
        nodes: made.nodes.map(({ nodeId, nodeHoursAvailable }: { nodeId: number; nodeHoursAvailable: number }) => ({
          nodeId,
          nodeHoursAvailable,
        })),
      },
    });
    expect(moved.status).toBe(200);
    expect((await pi.get(`/api/proposals/${proposal.id}/plans`)).body.run).toMatchObject({ state: 'queued', current: false });
    // Cleaning up: proposals first (they hold on to the cycle).
    await h.created.ctx.db('proposals').where({ id: proposal.id }).del();
  });
});

describe('GET /api/cycles visibility', () => {
  it('proposers see open calls plus cycles they have a proposal in; managers and administrators see all', async () => {
    const closedWithMine = await net.createCycle({ opensInMs: -3 * 86400_000, closesInMs: 60_000 });
    const { browser: pi, proposal } = await proposerWithDraft(h, closedWithMine.id);
    const upcoming = await net.createCycle({ opensInMs: 86400_000, closesInMs: 2 * 86400_000 });
    const closed = await net.createCycle({ opensInMs: -3 * 86400_000, closesInMs: -86400_000 });
    // The call of the cycle with the proposal closes meanwhile.
    await h.created.ctx
      .db('cycles')
      .where({ id: closedWithMine.id })
      .update({ call_closes_at: new Date(Date.now() - 1000) });

    const ids = async (b: typeof pi) => new Set(((await b.get('/api/cycles')).body as { id: number }[]).map((c) => c.id));
    const mine = await ids(pi);
    expect(mine.has(net.cycleId)).toBe(true);
    expect(mine.has(closedWithMine.id)).toBe(true);
    expect(mine.has(upcoming.id)).toBe(false);
    expect(mine.has(closed.id)).toBe(false);
    expect((await pi.get(`/api/cycles/${upcoming.id}`)).status).toBe(404);
    expect((await pi.get(`/api/cycles/${closedWithMine.id}`)).body.status).toBe('closed');

    const reviewer = (await signedIn(h, ['reviewer'])).browser;
    const seen = await ids(reviewer);
    expect(seen.has(net.cycleId)).toBe(true);
    expect(seen.has(closedWithMine.id)).toBe(false);

    for (const role of ['facility_manager', 'administrator'] as const) {
      const all = await ids((await signedIn(h, [role])).browser);
      for (const id of [net.cycleId, closedWithMine.id, upcoming.id, closed.id]) expect(all.has(id)).toBe(true);
    }
    await h.created.ctx.db('proposals').where({ id: proposal.id }).del();
  });
});
