import { addHours, startOfDay } from 'date-fns';
import type { Knex } from 'knex';
import { computePanelStatistics } from '../../shared/src/review/review-statistics';
import { initialStandingOrder } from '../../shared/src/review/standing';
import { findAccountByEmail } from '../../server/src/features/accounts/account-repository';

/**
 * Demo awards: the "<year>-R0" cycle of 03-review gets its panel's standing locked (from the
 * normalised grades, as the chair would lock it) the day before yesterday, which makes its
 * proposals ranked, and the demo manager's decisions on five of its eight proposals, within
 * each node's capacity: two awarded what their feasible plans need, one partial award (its
 * first feasible targets only), one on the reserve list, and one not awarded (the best-placed
 * proposal whose plans are not feasible on its nodes). The others are left for the manager to
 * decide, and the decisions are not released, so that the award board has work on it. Each
 * decision has its audit entry. Which plans are feasible depends on the day of seeding (the
 * campaign is relative to it), so the choice follows the stored plans; when fewer than three
 * proposals have feasible plans, the best-placed others are awarded what their plans request.
 * Every name is invented.
 *
 * Idempotent: runs after 03-review (whose cycles 01-demo's truncation clears on a full reload);
 * run again on its own, it replaces its own decisions and audit entries and keeps a standing
 * that is already locked.
 */
export async function seed(db: Knex): Promise<void> {
  await db.transaction((trx) => seedAwards(trx));
}

const round2 = (x: number) => Math.round(x * 100) / 100;

/** Why the manager decided so (kept in the audit log). */
const NOTES = {
  awarded: 'Strong case; the plans fit the node-hours offered.',
  partial: 'Partial award: the first targets carry the science case; the rest would overfill the nodes.',
  reserve: 'Reserve: promoted if a higher-placed program returns node-hours.',
  infeasible: 'The plans are not feasible on the requested nodes in this campaign.',
  below: 'Below the line this cycle.',
};

async function seedAwards(knex: Knex): Promise<void> {
  const year = startOfDay(new Date()).getUTCFullYear();
  const cycle = (await knex('cycles').where('code', `${year}-R0`).first('id')) as { id: number } | undefined;
  if (!cycle) throw new Error(`04-awards needs the cycle ${year}-R0 of 03-review`);
  const manager = (await findAccountByEmail(knex, 'manager@halcyon.example'))!;
  const panel = (await knex('panels').where('cycle_id', cycle.id).orderBy('id').first('id', 'standing_locked_at', 'chair_account_id')) as
    { id: number; standing_locked_at: Date | null; chair_account_id: number } | undefined;
  if (!panel) throw new Error('04-awards needs the panel of 03-review');

  // Start over with this seed's own rows.
  await knex('audit_log').where('cycle_id', cycle.id).del();
  await knex('programs').where('cycle_id', cycle.id).del();
  await knex('awards').where('cycle_id', cycle.id).del();
  await knex('cycles').where('id', cycle.id).update({ awards_released_at: null, awards_released_by: null });

  const lockedAt = addHours(startOfDay(new Date()), -40);
  let order: number[];
  if (panel.standing_locked_at) {
    order = await knex('standing_positions').where('panel_id', panel.id).orderBy('position').pluck('proposal_id');
  } else {
    // The standing as the review would start it: merit order of the normalised grades.
    const proposals = (await knex('proposals')
      .where('panel_id', panel.id)
      .whereNot('state', 'draft')
      .orderBy('id')
      .select('id', 'not_discussed')) as { id: number; not_discussed: boolean }[];
    const grades = (await knex('review_assignments as ra')
      .join('proposals as p', 'p.id', 'ra.proposal_id')
      .where('p.panel_id', panel.id)
      .whereNotNull('ra.grade')
      .select('ra.proposal_id', 'ra.reviewer_account_id', 'ra.grade')) as {
      proposal_id: number;
      reviewer_account_id: number;
      grade: number;
    }[];
    const stats = computePanelStatistics(
      proposals.map((p) => p.id),
      grades.map((g) => ({ proposalId: g.proposal_id, reviewerId: g.reviewer_account_id, grade: Number(g.grade) })),
      3,
    );
    order = initialStandingOrder(stats.proposals.map((s, i) => ({ ...s, notDiscussed: proposals[i].not_discussed })));
    await knex('standing_positions').where('panel_id', panel.id).del();
    await knex('standing_positions').insert(
      order.map((proposalId, i) => ({ proposal_id: proposalId, panel_id: panel.id, position: i + 1 })),
    );
    await knex('panels')
      .where('id', panel.id)
      .update({
        standing_locked_at: lockedAt,
        standing_locked_by: panel.chair_account_id,
        version: knex.raw('version + 1'),
        updated_at: knex.fn.now(),
      });
  }
  await knex('proposals')
    .whereIn('id', order)
    .whereIn('state', ['in_review', 'awarded', 'reserve', 'not_awarded'])
    .update({ state: 'ranked', version: knex.raw('version + 1'), updated_at: knex.fn.now() });

  const offered = new Map<number, number>(
    (
      (await knex('cycle_nodes').where('cycle_id', cycle.id).select('node_id', 'node_hours_available')) as {
        node_id: number;
        node_hours_available: number;
      }[]
    ).map((r) => [r.node_id, Number(r.node_hours_available)]),
  );
  const remaining = new Map(offered);

  // Feasible plans on requested nodes: what each proposal (and each target) needs per node.
  const plans = await listPlans(knex, order, true);
  /** Node-hours within what is left on each node (a node with nothing left is dropped). */
  const within = (need: Map<number, number>) =>
    [...need]
      .filter(([nodeId]) => offered.has(nodeId))
      .map(([nodeId, hours]) => ({ nodeId, nodeHours: round2(Math.min(hours, remaining.get(nodeId) ?? 0)) }))
      .filter((n) => n.nodeHours > 0);

  const feasibleNeeds = (proposalId: number, targets: Set<number> | null) => needs(plans, proposalId, targets);
  const fundable = order.filter((id) => feasibleNeeds(id, null).size > 0);
  const unfundable = order.filter((id) => !fundable.includes(id));
  // Fewer than three proposals with feasible plans: the best-placed others are awarded what their plans request.
  const allPlans = unfundable.length && fundable.length < 3 ? await listPlans(knex, order, false) : [];
  const candidates = [...fundable, ...unfundable.slice(0, Math.max(0, 3 - fundable.length))];
  const needOf = (proposalId: number, targets: Set<number> | null) =>
    fundable.includes(proposalId) ? feasibleNeeds(proposalId, targets) : needs(allPlans, proposalId, targets);
  const planned: { proposalId: number; kind: 'awarded' | 'partial' | 'reserve' | 'not_awarded'; note: string }[] = [];
  candidates
    .slice(0, 3)
    .forEach((proposalId, i) =>
      planned.push({ proposalId, kind: i === 2 ? 'partial' : 'awarded', note: NOTES[i === 2 ? 'partial' : 'awarded'] }),
    );
  const used = () => new Set(planned.map((d) => d.proposalId));
  const reserve = [...fundable, ...unfundable].find((id) => !used().has(id));
  if (reserve !== undefined) planned.push({ proposalId: reserve, kind: 'reserve', note: NOTES.reserve });
  const infeasible = unfundable.find((id) => !used().has(id));
  const below = [...order].reverse().find((id) => !used().has(id));
  const notAwarded = infeasible ?? below;
  if (notAwarded !== undefined)
    planned.push({ proposalId: notAwarded, kind: 'not_awarded', note: infeasible !== undefined ? NOTES.infeasible : NOTES.below });

  const base = addHours(startOfDay(new Date()), -20);
  for (const [i, d] of planned.entries()) {
    let outcome: 'awarded' | 'reserve' | 'not_awarded' = d.kind === 'partial' ? 'awarded' : d.kind;
    let targetIds: number[] | null = null;
    let nodes: { nodeId: number; nodeHours: number }[] = [];
    if (d.kind === 'partial') {
      const withPlans = [
        ...new Set(
          (fundable.includes(d.proposalId) ? plans : allPlans).filter((p) => p.proposal_id === d.proposalId).map((p) => p.target_id),
        ),
      ];
      const all = (await knex('targets').where('proposal_id', d.proposalId).pluck('id')) as number[];
      targetIds = withPlans.slice(0, Math.max(1, Math.ceil(withPlans.length / 2)));
      if (targetIds.length >= all.length) targetIds = null;
      nodes = within(needOf(d.proposalId, targetIds && new Set(targetIds)));
    } else if (d.kind === 'awarded') {
      nodes = within(needOf(d.proposalId, null));
    } else if (d.kind === 'reserve') {
      nodes = [...needOf(d.proposalId, null)].map(([nodeId, nodeHours]) => ({ nodeId, nodeHours })).filter((n) => n.nodeHours > 0);
    }
    // Nothing left to give: the reserve list instead.
    if (outcome === 'awarded' && !nodes.length) {
      outcome = 'reserve';
      targetIds = null;
    }
    if (outcome === 'awarded') for (const n of nodes) remaining.set(n.nodeId, round2(remaining.get(n.nodeId)! - n.nodeHours));
    const decidedAt = addHours(base, i);
    await knex('awards').insert({
      proposal_id: d.proposalId,
      cycle_id: cycle.id,
      outcome,
      target_ids: targetIds,
      decided_by: manager.id,
      decided_at: decidedAt,
    });
    if (nodes.length)
      await knex('award_nodes').insert(nodes.map((n) => ({ proposal_id: d.proposalId, node_id: n.nodeId, node_hours: n.nodeHours })));
    await knex('audit_log').insert({
      at: decidedAt,
      actor_account_id: manager.id,
      cycle_id: cycle.id,
      entity: 'award',
      entity_id: d.proposalId,
      action: 'decided',
      before: null,
      after: JSON.stringify({ outcome, nodes, targetIds, overrideReason: null }),
      reason: d.note,
    });
  }
}

interface PlanRow {
  proposal_id: number;
  target_id: number;
  node_id: number;
  node_hours: number;
}

/** Stored plans of the proposals on the nodes they request (only the feasible ones, or every one with hours). */
async function listPlans(knex: Knex, proposalIds: number[], feasibleOnly: boolean): Promise<PlanRow[]> {
  const q = knex('target_plans as tp')
    .join('proposal_nodes as pn', (on) => {
      on.on('pn.proposal_id', 'tp.proposal_id').andOn('pn.node_id', 'tp.node_id');
    })
    .join('targets as t', 't.id', 'tp.target_id')
    .whereIn('tp.proposal_id', proposalIds)
    .whereNotNull('tp.node_hours')
    .orderBy('t.position')
    .select('tp.proposal_id', 'tp.target_id', 'tp.node_id', 'tp.node_hours');
  if (feasibleOnly) q.where('tp.feasible', true);
  return (await q) as PlanRow[];
}

/** Node-hours per node a proposal's plans need (of some targets, or of every one). */
function needs(plans: PlanRow[], proposalId: number, targets: Set<number> | null): Map<number, number> {
  const out = new Map<number, number>();
  for (const p of plans) {
    if (p.proposal_id !== proposalId || (targets && !targets.has(p.target_id))) continue;
    out.set(p.node_id, round2((out.get(p.node_id) ?? 0) + Number(p.node_hours)));
  }
  return out;
}
