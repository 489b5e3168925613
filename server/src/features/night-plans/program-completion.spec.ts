/**
 * Programs become complete (program-completion.ts): by their visits, when the last visit night a
 * target's plan needs is marked done (one visit, or an execution upload), in that transaction,
 * with its audit row, its future planned visits removed; by the campaign's end, at the overview
 * of the cycle, with a moved clock; idempotent; never touching a done or missed visit (a
 * property over random visits); and re-plans after a completion leave the program alone.
 * Fixtures are written straight into the database (./testing); the target figures and visits are
 * written by the tests, so that "what the plan needs" is known exactly.
 */
import fc from 'fast-check';
import type { Knex } from 'knex';
import { Browser, startHarness, type Harness } from '../../../../test/support/api-harness';
import { createTestNetwork, type TestNetwork } from '../../../../test/api/support/proposal-kit';
import { account, browserFor } from '../awards/testing/award-fixtures';
import { runNightPlanNodeJob } from './night-plan-build';
import {
  campaignEndedReason,
  campaignOverAt,
  completeProgramsOfEndedCampaigns,
  completeProgramsWithVisitsDone,
  isCampaignOver,
  VISITS_DONE_REASON,
} from './program-completion';
import { createNightPlanFixture, fakeNightPlanQueue, type NightPlanFixture } from './testing/night-plan-fixtures';

let h: Harness;
let net: TestNetwork;
let manager: Browser;
let managerId: number;
const queue = fakeNightPlanQueue();
const realNow = () => new Date();
const MS_PER_DAY = 86_400_000;

const db = () => h.created.ctx.db;
const night = (f: NightPlanFixture, k: number) =>
  new Date(Date.parse(`${f.campaignStart}T00:00:00Z`) + k * MS_PER_DAY).toISOString().slice(0, 10);
/** Noon UTC of the campaign's day k: every visit of nights before k has started (they start at 03:00 UTC the morning after their night). */
const noonOf = (f: NightPlanFixture, k: number) => new Date(Date.parse(`${night(f, k)}T12:00:00Z`));
const setClock = (at: Date) => {
  h.created.ctx.now = () => new Date(at);
};

interface VisitRow {
  id: number;
  proposal_id: number;
  target_id: number;
  node_id: number;
  night_date: string;
  start_at: Date;
  end_at: Date;
  status: string;
  version: number;
}

/** A visit of the night of campaign day `k`: from 03:00 UTC the next morning plus `minute`, 20 minutes long. */
async function addVisit(
  q: Knex,
  f: NightPlanFixture,
  o: { program?: number; target?: number; node?: number; k: number; minute?: number; status?: 'planned' | 'done' | 'missed' },
): Promise<number> {
  const start = new Date(Date.parse(`${night(f, o.k)}T00:00:00Z`) + 27 * 3600_000 + (o.minute ?? 0) * 60_000);
  const [{ id }] = await q('night_plan_visits')
    .insert({
      cycle_id: f.cycleId,
      node_id: f.nodeIds[o.node ?? 0],
      proposal_id: f.proposalIds[o.program ?? 0],
      target_id: f.targetIds[o.program ?? 0][o.target ?? 0],
      night_date: night(f, o.k),
      start_at: start,
      end_at: new Date(start.getTime() + 20 * 60_000),
      altitude_deg: 50,
      airmass: 1.3,
      status: o.status ?? 'planned',
    })
    .returning('id');
  return Number(id);
}

/** The stored figures of one target on one node: its plan needs `nights` visit nights. */
async function addFigures(q: Knex, f: NightPlanFixture, o: { program?: number; target?: number; node?: number; nights: number }) {
  await q('night_plan_targets').insert({
    cycle_id: f.cycleId,
    proposal_id: f.proposalIds[o.program ?? 0],
    target_id: f.targetIds[o.program ?? 0][o.target ?? 0],
    node_id: f.nodeIds[o.node ?? 0],
    visits_required: o.nights,
    visit_nights_required: o.nights,
    step_nights: 1,
    tolerance_nights: 0,
    visits_planned: 9,
    visit_nights_planned: 9,
  });
}

const stateOf = async (proposalId: number) => (await db()('programs').where('proposal_id', proposalId).first('state')).state as string;
const completeRows = (proposalId: number) => db()('audit_log').where({ entity: 'program', entity_id: proposalId, action: 'complete' });
const visitsOf = (cycleId: number): Promise<VisitRow[]> => db()('night_plan_visits').where('cycle_id', cycleId).orderBy('id');

async function upload(f: NightPlanFixture, rows: string[]) {
  await manager.ready();
  return manager.agent
    .post(`/api/night-plans/cycles/${f.cycleId}/execution`)
    .set('X-XSRF-TOKEN', manager.xsrf() ?? '')
    .attach('file', Buffer.from(['target,node,utc_time,status', ...rows].join('\n')), 'log.csv');
}

/** The middle of a stored visit, as an execution log names it. */
const midOf = (v: VisitRow) => new Date((v.start_at.getTime() + v.end_at.getTime()) / 2).toISOString();

beforeAll(async () => {
  // Sessions outlive the clocks the tests move (days into the campaign).
  h = await startHarness({ LOGIN_RATE_LIMIT: 10_000, SESSION_ABSOLUTE_HOURS: 100_000 });
  h.created.ctx.nightPlanQueue = queue;
  net = await createTestNetwork(h, 'PC');
  const m = await account(h, ['facility_manager'], 'Completion Manager');
  managerId = m.id;
  manager = await browserFor(h, m);
}, 60_000);
afterEach(() => {
  h.created.ctx.now = realNow;
});
afterAll(async () => {
  await net.cleanUp();
  await h.close();
});

describe('the campaign-end rule: worked by hand in this test', () => {
  it('a campaign whose last night is 15 Apr 2027 is over from 00:00 UTC on 17 Apr 2027, not a millisecond before', () => {
    // The night of 15 Apr begins that evening and ends on the morning of 16 Apr, local time; at
    // UTC−12 that morning is 16 Apr ~18:00 UTC, so 17 Apr 00:00 UTC is after it everywhere.
    expect(campaignOverAt('2027-04-15').toISOString()).toBe('2027-04-17T00:00:00.000Z');
    expect(isCampaignOver('2027-04-15', new Date('2027-04-16T23:59:59.999Z'))).toBe(false);
    expect(isCampaignOver('2027-04-15', new Date('2027-04-17T00:00:00.000Z'))).toBe(true);
    expect(campaignEndedReason('2027-04-15')).toBe('The campaign ended on 15 Apr 2027.');
  });
});

describe('complete by visits, one visit at a time', () => {
  let f: NightPlanFixture;
  const ids: Record<string, number> = {};

  beforeAll(async () => {
    f = await createNightPlanFixture(h, net, {
      nodes: [net.nodes[0]],
      programs: [
        { targets: 2, hours: [6] },
        { targets: 1, hours: [4] },
      ],
      campaignNights: 10,
    });
    // Program 0: target A needs 2 visit nights, target B needs 1.
    await addFigures(db(), f, { target: 0, nights: 2 });
    await addFigures(db(), f, { target: 1, nights: 1 });
    await addFigures(db(), f, { program: 1, nights: 3 });
    ids.a0 = await addVisit(db(), f, { target: 0, k: 0 });
    ids.a0b = await addVisit(db(), f, { target: 0, k: 0, minute: 40 });
    ids.a1missed = await addVisit(db(), f, { target: 0, k: 1, status: 'missed' });
    ids.b1 = await addVisit(db(), f, { target: 1, k: 1, minute: 30 });
    ids.a2 = await addVisit(db(), f, { target: 0, k: 2 });
    ids.b3 = await addVisit(db(), f, { target: 1, k: 3 });
    ids.a5 = await addVisit(db(), f, { target: 0, k: 5 });
    ids.b6 = await addVisit(db(), f, { target: 1, k: 6 });
    ids.other5 = await addVisit(db(), f, { program: 1, k: 5, minute: 60 });
  });

  it('counts distinct nights: two visits of one night are one visit night', async () => {
    setClock(noonOf(f, 4));
    for (const id of [ids.a0, ids.a0b, ids.b1]) {
      const res = await manager.put(`/api/night-plans/visits/${id}`, { status: 'done' });
      expect(res.status).toBe(200);
    }
    // A: 1 of 2 nights (both visits on night 0); B: 1 of 1. Not complete.
    expect(await stateOf(f.proposalIds[0])).toBe('observing');
    expect(await completeRows(f.proposalIds[0])).toHaveLength(0);
    expect((await visitsOf(f.cycleId)).map((v) => v.id)).toContain(ids.a5);
  });

  it('marking the last needed night done completes the program in that transaction: audit row, future planned visits gone', async () => {
    const clock = noonOf(f, 4);
    setClock(clock);
    const before = await visitsOf(f.cycleId);
    const res = await manager.put(`/api/night-plans/visits/${ids.a2}`, { status: 'done' });
    expect(res.status).toBe(200);
    expect(res.body.status).toBe('done');
    expect(await stateOf(f.proposalIds[0])).toBe('complete');

    const [row] = await completeRows(f.proposalIds[0]);
    expect(row).toEqual(
      expect.objectContaining({
        cycle_id: f.cycleId,
        actor_account_id: managerId,
        before: { state: 'observing' },
        after: { state: 'complete', cause: 'visits_done', plannedVisitsRemoved: 2 },
        reason: VISITS_DONE_REASON,
      }),
    );
    // Written with the visit's change: the same instant.
    const a2 = (await visitsOf(f.cycleId)).find((v) => v.id === ids.a2)!;
    expect((await db()('night_plan_visits').where('id', ids.a2).first('status_changed_at')).status_changed_at).toEqual(row.at);
    expect(a2.status).toBe('done');

    const after = await visitsOf(f.cycleId);
    const afterIds = after.map((v) => v.id);
    // Its planned visits after the clock (nights 5 and 6) are removed; night 3's has started and stays planned.
    expect(afterIds).not.toContain(ids.a5);
    expect(afterIds).not.toContain(ids.b6);
    expect(after.find((v) => v.id === ids.b3)!.status).toBe('planned');
    // The other program's future visit, and every done and missed visit, are as they were.
    expect(after.find((v) => v.id === ids.other5)).toEqual(before.find((v) => v.id === ids.other5));
    for (const v of before.filter((x) => x.status !== 'planned' && x.id !== ids.a2)) expect(after.find((x) => x.id === v.id)).toEqual(v);
    // The figures' planned counts come down to what is left (worked by hand in this test):
    // A keeps its visits of nights 0, 0 and 2 (not the missed one): 3 visits on 2 nights;
    // B keeps nights 1 and 3: 2 visits on 2 nights. Program 1's figures are untouched.
    const figures = await db()('night_plan_targets').where('cycle_id', f.cycleId).orderBy('target_id');
    const byTarget = new Map(figures.map((r) => [r.target_id, r]));
    expect(byTarget.get(f.targetIds[0][0])).toEqual(expect.objectContaining({ visits_planned: 3, visit_nights_planned: 2 }));
    expect(byTarget.get(f.targetIds[0][1])).toEqual(expect.objectContaining({ visits_planned: 2, visit_nights_planned: 2 }));
    expect(byTarget.get(f.targetIds[1][0])).toEqual(expect.objectContaining({ visits_planned: 9, visit_nights_planned: 9 }));
    expect(await stateOf(f.proposalIds[1])).toBe('scheduled');
  });

  it('the overview and the team’s progress say it is complete, and why', async () => {
    const overview = await manager.get(`/api/night-plans/cycles/${f.cycleId}`);
    expect(overview.status).toBe(200);
    const p = overview.body.programs.find((x: { proposalId: number }) => x.proposalId === f.proposalIds[0]);
    expect(p.programState).toBe('complete');
    expect(p.completion).toEqual({ cause: 'visits_done', at: expect.any(String), campaignEnd: null });
    expect(overview.body.programs.find((x: { proposalId: number }) => x.proposalId === f.proposalIds[1]).completion).toBeNull();
    const pi = await browserFor(h, f.pis[0]);
    const progress = await pi.get(`/api/night-plans/programs/${f.proposalIds[0]}`);
    expect(progress.status).toBe(200);
    expect(progress.body.programState).toBe('complete');
    expect(progress.body.completion.cause).toBe('visits_done');
  });

  it('idempotent: more visits done afterwards write no second audit row', async () => {
    setClock(noonOf(f, 4));
    const res = await manager.put(`/api/night-plans/visits/${ids.b3}`, { status: 'done' });
    expect(res.status).toBe(200);
    expect(await stateOf(f.proposalIds[0])).toBe('complete');
    expect(await completeRows(f.proposalIds[0])).toHaveLength(1);
  });
});

describe('complete by visits, from an execution upload', () => {
  let f: NightPlanFixture;

  beforeAll(async () => {
    f = await createNightPlanFixture(h, net, { nodes: [net.nodes[0]], programs: [{ targets: 1, hours: [5] }], campaignNights: 10 });
    await addFigures(db(), f, { nights: 2 });
    await addVisit(db(), f, { k: 0 });
    await addVisit(db(), f, { k: 1 });
    await addVisit(db(), f, { k: 2 });
    await addVisit(db(), f, { k: 7 });
  });

  it('one night done: observing; the second: complete in the upload’s transaction, with both audit rows, the future visit gone', async () => {
    setClock(noonOf(f, 3));
    const [v0, v1, v2, v7] = await visitsOf(f.cycleId);
    const name = f.targetNames[0][0];
    const code = f.nodeCodes[0];
    const first = await upload(f, [`${name},${code},${midOf(v0)},done`, `${name},${code},${midOf(v2)},missed`]);
    expect(first.status).toBe(200);
    expect(await stateOf(f.proposalIds[0])).toBe('observing');
    expect(await completeRows(f.proposalIds[0])).toHaveLength(0);

    // A file with a bad row writes nothing: the program stays observing.
    const refused = await upload(f, [`${name},${code},${midOf(v1)},done`, `${name},NOPE,${midOf(v1)},done`]);
    expect(refused.status).toBe(400);
    expect(await stateOf(f.proposalIds[0])).toBe('observing');

    const second = await upload(f, [`${name},${code},${midOf(v1)},done`]);
    expect(second.status).toBe(200);
    expect(second.body).toEqual({ updated: 1, rows: 1 });
    expect(await stateOf(f.proposalIds[0])).toBe('complete');
    const [row] = await completeRows(f.proposalIds[0]);
    expect(row).toEqual(
      expect.objectContaining({
        actor_account_id: managerId,
        before: { state: 'observing' },
        after: { state: 'complete', cause: 'visits_done', plannedVisitsRemoved: 1 },
        reason: VISITS_DONE_REASON,
      }),
    );
    const after = await visitsOf(f.cycleId);
    expect(after.map((v) => [v.id, v.status])).toEqual([
      [v0.id, 'done'],
      [v1.id, 'done'],
      [v2.id, 'missed'],
    ]);
    expect(after.map((v) => v.id)).not.toContain(v7.id);
    expect(await db()('audit_log').where({ entity: 'program', entity_id: f.proposalIds[0] }).orderBy('id').pluck('action')).toEqual([
      'observing',
      'complete',
    ]);
  });
});

describe('complete by the campaign’s end (a moved clock)', () => {
  let f: NightPlanFixture;

  beforeAll(async () => {
    f = await createNightPlanFixture(h, net, {
      nodes: [net.nodes[0]],
      programs: [
        { targets: 1, hours: [3] },
        { targets: 1, hours: [3] },
        { targets: 1, hours: [3] },
      ],
      campaignNights: 5,
    });
    await db()('programs').where('proposal_id', f.proposalIds[1]).update({ state: 'observing' });
    await db()('programs').where('proposal_id', f.proposalIds[2]).update({ state: 'withdrawn' });
    await addFigures(db(), f, { program: 1, nights: 4 });
    await addVisit(db(), f, { program: 1, k: 0, status: 'done' });
    await addVisit(db(), f, { program: 1, k: 1, status: 'missed' });
    await addVisit(db(), f, { program: 1, k: 4 });
  });

  it('not before the end: the overview changes nothing a millisecond before', async () => {
    setClock(new Date(campaignOverAt(f.campaignEnd).getTime() - 1));
    const res = await manager.get(`/api/night-plans/cycles/${f.cycleId}`);
    expect(res.status).toBe(200);
    expect(res.body.programs.map((p: { programState: string }) => p.programState)).toEqual(['scheduled', 'observing', 'withdrawn']);
    expect(await db()('audit_log').where({ cycle_id: f.cycleId, action: 'complete' })).toHaveLength(0);
  });

  it('from the end on, the overview completes scheduled and observing programs (withdrawn stays), once, visits untouched', async () => {
    const before = await visitsOf(f.cycleId);
    const at = campaignOverAt(f.campaignEnd);
    setClock(at);
    const res = await manager.get(`/api/night-plans/cycles/${f.cycleId}`);
    expect(res.status).toBe(200);
    expect(res.body.programs.map((p: { programState: string }) => p.programState)).toEqual(['complete', 'complete', 'withdrawn']);
    expect(res.body.programs[0].completion).toEqual({ cause: 'campaign_ended', at: at.toISOString(), campaignEnd: f.campaignEnd });
    expect(res.body.programs[2].completion).toBeNull();
    const rows = await db()('audit_log').where({ cycle_id: f.cycleId, action: 'complete' }).orderBy('entity_id');
    expect(rows.map((r) => [r.entity_id, r.before, r.after.state, r.reason, r.actor_account_id])).toEqual([
      [f.proposalIds[0], { state: 'scheduled' }, 'complete', campaignEndedReason(f.campaignEnd), null],
      [f.proposalIds[1], { state: 'observing' }, 'complete', campaignEndedReason(f.campaignEnd), null],
    ]);
    // Twice more, and the sweep itself: still two rows, nothing else changed.
    await manager.get(`/api/night-plans/cycles/${f.cycleId}`);
    await manager.get(`/api/night-plans/cycles/${f.cycleId}`);
    expect(await completeProgramsOfEndedCampaigns(db(), new Date(at.getTime() + 5 * MS_PER_DAY), { cycleIds: [f.cycleId] })).toEqual([]);
    expect(await db()('audit_log').where({ cycle_id: f.cycleId, action: 'complete' })).toHaveLength(2);
    expect(await visitsOf(f.cycleId)).toEqual(before);
  });
});

describe('re-plans after a completion', () => {
  let f: NightPlanFixture;

  const runQueued = async () => {
    for (const job of queue.jobs.splice(0)) await runNightPlanNodeJob(db(), job);
  };

  beforeAll(async () => {
    f = await createNightPlanFixture(h, net, {
      nodes: [net.nodes[0]],
      programs: [
        { targets: 1, hours: [8] },
        { targets: 1, hours: [8] },
      ],
      campaignNights: 12,
    });
    const res = await manager.post(`/api/night-plans/cycles/${f.cycleId}/builds`);
    expect(res.status).toBe(202);
    await runQueued();
  }, 300_000);

  it('keep the complete program’s done visits and figures, and plan nothing more for it', async () => {
    const p0 = f.proposalIds[0];
    const planned = (await visitsOf(f.cycleId)).filter((v) => v.proposal_id === p0);
    const nights = [...new Set(planned.map((v) => v.night_date))].sort();
    expect(nights.length).toBeGreaterThanOrEqual(3);
    // The test sets the need to two visit nights, then marks the first two nights' visits done.
    await db()('night_plan_targets').where({ proposal_id: p0 }).update({ visit_nights_required: 2 });
    const firstTwo = planned.filter((v) => v.night_date <= nights[1]);
    const clock = new Date(Math.max(...firstTwo.map((v) => v.end_at.getTime())) + 60_000);
    setClock(clock);
    for (const v of firstTwo) expect((await manager.put(`/api/night-plans/visits/${v.id}`, { status: 'done' })).status).toBe(200);
    expect(await stateOf(p0)).toBe('complete');
    const kept = (await visitsOf(f.cycleId)).filter((v) => v.proposal_id === p0);
    expect(kept.every((v) => v.start_at.getTime() <= clock.getTime())).toBe(true);
    const figures = await db()('night_plan_targets').where({ proposal_id: p0 });
    expect(figures).toHaveLength(1);

    // A lost night after the completion re-plans the node from it; then a full build.
    const lostDate = nights[nights.length - 1];
    const lost = await manager.post(`/api/night-plans/cycles/${f.cycleId}/nodes/${f.nodeIds[0]}/lost-nights`, {
      date: lostDate,
      reason: 'Dome fault',
    });
    expect(lost.status).toBe(202);
    await runQueued();
    const build = await manager.post(`/api/night-plans/cycles/${f.cycleId}/builds`);
    expect(build.status).toBe(202);
    await runQueued();
    expect((await manager.get(`/api/night-plans/cycles/${f.cycleId}/builds/latest`)).body.state).toBe('done');

    const after = (await visitsOf(f.cycleId)).filter((v) => v.proposal_id === p0);
    // Its done visits are as they were; nothing planned was added for it.
    expect(after.filter((v) => v.status === 'done')).toEqual(kept.filter((v) => v.status === 'done'));
    expect(after.filter((v) => v.status === 'planned' && !kept.some((k) => k.id === v.id))).toEqual([]);
    // Its figures survive the re-plans (a build leaves complete programs out).
    expect(await db()('night_plan_targets').where({ proposal_id: p0 })).toEqual(figures);
    // The other program is still planned.
    expect((await visitsOf(f.cycleId)).some((v) => v.proposal_id === f.proposalIds[1] && v.status === 'planned')).toBe(true);
    expect(await stateOf(p0)).toBe('complete');
    expect(await completeRows(p0)).toHaveLength(1);
  }, 300_000);
});

describe('property: completion never alters a done or missed visit', () => {
  let f: NightPlanFixture;

  beforeAll(async () => {
    f = await createNightPlanFixture(h, net, {
      nodes: [net.nodes[0], net.nodes[1]],
      programs: [{ targets: 2, hours: [4, 4] }],
      campaignNights: 8,
    });
  });

  const visitArb = fc.record({
    target: fc.integer({ min: 0, max: 1 }),
    node: fc.integer({ min: 0, max: 1 }),
    // Few nights, so that visits share nights often (two visits of one night are one visit night).
    k: fc.integer({ min: 0, max: 3 }),
    minute: fc.integer({ min: 0, max: 300 }),
    // Done half the time, so that the rule is met often enough to be tested both ways.
    status: fc.constantFrom<'planned' | 'done' | 'missed'>('done', 'done', 'planned', 'missed'),
  });

  it('whatever the visits, needs, state and clock: done and missed visits stay; the rule decides; a second run changes nothing', async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.array(visitArb, { minLength: 1, maxLength: 20 }),
        fc.array(fc.integer({ min: 0, max: 2 }), { minLength: 4, maxLength: 4 }),
        fc.constantFrom('scheduled', 'observing', 'complete', 'withdrawn'),
        fc.integer({ min: 0, max: 5 }),
        async (specs, needs, state, clockDay) => {
          const trx = await db().transaction();
          try {
            const p = f.proposalIds[0];
            await trx('programs').where('proposal_id', p).update({ state });
            for (let i = 0; i < 4; i++) await addFigures(trx, f, { target: i % 2, node: Math.floor(i / 2), nights: needs[i] });
            const ids: number[] = [];
            for (const s of specs) ids.push(await addVisit(trx, f, s));
            const at = noonOf(f, clockDay);
            const read = (): Promise<VisitRow[]> => trx('night_plan_visits').where('cycle_id', f.cycleId).orderBy('id');
            const before = await read();

            // The oracle (this test's own count): every (target, node) has its needed distinct done nights.
            const doneNights = (t: number, n: number) =>
              new Set(specs.filter((s) => s.status === 'done' && s.target === t && s.node === n).map((s) => s.k)).size;
            const meets = [0, 1, 2, 3].every((i) => doneNights(i % 2, Math.floor(i / 2)) >= needs[i]);
            const expectComplete = (state === 'scheduled' || state === 'observing') && meets;

            const completed = await completeProgramsWithVisitsDone(trx, f.cycleId, ids, managerId, at);
            const after = await read();
            const byId = new Map(after.map((v) => [v.id, v]));
            for (const v of before) {
              if (v.status !== 'planned') expect(byId.get(v.id)).toEqual(v);
              else if (expectComplete && v.start_at.getTime() > at.getTime()) expect(byId.has(v.id)).toBe(false);
              else expect(byId.get(v.id)).toEqual(v);
            }
            expect(completed.map((c) => c.proposalId)).toEqual(expectComplete ? [p] : []);
            const finalState = (await trx('programs').where('proposal_id', p).first('state')).state;
            expect(finalState).toBe(expectComplete ? 'complete' : state);

            // Again, then the campaign's end: no second row; the sweep never touches a visit either.
            expect(await completeProgramsWithVisitsDone(trx, f.cycleId, ids, managerId, at)).toEqual([]);
            await completeProgramsOfEndedCampaigns(trx, campaignOverAt(f.campaignEnd), { cycleIds: [f.cycleId] });
            expect(await read()).toEqual(after);
            const rows = await trx('audit_log').where({ entity: 'program', entity_id: p, action: 'complete' });
            const swept = !expectComplete && (state === 'scheduled' || state === 'observing');
            expect(rows).toHaveLength(expectComplete || swept ? 1 : 0);
            expect((await trx('programs').where('proposal_id', p).first('state')).state).toBe(
              state === 'withdrawn' ? 'withdrawn' : 'complete',
            );
          } finally {
            await trx.rollback();
          }
        },
      ),
      { numRuns: 100 },
    );
  }, 120_000);
});
