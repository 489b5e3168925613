import type { CycleInput, CycleUpdate } from '@spincycle/shared/cycles/cycle-schemas';
import { callStatusAt, type CycleSummary } from '@spincycle/shared/facility/facility-types';
import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import { hasAnyRole } from '@spincycle/shared/accounts/roles';
import type { AppContext } from '../../app-context';
import { isUniqueViolation } from '../../db/unique-violation';
import { AppError } from '../../http/app-error';
import { listNodes } from '../facility/facility-repository';
import { markPlansRequested } from '../proposals/plans/plan-repository';
import { queuePlanComputations } from '../proposals/plans/plan-requests';
import {
  cycleIdsWithMembership,
  draftProposalIdsOfCycle,
  findCycleById,
  findCycleWithNodes,
  insertCycle,
  listCycles,
  replaceCycleNodes,
  requestedNodesOfCycle,
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
  return new AppError('code_taken', `A cycle with the code ${code} exists already`, 409, { [`${prefix}code`]: [`a cycle with the code ${code} exists already`] });
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

/**
 * PUT /api/cycles/:id (facility managers). The body names the version it read: another
 * manager's save in between → 409 `version_conflict`, nothing written. The nodes and their
 * capacity are replaced in the same transaction; a node that proposals of the cycle request
 * cannot be dropped (409 `node_in_use`). A changed campaign makes the draft proposals' plans
 * stale, so they are queued for recomputation.
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
