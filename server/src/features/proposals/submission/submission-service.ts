import type { Knex } from 'knex';
import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import { callStatusAt } from '@spincycle/shared/facility/facility-types';
import type { Proposal, SubmissionCheck } from '@spincycle/shared/proposals/proposal-schemas';
import type { AppContext } from '../../../app-context';
import { inParallel } from '../../../db/in-parallel';
import { AppError } from '../../../http/app-error';
import { deliverMail, enqueueMail } from '../../../mail/outbox';
import { listCycleNodes } from '../../cycles/cycle-repository';
import { formatUtc } from '../../cycles/cycle-service';
import { findJustificationMeta } from '../justification/justification-repository';
import { countPlanErrors, listStoredPlans, nodeRequestTotals } from '../plans/plan-repository';
import { planRunStatusOf } from '../plans/plan-service';
import { accessProposal, requirePi, type ProposalAccess } from '../proposal-access';
import { listProposalNodeIds, setProposalState } from '../proposal-repository';
import { assembleProposal, getProposal } from '../proposal-service';
import { countTargets, listTargets, toTargetRow } from '../targets/target-repository';
import { receiptMail } from './receipt-mail';
import { renderProposalSummaryPdf } from './summary-pdf';

/** Shortest abstract accepted for submission, characters. */
export const MIN_ABSTRACT_CHARACTERS = 100;

/** Node-hours in readiness messages: at most two decimals, no trailing zeros. */
const hours = (x: number) => String(Math.round(x * 100) / 100);

/**
 * What still stands between the proposal and submission. Problems block it; warnings do not
 * (infeasible target plans may be submitted: the panel judges them). A request above what the
 * cycle offers on a node is a warning, or a problem when the cycle blocks such requests
 * (`capacityOverrun`).
 */
async function checkReadiness(db: Knex, access: ProposalAccess): Promise<SubmissionCheck> {
  const { proposal, cycle } = access;
  const id = proposal.id;
  const [nodeIds, targetCount, justification, run, planErrors, request, capacity] = await inParallel(db, [
    () => listProposalNodeIds(db, id),
    () => countTargets(db, id),
    () => findJustificationMeta(db, id),
    () => planRunStatusOf(db, access),
    () => countPlanErrors(db, id),
    () => nodeRequestTotals(db, id),
    () => listCycleNodes(db, cycle.id),
  ] as const);
  const problems: SubmissionCheck['problems'] = [];
  const warnings: SubmissionCheck['warnings'] = [];
  const abstractLength = proposal.abstract.trim().length;
  if (!proposal.title.trim()) problems.push({ field: 'title', message: 'give the proposal a title' });
  if (abstractLength < MIN_ABSTRACT_CHARACTERS) {
    problems.push({
      field: 'abstract',
      message: `write an abstract of at least ${MIN_ABSTRACT_CHARACTERS} characters (it has ${abstractLength})`,
    });
  }
  if (!proposal.category) problems.push({ field: 'category', message: 'choose a science category' });
  else if (!cycle.categories.includes(proposal.category))
    problems.push({ field: 'category', message: `choose one of the cycle's categories: ${cycle.categories.join('; ')}` });
  if (!nodeIds.length) problems.push({ field: 'nodeIds', message: 'request at least one node' });
  if (!targetCount) problems.push({ field: 'targets', message: 'add at least one target' });
  if (!justification) problems.push({ field: 'justification', message: 'upload the justification PDF' });
  if (nodeIds.length && targetCount) {
    if (run.state === 'queued' || run.state === 'running') {
      problems.push({
        field: 'plans',
        message: `the target plans are being computed (${run.done} of ${run.total} targets); submit once they are ready`,
      });
    } else if (run.state === 'failed') {
      problems.push({ field: 'plans', message: 'the plan computation failed: ask for a recomputation' });
    } else if (!run.current) {
      problems.push({ field: 'plans', message: 'the target plans are out of date: recompute them' });
    } else if (planErrors) {
      problems.push({
        field: 'plans',
        message: `${planErrors} target plan${planErrors > 1 ? 's' : ''} could not be computed from their input: fix those targets (see the plans)`,
      });
    }
  }
  const offered = new Map(capacity.map((n) => [n.nodeId, n.nodeHoursAvailable]));
  for (const r of request) {
    const available = offered.get(r.nodeId);
    if (available === undefined || r.nodeHours <= available) continue;
    const over = `${hours(r.nodeHours)} node-hours are requested on ${r.nodeCode}, more than the ${hours(available)} the cycle offers there`;
    if (cycle.capacityOverrun === 'block') {
      problems.push({
        field: 'request',
        message: `${over}; this cycle accepts no request above a node's capacity: drop targets or visits on ${r.nodeCode}`,
      });
    } else {
      warnings.push({ field: 'request', message: `${over}; it can be submitted, and the panel sees the overrun` });
    }
  }
  const infeasible = request.reduce((n, r) => n + r.infeasibleTargets, 0);
  const planned = request.reduce((n, r) => n + r.targets, 0);
  if (infeasible) {
    warnings.push({
      field: 'plans',
      message: `${infeasible} of ${planned} target plans are infeasible as they stand (see the plans); they are submitted with the rest`,
    });
  }
  return { ready: problems.length === 0, problems, warnings };
}

/** GET /api/proposals/:id/readiness (team members). */
export async function getReadiness(ctx: AppContext, viewer: SessionUser, id: number): Promise<SubmissionCheck> {
  return checkReadiness(ctx.db, await accessProposal(ctx.db, viewer, id));
}

function callClosed(code: string, closesAt: string, what = '') {
  const message = `The call for ${code} closed at ${formatUtc(closesAt)}${what}`;
  return new AppError('call_closed', message, 422, { callClosesAt: [message] });
}

/**
 * POST /api/proposals/:id/submit (the PI). The server's clock decides: at or after the call's
 * closing instant (UTC) → 422 `call_closed` with the deadline. A proposal that is not ready →
 * 422 `not_ready` with the problems as fieldErrors. Then it is submitted (read-only from now
 * on) and every active team member gets a receipt with the request and the fee caution (written
 * to the outbox in the same transaction, handed to the relay after the commit).
 */
export async function submitProposal(ctx: AppContext, viewer: SessionUser, id: number): Promise<Proposal> {
  const mailId = await ctx.db.transaction(async (trx) => {
    const access = await accessProposal(trx, viewer, id, { forUpdate: true });
    requirePi(access, 'submit the proposal');
    const now = ctx.now();
    const { proposal, cycle } = access;
    if (proposal.state !== 'draft') throw new AppError('not_editable', 'This proposal has been submitted already', 409);
    const status = callStatusAt(cycle, now);
    if (status === 'closed') throw callClosed(cycle.code, cycle.callClosesAt);
    if (status === 'upcoming')
      throw new AppError('call_not_open', `The call for ${cycle.code} opens at ${formatUtc(cycle.callOpensAt)}`, 422);
    const check = await checkReadiness(trx, access);
    if (!check.ready) {
      const fieldErrors: Record<string, string[]> = {};
      for (const p of check.problems) (fieldErrors[p.field] ??= []).push(p.message);
      const more = check.problems.length > 1 ? ` (and ${check.problems.length - 1} more)` : '';
      throw new AppError('not_ready', `The proposal is not ready to submit: ${check.problems[0].message}${more}`, 422, fieldErrors);
    }
    await setProposalState(trx, id, 'submitted', now);
    const submitted = await assembleProposal(ctx, trx, access);
    const team = submitted.team.filter((m) => m.status === 'active');
    const receipt = receiptMail({
      to: team.map((m) => m.email),
      title: submitted.title,
      piName: team.find((m) => m.role === 'pi')?.displayName ?? viewer.displayName,
      cycle: submitted.cycle,
      submittedAt: now.toISOString(),
      targetCount: submitted.targetCount,
      request: submitted.request,
    });
    return enqueueMail(trx, receipt, 'submission');
  });
  await deliverMail(ctx, [mailId]);
  return getProposal(ctx, viewer, id);
}

/** POST /api/proposals/:id/withdraw (the PI): a submitted proposal back to draft, only while its call is open. */
export async function withdrawProposal(ctx: AppContext, viewer: SessionUser, id: number): Promise<Proposal> {
  await ctx.db.transaction(async (trx) => {
    const access = await accessProposal(trx, viewer, id, { forUpdate: true });
    requirePi(access, 'withdraw the proposal');
    const { proposal, cycle } = access;
    if (proposal.state !== 'submitted') throw new AppError('not_submitted', 'Only a submitted proposal can be withdrawn', 409);
    if (callStatusAt(cycle, ctx.now()) !== 'open')
      throw callClosed(cycle.code, cycle.callClosesAt, '; the proposal can no longer be withdrawn');
    await setProposalState(trx, id, 'draft', null);
  });
  return getProposal(ctx, viewer, id);
}

/** GET /api/proposals/:id/summary.pdf (team members): the printable summary. */
export async function proposalSummaryPdf(ctx: AppContext, viewer: SessionUser, id: number): Promise<{ filename: string; pdf: Buffer }> {
  const access = await accessProposal(ctx.db, viewer, id);
  const [proposal, targets, stored, run] = await Promise.all([
    assembleProposal(ctx, ctx.db, access),
    listTargets(ctx.db, id),
    listStoredPlans(ctx.db, id),
    planRunStatusOf(ctx.db, access),
  ]);
  const requested = new Set(proposal.nodeIds);
  const pdf = await renderProposalSummaryPdf(
    {
      proposal,
      targets: targets.map(toTargetRow),
      plans: stored.plans.filter((p) => requested.has(p.nodeId)),
      plansCurrent: run.current,
      generatedAt: ctx.now(),
    },
    // Uncompressed under test, so that the content can be searched.
    { compress: ctx.config.NODE_ENV !== 'test' },
  );
  return { filename: `proposal-${id}-summary.pdf`, pdf };
}
