/**
 * A night-plan build end to end on a small released cycle (two nodes, three programs): the
 * build asked for through the API, its node jobs run with the worker's own function (no
 * pg-boss), then the stored visits checked against sky windows recomputed here; a lost night
 * and its re-plan; the execution CSV; the exports.
 */
import { MAX_INTERVALS_PER_NIGHT, type SkyWindowsResult } from '@spincycle/shared/sky/sky-types';
import { Browser, startHarness, type Harness } from '../../../../test/support/api-harness';
import { createTestNetwork, type TestNetwork } from '../../../../test/api/support/proposal-kit';
import { account, browserFor } from '../awards/testing/award-fixtures';
import { listNodes } from '../facility/facility-repository';
import { nodeSkyWindows } from '../proposals/plans/plan-computation';
import { listTargets, type StoredTarget } from '../proposals/targets/target-repository';
import { programWeights, runNightPlanNodeJob } from './night-plan-build';
import { createNightPlanFixture, fakeNightPlanQueue, type NightPlanFixture } from './testing/night-plan-fixtures';

let h: Harness;
let net: TestNetwork;
let f: NightPlanFixture;
let manager: Browser;
const queue = fakeNightPlanQueue();

/** Runs every queued node job with the worker's function, in order, and empties the queue. */
async function runQueued(): Promise<void> {
  const jobs = queue.jobs.splice(0);
  for (const job of jobs) await runNightPlanNodeJob(h.created.ctx.db, job);
}

interface VisitDb {
  id: number;
  node_id: number;
  target_id: number;
  proposal_id: number;
  night_date: string;
  start_at: Date;
  end_at: Date;
  status: string;
  altitude_deg: number;
  airmass: number;
}

async function visitsOf(nodeId?: number): Promise<VisitDb[]> {
  const q = h.created.ctx.db('night_plan_visits').where('cycle_id', f.cycleId).orderBy(['node_id', 'start_at', 'id']);
  if (nodeId) q.where('node_id', nodeId);
  return q;
}

beforeAll(async () => {
  h = await startHarness({ LOGIN_RATE_LIMIT: 10_000 });
  h.created.ctx.nightPlanQueue = queue;
  net = await createTestNetwork(h, 'NB');
  manager = await browserFor(h, await account(h, ['facility_manager'], 'Night Manager'));
  // Node 0 (north) and node 2 (south); programs on one or both, one with a partial award.
  f = await createNightPlanFixture(h, net, {
    nodes: [net.nodes[0], net.nodes[2]],
    programs: [
      { targets: 3, hours: [12, 0] },
      { targets: 2, hours: [6, 8] },
      { targets: 3, hours: [0, 10], awardedTargets: 2 },
    ],
  });
}, 60_000);
afterAll(async () => {
  await net.cleanUp();
  await h.close();
});

it('weighs programs by relative place in their panels: worked by hand in this test', () => {
  // Panel A: 4 programs, panel B: 2. Places: A1 0.25, A2 0.5, B1 0.5, A3 0.75, A4 1, B2 1.
  // Ties (A2/B1, A4/B2) go to the earlier position, then the smaller id: order A1, B1, A2, A3, B2, A4.
  const w = programWeights([
    { proposalId: 1, position: 1, panelSize: 4 },
    { proposalId: 2, position: 2, panelSize: 4 },
    { proposalId: 3, position: 3, panelSize: 4 },
    { proposalId: 4, position: 4, panelSize: 4 },
    { proposalId: 5, position: 1, panelSize: 2 },
    { proposalId: 6, position: 2, panelSize: 2 },
    { proposalId: 7, position: null, panelSize: 0 },
  ]);
  expect([1, 5, 2, 3, 6, 4, 7].map((id) => w.get(id))).toEqual([7, 6, 5, 4, 3, 2, 1]);
});

describe('a full build', () => {
  let windowsByNode: Map<number, { windows: SkyWindowsResult; targets: StoredTarget[] }>;

  beforeAll(async () => {
    const res = await manager.post(`/api/night-plans/cycles/${f.cycleId}/builds`);
    expect(res.status).toBe(202);
    expect(res.body).toEqual(expect.objectContaining({ cycleId: f.cycleId, kind: 'build', state: 'queued', fromNight: null }));
    expect(queue.jobs.map((j) => j.nodeId).sort()).toEqual([...f.nodeIds].sort());
    // A second build while this one is queued is refused.
    const again = await manager.post(`/api/night-plans/cycles/${f.cycleId}/builds`);
    expect(again.status).toBe(409);
    expect(again.body.code).toBe('build_running');
    await runQueued();

    // The windows recomputed here, per node, for every awarded target on it.
    windowsByNode = new Map();
    const nodes = await listNodes(h.created.ctx.db, f.nodeIds);
    for (const node of nodes) {
      const onNode: StoredTarget[] = [];
      for (let p = 0; p < f.proposalIds.length; p++) {
        const hours = (await h.created.ctx.db('award_nodes').where({ proposal_id: f.proposalIds[p], node_id: node.id }).first())
          ?.node_hours;
        if (!hours) continue;
        const awarded = p === 2 ? f.targetIds[p].slice(0, 2) : f.targetIds[p];
        onNode.push(...(await listTargets(h.created.ctx.db, f.proposalIds[p])).filter((t) => awarded.includes(t.id)));
      }
      windowsByNode.set(node.id, {
        windows: nodeSkyWindows(node, { firstNight: f.campaignStart, lastNight: f.campaignEnd }, onNode),
        targets: onNode,
      });
    }
  }, 300_000);

  it('finishes the build with its progress complete', async () => {
    const res = await manager.get(`/api/night-plans/cycles/${f.cycleId}/builds/latest`);
    expect(res.status).toBe(200);
    expect(res.body.state).toBe('done');
    expect(res.body.done).toBe(res.body.total);
    expect(res.body.total).toBeGreaterThan(0);
    expect(res.body.finishedAt).not.toBeNull();
  });

  it('plans visits on both nodes, each inside one usable interval of its target and within darkness', async () => {
    const visits = await visitsOf();
    for (const nodeId of f.nodeIds) expect(visits.filter((v) => v.node_id === nodeId).length).toBeGreaterThan(0);
    for (const v of visits) {
      const { windows, targets } = windowsByNode.get(v.node_id)!;
      const n = windows.nights.findIndex((x) => x.nightDate === v.night_date);
      expect(n).toBeGreaterThanOrEqual(0);
      const night = windows.nights[n];
      const start = v.start_at.getTime();
      const end = v.end_at.getTime();
      expect(start).toBeGreaterThanOrEqual(night.darkStartUtcMs!);
      expect(end).toBeLessThanOrEqual(night.darkEndUtcMs!);
      const tw = windows.targets[targets.findIndex((t) => t.id === v.target_id)];
      expect(tw).toBeDefined();
      expect(tw.moonExcludedByNight[n]).toBe(0);
      const base = n * MAX_INTERVALS_PER_NIGHT * 2;
      let inside = false;
      for (let k = 0; k < tw.intervalCountByNight[n]; k++) {
        if (start >= tw.intervalsUtcMs[base + 2 * k] && end <= tw.intervalsUtcMs[base + 2 * k + 1]) inside = true;
      }
      expect(inside).toBe(true);
      // Altitude at mid-visit from astronomy-engine: above the node's limit (25°) less a margin
      // for the refraction model of the windows; airmass ≥ 1.
      expect(v.altitude_deg).toBeGreaterThan(24.5);
      expect(v.airmass).toBeGreaterThanOrEqual(1);
    }
  });

  it('never overlaps two visits in a night of a node', async () => {
    const visits = await visitsOf();
    for (let i = 1; i < visits.length; i++) {
      if (visits[i].node_id !== visits[i - 1].node_id) continue;
      expect(visits[i].start_at.getTime()).toBeGreaterThanOrEqual(visits[i - 1].end_at.getTime());
    }
  });

  it('stores each target’s figures: visits never above its plan’s need, recovery in [0, 1]', async () => {
    const rows = await h.created.ctx.db('night_plan_targets').where('cycle_id', f.cycleId);
    // 3 + 2 targets on node 0; 2 + 2 (partial award) on node 2.
    expect(rows.length).toBe(9);
    expect(rows.map((r) => r.target_id)).not.toContain(f.targetIds[2][2]);
    const visits = await visitsOf();
    for (const r of rows) {
      const count = visits.filter((v) => v.target_id === r.target_id && v.node_id === r.node_id).length;
      expect(count).toBe(r.visits_planned);
      expect(count).toBeLessThanOrEqual(r.visits_required);
      expect(r.recovery_fraction).not.toBeNull();
      expect(r.recovery_fraction).toBeGreaterThanOrEqual(0);
      expect(r.recovery_fraction).toBeLessThanOrEqual(1);
      expect(typeof r.recovery_explanation).toBe('string');
      expect(Array.isArray(r.at_risk)).toBe(true);
    }
  });

  it('shows the overview, a timeline, a night and the team’s progress', async () => {
    const overview = await manager.get(`/api/night-plans/cycles/${f.cycleId}`);
    expect(overview.status).toBe(200);
    expect(overview.body.nodes).toHaveLength(2);
    expect(overview.body.programs.map((p: { proposalId: number }) => p.proposalId).sort()).toEqual([...f.proposalIds].sort());
    const visits = await visitsOf(f.nodeIds[0]);
    const date = visits[0].night_date;
    const timeline = await manager.get(
      `/api/night-plans/cycles/${f.cycleId}/nodes/${f.nodeIds[0]}/timeline?from=${f.campaignStart}&to=${f.campaignEnd}`,
    );
    expect(timeline.status).toBe(200);
    expect(timeline.body.nights).toHaveLength(30);
    expect(timeline.body.nights.flatMap((n: { visits: unknown[] }) => n.visits)).toHaveLength(visits.length);
    const night = await manager.get(`/api/night-plans/cycles/${f.cycleId}/nodes/${f.nodeIds[0]}/nights/${date}`);
    expect(night.status).toBe(200);
    expect(night.body.visits.length).toBe(visits.filter((v) => v.night_date === date).length);
    expect(night.body.visits[0].startLocal).toMatch(/^\d{2}:\d{2}$/);
    expect(night.body.node.timeZone).toBe('America/Denver');
    const pi = await browserFor(h, f.pis[1]);
    const progress = await pi.get(`/api/night-plans/programs/${f.proposalIds[1]}`);
    expect(progress.status).toBe(200);
    expect(progress.body.targets).toHaveLength(4);
    expect(progress.body.position).toBe(2);
  });

  it('refuses a timeline longer than 62 nights naming `to`, and a night outside the campaign naming `date`', async () => {
    const long = await createNightPlanFixture(h, net, { nodes: [net.nodes[0]], programs: [], campaignNights: 90 });
    const res = await manager.get(
      `/api/night-plans/cycles/${long.cycleId}/nodes/${long.nodeIds[0]}/timeline?from=${long.campaignStart}&to=${long.campaignEnd}`,
    );
    expect(res.status).toBe(400);
    expect(res.body.fieldErrors).toHaveProperty('to');
    const lost = await manager.post(`/api/night-plans/cycles/${f.cycleId}/nodes/${f.nodeIds[0]}/lost-nights`, {
      date: '2020-01-01',
      reason: 'clouds',
    });
    expect(lost.status).toBe(400);
    expect(lost.body.fieldErrors).toHaveProperty('date');
  });

  it('exports the node’s plan as CSV and iCalendar, one row and one event per visit', async () => {
    const visits = await visitsOf(f.nodeIds[0]);
    const csv = await manager.get(`/api/night-plans/cycles/${f.cycleId}/nodes/${f.nodeIds[0]}/plan.csv`);
    expect(csv.status).toBe(200);
    expect(csv.headers['content-disposition']).toBe(`attachment; filename="night-plan-${f.cycleId}-${f.nodeIds[0]}.csv"`);
    expect(csv.text.trim().split('\r\n')).toHaveLength(visits.length + 1);
    const ics = await manager.get(`/api/night-plans/cycles/${f.cycleId}/nodes/${f.nodeIds[0]}/plan.ics`).buffer(true);
    expect(ics.status).toBe(200);
    const text = ics.text ?? String(ics.body);
    expect(text.match(/BEGIN:VEVENT/g)).toHaveLength(visits.length);
    expect(text).toContain(`SUMMARY:${f.targetNames[0][0]} (${f.titles[0]})`);
    expect(text).toMatch(/DTSTART:\d{8}T\d{6}Z/);
  });
});

describe('after the build', () => {
  it('a lost night: re-planned from it, earlier and done visits unchanged, nothing planned on it', async () => {
    const nodeId = f.nodeIds[0];
    const before = await visitsOf(nodeId);
    const nights = [...new Set(before.map((v) => v.night_date))].sort();
    expect(nights.length).toBeGreaterThanOrEqual(3);
    const lostDate = nights[Math.floor(nights.length / 2)];
    // A later visit is done already.
    const later = before.find((v) => v.night_date > lostDate)!;
    const program = await h.created.ctx.db('programs').where({ proposal_id: later.proposal_id }).first('state');
    const put = await manager.put(`/api/night-plans/visits/${later.id}`, { status: 'done' });
    expect(put.status).toBe(200);
    expect(put.body.status).toBe('done');
    // Its program's first visit done: scheduled → observing, with its audit row.
    expect(program.state).toBe('scheduled');
    expect((await h.created.ctx.db('programs').where({ proposal_id: later.proposal_id }).first('state')).state).toBe('observing');
    expect(
      await h.created.ctx
        .db('audit_log')
        .where({ cycle_id: f.cycleId, entity: 'program', entity_id: later.proposal_id, action: 'observing' }),
    ).toHaveLength(1);
    const kept = (await visitsOf(nodeId)).filter((v) => v.night_date < lostDate || v.status === 'done');
    const onLost = before.filter((v) => v.night_date === lostDate).map((v) => v.id);

    const res = await manager.post(`/api/night-plans/cycles/${f.cycleId}/nodes/${nodeId}/lost-nights`, {
      date: lostDate,
      reason: 'Dome fault',
    });
    expect(res.status).toBe(202);
    expect(res.body).toEqual(expect.objectContaining({ kind: 'replan', fromNight: lostDate, state: 'queued' }));
    expect(queue.jobs).toEqual([{ buildId: res.body.id, nodeId }]);
    const twice = await manager.post(`/api/night-plans/cycles/${f.cycleId}/nodes/${nodeId}/lost-nights`, {
      date: lostDate,
      reason: 'Dome fault',
    });
    expect(twice.status).toBe(409);
    await runQueued();

    const after = await visitsOf(nodeId);
    const byId = new Map(after.map((v) => [v.id, v]));
    for (const v of kept) expect(byId.get(v.id)).toEqual(v);
    const lostVisits = after.filter((v) => v.night_date === lostDate);
    expect(lostVisits.every((v) => v.status === 'missed')).toBe(true);
    expect(lostVisits.map((v) => v.id).sort()).toEqual(onLost.sort());
    const build = await manager.get(`/api/night-plans/cycles/${f.cycleId}/builds/latest`);
    expect(build.body).toEqual(expect.objectContaining({ id: res.body.id, state: 'done' }));
    // The other node was not touched.
    const audit = await h.created.ctx.db('audit_log').where({ cycle_id: f.cycleId, entity: 'lost_night' });
    expect(audit).toHaveLength(1);
    const unmark = await manager.delete(`/api/night-plans/cycles/${f.cycleId}/nodes/${nodeId}/lost-nights/${lostDate}`);
    expect(unmark.status).toBe(204);
  }, 120_000);

  it('execution CSV: a good file sets the statuses, a file with bad rows names each and writes nothing', async () => {
    const nodeId = f.nodeIds[1];
    const code = f.nodeCodes[1];
    const planned = (await visitsOf(nodeId)).filter((v) => v.status === 'planned');
    expect(planned.length).toBeGreaterThanOrEqual(2);
    const name = async (targetId: number) => (await h.created.ctx.db('targets').where('id', targetId).first('name')).name as string;
    const [a, b] = planned;
    const mid = (v: VisitDb) => new Date((v.start_at.getTime() + v.end_at.getTime()) / 2).toISOString();
    const bad = [
      'target,node,utc_time,status',
      `${await name(a.target_id)},${code},${mid(a)},done`,
      `No such star,${code},${mid(a)},done`,
      `${await name(b.target_id)},NOPE,${mid(b)},done`,
      `${await name(b.target_id)},${code},yesterday,finished`,
    ].join('\n');
    const refused = await (
      await manager.ready()
    ).agent
      .post(`/api/night-plans/cycles/${f.cycleId}/execution`)
      .set('X-XSRF-TOKEN', manager.xsrf() ?? '')
      .attach('file', Buffer.from(bad), 'log.csv');
    expect(refused.status).toBe(400);
    expect(refused.body.code).toBe('invalid_execution_log');
    expect(refused.body.rows.map((r: { row: number; field: string }) => `${r.row}.${r.field}`)).toEqual([
      '2.target',
      '3.node',
      '4.utc_time',
      '4.status',
    ]);
    expect((await h.created.ctx.db('night_plan_visits').whereIn('id', [a.id, b.id]).pluck('status')).sort()).toEqual([
      'planned',
      'planned',
    ]);

    const good = [
      'target,node,utc_time,status',
      `${await name(a.target_id)},${code},${mid(a)},done`,
      `${await name(b.target_id)},${code},${mid(b)},missed`,
    ].join('\n');
    const ok = await manager.agent
      .post(`/api/night-plans/cycles/${f.cycleId}/execution`)
      .set('X-XSRF-TOKEN', manager.xsrf() ?? '')
      .attach('file', Buffer.from(good), 'log.csv');
    expect(ok.status).toBe(200);
    expect(ok.body).toEqual({ updated: 2, rows: 2 });
    expect((await h.created.ctx.db('night_plan_visits').where('id', a.id).first()).status).toBe('done');
    expect((await h.created.ctx.db('night_plan_visits').where('id', b.id).first()).status).toBe('missed');
    expect(await h.created.ctx.db('audit_log').where({ cycle_id: f.cycleId, entity: 'visit', action: 'execution_upload' })).toHaveLength(2);
  });
});
