import type { Knex } from 'knex';
import type { CapacityOverrunRule, CycleInput } from '@spincycle/shared/cycles/cycle-schemas';
import type { Cycle, CycleNodeCapacity } from '@spincycle/shared/facility/facility-types';
import type { ProposalState } from '@spincycle/shared/proposals/proposal-states';

interface CycleRow {
  id: number;
  code: string;
  title: string;
  call_opens_at: Date;
  call_closes_at: Date;
  /** DATE as `YYYY-MM-DD` (db/knex.ts installs the parser for every Knex). */
  campaign_start: string;
  campaign_end: string;
  anonymous_review: boolean;
  capacity_overrun: CapacityOverrunRule;
  categories: string[];
  version: number;
  updated_at: Date;
}

/** A cycle with the time of its last change (for conflict messages). */
export interface StoredCycle extends Cycle {
  updatedAt: string;
}

/** A `cycles` row as a stored cycle (camelCase, ISO instants). */
function toCycle(r: CycleRow): StoredCycle {
  return {
    id: r.id,
    code: r.code,
    title: r.title,
    callOpensAt: r.call_opens_at.toISOString(),
    callClosesAt: r.call_closes_at.toISOString(),
    campaignStart: r.campaign_start,
    campaignEnd: r.campaign_end,
    anonymousReview: r.anonymous_review,
    capacityOverrun: r.capacity_overrun,
    categories: r.categories,
    version: r.version,
    updatedAt: r.updated_at.toISOString(),
  };
}

/**
 * A cycle read as `row_to_json(c.*)` (when joined to another table's row): the same columns,
 * with instants as ISO text.
 */
export function toCycleFromJson(
  r: Omit<CycleRow, 'call_opens_at' | 'call_closes_at' | 'updated_at'> & Record<'call_opens_at' | 'call_closes_at' | 'updated_at', string>,
): StoredCycle {
  return toCycle({
    ...r,
    call_opens_at: new Date(r.call_opens_at),
    call_closes_at: new Date(r.call_closes_at),
    updated_at: new Date(r.updated_at),
  });
}

/** Strips the repository-only `updatedAt` from a stored cycle. */
export function toPublicCycle({ updatedAt: _hidden, ...cycle }: StoredCycle): Cycle {
  return cycle;
}

async function capacityOf(db: Knex, cycleIds: number[]): Promise<Map<number, CycleNodeCapacity[]>> {
  const rows = await db('cycle_nodes as cn')
    .join('nodes as n', 'n.id', 'cn.node_id')
    .whereIn('cn.cycle_id', cycleIds)
    .orderBy('n.code')
    .select('cn.cycle_id', 'cn.node_id', 'n.code', 'cn.node_hours_available');
  const byCycle = new Map<number, CycleNodeCapacity[]>();
  for (const r of rows) {
    const list = byCycle.get(r.cycle_id) ?? [];
    list.push({ nodeId: r.node_id, nodeCode: r.code, nodeHoursAvailable: r.node_hours_available });
    byCycle.set(r.cycle_id, list);
  }
  return byCycle;
}

/** Cycles with their node capacity, newest call first; `ids` narrows the list. */
export async function listCycles(db: Knex, ids?: number[]): Promise<(StoredCycle & { nodes: CycleNodeCapacity[] })[]> {
  const q = db<CycleRow>('cycles').orderBy('call_opens_at', 'desc').orderBy('id', 'desc');
  if (ids) q.whereIn('id', ids);
  const rows = await q;
  const capacity = await capacityOf(
    db,
    rows.map((r) => r.id),
  );
  return rows.map((r) => ({ ...toCycle(r), nodes: capacity.get(r.id) ?? [] }));
}

/** The cycle; `forUpdate` locks its row until the transaction ends. */
export async function findCycleById(db: Knex, id: number, options: { forUpdate?: boolean } = {}): Promise<StoredCycle | undefined> {
  const q = db<CycleRow>('cycles').where({ id }).first();
  if (options.forUpdate) q.forUpdate();
  const row = await q;
  return row ? toCycle(row) : undefined;
}

/** The cycle with its node capacity. */
export async function findCycleWithNodes(db: Knex, id: number): Promise<(StoredCycle & { nodes: CycleNodeCapacity[] }) | undefined> {
  const [cycle] = await listCycles(db, [id]);
  return cycle;
}

/** The node capacity of one cycle, by node code (for a cycle already at hand). */
export async function listCycleNodes(db: Knex, cycleId: number): Promise<CycleNodeCapacity[]> {
  return (await capacityOf(db, [cycleId])).get(cycleId) ?? [];
}

/** Ids of the cycles in which the account is an active member of a proposal. */
export async function cycleIdsWithMembership(db: Knex, accountId: number): Promise<number[]> {
  return db('proposals as p')
    .join('proposal_members as m', 'm.proposal_id', 'p.id')
    .where('m.account_id', accountId)
    .whereNotNull('m.accepted_at')
    .distinct('p.cycle_id')
    .pluck('p.cycle_id');
}

function cycleColumns(input: CycleInput) {
  return {
    code: input.code,
    title: input.title,
    call_opens_at: new Date(input.callOpensAt),
    call_closes_at: new Date(input.callClosesAt),
    campaign_start: input.campaignStart,
    campaign_end: input.campaignEnd,
    anonymous_review: input.anonymousReview,
    capacity_overrun: input.capacityOverrun,
    categories: input.categories,
  };
}

/** Inserts a cycle (version 1); returns its id. */
export async function insertCycle(db: Knex, input: CycleInput, createdBy: number): Promise<number> {
  const [row] = await db('cycles')
    .insert({ ...cycleColumns(input), created_by: createdBy })
    .returning('id');
  return row.id;
}

/** Writes the fields and increments the version. */
export async function updateCycleRow(db: Knex, id: number, input: CycleInput): Promise<void> {
  await db('cycles')
    .where({ id })
    .update({ ...cycleColumns(input), version: db.raw('version + 1'), updated_at: db.fn.now() });
}

/** Replaces the cycle's participating nodes and their capacity. */
export async function replaceCycleNodes(db: Knex, cycleId: number, nodes: CycleInput['nodes']): Promise<void> {
  await db('cycle_nodes').where({ cycle_id: cycleId }).del();
  await db('cycle_nodes').insert(nodes.map((n) => ({ cycle_id: cycleId, node_id: n.nodeId, node_hours_available: n.nodeHoursAvailable })));
}

/** Nodes requested by proposals of the cycle, with how many proposals request each. */
export async function requestedNodesOfCycle(db: Knex, cycleId: number): Promise<{ nodeId: number; nodeCode: string; proposals: number }[]> {
  const rows = await db('proposal_nodes as pn')
    .join('proposals as p', 'p.id', 'pn.proposal_id')
    .join('nodes as n', 'n.id', 'pn.node_id')
    .where('p.cycle_id', cycleId)
    .groupBy('pn.node_id', 'n.code')
    .select('pn.node_id', 'n.code', db.raw('count(*)::int AS proposals'));
  return rows.map((r: { node_id: number; code: string; proposals: number }) => ({
    nodeId: r.node_id,
    nodeCode: r.code,
    proposals: r.proposals,
  }));
}

/**
 * Node-hours the cycle's submitted proposals (every state but draft) request on each node,
 * feasible plans only (as in the proposals' own request), by node id.
 */
export async function submittedRequestsByNode(db: Knex, cycleId: number): Promise<Map<number, { nodeHours: number; proposals: number }>> {
  const rows = (await db('proposal_nodes as pn')
    .join('proposals as p', 'p.id', 'pn.proposal_id')
    .leftJoin('target_plans as tp', function () {
      this.on('tp.proposal_id', 'pn.proposal_id').andOn('tp.node_id', 'pn.node_id').andOnNotNull('tp.result');
    })
    .where('p.cycle_id', cycleId)
    .whereNot('p.state', 'draft')
    .groupBy('pn.node_id')
    .select(
      'pn.node_id',
      db.raw('coalesce(sum(tp.node_hours) FILTER (WHERE tp.feasible), 0)::float8 AS node_hours'),
      db.raw('count(DISTINCT pn.proposal_id)::int AS proposals'),
    )) as { node_id: number; node_hours: number; proposals: number }[];
  return new Map(rows.map((r) => [r.node_id, { nodeHours: Math.round(r.node_hours * 100) / 100, proposals: r.proposals }]));
}

/** One proposal of a cycle as the facility manager's list shows it (without its request). */
export interface CycleProposalRow {
  id: number;
  title: string;
  piName: string;
  state: ProposalState;
  submittedAt: string | null;
}

/** The cycle's proposals in every state but draft, earliest submission first. */
export async function listSubmittedProposalsOfCycle(db: Knex, cycleId: number): Promise<CycleProposalRow[]> {
  const rows = (await db('proposals as p')
    .join('accounts as a', 'a.id', 'p.pi_account_id')
    .where('p.cycle_id', cycleId)
    .whereNot('p.state', 'draft')
    .orderBy([{ column: 'p.submitted_at', order: 'asc', nulls: 'last' }, { column: 'p.id' }])
    .select('p.id', 'p.title', 'a.display_name', 'p.state', 'p.submitted_at')) as {
    id: number;
    title: string;
    display_name: string;
    state: ProposalState;
    submitted_at: Date | null;
  }[];
  return rows.map((r) => ({
    id: r.id,
    title: r.title,
    piName: r.display_name,
    state: r.state,
    submittedAt: r.submitted_at?.toISOString() ?? null,
  }));
}

/** How many of the cycle's proposals are still drafts (not counted in its pressure). */
export async function countDraftsOfCycle(db: Knex, cycleId: number): Promise<number> {
  const [{ n }] = await db('proposals').where({ cycle_id: cycleId, state: 'draft' }).count<{ n: number }[]>({ n: '*' });
  return Number(n);
}

/** Per proposal and requested node: feasible node-hours, infeasible node-hours and plan counts. */
export async function requestsOfProposals(
  db: Knex,
  proposalIds: number[],
): Promise<
  {
    proposalId: number;
    nodeId: number;
    nodeCode: string;
    nodeHours: number;
    infeasibleNodeHours: number;
    targets: number;
    infeasibleTargets: number;
  }[]
> {
  if (!proposalIds.length) return [];
  const rows = (await db('proposal_nodes as pn')
    .join('nodes as n', 'n.id', 'pn.node_id')
    .leftJoin('target_plans as tp', function () {
      this.on('tp.proposal_id', 'pn.proposal_id').andOn('tp.node_id', 'pn.node_id').andOnNotNull('tp.result');
    })
    .whereIn('pn.proposal_id', proposalIds)
    .groupBy('pn.proposal_id', 'pn.node_id', 'n.code')
    .orderBy([{ column: 'pn.proposal_id' }, { column: 'n.code' }])
    .select(
      'pn.proposal_id',
      'pn.node_id',
      'n.code',
      db.raw('coalesce(sum(tp.node_hours) FILTER (WHERE tp.feasible), 0)::float8 AS node_hours'),
      db.raw('coalesce(sum(tp.node_hours) FILTER (WHERE NOT tp.feasible), 0)::float8 AS infeasible_node_hours'),
      db.raw('count(tp.target_id)::int AS targets'),
      db.raw('count(tp.target_id) FILTER (WHERE NOT tp.feasible)::int AS infeasible'),
    )) as {
    proposal_id: number;
    node_id: number;
    code: string;
    node_hours: number;
    infeasible_node_hours: number;
    targets: number;
    infeasible: number;
  }[];
  const round = (x: number) => Math.round(x * 100) / 100;
  return rows.map((r) => ({
    proposalId: r.proposal_id,
    nodeId: r.node_id,
    nodeCode: r.code,
    nodeHours: round(r.node_hours),
    infeasibleNodeHours: round(r.infeasible_node_hours),
    targets: r.targets,
    infeasibleTargets: r.infeasible,
  }));
}

/** Ids of the cycle's proposals still in draft. */
export async function draftProposalIdsOfCycle(db: Knex, cycleId: number): Promise<number[]> {
  return db('proposals').where({ cycle_id: cycleId, state: 'draft' }).pluck('id');
}
