import type { Knex } from 'knex';
import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import { callStatusAt } from '@spincycle/shared/facility/facility-types';
import {
  DEFAULT_COMPLETENESS,
  type CreateProposalInput,
  type Proposal,
  type ProposalSummary,
  type UpdateProposalInput,
} from '@spincycle/shared/proposals/proposal-schemas';
import type { AppContext } from '../../app-context';
import { inParallel } from '../../db/in-parallel';
import { AppError, invalidField } from '../../http/app-error';
import { findCycleById, listCycleNodes } from '../cycles/cycle-repository';
import { formatUtc, formatUtcTime, summarizeCycle } from '../cycles/cycle-service';
import { findJustificationMeta } from './justification/justification-repository';
import { planInputsHash } from './plans/plan-inputs';
import { insertIdlePlanRun, markPlansRequested, nodeRequestTotals } from './plans/plan-repository';
import { queuePlanComputations } from './plans/plan-requests';
import { accessProposal, isEditable, requireEditable, requirePi, type ProposalAccess } from './proposal-access';
import {
  deleteProposalRow,
  insertProposal,
  listProposalNodeIds,
  listProposalSummariesOf,
  replaceProposalNodes,
  updateProposalFields,
} from './proposal-repository';
import { countTargets } from './targets/target-repository';
import { insertPiMember, listMembers } from './team/member-repository';

/** GET /api/proposals: the proposals on which the viewer is an active team member. */
export function listMyProposals(ctx: AppContext, viewer: SessionUser): Promise<ProposalSummary[]> {
  return listProposalSummariesOf(ctx.db, viewer.id);
}

/** The whole proposal as its team sees it (the cycle's row comes with `access`, its capacity is read here). */
export async function assembleProposal(ctx: AppContext, db: Knex, access: ProposalAccess): Promise<Proposal> {
  const { proposal, cycle, role } = access;
  const [cycleNodes, team, nodeIds, justification, targetCount, request] = await inParallel(db, [
    () => listCycleNodes(db, cycle.id),
    () => listMembers(db, proposal.id),
    () => listProposalNodeIds(db, proposal.id),
    () => findJustificationMeta(db, proposal.id),
    () => countTargets(db, proposal.id),
    () => nodeRequestTotals(db, proposal.id),
  ] as const);
  const now = ctx.now();
  return {
    id: proposal.id,
    cycle: summarizeCycle({ ...cycle, nodes: cycleNodes }, now),
    title: proposal.title,
    abstract: proposal.abstract,
    category: proposal.category,
    state: proposal.state,
    version: proposal.version,
    nodeIds,
    completeness: proposal.completeness,
    team: team.map(({ proposalId: _p, ...member }) => member),
    justification,
    targetCount,
    request,
    myRole: role,
    editable: isEditable(access, now),
    submittedAt: proposal.submittedAt,
    createdAt: proposal.createdAt,
    updatedAt: proposal.updatedAt,
  };
}

/** GET /api/proposals/:id (team members; 404 for everyone else). */
export async function getProposal(ctx: AppContext, viewer: SessionUser, id: number): Promise<Proposal> {
  return assembleProposal(ctx, ctx.db, await accessProposal(ctx.db, viewer, id));
}

/**
 * POST /api/proposals (proposers): a new draft in a cycle whose call is open; the creator
 * becomes its PI. The plan run starts `idle` and current (no targets, no nodes: nothing to plan).
 */
export async function createProposal(ctx: AppContext, viewer: SessionUser, input: CreateProposalInput): Promise<Proposal> {
  const cycle = await findCycleById(ctx.db, input.cycleId);
  if (!cycle) throw invalidField('cycleId', `no cycle ${input.cycleId}`);
  const status = callStatusAt(cycle, ctx.now());
  if (status !== 'open') {
    const when = status === 'upcoming' ? `opens at ${formatUtc(cycle.callOpensAt)}` : `closed at ${formatUtc(cycle.callClosesAt)}`;
    throw new AppError('call_not_open', `The call for ${cycle.code} is not open: it ${when}`, 422, { cycleId: [`the call ${when}`] });
  }
  const id = await ctx.db.transaction(async (trx) => {
    const proposalId = await insertProposal(trx, {
      cycleId: cycle.id,
      piAccountId: viewer.id,
      title: input.title,
      completeness: DEFAULT_COMPLETENESS,
    });
    await insertPiMember(trx, proposalId, viewer);
    const emptyHash = planInputsHash({
      campaign: { firstNight: cycle.campaignStart, lastNight: cycle.campaignEnd },
      nodes: [],
      targets: [],
      completeness: DEFAULT_COMPLETENESS,
    });
    await insertIdlePlanRun(trx, proposalId, emptyHash);
    return proposalId;
  });
  return getProposal(ctx, viewer, id);
}

/**
 * PATCH /api/proposals/:id (team members; the editor's autosave). The body names the version
 * the editor last read; if someone else on the team saved since, nothing is written and the
 * answer is 409 `version_conflict` with the time of their save: never a silent overwrite.
 * Requested nodes must take part in the cycle; changing them or the completeness queues the
 * plans again (in the same transaction, like a target change).
 */
export async function updateProposal(ctx: AppContext, viewer: SessionUser, id: number, input: UpdateProposalInput): Promise<Proposal> {
  let plansChanged = false;
  await ctx.db.transaction(async (trx) => {
    const access = await accessProposal(trx, viewer, id, { forUpdate: true });
    requireEditable(access, ctx.now());
    const { proposal, cycle } = access;
    if (proposal.version !== input.version) {
      throw new AppError(
        'version_conflict',
        `Someone else on the team saved this proposal at ${formatUtcTime(proposal.updatedAt)}; reload to see their changes`,
        409,
        { version: [`the current version is ${proposal.version}, not ${input.version}`] },
      );
    }
    if (input.category !== undefined && input.category !== null && !cycle.categories.includes(input.category)) {
      throw invalidField('category', `choose one of the cycle's categories: ${cycle.categories.join('; ')}`);
    }
    let nodeIds: number[] | undefined;
    let nodesChanged = false;
    if (input.nodeIds !== undefined) {
      nodeIds = [...new Set(input.nodeIds)].sort((a, b) => a - b);
      const offered = new Set((await listCycleNodes(trx, cycle.id)).map((n) => n.nodeId));
      const foreign = nodeIds.filter((n) => !offered.has(n));
      if (foreign.length) {
        throw invalidField(
          'nodeIds',
          `node${foreign.length > 1 ? 's' : ''} ${foreign.join(', ')} ${foreign.length > 1 ? 'do' : 'does'} not take part in cycle ${cycle.code}`,
        );
      }
      const current = await listProposalNodeIds(trx, id);
      nodesChanged = current.join(',') !== nodeIds.join(',');
    }
    const completenessChanged = input.completeness !== undefined && input.completeness !== proposal.completeness;
    const fieldsChanged =
      (input.title !== undefined && input.title !== proposal.title) ||
      (input.abstract !== undefined && input.abstract !== proposal.abstract) ||
      (input.category !== undefined && input.category !== proposal.category) ||
      completenessChanged;
    // An autosave that changes nothing keeps the version, so that it cannot cause a conflict.
    if (!fieldsChanged && !nodesChanged) return;
    await updateProposalFields(trx, id, {
      title: input.title,
      abstract: input.abstract,
      category: input.category,
      completeness: completenessChanged ? input.completeness : undefined,
    });
    if (nodesChanged) await replaceProposalNodes(trx, id, nodeIds!);
    plansChanged = nodesChanged || completenessChanged;
    if (plansChanged) await markPlansRequested(trx, [id]);
  });
  if (plansChanged) await queuePlanComputations(ctx, [id]);
  return getProposal(ctx, viewer, id);
}

/** DELETE /api/proposals/:id: the PI deletes a draft, with its team, targets, plans and files. */
export async function deleteProposal(ctx: AppContext, viewer: SessionUser, id: number): Promise<void> {
  await ctx.db.transaction(async (trx) => {
    const access = await accessProposal(trx, viewer, id, { forUpdate: true });
    requirePi(access, 'delete the proposal');
    if (access.proposal.state !== 'draft') {
      throw new AppError('not_editable', 'Only a draft can be deleted; withdraw the proposal first, while the call is open', 409);
    }
    await deleteProposalRow(trx, id);
  });
}
