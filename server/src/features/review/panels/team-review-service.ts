import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import { assignReviewers } from '@spincycle/shared/review/assignment';
import type { DistributionResult, TeamReviewer, TeamReviewerInput, TeamReviewerRow } from '@spincycle/shared/review/panels';
import type { AppContext } from '../../../app-context';
import { AppError, invalidField } from '../../../http/app-error';
import { deliverMail } from '../../../mail/outbox';
import { accessProposal, requirePi, type ProposalAccess } from '../../proposals/proposal-access';
import { notifyAssigned } from './assignment-service';
import { loadEligibility } from './eligibility';
import {
  deleteAssignments,
  findReviewerByEmail,
  insertAssignments,
  listReviewerAccounts,
  listSubmittedOfCycle,
  setAside,
  setStateOfProposals,
  teamAssignmentsOfCycle,
  teamReviewersOfProposals,
  upsertTeamReviewer,
  type CycleReview,
} from './panel-repository';
import { requireCallClosed, requireCycle } from './panel-service';

const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? '' : 's'}`;

function requireDistributed(cycle: CycleReview): void {
  if (cycle.reviewMode !== 'distributed') {
    throw new AppError('not_distributed', `Cycle ${cycle.code} is reviewed by panels; teams do not name reviewers`, 409);
  }
}

async function teamReviewerOf(ctx: AppContext, access: ProposalAccess): Promise<TeamReviewer> {
  const proposalId = access.proposal.id;
  const cycle = await requireCycle(ctx.db, access.proposal.cycleId);
  const context = {
    reviewMode: cycle.reviewMode,
    reviewDeadline: cycle.reviewDeadline,
    deadlinePassed: !!cycle.reviewDeadline && ctx.now().getTime() >= Date.parse(cycle.reviewDeadline),
    myRole: access.role,
  };
  const [entry] = await teamReviewersOfProposals(ctx.db, [proposalId]);
  if (!entry) return { proposalId, reviewer: null, namedAt: null, ...context };
  const [account] = await listReviewerAccounts(ctx.db, [entry.reviewerId]);
  return {
    proposalId,
    reviewer: account ? { id: account.id, displayName: account.displayName, email: account.email } : null,
    namedAt: entry.namedAt,
    ...context,
  };
}

/** GET /api/review/proposals/:proposalId/team-reviewer (the team; 404 for everyone else). */
export async function getTeamReviewer(ctx: AppContext, viewer: SessionUser, proposalId: number): Promise<TeamReviewer> {
  return teamReviewerOf(ctx, await accessProposal(ctx.db, viewer, proposalId));
}

/**
 * PUT /api/review/proposals/:proposalId/team-reviewer (the team's PI): names the account, by
 * e-mail, that reviews for the team in a distributed cycle. It must hold the reviewer role.
 * Allowed until the review deadline; a later distribution uses the new name.
 */
export async function putTeamReviewer(
  ctx: AppContext,
  viewer: SessionUser,
  proposalId: number,
  input: TeamReviewerInput,
): Promise<TeamReviewer> {
  const access = await ctx.db.transaction(async (trx) => {
    const locked = await accessProposal(trx, viewer, proposalId, { forUpdate: true });
    requirePi(locked, 'name the team’s reviewer');
    const cycle = await requireCycle(trx, locked.proposal.cycleId);
    requireDistributed(cycle);
    if (cycle.reviewDeadline && ctx.now().getTime() >= Date.parse(cycle.reviewDeadline)) {
      throw new AppError('deadline_passed', 'The review deadline has passed; the team’s reviewer can no longer change', 409);
    }
    const reviewer = await findReviewerByEmail(trx, input.email);
    if (!reviewer) throw invalidField('email', 'no reviewer account has this e-mail address');
    await upsertTeamReviewer(trx, proposalId, reviewer.id, viewer.id);
    return locked;
  });
  return teamReviewerOf(ctx, access);
}

/**
 * GET /api/review/cycles/:cycleId/team-reviewers (facility managers): each team's reviewer and
 * progress. Once the deadline passed, a team whose reviewer has grades missing, or that named
 * nobody, is late; with `setAsideLateTeams` the late teams' proposals are set aside (in one
 * transaction, idempotently: a proposal set aside stays so).
 */
export async function listTeamReviewers(ctx: AppContext, cycleId: number): Promise<TeamReviewerRow[]> {
  const cycle = await requireCycle(ctx.db, cycleId);
  requireDistributed(cycle);
  let rows = await teamRows(ctx, cycle);
  const late = rows.filter((r) => r.late && !r.setAside).map((r) => r.proposalId);
  if (cycle.setAsideLateTeams && late.length) {
    await ctx.db.transaction(async (trx) => {
      await trx('cycles').where({ id: cycleId }).forUpdate().select('id');
      await setAside(trx, late);
    });
    rows = await teamRows(ctx, cycle);
  }
  return rows;
}

async function teamRows(ctx: AppContext, cycle: CycleReview): Promise<TeamReviewerRow[]> {
  const proposals = await listSubmittedOfCycle(ctx.db, cycle.id);
  const [named, assignments] = await Promise.all([
    teamReviewersOfProposals(
      ctx.db,
      proposals.map((p) => p.id),
    ),
    teamAssignmentsOfCycle(ctx.db, cycle.id),
  ]);
  const accounts = new Map(
    (
      await listReviewerAccounts(
        ctx.db,
        named.map((n) => n.reviewerId),
      )
    ).map((a) => [a.id, a]),
  );
  const reviewerOf = new Map(named.map((n) => [n.proposalId, n.reviewerId]));
  const pastDeadline = !!cycle.reviewDeadline && ctx.now().getTime() >= Date.parse(cycle.reviewDeadline);
  return proposals.map((p) => {
    const reviewerId = reviewerOf.get(p.id);
    const account = reviewerId !== undefined ? accounts.get(reviewerId) : undefined;
    const theirs = reviewerId !== undefined ? assignments.filter((a) => a.reviewerId === reviewerId) : [];
    const graded = theirs.filter((a) => a.graded).length;
    return {
      proposalId: p.id,
      title: p.title,
      state: p.state,
      piName: p.piName,
      reviewer: account ? { id: account.id, displayName: account.displayName, email: account.email } : null,
      assigned: theirs.length,
      graded,
      late: pastDeadline && (!account || graded < theirs.length || theirs.length === 0),
      setAside: p.setAside,
    };
  });
}

/**
 * POST /api/review/cycles/:cycleId/distribute (facility managers): gives every named reviewer
 * k proposals of the cycle (source 'team'), never their own team's, never a conflicted or
 * same-affiliation one, with the number of reviews per proposal balanced (within one). The
 * same solver as the panels, turned around: reviewers need k proposals, proposals share the
 * load. Graded team assignments stay and count; ungraded ones are replaced. Proposals still
 * "submitted" become "in review".
 */
export async function distribute(ctx: AppContext, actor: SessionUser, cycleId: number): Promise<DistributionResult> {
  const outcome = await ctx.db.transaction(async (trx) => {
    const cycle = await requireCycle(trx, cycleId, { forUpdate: true });
    requireDistributed(cycle);
    requireCallClosed(ctx, cycle, 'distributed to reviewers');
    const proposals = (await listSubmittedOfCycle(trx, cycleId)).filter((p) => p.state === 'submitted' || p.state === 'in_review');
    if (!proposals.length) throw new AppError('nothing_to_review', `Cycle ${cycle.code} has no submitted proposals`, 409);
    const named = await teamReviewersOfProposals(
      trx,
      proposals.map((p) => p.id),
    );
    const reviewers = await listReviewerAccounts(trx, [...new Set(named.map((n) => n.reviewerId))]);
    if (!reviewers.length) throw new AppError('no_team_reviewers', `No team of ${cycle.code} has named a reviewer yet`, 409);
    const existing = await teamAssignmentsOfCycle(trx, cycleId);
    const replaced = existing.filter((a) => !a.graded);
    const fixed = existing.filter((a) => a.graded);
    const eligibility = await loadEligibility(
      trx,
      proposals.map((p) => p.id),
      reviewers,
    );
    // Turned around: each reviewer "needs" k proposals; each proposal's load is balanced.
    const result = assignReviewers({
      proposals: reviewers.map((r) => ({ id: r.id })),
      reviewers: proposals.map((p) => ({ id: p.id })),
      reviewersPerProposal: cycle.reviewersPerProposal,
      fixed: fixed.map((a) => ({ proposalId: a.reviewerId, reviewerId: a.proposalId })),
      eligible: (reviewerId, proposalId) => eligibility.eligible(proposalId, reviewerId),
    });
    if (!result.ok) {
      const names = new Map(reviewers.map((r) => [r.id, r.displayName]));
      const short = result.proposals.map((r) => `${names.get(r.id)} (${r.eligibleReviewers} eligible)`);
      const message = short.length
        ? `These reviewers cannot get ${plural(cycle.reviewersPerProposal, 'eligible proposal')}: ${short.join(', ')}`
        : `The proposals cannot share the reviews evenly: ${result.reviewers.length} of them have too few eligible reviewers`;
      throw new AppError(
        'assignment_infeasible',
        `${message}. Lower the proposals per reviewer or ask more teams to name reviewers.`,
        409,
        undefined,
        {
          reviewers: result.proposals.map((r) => ({
            id: r.id,
            displayName: names.get(r.id),
            eligibleProposals: r.eligibleReviewers,
            needed: r.needed,
          })),
          proposals: result.reviewers.map((p) => ({ id: p.id, problem: p.problem, load: p.load })),
        },
      );
    }
    const pairs = result.assignments.map((a) => ({ proposalId: a.reviewerId, reviewerId: a.proposalId }));
    const keep = new Set(pairs.map((a) => `${a.proposalId}:${a.reviewerId}`));
    const removed = replaced.filter((a) => !keep.has(`${a.proposalId}:${a.reviewerId}`));
    const before = new Set(replaced.map((a) => `${a.proposalId}:${a.reviewerId}`));
    const fresh = pairs.filter((a) => !before.has(`${a.proposalId}:${a.reviewerId}`));
    await deleteAssignments(
      trx,
      removed.map((a) => a.id),
    );
    // A reviewer assigned by hand or in a panel to the same proposal keeps that row.
    const taken = new Set(
      (
        await trx('review_assignments')
          .whereIn('proposal_id', [...new Set(fresh.map((f) => f.proposalId))])
          .select('proposal_id', 'reviewer_account_id')
      ).map((r) => `${r.proposal_id}:${r.reviewer_account_id}`),
    );
    const ids = await insertAssignments(
      trx,
      fresh.filter((f) => !taken.has(`${f.proposalId}:${f.reviewerId}`)),
      'team',
      actor.id,
    );
    await setStateOfProposals(
      trx,
      proposals.filter((p) => p.state === 'submitted').map((p) => p.id),
      'submitted',
      'in_review',
    );
    return { mailIds: await notifyAssigned(ctx, trx, ids), reviewers: reviewers.length, added: ids.length, removed: removed.length };
  });
  await deliverMail(ctx, outcome.mailIds);
  return { reviewers: outcome.reviewers, added: outcome.added, removed: outcome.removed, rows: await listTeamReviewers(ctx, cycleId) };
}
