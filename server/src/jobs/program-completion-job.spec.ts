/**
 * The daily campaign-end sweep: its handler with a moved clock (nothing before the campaign is
 * over, every scheduled or observing program of the cycle after, once), and its registration
 * on the real pg-boss of the test database: the cron schedule stored in UTC, and the sweep
 * queued at the start run by the registered worker. The test database is shared with other
 * suites, so every sweep here is limited to this suite's cycle (`cycleIds`), and the queue is
 * this suite's own.
 */
import { randomUUID } from 'node:crypto';
import { startHarness, type Harness } from '../../../test/support/api-harness';
import { createTestNetwork, type TestNetwork } from '../../../test/api/support/proposal-kit';
import { campaignOverAt } from '../features/night-plans/program-completion';
import { createNightPlanFixture, type NightPlanFixture } from '../features/night-plans/testing/night-plan-fixtures';
import { createPgBoss, PG_BOSS_SCHEMA } from './pg-boss-factory';
import { runProgramCompletionJob, startProgramCompletionJob } from './program-completion-job';

let h: Harness;
let net: TestNetwork;
const queue = `program-completion-test-${randomUUID().slice(0, 8)}`;

const states = async (f: NightPlanFixture) =>
  (await h.created.ctx.db('programs').whereIn('proposal_id', f.proposalIds).orderBy('proposal_id')).map((p) => p.state as string);
const fixture = () =>
  createNightPlanFixture(h, net, {
    nodes: [net.nodes[0]],
    programs: [
      { targets: 1, hours: [3] },
      { targets: 1, hours: [3] },
    ],
    campaignNights: 5,
  });

beforeAll(async () => {
  h = await startHarness();
  net = await createTestNetwork(h, 'PJ');
}, 60_000);
afterAll(async () => {
  const boss = createPgBoss(h.created.ctx.config, 'web');
  await boss.start();
  await boss.unschedule(queue).catch(() => undefined);
  await boss.deleteQueue(queue).catch(() => undefined);
  await boss.stop({ graceful: false, close: true, wait: true, timeout: 5000 });
  await net.cleanUp();
  await h.close();
}, 60_000);

it('the handler: nothing before the campaign is over; then its scheduled and observing programs, once', async () => {
  const f = await fixture();
  await h.created.ctx.db('programs').where('proposal_id', f.proposalIds[1]).update({ state: 'observing' });
  const end = campaignOverAt(f.campaignEnd);
  const db = h.created.ctx.db;
  expect(await runProgramCompletionJob(db, { cycleIds: [f.cycleId] }, new Date(end.getTime() - 1))).toBe(0);
  expect(await states(f)).toEqual(['scheduled', 'observing']);
  expect(await runProgramCompletionJob(db, { cycleIds: [f.cycleId] }, end)).toBe(2);
  expect(await states(f)).toEqual(['complete', 'complete']);
  expect(await runProgramCompletionJob(db, { cycleIds: [f.cycleId] }, end)).toBe(0);
  expect(await db('audit_log').where({ cycle_id: f.cycleId, entity: 'program', action: 'complete' })).toHaveLength(2);
});

it('the registration: a daily cron in UTC stored by pg-boss, and the sweep queued at the start run by its worker', async () => {
  const f = await fixture();
  const job = await startProgramCompletionJob({
    config: h.created.ctx.config,
    db: h.created.ctx.db,
    logger: h.created.ctx.logger,
    now: () => campaignOverAt(f.campaignEnd),
    queue,
    data: { cycleIds: [f.cycleId] },
  });
  try {
    const deadline = Date.now() + 30_000;
    while ((await states(f)).some((s) => s !== 'complete') && Date.now() < deadline) await new Promise((r) => setTimeout(r, 250));
    expect(await states(f)).toEqual(['complete', 'complete']);
    const schedule = await h.created.ctx.db.withSchema(PG_BOSS_SCHEMA).table('schedule').where('name', queue).first();
    expect(schedule).toEqual(
      expect.objectContaining({ name: queue, cron: '10 0 * * *', timezone: 'UTC', data: { cycleIds: [f.cycleId] } }),
    );
    // Registering again (another worker starting) keeps one schedule.
    const again = await startProgramCompletionJob({
      config: h.created.ctx.config,
      db: h.created.ctx.db,
      logger: h.created.ctx.logger,
      now: () => campaignOverAt(f.campaignEnd),
      queue,
      data: { cycleIds: [f.cycleId] },
    });
    await again.stop(5000);
    expect(await h.created.ctx.db.withSchema(PG_BOSS_SCHEMA).table('schedule').where('name', queue)).toHaveLength(1);
  } finally {
    await job.stop(5000);
  }
  expect(await h.created.ctx.db('audit_log').where({ cycle_id: f.cycleId, entity: 'program', action: 'complete' })).toHaveLength(2);
}, 60_000);
