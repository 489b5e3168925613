import {
  pressureOf,
  type CycleNodePressure,
  type CycleProposalItem,
  type CycleProposalsReport,
} from '@spincycle/shared/cycles/cycle-proposals';
import type { CycleInput, CycleUpdate } from '@spincycle/shared/cycles/cycle-schemas';
import { callStatusAt, type CycleSummary } from '@spincycle/shared/facility/facility-types';
import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import { hasAnyRole } from '@spincycle/shared/accounts/roles';
import type { Knex } from 'knex';
import type { AppContext } from '../../app-context';
import { isUniqueViolation } from '../../db/unique-violation';
import { AppError } from '../../http/app-error';
import { listNodes } from '../facility/facility-repository';
import { markPlansRequested } from '../proposals/plans/plan-repository';
import { queuePlanComputations } from '../proposals/plans/plan-requests';
import {
  countDraftsOfCycle,
  cycleIdsWithMembership,
  draftProposalIdsOfCycle,
  findCycleById,
  findCycleWithNodes,
  insertCycle,
  listCycleNodes,
  listCycles,
  listSubmittedProposalsOfCycle,
  replaceCycleNodes,
  requestedNodesOfCycle,
  requestsOfProposals,
  submittedRequestsByNode,
  toPublicCycle,
  updateCycleRow,
  type StoredCycle,
} from './cycle-repository';

/** Facility managers and administrators see every cycle, whatever its call status. */
const seesAllCycles = (viewer: SessionUser) => hasAnyRole(viewer, 'facility_manager', 'administrator');

/** `2027-01-15T23:59:59.000Z` → `2027-01-15 23:59:59 UTC`. */
export function formatUtc(iso: string): string {
  return `${iso.slice(0, 10)} ${iso.slice(11, 19)} UTC`;
}

/** `HH:MM UTC` of an instant, for "saved at" messages. */
export function formatUtcTime(iso: string): string {
  return `${iso.slice(11, 16)} UTC`;
}

/** A stored cycle with its capacity as the API shows it, with the call status at `now`. */
export function summarizeCycle(cycle: StoredCycle & { nodes: CycleSummary['nodes'] }, now: Date): CycleSummary {
  const { nodes, ...rest } = cycle;
  const plain = toPublicCycle(rest);
  return { ...plain, nodes, status: callStatusAt(plain, now) };
}

const summarize = (ctx: AppContext, cycle: StoredCycle & { nodes: CycleSummary['nodes'] }) => summarizeCycle(cycle, ctx.now());

/**
 * GET /api/cycles. A call is shown to proposers (and every role other than facility manager
 * and administrator) only while it is open, plus the cycles in which they have a proposal,
 * so that upcoming calls stay private until they open and old ones do not clutter the list.
 */
export async function listCyclesFor(ctx: AppContext, viewer: SessionUser): Promise<CycleSummary[]> {
  const cycles = (await listCycles(ctx.db)).map((c) => summarize(ctx, c));
  if (seesAllCycles(viewer)) return cycles;
  const mine = new Set(await cycleIdsWithMembership(ctx.db, viewer.id));
  return cycles.filter((c) => c.status === 'open' || mine.has(c.id));
}

/** GET /api/cycles/:id, under the same visibility rule (404 when hidden). */
export async function getCycleFor(ctx: AppContext, viewer: SessionUser, id: number): Promise<CycleSummary> {
  const cycle = await findCycleWithNodes(ctx.db, id);
  const hidden = () => new AppError('cycle_not_found', `No cycle ${id}`, 404);
  if (!cycle) throw hidden();
  const summary = summarize(ctx, cycle);
  if (seesAllCycles(viewer) || summary.status === 'open') return summary;
  if ((await cycleIdsWithMembership(ctx.db, viewer.id)).includes(id)) return summary;
  throw hidden();
}

/** 400 naming every node of the input that does not exist; `prefix` is the body path of the cycle. */
async function checkNodesExist(ctx: AppContext, input: CycleInput, prefix: '' | 'cycle.'): Promise<void> {
  const ids = input.nodes.map((n) => n.nodeId);
  const known = new Set((await listNodes(ctx.db, ids)).map((n) => n.id));
  const fieldErrors: Record<string, string[]> = {};
  input.nodes.forEach((n, i) => {
    if (!known.has(n.nodeId)) fieldErrors[`${prefix}nodes.${i}.nodeId`] = [`no node ${n.nodeId}`];
  });
  const keys = Object.keys(fieldErrors);
  if (keys.length) throw new AppError('validation_failed', `${keys[0]}: ${fieldErrors[keys[0]][0]}`, 400, fieldErrors);
}

function codeTaken(code: string, prefix: string) {
  return new AppError('code_taken', `A cycle with the code ${code} exists already`, 409, {
    [`${prefix}code`]: [`a cycle with the code ${code} exists already`],
  });
}

/** POST /api/cycles (facility managers): a new cycle with its nodes and their capacity. */
export async function createCycle(ctx: AppContext, actor: SessionUser, input: CycleInput): Promise<CycleSummary> {
  await checkNodesExist(ctx, input, '');
  try {
    const id = await ctx.db.transaction(async (trx) => {
      const cycleId = await insertCycle(trx, input, actor.id);
      await replaceCycleNodes(trx, cycleId, input.nodes);
      return cycleId;
    });
    return summarize(ctx, (await findCycleWithNodes(ctx.db, id))!);
  } catch (err) {
    if (isUniqueViolation(err)) throw codeTaken(input.code, '');
    throw err;
  }
}

/** `809.68` → `809.68`, `620` → `620` (node-hours in messages). */
const hours = (x: number) => String(Math.round(x * 100) / 100);

/**
 * PUT /api/cycles/:id (facility managers). The body names the version it read: another
 * manager's save in between → 409 `version_conflict`, nothing written. The nodes and their
 * capacity are replaced in the same transaction; a node that proposals of the cycle request
 * cannot be dropped (409 `node_in_use`). Cutting a node's capacity below what the cycle's
 * submitted proposals request there needs `confirmCapacityCut` (else 409
 * `capacity_below_requests` naming node, request and new capacity, nothing written). A changed
 * campaign makes the draft proposals' plans stale, so they are queued for recomputation.
 */
export async function updateCycle(ctx: AppContext, id: number, update: CycleUpdate): Promise<CycleSummary> {
  const input = update.cycle;
  await checkNodesExist(ctx, input, 'cycle.');
  let replan: number[] = [];
  try {
    await ctx.db.transaction(async (trx) => {
      const current = await findCycleById(trx, id, { forUpdate: true });
      if (!current) throw new AppError('cycle_not_found', `No cycle ${id}`, 404);
      if (current.version !== update.version) {
        throw new AppError(
          'version_conflict',
          `Someone else saved cycle ${current.code} at ${formatUtcTime(current.updatedAt)}; reload to see their changes`,
          409,
          { version: [`the current version is ${current.version}, not ${update.version}`] },
        );
      }
      const kept = new Set(input.nodes.map((n) => n.nodeId));
      const dropped = (await requestedNodesOfCycle(trx, id)).filter((n) => !kept.has(n.nodeId));
      if (dropped.length) {
        const names = dropped.map((n) => `${n.nodeCode} (requested by ${n.proposals} proposal${n.proposals === 1 ? '' : 's'})`).join(', ');
        throw new AppError('node_in_use', `These nodes cannot leave the cycle while proposals request them: ${names}`, 409, {
          'cycle.nodes': [`still requested: ${names}`],
        });
      }
      if (!update.confirmCapacityCut) await refuseUnconfirmedCapacityCut(trx, id, input);
      await updateCycleRow(trx, id, input);
      await replaceCycleNodes(trx, id, input.nodes);
      if (current.campaignStart !== input.campaignStart || current.campaignEnd !== input.campaignEnd) {
        replan = await draftProposalIdsOfCycle(trx, id);
        await markPlansRequested(trx, replan);
      }
    });
  } catch (err) {
    if (isUniqueViolation(err)) throw codeTaken(input.code, 'cycle.');
    throw err;
  }
  await queuePlanComputations(ctx, replan);
  return summarize(ctx, (await findCycleWithNodes(ctx.db, id))!);
}

/**
 * 409 `capacity_below_requests` when the input lowers some node's capacity below the node-hours
 * the cycle's submitted proposals request there (a raise, or a cut that still covers the
 * requests, passes). Its message lists node, request and new capacity; fieldErrors point at
 * each row's capacity (`cycle.nodes.<i>.nodeHoursAvailable`).
 */
async function refuseUnconfirmedCapacityCut(db: Knex, cycleId: number, input: CycleInput): Promise<void> {
  const [before, requested] = await Promise.all([listCycleNodes(db, cycleId), submittedRequestsByNode(db, cycleId)]);
  const previous = new Map(before.map((n) => [n.nodeId, n]));
  const cuts: { index: number; nodeCode: string; requested: number; capacity: number }[] = [];
  input.nodes.forEach((n, index) => {
    const old = previous.get(n.nodeId);
    const request = requested.get(n.nodeId)?.nodeHours ?? 0;
    if (old && n.nodeHoursAvailable < old.nodeHoursAvailable && n.nodeHoursAvailable < request) {
      cuts.push({ index, nodeCode: old.nodeCode, requested: request, capacity: n.nodeHoursAvailable });
    }
  });
  if (!cuts.length) return;
  const list = cuts.map((c) => `${c.nodeCode}: ${hours(c.requested)} node-hours requested, new capacity ${hours(c.capacity)}`).join('; ');
  const fieldErrors: Record<string, string[]> = {};
  for (const c of cuts) {
    fieldErrors[`cycle.nodes.${c.index}.nodeHoursAvailable`] = [
      `below the ${hours(c.requested)} node-hours submitted proposals request on ${c.nodeCode}`,
    ];
  }
  throw new AppError(
    'capacity_below_requests',
    `The new capacity is below what submitted proposals request (${list}). Save again with confirmCapacityCut to cut it anyway.`,
    409,
    fieldErrors,
    { nodes: cuts.map(({ nodeCode, requested: r, capacity }) => ({ nodeCode, requestedNodeHours: r, nodeHoursAvailable: capacity })) },
  );
}

/**
 * GET /api/cycles/:id/proposals (facility managers): the proposals submitted to the cycle
 * (every state but draft), each with its request per node against the node's capacity, and
 * the pressure on each node (requested ÷ offered). Requests count feasible target plans only;
 * the infeasible plans' node-hours are reported apart.
 */
export async function getCycleProposals(ctx: AppContext, id: number): Promise<CycleProposalsReport> {
  const cycle = await findCycleWithNodes(ctx.db, id);
  if (!cycle) throw new AppError('cycle_not_found', `No cycle ${id}`, 404);
  const [rows, draftCount] = await Promise.all([listSubmittedProposalsOfCycle(ctx.db, id), countDraftsOfCycle(ctx.db, id)]);
  const requests = await requestsOfProposals(
    ctx.db,
    rows.map((r) => r.id),
  );
  const capacity = new Map(cycle.nodes.map((n) => [n.nodeId, n.nodeHoursAvailable]));
  const byProposal = new Map<number, CycleProposalItem['request']>();
  for (const r of requests) {
    const available = capacity.get(r.nodeId) ?? null;
    const { proposalId, ...rest } = r;
    const list = byProposal.get(proposalId) ?? [];
    list.push({ ...rest, nodeHoursAvailable: available, overCapacity: available !== null && r.nodeHours > available });
    byProposal.set(proposalId, list);
  }
  const proposals: CycleProposalItem[] = rows.map((row) => {
    const request = byProposal.get(row.id) ?? [];
    return {
      ...row,
      request,
      totalNodeHours: Math.round(request.reduce((s, r) => s + r.nodeHours, 0) * 100) / 100,
      overCapacity: request.some((r) => r.overCapacity),
    };
  });
  const nodes: CycleNodePressure[] = cycle.nodes.map((n) => {
    const on = requests.filter((r) => r.nodeId === n.nodeId);
    const requested = Math.round(on.reduce((s, r) => s + r.nodeHours, 0) * 100) / 100;
    return {
      nodeId: n.nodeId,
      nodeCode: n.nodeCode,
      nodeHoursAvailable: n.nodeHoursAvailable,
      requestedNodeHours: requested,
      infeasibleNodeHours: Math.round(on.reduce((s, r) => s + r.infeasibleNodeHours, 0) * 100) / 100,
      proposals: on.length,
      pressure: pressureOf(requested, n.nodeHoursAvailable),
    };
  });
  return { cycle: summarize(ctx, cycle), nodes, proposals, draftCount };
}
