import type { AuditEntry, AwardBoard, ReleaseResult, TeamDecision } from '@spincycle/shared/awards/awards';
import { Browser, startHarness, type Harness } from '../../../../test/support/api-harness';
import { createTestNetwork, type TestNetwork } from '../../../../test/api/support/proposal-kit';
import { account, awardBody, browserFor, createAwardFixture, decideAll, type AwardFixture } from './testing/award-fixtures';

let h: Harness;
let net: TestNetwork;
let manager: Browser;
let managerId: number;

beforeAll(async () => {
  h = await startHarness({ LOGIN_RATE_LIMIT: 10_000 });
  net = await createTestNetwork(h, 'AW');
  const m = await account(h, ['facility_manager'], 'Manager Awards');
  managerId = m.id;
  manager = await browserFor(h, m);
});
afterAll(async () => {
  await net.cleanUp();
  await h.close();
});

const db = () => h.created.ctx.db;
const board = async (f: AwardFixture) => (await manager.get(`/api/awards/cycles/${f.cycleId}`)).body as AwardBoard;
const put = async (proposalId: number, body: object) => manager.put(`/api/awards/proposals/${proposalId}`, body);
const audit = async (f: AwardFixture) => (await manager.get(`/api/awards/cycles/${f.cycleId}/audit`)).body as AuditEntry[];

/*
 * The worked example (worked by hand in this test). Nodes A (offers 100 node-hours, weather
 * loss 0.3 → 70 clear) and B (offers 50, weather loss 0.25 → 37.5 clear).
 *   P1: T1 A 20.25 + B 10; T2 A 15.5; T3 A 5 (infeasible)  → requests A 35.75, B 10
 *   P2: T1 A 30; T2 B 25                                   → requests A 30, B 25
 *   P3: T1 B 40                                            → requests B 40
 * Decisions: P1 awarded A 35.75 + B 10; P2 reserve A 30; P3 awarded B 40.
 *   A: awarded 35.75, remaining 64.25, reserve 30, requested 35.75 + 30 = 65.75
 *   B: awarded 10 + 40 = 50, remaining 0, reserve 0, requested 10 + 25 + 40 = 75
 * Grades (reviewer 1, reviewer 2): P1 8, 7; P2 6, 7; P3 4, 5.
 *   Reviewer 1: mean 6, population sd √(8/3) = 1.632993 → z 1.224745, 0, −1.224745
 *   Reviewer 2: mean 6.333333, sd √(8/9) = 0.942809 → z 0.707107, 0.707107, −1.414214
 *   mean z: P1 0.965926, P2 0.353553, P3 −1.319479
 */
const WORKED = {
  capacities: [100, 50],
  proposals: [
    [
      [
        { node: 0, hours: 20.25 },
        { node: 1, hours: 10 },
      ],
      [{ node: 0, hours: 15.5 }],
      [{ node: 0, hours: 5, feasible: false }],
    ],
    [[{ node: 0, hours: 30 }], [{ node: 1, hours: 25 }]],
    [[{ node: 1, hours: 40 }]],
  ],
  grades: [
    [8, 7],
    [6, 7],
    [4, 5],
  ] as [number, number][],
};

async function workedFixture(): Promise<AwardFixture> {
  const f = await createAwardFixture(h, net, WORKED);
  await db()('nodes').where('id', f.nodeIds[1]).update({ weather_loss_fraction: 0.25 });
  return f;
}

describe('the award board and decisions (worked example)', () => {
  let f: AwardFixture;
  let A: number;
  let B: number;
  beforeAll(async () => {
    f = await workedFixture();
    [A, B] = f.nodeIds;
  });
  afterAll(async () => {
    await db()('nodes').where('id', f.nodeIds[1]).update({ weather_loss_fraction: 0.3 });
  });

  it('before any decision: requests, mean z, offered and clear hours, nothing awarded', async () => {
    const b = await board(f);
    expect(b.rows.map((r) => r.proposalId)).toEqual(f.proposalIds);
    expect(b.rows.map((r) => r.position)).toEqual([1, 2, 3]);
    expect(b.undecided).toBe(3);
    const [p1, p2, p3] = b.rows;
    expect(p1.requests).toEqual([
      { nodeId: A, requestedHours: 35.75, neededForAwardedTargets: 35.75 },
      { nodeId: B, requestedHours: 10, neededForAwardedTargets: 10 },
    ]);
    expect(p1).toMatchObject({ targetCount: 3, feasibleTargets: 2, state: 'ranked', award: null, programState: null });
    expect(p1.targets.map((t) => t.feasible)).toEqual([true, true, false]);
    // Worked by hand in this test (see the comment above).
    expect(p1.meanZ).toBeCloseTo(0.965926, 6);
    expect(p2.meanZ).toBeCloseTo(0.353553, 6);
    expect(p3.meanZ).toBeCloseTo(-1.319479, 6);
    expect(b.nodes.find((n) => n.nodeId === A)).toMatchObject({ offeredHours: 100, clearHours: 70, awardedHours: 0, remainingHours: 100 });
    expect(b.nodes.find((n) => n.nodeId === B)).toMatchObject({ offeredHours: 50, clearHours: 37.5, requestedHours: 75 });
    expect(b.panels).toEqual([{ id: f.panelId, name: expect.any(String), standingLocked: true, proposals: 3 }]);
  });

  it('decisions: the capacity numbers of the worked example', async () => {
    const [p1, p2, p3] = f.proposalIds;
    expect(
      (
        await put(
          p1,
          await awardBody(h, p1, {
            outcome: 'awarded',
            nodes: [
              { nodeId: A, nodeHours: 35.75 },
              { nodeId: B, nodeHours: 10 },
            ],
          }),
        )
      ).status,
    ).toBe(200);
    expect((await put(p2, await awardBody(h, p2, { outcome: 'reserve', nodes: [{ nodeId: A, nodeHours: 30 }] }))).status).toBe(200);
    const res = await put(p3, await awardBody(h, p3, { outcome: 'awarded', nodes: [{ nodeId: B, nodeHours: 40 }] }));
    expect(res.status).toBe(200);
    const b = res.body as AwardBoard;
    // Worked by hand in this test (see the comment above).
    expect(b.nodes.find((n) => n.nodeId === A)).toMatchObject({
      offeredHours: 100,
      clearHours: 70,
      awardedHours: 35.75,
      remainingHours: 64.25,
      reserveHours: 30,
      requestedHours: 65.75,
    });
    expect(b.nodes.find((n) => n.nodeId === B)).toMatchObject({
      offeredHours: 50,
      clearHours: 37.5,
      awardedHours: 50,
      remainingHours: 0,
      reserveHours: 0,
      requestedHours: 75,
    });
    expect(b.undecided).toBe(0);
    expect(b.rows[0].award).toMatchObject({ outcome: 'awarded', version: 1, decidedBy: 'Manager Awards', mailedAt: null, targetIds: null });
    // Before the release a decision does not change the proposal's state.
    expect(b.rows.map((r) => r.state)).toEqual(['ranked', 'ranked', 'ranked']);
  });

  it('capacity exceeded: 409 naming nodes.0.nodeHours with offered, awarded and what would be left; accepted with a reason', async () => {
    const [, p2] = f.proposalIds;
    const body = await awardBody(h, p2, { outcome: 'awarded', nodes: [{ nodeId: B, nodeHours: 25 }] });
    const refused = await put(p2, body);
    expect(refused.status).toBe(409);
    expect(refused.body.code).toBe('capacity_exceeded');
    // 50 offered, 50 already awarded (P1 10 + P3 40), 25 more leave −25 (worked by hand in this test).
    expect(refused.body.fieldErrors['nodes.0.nodeHours'][0]).toMatch(
      /offers 50\.00 node-hours and 50\.00 are already awarded.*leave -25\.00/,
    );
    expect((await db()('awards').where('proposal_id', p2).first()).outcome).toBe('reserve');

    const emptyReason = await put(p2, { ...body, overrideReason: '   ' });
    expect(emptyReason.status).toBe(409);

    const ok = await put(p2, { ...body, overrideReason: 'Night B is shared with a partner this cycle', note: 'Agreed at the meeting' });
    expect(ok.status).toBe(200);
    const nodeB = (ok.body as AwardBoard).nodes.find((n) => n.nodeId === B)!;
    expect(nodeB).toMatchObject({ awardedHours: 75, remainingHours: -25 });
    const entry = (await audit(f)).find((e) => e.entityId === p2 && e.action === 'changed')!;
    expect(entry.reason).toBe('Over capacity: Night B is shared with a partner this cycle — Agreed at the meeting');
    expect(entry.before).toEqual({ outcome: 'reserve', nodes: [{ nodeId: A, nodeHours: 30 }], targetIds: null, overrideReason: null });
    expect(entry.after).toEqual({
      outcome: 'awarded',
      nodes: [{ nodeId: B, nodeHours: 25 }],
      targetIds: null,
      overrideReason: 'Night B is shared with a partner this cycle',
    });
  });

  it('stale version: 409 with the current row, nothing written', async () => {
    const [p1] = f.proposalIds;
    const res = await put(p1, { version: 0, outcome: 'not_awarded', nodes: [], targetIds: null, overrideReason: null });
    expect(res.status).toBe(409);
    expect(res.body.code).toBe('stale_version');
    expect(res.body.row).toMatchObject({ proposalId: p1, award: { version: 1, outcome: 'awarded' } });
    expect((await db()('awards').where('proposal_id', p1).first()).outcome).toBe('awarded');
  });

  it('partial award: neededForAwardedTargets counts the feasible plans of the awarded targets only', async () => {
    const [p1] = f.proposalIds;
    const [t1, , t3] = f.targetIds[0];
    const res = await put(
      p1,
      await awardBody(h, p1, { outcome: 'awarded', nodes: [{ nodeId: A, nodeHours: 20.25 }], targetIds: [t1, t3], note: 'T2 not needed' }),
    );
    expect(res.status).toBe(200);
    const row = (res.body as AwardBoard).rows.find((r) => r.proposalId === p1)!;
    expect(row.award).toMatchObject({ targetIds: [t1, t3], nodes: [{ nodeId: A, nodeHours: 20.25 }], version: 2 });
    // T1 20.25 on A and 10 on B; T3 is infeasible (worked by hand in this test).
    expect(row.requests).toEqual([
      { nodeId: A, requestedHours: 35.75, neededForAwardedTargets: 20.25 },
      { nodeId: B, requestedHours: 10, neededForAwardedTargets: 10 },
    ]);
    // Naming every target is stored as "every target".
    const all = await put(
      p1,
      await awardBody(h, p1, { outcome: 'awarded', nodes: [{ nodeId: A, nodeHours: 20.25 }], targetIds: f.targetIds[0] }),
    );
    expect(all.body.rows.find((r: { proposalId: number }) => r.proposalId === p1).award.targetIds).toBeNull();
  });

  it('the audit log: decided then changed, with before and after, newest first', async () => {
    const [p1] = f.proposalIds;
    const entries = (await audit(f)).filter((e) => e.entityId === p1 && e.entity === 'award');
    expect(entries.map((e) => e.action)).toEqual(['changed', 'changed', 'decided']);
    expect(entries[2]).toMatchObject({ before: null, actorName: 'Manager Awards', proposalTitle: f.titles[0], reason: null });
    expect(entries[1]).toMatchObject({
      before: { outcome: 'awarded', targetIds: null },
      after: { outcome: 'awarded', targetIds: f.targetIds[0].filter((_, i) => i !== 1), nodes: [{ nodeId: A, nodeHours: 20.25 }] },
      reason: 'T2 not needed',
    });
    const ats = (await audit(f)).map((e) => Date.parse(e.at));
    expect([...ats].sort((a, b) => b - a)).toEqual(ats);
  });
});

describe('one transaction: a failing audit insert leaves the award as it was', () => {
  it('the decision is rolled back with its audit entry', async () => {
    const f = await createAwardFixture(h, net, { capacities: [100], proposals: [[[{ node: 0, hours: 10 }]]] });
    const [p] = f.proposalIds;
    const A = f.nodeIds[0];
    expect((await put(p, await awardBody(h, p, { outcome: 'awarded', nodes: [{ nodeId: A, nodeHours: 10 }] }))).status).toBe(200);
    // A trigger refuses this proposal's next audit entry (only its own: other tests write the log too).
    const fn = `refuse_audit_${f.cycleId}`;
    await db().raw(`CREATE FUNCTION ${fn}() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN IF NEW.entity_id = ${p} AND NEW.entity = 'award' THEN RAISE EXCEPTION 'audit refused by the test'; END IF; RETURN NEW; END $$`);
    await db().raw(`CREATE TRIGGER ${fn} BEFORE INSERT ON audit_log FOR EACH ROW EXECUTE FUNCTION ${fn}()`);
    try {
      const res = await put(p, await awardBody(h, p, { outcome: 'not_awarded', nodes: [] }));
      expect(res.status).toBe(500);
    } finally {
      await db().raw(`DROP TRIGGER ${fn} ON audit_log`);
      await db().raw(`DROP FUNCTION ${fn}()`);
    }
    const award = await db()('awards').where('proposal_id', p).first();
    expect(award).toMatchObject({ outcome: 'awarded', version: 1 });
    expect(await db()('award_nodes').where('proposal_id', p).select('node_id', 'node_hours')).toEqual([{ node_id: A, node_hours: 10 }]);
    expect(await db()('audit_log').where({ entity: 'award', entity_id: p }).pluck('action')).toEqual(['decided']);
  });
});

describe('refusals', () => {
  let f: AwardFixture;
  beforeAll(async () => {
    f = await createAwardFixture(h, net, {
      capacities: [100, 100],
      proposals: [[[{ node: 0, hours: 10 }]], [[{ node: 1, hours: 10 }]]],
    });
  });

  it.each([
    ['an award without nodes', 'nodes', { outcome: 'awarded', nodes: [] }],
    ['not awarded with nodes', 'nodes', { outcome: 'not_awarded', nodes: [{ nodeId: 0, nodeHours: 5 }] }],
    ['not awarded with targets', 'targetIds', { outcome: 'not_awarded', nodes: [], targetIds: [1] }],
    ['node-hours of 0', 'nodes.0.nodeHours', { outcome: 'awarded', nodes: [{ nodeId: 0, nodeHours: 0 }] }],
    ['node-hours with three decimals', 'nodes.0.nodeHours', { outcome: 'awarded', nodes: [{ nodeId: 0, nodeHours: 1.234 }] }],
    ['an unknown outcome', 'outcome', { outcome: 'granted', nodes: [] }],
  ])('400 for %s, naming %s', async (_name, field, decision) => {
    const p = f.proposalIds[0];
    const nodes = (decision.nodes as { nodeId: number; nodeHours: number }[]).map((n) => ({ ...n, nodeId: f.nodeIds[n.nodeId] }));
    const res = await put(p, { version: 0, targetIds: null, overrideReason: null, ...decision, nodes });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.fieldErrors)).toEqual([field]);
  });

  it('400 for a node the cycle does not offer, a node listed twice, a target of another proposal', async () => {
    const [p, q] = f.proposalIds;
    const notOffered = net.nodeIds[2];
    const a = await put(p, await awardBody(h, p, { outcome: 'awarded', nodes: [{ nodeId: notOffered, nodeHours: 5 }] }));
    expect(a.status).toBe(400);
    expect(a.body.fieldErrors).toEqual({ 'nodes.0.nodeId': [expect.stringContaining('not offered')] });
    const twice = [
      { nodeId: f.nodeIds[0], nodeHours: 5 },
      { nodeId: f.nodeIds[0], nodeHours: 6 },
    ];
    const b = await put(p, await awardBody(h, p, { outcome: 'awarded', nodes: twice }));
    expect(b.body.fieldErrors).toEqual({ 'nodes.1.nodeId': [expect.stringContaining('twice')] });
    const c = await put(
      p,
      await awardBody(h, p, {
        outcome: 'awarded',
        nodes: [{ nodeId: f.nodeIds[0], nodeHours: 5 }],
        targetIds: [f.targetIds[0][0], f.targetIds[1][0]],
      }),
    );
    expect(c.status).toBe(400);
    expect(c.body.fieldErrors).toEqual({ 'targetIds.1': [expect.stringContaining('not a target of this proposal')] });
    expect(await db()('awards').whereIn('proposal_id', [p, q])).toEqual([]);
  });

  it('404 for an unknown proposal, 400 for a malformed id', async () => {
    const body = { version: 0, outcome: 'not_awarded', nodes: [], targetIds: null, overrideReason: null };
    expect((await put(2_000_000_000, body)).status).toBe(404);
    const bad = await put('abc' as unknown as number, body);
    expect(bad.status).toBe(400);
    expect(bad.body.fieldErrors).toHaveProperty('proposalId');
    expect((await manager.get('/api/awards/cycles/2000000000')).status).toBe(404);
    expect((await manager.get('/api/awards/cycles/2000000000/audit')).status).toBe(404);
    expect((await manager.post('/api/awards/cycles/2000000000/release', { confirm: true })).status).toBe(404);
  });

  it('409 standing_not_locked until the panel locks its standing (through the review route)', async () => {
    const g = await createAwardFixture(h, net, { capacities: [100], proposals: [[[{ node: 0, hours: 10 }]]], locked: false });
    const [p] = g.proposalIds;
    const body = await awardBody(h, p, { outcome: 'awarded', nodes: [{ nodeId: g.nodeIds[0], nodeHours: 10 }] });
    const refused = await put(p, body);
    expect(refused.status).toBe(409);
    expect(refused.body.code).toBe('standing_not_locked');
    expect((await board(g)).rows).toEqual([]);
    expect((await manager.post(`/api/review/panels/${g.panelId}/standing/lock`)).status).toBe(200);
    const ok = await put(p, body);
    expect(ok.status).toBe(200);
    expect((ok.body as AwardBoard).rows.map((r) => r.proposalId)).toEqual([p]);
  });
});

describe('release', () => {
  let f: AwardFixture;
  let result: ReleaseResult;
  beforeAll(async () => {
    h.mail.clear();
    f = await createAwardFixture(h, net, {
      capacities: [100, 60],
      proposals: [
        [[{ node: 0, hours: 12.5 }], [{ node: 1, hours: 8 }]],
        [[{ node: 0, hours: 20 }], [{ node: 0, hours: 5 }]],
        [[{ node: 1, hours: 30 }]],
        [[{ node: 1, hours: 40 }]],
      ],
    });
  });

  it('409 undecided, naming the proposals without a decision', async () => {
    const [p1] = f.proposalIds;
    await put(p1, await awardBody(h, p1, { outcome: 'awarded', nodes: [{ nodeId: f.nodeIds[0], nodeHours: 12.5 }] }));
    const res = await manager.post(`/api/awards/cycles/${f.cycleId}/release`, { confirm: true });
    expect(res.status).toBe(409);
    expect(res.body.code).toBe('undecided');
    expect(res.body.proposalIds).toEqual(f.proposalIds.slice(1));
    expect(res.body.message).toContain(f.titles[1]);
    expect(await db()('proposals').whereIn('id', f.proposalIds).pluck('state')).toEqual(['ranked', 'ranked', 'ranked', 'ranked']);
  });

  it('400 without the confirmation', async () => {
    const res = await manager.post(`/api/awards/cycles/${f.cycleId}/release`, {});
    expect(res.status).toBe(400);
    expect(res.body.fieldErrors).toHaveProperty('confirm');
  });

  it('releases: states, programs, audit entries, one mail per team', async () => {
    const [A, B] = f.nodeIds;
    await decideAll(manager, h, f, {
      0: {
        outcome: 'awarded',
        nodes: [
          { nodeId: A, nodeHours: 12.5 },
          { nodeId: B, nodeHours: 8 },
        ],
      },
      1: { outcome: 'awarded', nodes: [{ nodeId: A, nodeHours: 20 }], targetIds: [f.targetIds[1][0]] },
      2: { outcome: 'reserve', nodes: [{ nodeId: B, nodeHours: 30 }] },
    });
    const res = await manager.post(`/api/awards/cycles/${f.cycleId}/release`, { confirm: true });
    expect(res.status).toBe(200);
    result = res.body as ReleaseResult;
    expect(result).toMatchObject({ mailed: 4, mailFailures: 0, programsCreated: 2 });
    expect(result.board.cycle.releasedAt).not.toBeNull();
    expect(result.board.rows.map((r) => r.state)).toEqual(['awarded', 'awarded', 'reserve', 'not_awarded']);
    expect(result.board.rows.map((r) => r.programState)).toEqual(['scheduled', 'scheduled', null, null]);
    expect(result.board.rows.every((r) => r.award!.mailedAt !== null)).toBe(true);
    const cycle = await db()('cycles').where('id', f.cycleId).first('awards_released_by');
    expect(cycle.awards_released_by).toBe(managerId);
    const entries = await audit(f);
    expect(entries[0]).toMatchObject({
      entity: 'release',
      entityId: f.cycleId,
      after: { awarded: 2, reserve: 1, notAwarded: 1, programsCreated: 2 },
    });
    const released = entries.filter((e) => e.action === 'released' && e.entity === 'award');
    expect(released.map((e) => e.entityId).sort()).toEqual([...f.proposalIds].sort());
    expect(released.find((e) => e.entityId === f.proposalIds[2])).toMatchObject({
      before: { proposalState: 'ranked' },
      after: { proposalState: 'reserve', program: null },
    });
  });

  it('the mails: outcome, node-hours per node, partial targets, anonymous comments, no committee note, to the accepted team', async () => {
    const mail1 = await h.mail.waitFor((m) => m.to.includes(f.pis[0].email));
    expect(mail1.to.sort()).toEqual([f.pis[0].email, f.cois[0].email].sort());
    expect(mail1.subject).toBe(`Decision on your proposal in ${f.cycleCode}: Awarded`);
    const [nodeA, nodeB] = net.nodes;
    expect(mail1.text).toContain(`- ${nodeA.code} (Test 50): 12.50 node-hours`);
    expect(mail1.text).toContain(`- ${nodeB.code} (Test 40): 8.00 node-hours`);
    expect(mail1.text).toContain("The consortium's own allocation rules govern");
    expect(mail1.text).not.toContain('partial award');
    const mail2 = await h.mail.waitFor((m) => m.to.includes(f.pis[1].email));
    expect(mail2.text).toContain('partial award, for 1 of your targets');
    expect(mail2.text).toContain(`- Star W`);
    const mail3 = await h.mail.waitFor((m) => m.to.includes(f.pis[2].email));
    expect(mail3.text).toContain('Outcome: Reserve');
    expect(mail3.text).toContain('30.00 node-hours');
    const mail4 = await h.mail.waitFor((m) => m.to.includes(f.pis[3].email));
    expect(mail4.text).toContain('Outcome: Not awarded');

    for (const [i, mail] of [mail1, mail2, mail3, mail4].entries()) {
      // Reviewer 1 then Reviewer 2, in assignment order, strengths and weaknesses only.
      const r1 = mail.text.indexOf('Reviewer 1');
      const r2 = mail.text.indexOf('Reviewer 2');
      expect(r1).toBeGreaterThan(0);
      expect(r2).toBeGreaterThan(r1);
      expect(mail.text).toContain(f.texts.strengths[i * 2]);
      expect(mail.text).toContain(f.texts.weaknesses[i * 2 + 1]);
      expect(mail.text.indexOf(f.texts.strengths[i * 2])).toBeLessThan(r2);
      for (const note of f.texts.committeeNotes) expect(mail.text).not.toContain(note);
      expect(mail.text).not.toContain('COMMITTEE ONLY');
      for (const r of f.reviewers) {
        expect(mail.text).not.toContain(r.displayName);
        expect(mail.text).not.toContain(r.email);
        expect(mail.to).not.toContain(r.email);
      }
      expect(mail.to.some((t) => t.startsWith('pending-'))).toBe(false);
    }
  });

  it('the team reads its decision (anonymous comments); others get 404', async () => {
    const [p1, p2] = f.proposalIds;
    const pi = await browserFor(h, f.pis[1]);
    const res = await pi.get(`/api/awards/proposals/${p2}/decision`);
    expect(res.status).toBe(200);
    const d = res.body as TeamDecision;
    expect(d).toMatchObject({ proposalId: p2, outcome: 'awarded', programState: 'scheduled', cycleCode: f.cycleCode });
    expect(d.nodes).toEqual([{ nodeId: f.nodeIds[0], nodeHours: 20, code: net.nodes[0].code, name: 'Test 50' }]);
    expect(d.awardedTargets).toEqual([expect.stringMatching(/^Star W/)]);
    expect(d.comments.map((c) => c.reviewer)).toEqual(['Reviewer 1', 'Reviewer 2']);
    expect(JSON.stringify(d)).not.toContain('COMMITTEE ONLY');
    for (const r of f.reviewers) expect(JSON.stringify(d)).not.toContain(r.displayName);
    expect((await (await browserFor(h, f.cois[1])).get(`/api/awards/proposals/${p2}/decision`)).status).toBe(200);
    expect((await pi.get(`/api/awards/proposals/${p1}/decision`)).status).toBe(404);
    expect((await (await browserFor(h, f.reviewers[0])).get(`/api/awards/proposals/${p2}/decision`)).status).toBe(404);
  });

  it('a second release: 409 already_released', async () => {
    const res = await manager.post(`/api/awards/cycles/${f.cycleId}/release`, { confirm: true });
    expect(res.status).toBe(409);
    expect(res.body.code).toBe('already_released');
  });

  it('a change after the release: state, program withdrawn and reinstated, audit entries, mail to the team', async () => {
    const [p1] = f.proposalIds;
    h.mail.clear();
    const res = await put(p1, await awardBody(h, p1, { outcome: 'not_awarded', nodes: [], note: 'Node A lost to maintenance' }));
    expect(res.status).toBe(200);
    const row = (res.body as AwardBoard).rows.find((r) => r.proposalId === p1)!;
    expect(row).toMatchObject({ state: 'not_awarded', programState: 'withdrawn' });
    expect(row.award!.mailedAt).not.toBeNull();
    const mail = await h.mail.waitFor((m) => m.to.includes(f.pis[0].email));
    expect(mail.text).toContain('has changed');
    expect(mail.text).toContain('Outcome: Not awarded');
    const entries = await audit(f);
    expect(entries.find((e) => e.entity === 'program' && e.entityId === p1)).toMatchObject({
      action: 'withdrawn',
      before: { state: 'scheduled' },
      after: { state: 'withdrawn', proposalState: 'not_awarded' },
    });

    const back = await put(p1, await awardBody(h, p1, { outcome: 'awarded', nodes: [{ nodeId: f.nodeIds[0], nodeHours: 10 }] }));
    expect(back.status).toBe(200);
    expect((back.body as AwardBoard).rows.find((r) => r.proposalId === p1)).toMatchObject({ state: 'awarded', programState: 'scheduled' });
    expect((await audit(f))[0]).toMatchObject({ entity: 'program', entityId: p1, action: 'reinstated' });

    // A reserve proposal promoted after the release gets its program.
    const p3 = f.proposalIds[2];
    const promoted = await put(p3, await awardBody(h, p3, { outcome: 'awarded', nodes: [{ nodeId: f.nodeIds[1], nodeHours: 30 }] }));
    expect((promoted.body as AwardBoard).rows.find((r) => r.proposalId === p3)).toMatchObject({
      state: 'awarded',
      programState: 'scheduled',
    });
    expect((await audit(f))[0]).toMatchObject({ entity: 'program', entityId: p3, action: 'created', before: null });
  });
});

describe('release: a failing mail is counted and logged, not fatal', () => {
  it('mailFailures counts it and leaves that award unmailed', async () => {
    const f = await createAwardFixture(h, net, { capacities: [100], proposals: [[[{ node: 0, hours: 10 }]], [[{ node: 0, hours: 10 }]]] });
    await decideAll(manager, h, f, { 0: { outcome: 'awarded', nodes: [{ nodeId: f.nodeIds[0], nodeHours: 10 }] } });
    const real = h.created.ctx.mailer;
    const sent: string[][] = [];
    h.created.ctx.mailer = {
      async send(mail) {
        const to = ([] as string[]).concat(mail.to);
        if (to.includes(f.pis[1].email)) throw new Error('relay refused the message (test)');
        sent.push(to);
      },
      close() {},
    };
    let res;
    try {
      res = await manager.post(`/api/awards/cycles/${f.cycleId}/release`, { confirm: true });
    } finally {
      h.created.ctx.mailer = real;
    }
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ mailed: 1, mailFailures: 1, programsCreated: 1 });
    expect(sent).toEqual([expect.arrayContaining([f.pis[0].email, f.cois[0].email])]);
    const mailed = await db()('awards').whereIn('proposal_id', f.proposalIds).orderBy('proposal_id').pluck('mailed_at');
    expect(mailed[0]).not.toBeNull();
    expect(mailed[1]).toBeNull();
  });
});

describe('release in one transaction', () => {
  it('a failing release audit entry leaves states, programs and the cycle untouched, and mails nobody', async () => {
    const f = await createAwardFixture(h, net, { capacities: [100], proposals: [[[{ node: 0, hours: 10 }]]] });
    await decideAll(manager, h, f, { 0: { outcome: 'awarded', nodes: [{ nodeId: f.nodeIds[0], nodeHours: 10 }] } });
    h.mail.clear();
    const fn = `refuse_release_${f.cycleId}`;
    await db().raw(`CREATE FUNCTION ${fn}() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN IF NEW.entity = 'release' AND NEW.entity_id = ${f.cycleId} THEN RAISE EXCEPTION 'release refused by the test'; END IF; RETURN NEW; END $$`);
    await db().raw(`CREATE TRIGGER ${fn} BEFORE INSERT ON audit_log FOR EACH ROW EXECUTE FUNCTION ${fn}()`);
    try {
      expect((await manager.post(`/api/awards/cycles/${f.cycleId}/release`, { confirm: true })).status).toBe(500);
    } finally {
      await db().raw(`DROP TRIGGER ${fn} ON audit_log`);
      await db().raw(`DROP FUNCTION ${fn}()`);
    }
    expect(await db()('proposals').whereIn('id', f.proposalIds).pluck('state')).toEqual(['ranked']);
    expect(await db()('programs').whereIn('proposal_id', f.proposalIds)).toEqual([]);
    expect((await db()('cycles').where('id', f.cycleId).first('awards_released_at')).awards_released_at).toBeNull();
    expect(await db()('audit_log').where({ cycle_id: f.cycleId, action: 'released' })).toEqual([]);
    expect(h.mail.messages().filter((m) => m.to.includes(f.pis[0].email))).toEqual([]);
  });
});

describe('GET /api/awards/cycles', () => {
  it('lists cycles with panels, with their counts', async () => {
    const f = await createAwardFixture(h, net, { capacities: [100], proposals: [[[{ node: 0, hours: 10 }]], [[{ node: 0, hours: 10 }]]] });
    await put(f.proposalIds[0], await awardBody(h, f.proposalIds[0], { outcome: 'not_awarded', nodes: [] }));
    const res = await manager.get('/api/awards/cycles');
    expect(res.status).toBe(200);
    expect(res.body.find((c: { id: number }) => c.id === f.cycleId)).toEqual({
      id: f.cycleId,
      code: f.cycleCode,
      title: expect.any(String),
      lockedPanels: 1,
      panels: 1,
      ranked: 2,
      decided: 1,
      releasedAt: null,
    });
    expect(res.body.some((c: { id: number }) => c.id === net.cycleId)).toBe(false);
  });
});
