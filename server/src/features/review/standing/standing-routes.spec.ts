import { startHarness, type Harness } from '../../../../../test/support/api-harness';
import { createTestNetwork, type TestNetwork } from '../../../../../test/api/support/proposal-kit';
import type { PanelStanding, PanelStatisticsReport } from '@spincycle/shared/review/standing';
import type { CyclePressureReport } from '@spincycle/shared/review/pressure';
import { account, addTargetWithPlans, browserFor, createPanelFixture, type PanelFixture } from './testing/standing-fixtures';

let h: Harness;
let net: TestNetwork;
beforeAll(async () => {
  h = await startHarness({ LOGIN_RATE_LIMIT: 10_000 });
  net = await createTestNetwork(h, 'RS');
});
afterAll(async () => {
  await net.cleanUp();
  await h.close();
});

/*
 * The worked example of shared/src/review/review-statistics.spec.ts (worked by hand there):
 * reviewers A (the chair), B, C, D; P1 8, 9; P2 6, 9, 2; P3 4, ·, 6, 5; P4 assigned, not graded.
 * Normalised means P1 0.612372, P2 −0.333333, P3 −0.074915; P2's spread 7 > 3 is flagged.
 */
const WORKED = [[8, 9], [6, 9, 2], [4, undefined, 6, 5], [null]];

async function manager() {
  return browserFor(h, await account(h, ['facility_manager']));
}

describe('GET /api/review/panels/:panelId/statistics', () => {
  let f: PanelFixture;
  beforeAll(async () => {
    f = await createPanelFixture(h, net, { grades: WORKED, anonymous: true });
  });

  it('manager: every proposal, raw and normalised grades, mean, median, spread, flag (worked example)', async () => {
    const res = await (await manager()).get(`/api/review/panels/${f.panelId}/statistics`);
    expect(res.status).toBe(200);
    const body = res.body as PanelStatisticsReport;
    const [p1, p2, p3, p4] = f.proposalIds;
    expect(body.proposals.map((p) => p.proposalId)).toEqual([p1, p3, p2, p4]);
    const row = (id: number) => body.proposals.find((p) => p.proposalId === id)!;
    expect(row(p1).normalisedMean).toBeCloseTo(0.612372, 6);
    expect(row(p2)).toMatchObject({ median: 6, spread: 7, flagged: true, gradeCount: 3 });
    expect(row(p2).normalisedMean).toBeCloseTo(-0.333333, 6);
    expect(row(p3).normalisedMean).toBeCloseTo(-0.074915, 6);
    expect(row(p4)).toMatchObject({ gradeCount: 0, normalisedMean: null, flagged: false });
    expect(row(p1).grades).toEqual([
      expect.objectContaining({ raw: 8, normalised: expect.closeTo(1.224745, 6) }),
      expect.objectContaining({ raw: 9, normalised: 0 }),
    ]);
    expect(body.reviewers).toHaveLength(4);
    // Anonymous cycle: managers still see the team.
    expect(row(p1).team).toEqual({ piName: expect.stringContaining('Proposer'), piAffiliation: 'Test Station' });
    expect(body.panel).toMatchObject({ viewerRole: 'manager', teamHidden: false, panelStage: true, spreadThreshold: 3 });
  });

  it('chair of an anonymous cycle: no team names anywhere in the body', async () => {
    const res = await (await f.signIn(f.chair)).get(`/api/review/panels/${f.panelId}/statistics`);
    expect(res.status).toBe(200);
    expect(res.body.panel).toMatchObject({ viewerRole: 'chair', teamHidden: true });
    expect(res.body.proposals.every((p: { team: unknown }) => p.team === null)).toBe(true);
    expect(JSON.stringify(res.body)).not.toMatch(/Proposer|Test Station/);
  });

  it('chair: proposals they are conflicted with or on the team of are left out (not even the row)', async () => {
    const g = await createPanelFixture(h, net, {
      grades: [
        [7, 5],
        [6, 4],
        [5, 8],
      ],
    });
    const db = h.created.ctx.db;
    await db('review_conflicts').insert({ proposal_id: g.proposalIds[1], reviewer_account_id: g.chair.id, reason: 'Former student' });
    await db('proposal_members').insert({
      proposal_id: g.proposalIds[2],
      account_id: null,
      email: g.chair.email.toUpperCase(),
      role: 'coi',
    });
    const chairView = (await (await g.signIn(g.chair)).get(`/api/review/panels/${g.panelId}/statistics`)).body as PanelStatisticsReport;
    expect(chairView.proposals.map((p) => p.proposalId)).toEqual([g.proposalIds[0]]);
    expect(chairView.proposals[0].team).not.toBeNull(); // not anonymous: the chair sees the team
    const standing = (await (await g.signIn(g.chair)).get(`/api/review/panels/${g.panelId}/standing`)).body as PanelStanding;
    expect(standing.entries.map((e) => e.proposal.proposalId)).toEqual([g.proposalIds[0]]);
    const managerView = (await (await manager()).get(`/api/review/panels/${g.panelId}/statistics`)).body as PanelStatisticsReport;
    expect(managerView.proposals).toHaveLength(3);
    // The chair cannot move a hidden proposal (answered like one not in the panel).
    const move = await (
      await g.signIn(g.chair)
    ).post(`/api/review/panels/${g.panelId}/standing/moves`, {
      proposalId: g.proposalIds[1],
      toPosition: 1,
      reason: 'Try',
    });
    expect(move.status).toBe(404);
  });

  it('manager: an unknown panel is 404; a bad id is 400 naming panelId', async () => {
    const m = await manager();
    expect((await m.get('/api/review/panels/2147483000/statistics')).status).toBe(404);
    const bad = await m.get('/api/review/panels/1e3/statistics');
    expect(bad.status).toBe(400);
    expect(bad.body.fieldErrors).toHaveProperty('panelId');
  });
});

describe('PUT triage and spread threshold', () => {
  it('triage (managers): the lowest ⌊f × n⌋ graded proposals by normalised mean are not discussed', async () => {
    const f = await createPanelFixture(h, net, { grades: WORKED });
    const m = await manager();
    const [p1, p2, p3, p4] = f.proposalIds;
    // n = 3 graded; ⌊0.34 × 3⌋ = 1 → P2 (lowest normalised mean).
    let res = await m.put(`/api/review/panels/${f.panelId}/triage`, { fraction: 0.34 });
    expect(res.status).toBe(200);
    const flags = (body: PanelStatisticsReport) => Object.fromEntries(body.proposals.map((p) => [p.proposalId, p.notDiscussed]));
    expect(flags(res.body)).toEqual({ [p1]: false, [p2]: true, [p3]: false, [p4]: false });
    expect(res.body.panel.triageFraction).toBe(0.34);
    // ⌊0.9 × 3⌋ = 2 → P2 and P3; back to 0 clears every flag.
    res = await m.put(`/api/review/panels/${f.panelId}/triage`, { fraction: 0.9 });
    expect(flags(res.body)).toEqual({ [p1]: false, [p2]: true, [p3]: true, [p4]: false });
    res = await m.put(`/api/review/panels/${f.panelId}/triage`, { fraction: 0 });
    expect(Object.values(flags(res.body)).some(Boolean)).toBe(false);

    const bad = await m.put(`/api/review/panels/${f.panelId}/triage`, { fraction: 0.95 });
    expect(bad.status).toBe(400);
    expect(bad.body.fieldErrors).toHaveProperty('fraction');
    // The chair may not triage.
    expect((await (await f.signIn(f.chair)).put(`/api/review/panels/${f.panelId}/triage`, { fraction: 0.5 })).status).toBe(403);
  });

  it('spread threshold (chair at the panel stage): the flag follows it', async () => {
    const f = await createPanelFixture(h, net, { grades: WORKED });
    const chair = await f.signIn(f.chair);
    const p2 = f.proposalIds[1];
    let res = await chair.put(`/api/review/panels/${f.panelId}/spread-threshold`, { spreadThreshold: 7 });
    expect(res.status).toBe(200);
    expect(res.body.proposals.find((p: { proposalId: number }) => p.proposalId === p2).flagged).toBe(false); // 7 is not > 7
    res = await chair.put(`/api/review/panels/${f.panelId}/spread-threshold`, { spreadThreshold: 6.9 });
    expect(res.body.proposals.find((p: { proposalId: number }) => p.proposalId === p2).flagged).toBe(true);
    const bad = await chair.put(`/api/review/panels/${f.panelId}/spread-threshold`, { spreadThreshold: 'x' });
    expect(bad.status).toBe(400);
    expect(bad.body.fieldErrors).toHaveProperty('spreadThreshold');
  });
});

describe('standing: initial order, moves, lock', () => {
  it('created on first read from the normalised mean, not-discussed last; moves shift and are recorded; lock ranks', async () => {
    const f = await createPanelFixture(h, net, { grades: WORKED });
    const m = await manager();
    const [p1, p2, p3, p4] = f.proposalIds;
    await m.put(`/api/review/panels/${f.panelId}/triage`, { fraction: 0.34 }); // P2 not discussed
    const chair = await f.signIn(f.chair);
    let standing = (await chair.get(`/api/review/panels/${f.panelId}/standing`)).body as PanelStanding;
    const order = (s: PanelStanding) => s.entries.map((e) => e.proposal.proposalId);
    expect(order(standing)).toEqual([p1, p3, p4, p2]);
    expect(standing.entries.map((e) => e.position)).toEqual([1, 2, 3, 4]);
    expect(standing.moves).toEqual([]);

    const moved = await chair.post(`/api/review/panels/${f.panelId}/standing/moves`, {
      proposalId: p4,
      toPosition: 1,
      reason: 'Discussed: "strong case", late grades',
    });
    expect(moved.status).toBe(201);
    standing = moved.body;
    expect(order(standing)).toEqual([p4, p1, p3, p2]);
    expect(standing.moves).toEqual([
      expect.objectContaining({ proposalId: p4, fromPosition: 3, toPosition: 1, reason: 'Discussed: "strong case", late grades' }),
    ]);
    const rows = await h.created.ctx.db('standing_moves').where('panel_id', f.panelId);
    expect(rows).toHaveLength(1);
    expect(rows[0].moved_by).toBe(f.chair.id);

    // Validation: reason required, position within the standing, proposal in the standing.
    for (const [body, field] of [
      [{ proposalId: p1, toPosition: 3, reason: '' }, 'reason'],
      [{ proposalId: p1, toPosition: 3 }, 'reason'],
      [{ proposalId: p1, toPosition: 9, reason: 'x' }, 'toPosition'],
      [{ proposalId: p1, toPosition: 2, reason: 'x' }, 'toPosition'],
    ] as const) {
      const res = await m.post(`/api/review/panels/${f.panelId}/standing/moves`, body);
      expect(res.status).toBe(400);
      expect(res.body.fieldErrors).toHaveProperty(field);
    }
    expect(
      (await m.post(`/api/review/panels/${f.panelId}/standing/moves`, { proposalId: 2147483000, toPosition: 1, reason: 'x' })).status,
    ).toBe(404);
    expect(await h.created.ctx.db('standing_moves').where('panel_id', f.panelId)).toHaveLength(1);

    // The manager moves too (down).
    standing = (await m.post(`/api/review/panels/${f.panelId}/standing/moves`, { proposalId: p4, toPosition: 4, reason: 'Back' })).body;
    expect(order(standing)).toEqual([p1, p3, p2, p4]);
    expect(standing.moves.map((x) => x.toPosition)).toEqual([4, 1]);

    // Lock: proposals in review become ranked; later moves and a second lock are refused with 409.
    const locked = await chair.post(`/api/review/panels/${f.panelId}/standing/lock`);
    expect(locked.status).toBe(200);
    expect(locked.body.locked).toBe(true);
    expect(locked.body.panel.standingLockedAt).not.toBeNull();
    const states = await h.created.ctx.db('proposals').whereIn('id', f.proposalIds).pluck('state');
    expect(states).toEqual(['ranked', 'ranked', 'ranked', 'ranked']);
    const after = await m.post(`/api/review/panels/${f.panelId}/standing/moves`, { proposalId: p1, toPosition: 2, reason: 'Late' });
    expect(after.status).toBe(409);
    expect((await chair.post(`/api/review/panels/${f.panelId}/standing/lock`)).status).toBe(409);
    expect((await m.put(`/api/review/panels/${f.panelId}/triage`, { fraction: 0.5 })).status).toBe(409);
    expect(order((await chair.get(`/api/review/panels/${f.panelId}/standing`)).body)).toEqual([p1, p3, p2, p4]);
  });

  it('a proposal that joins the panel later is appended; lock before the deadline is refused (409)', async () => {
    const f = await createPanelFixture(h, net, { grades: [[5], [7]], deadline: 'future' });
    const m = await manager();
    const first = (await m.get(`/api/review/panels/${f.panelId}/standing`)).body as PanelStanding;
    expect(first.entries.map((e) => e.proposal.proposalId)).toEqual([f.proposalIds[1], f.proposalIds[0]]);
    const extra = await createPanelFixture(h, net, { grades: [[9]], deadline: 'future', cycleId: f.cycleId });
    await h.created.ctx.db('proposals').where('id', extra.proposalIds[0]).update({ panel_id: f.panelId });
    const again = (await m.post(`/api/review/panels/${f.panelId}/standing/initialise`)).body as PanelStanding;
    expect(again.entries.map((e) => e.proposal.proposalId)).toEqual([f.proposalIds[1], f.proposalIds[0], extra.proposalIds[0]]);
    const lock = await m.post(`/api/review/panels/${f.panelId}/standing/lock`);
    expect(lock.status).toBe(409);
    expect(lock.body.code).toBe('not_panel_stage');
  });
});

describe('CSV exports', () => {
  it('matrix.csv: text/csv, neutral file name, quoted and formula-escaped cells, team columns only for managers', async () => {
    const f = await createPanelFixture(h, net, {
      grades: [
        [8, 6],
        [5, 7],
      ],
      anonymous: true,
      titles: ['Spots, "faculae" and flares', '=SUM(A1:A3) rotation'],
    });
    const res = await (await manager()).get(`/api/review/panels/${f.panelId}/matrix.csv`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    expect(res.headers['content-disposition']).toBe(`attachment; filename=panel-${f.panelId}-grades.csv`);
    const lines = res.text.trim().split('\r\n');
    expect(lines[0]).toMatch(/^proposal_id,title,pi,pi_affiliation,Reviewer A\d+ grade,Reviewer A\d+ normalised,Reviewer B\d+ grade/);
    expect(res.text).toContain('"Spots, ""faculae"" and flares"');
    expect(res.text).toContain("'=SUM(A1:A3) rotation");
    // Worked by hand: A gave 8 and 5 (mean 6.5, sd 1.5 → z ±1), B 6 and 7 (mean 6.5, sd 0.5 → z ∓1).
    const row = lines.find((l) => l.startsWith(`${f.proposalIds[0]},`))!;
    expect(row).toMatch(/,8,1,6,-1,7,7,0,2,no,no$/);

    const chairCsv = await (await f.signIn(f.chair)).get(`/api/review/panels/${f.panelId}/matrix.csv`);
    expect(chairCsv.status).toBe(200);
    expect(chairCsv.text.split('\r\n')[0]).not.toContain('pi');
    expect(chairCsv.text).not.toMatch(/Proposer|Test Station/);
  });

  it('standing.csv: the columns of the standing, position order', async () => {
    const f = await createPanelFixture(h, net, {
      grades: [
        [5, 5],
        [8, 7],
      ],
    });
    const res = await (await f.signIn(f.chair)).get(`/api/review/panels/${f.panelId}/standing.csv`);
    expect(res.status).toBe(200);
    expect(res.headers['content-disposition']).toBe(`attachment; filename=panel-${f.panelId}-standing.csv`);
    const lines = res.text.trim().split('\r\n');
    expect(lines[0]).toBe('position,proposal_id,title,normalised_mean,mean,median,spread,flagged,not_discussed');
    expect(lines[1].startsWith(`1,${f.proposalIds[1]},`)).toBe(true);
    expect(lines[2].startsWith(`2,${f.proposalIds[0]},`)).toBe(true);
  });
});

describe('GET /api/review/cycles/:cycleId/pressure', () => {
  it('per node requested over available; per RA bin requested over dark hours; only in review or ranked, feasible, requested nodes', async () => {
    const f = await createPanelFixture(h, net, { grades: [[5], [6], [7]] });
    const [a, b, c] = f.proposalIds;
    const [n0, n1] = net.nodeIds;
    // Worked by hand in this test: node 0 gets 30 (A, RA 15° → bin 0) + 50 (B, RA 100° → bin 3) = 80;
    // node 1 gets 12 (A). Not counted: an infeasible plan (A, 40 h), a draft's plan (C, 99 h).
    await addTargetWithPlans(h, a, 15, [
      { nodeId: n0, nodeHours: 30 },
      { nodeId: n1, nodeHours: 12 },
    ]);
    await addTargetWithPlans(h, a, 200, [{ nodeId: n0, nodeHours: 40, feasible: false }]);
    await addTargetWithPlans(h, b, 100, [{ nodeId: n0, nodeHours: 50 }]);
    await addTargetWithPlans(h, c, 100, [{ nodeId: n0, nodeHours: 99 }]);
    await h.created.ctx.db('proposals').where('id', c).update({ state: 'submitted' });
    await h.created.ctx.db('proposals').where('id', b).update({ state: 'ranked' });

    const res = await (await manager()).get(`/api/review/cycles/${f.cycleId}/pressure`);
    expect(res.status).toBe(200);
    const body = res.body as CyclePressureReport;
    expect(body.proposalCount).toBe(2);
    const node = (id: number) => body.nodes.find((x) => x.nodeId === id)!;
    expect(node(n0)).toMatchObject({ requestedNodeHours: 80, availableNodeHours: 500, pressure: 0.16 });
    expect(node(n1)).toMatchObject({ requestedNodeHours: 12, pressure: 0.024 });
    expect(body.raBins).toHaveLength(12);
    expect(body.raBins[0].requestedNodeHours).toBe(42);
    expect(body.raBins[3].requestedNodeHours).toBe(50);
    expect(body.raBins[6].requestedNodeHours).toBe(0);
    expect(body.raBins.some((bin) => bin.darkHours > 0)).toBe(true);
    for (const bin of body.raBins) expect(bin.pressure).toBe(bin.darkHours > 0 ? bin.requestedNodeHours / bin.darkHours : null);

    // The chair at the panel stage may read it; a proposer may not; an unknown cycle is 404 for managers.
    expect((await (await f.signIn(f.chair)).get(`/api/review/cycles/${f.cycleId}/pressure`)).status).toBe(200);
    expect((await (await f.signIn(f.pis[0])).get(`/api/review/cycles/${f.cycleId}/pressure`)).status).toBe(403);
    expect((await (await manager()).get('/api/review/cycles/2147483000/pressure')).status).toBe(404);
  });
});
