import { addDays, addHours, formatISO, startOfDay } from 'date-fns';
import type { Knex } from 'knex';
import { findAccountByEmail } from '../../server/src/features/accounts/account-repository';
import { findNightPlanCycle, insertBuild } from '../../server/src/features/night-plans/night-plan-repository';
import { unitsOf } from '../../server/src/features/night-plans/night-plan-service';
import { runNightPlanNodeJob } from '../../server/src/features/night-plans/night-plan-build';

/**
 * Demo night plans: the "<year>-R0" cycle of 04-awards gets its last decisions (the proposals
 * 04 left undecided are not awarded) and its release (states, programs, audit; no mail is
 * sent), then night plans built for every node of the cycle by the worker's own job, run here
 * in-process. Its campaign began twenty nights ago, so the plans have a past: on the first node
 * with visits, the planned visits of the past nights are marked done (one in seven missed), and
 * the night before yesterday is marked lost to weather and the node re-planned from it, as the
 * manager would. Every name is invented.
 *
 * Idempotent: runs after 04-awards, whose own reload clears the decisions and the release.
 */
export async function seed(db: Knex): Promise<void> {
  const year = startOfDay(new Date()).getUTCFullYear();
  const cycle = (await db('cycles').where('code', `${year}-R0`).first('id', 'campaign_start')) as
    { id: number; campaign_start: string } | undefined;
  if (!cycle) throw new Error(`05-night-plans needs the cycle ${year}-R0 of 03-review`);
  const manager = (await findAccountByEmail(db, 'manager@halcyon.example'))!;
  const now = new Date();

  await db.transaction(async (trx) => {
    await trx('night_plan_builds').where('cycle_id', cycle.id).del();
    await trx('night_plan_visits').where('cycle_id', cycle.id).del();
    await trx('night_plan_targets').where('cycle_id', cycle.id).del();
    await trx('lost_nights').where('cycle_id', cycle.id).del();
    await trx('audit_log').where('cycle_id', cycle.id).whereIn('entity', ['release', 'night_plan', 'lost_night', 'visit']).del();

    // The last decisions: what 04 left for the manager is below the line.
    const ranked = (await trx('proposals as p')
      .leftJoin('awards as a', 'a.proposal_id', 'p.id')
      .where('p.cycle_id', cycle.id)
      .where('p.state', 'ranked')
      .select('p.id', 'a.outcome')) as { id: number; outcome: string | null }[];
    const decidedAt = addHours(startOfDay(now), -15);
    for (const p of ranked.filter((r) => r.outcome === null)) {
      await trx('awards').insert({
        proposal_id: p.id,
        cycle_id: cycle.id,
        outcome: 'not_awarded',
        decided_by: manager.id,
        decided_at: decidedAt,
      });
      await trx('audit_log').insert({
        at: decidedAt,
        actor_account_id: manager.id,
        cycle_id: cycle.id,
        entity: 'award',
        entity_id: p.id,
        action: 'decided',
        before: null,
        after: JSON.stringify({ outcome: 'not_awarded', nodes: [], targetIds: null, overrideReason: null }),
        reason: 'Below the line this cycle.',
      });
    }

    // The release, as the award service writes it (the teams' mails are not sent by a seed).
    const releasedAt = addHours(startOfDay(now), -14);
    const awards = (await trx('awards').where('cycle_id', cycle.id).select('proposal_id', 'outcome')) as {
      proposal_id: number;
      outcome: string;
    }[];
    for (const a of awards) {
      await trx('proposals')
        .where('id', a.proposal_id)
        .update({ state: a.outcome, version: trx.raw('version + 1'), updated_at: trx.fn.now() });
    }
    const awarded = awards.filter((a) => a.outcome === 'awarded').map((a) => a.proposal_id);
    await trx('programs').where('cycle_id', cycle.id).del();
    if (awarded.length) await trx('programs').insert(awarded.map((id) => ({ proposal_id: id, cycle_id: cycle.id, state: 'observing' })));
    await trx('cycles').where('id', cycle.id).update({ awards_released_at: releasedAt, awards_released_by: manager.id });
    await trx('audit_log').insert({
      at: releasedAt,
      actor_account_id: manager.id,
      cycle_id: cycle.id,
      entity: 'release',
      entity_id: cycle.id,
      action: 'released',
      before: null,
      after: JSON.stringify({
        awarded: awarded.length,
        reserve: awards.filter((a) => a.outcome === 'reserve').length,
        notAwarded: awards.filter((a) => a.outcome === 'not_awarded').length,
        programsCreated: awarded.length,
      }),
      reason: null,
    });
  });

  // The build, one node job after another (the worker runs the same function).
  const nodeIds = (await db('cycle_nodes').where('cycle_id', cycle.id).orderBy('node_id').pluck('node_id')) as number[];
  const planCycle = (await findNightPlanCycle(db, cycle.id))!;
  const build = await insertBuild(db, {
    cycleId: cycle.id,
    kind: 'build',
    fromNight: null,
    nodeId: null,
    nodeJobs: nodeIds.length,
    total: await unitsOf(db, planCycle, nodeIds, null),
    requestedBy: manager.id,
    at: addHours(startOfDay(now), -13),
  });
  for (const nodeId of nodeIds) await runNightPlanNodeJob(db, { buildId: build.id, nodeId });

  // The past: on the first node with visits, visits before today done (one in seven missed);
  // the night before yesterday lost to weather, and the node re-planned from it.
  const today = formatISO(startOfDay(now), { representation: 'date' });
  const busiest = (await db('night_plan_visits')
    .where('cycle_id', cycle.id)
    .groupBy('node_id')
    .orderByRaw('count(*) desc')
    .first('node_id')) as { node_id: number } | undefined;
  if (!busiest) return;
  const nodeId = busiest.node_id;
  const past = (await db('night_plan_visits')
    .where({ cycle_id: cycle.id, node_id: nodeId })
    .where('night_date', '<', formatISO(addDays(startOfDay(now), -2), { representation: 'date' }))
    .orderBy('start_at')
    .select('id')) as { id: number }[];
  for (const [i, v] of past.entries()) {
    await db('night_plan_visits')
      .where('id', v.id)
      .update({ status: i % 7 === 3 ? 'missed' : 'done', status_changed_by: manager.id, status_changed_at: now });
  }
  const lostDate = formatISO(addDays(startOfDay(now), -2), { representation: 'date' });
  if (lostDate < cycle.campaign_start || lostDate >= today) return;
  await db.transaction(async (trx) => {
    await trx('lost_nights').insert({
      cycle_id: cycle.id,
      node_id: nodeId,
      night_date: lostDate,
      reason: 'Cloud all night.',
      marked_by: manager.id,
      marked_at: now,
    });
    await trx('night_plan_visits')
      .where({ cycle_id: cycle.id, node_id: nodeId, night_date: lostDate, status: 'planned' })
      .update({ status: 'missed' });
    await trx('audit_log').insert({
      at: now,
      actor_account_id: manager.id,
      cycle_id: cycle.id,
      entity: 'lost_night',
      entity_id: nodeId,
      action: 'mark_lost',
      before: null,
      after: JSON.stringify({ date: lostDate }),
      reason: 'Cloud all night.',
    });
  });
  const replan = await insertBuild(db, {
    cycleId: cycle.id,
    kind: 'replan',
    fromNight: lostDate,
    nodeId,
    nodeJobs: 1,
    total: await unitsOf(db, planCycle, [nodeId], lostDate),
    requestedBy: manager.id,
    at: now,
  });
  await runNightPlanNodeJob(db, { buildId: replan.id, nodeId });
}
