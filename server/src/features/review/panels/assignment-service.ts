import type { Knex } from 'knex';
import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import { assignReviewers, expertiseMatcher, expertiseMatches } from '@spincycle/shared/review/assignment';
import type {
  AssignmentInfeasibleDetails,
  AssignmentMatrix,
  AssignmentToggleInput,
  AutomaticAssignmentResult,
  MatrixCell,
  ReviewerAccount,
} from '@spincycle/shared/review/panels';
import type { AppContext } from '../../../app-context';
import { AppError } from '../../../http/app-error';
import { deliverMail, enqueueMail } from '../../../mail/outbox';
import { formatUtc } from '../../cycles/cycle-service';
import { loadEligibility, refusalOf } from './eligibility';
import {
  assignmentsOfPanel,
  deleteAssignments,
  insertAssignments,
  parseMatrixSource,
  readMatrixSource,
  listProposalsOfPanel,
  listReviewerAccounts,
  membersOfPanels,
  setAssignmentSource,
  touchPanel,
  type CycleReview,
  type MatrixSource,
} from './panel-repository';
import type { KeptAnswers, KeptBody } from '../kept-answers';
import { readReviewVersions } from '../review-read-version';
import { requireCycle, requirePanel, requireUnlocked } from './panel-service';

const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? '' : 's'}`;

/** The panel's members who still hold the reviewer role, by name. */
async function membersOf(db: Knex, panelId: number): Promise<ReviewerAccount[]> {
  const ids = (await membersOfPanels(db, [panelId])).get(panelId) ?? [];
  return listReviewerAccounts(db, ids);
}

/** The cells of assigned pairs, one read-only object per combination (no object per cell). */
const ASSIGNED_CELLS = new Map<string, MatrixCell>(
  (['manual', 'automatic', 'team'] as const).flatMap((source) =>
    [false, true].flatMap((graded) =>
      [false, true].map((expertiseMatch): [string, MatrixCell] => [
        `${source}:${graded}:${expertiseMatch}`,
        Object.freeze({ state: 'assigned', source, graded, expertiseMatch }),
      ]),
    ),
  ),
);
const FREE_CELLS: Record<'true' | 'false', MatrixCell> = {
  true: Object.freeze({ state: 'free', expertiseMatch: true }),
  false: Object.freeze({ state: 'free', expertiseMatch: false }),
};

/** The panel's matrix from its source texts (404 `panel_not_found` when there is no such panel). */
function buildMatrix(panelId: number, source: MatrixSource): AssignmentMatrix {
  const found = parseMatrixSource(source);
  if (!found) throw new AppError('panel_not_found', `No panel ${panelId}`, 404);
  const { reviewers, proposals } = found;
  const { panel } = found;
  const column = new Map(reviewers.map((r, i) => [r.id, i]));
  const matchers = reviewers.map((r) => expertiseMatcher(r.expertise));
  const memberLoads = reviewers.map(() => 0);
  for (const p of proposals) {
    for (const a of p.assignments) {
      const i = column.get(a.reviewerId);
      if (i !== undefined) memberLoads[i]++;
    }
  }
  return {
    panel: {
      id: panel.id,
      name: panel.name,
      cycleId: panel.cycleId,
      cycleCode: found.cycleCode,
      version: panel.version,
      standingLocked: panel.standingLocked,
    },
    reviewersPerProposal: found.reviewersPerProposal,
    reviewDeadline: found.reviewDeadline,
    reviewers: reviewers.map((r, i) => ({
      id: r.id,
      displayName: r.displayName,
      affiliation: r.affiliation,
      expertise: r.expertise,
      chair: r.id === panel.chairId,
      load: memberLoads[i],
    })),
    proposals: proposals.map((p) => {
      const cells: (MatrixCell | undefined)[] = new Array(reviewers.length);
      for (const a of p.assignments) {
        const i = column.get(a.reviewerId);
        if (i !== undefined && cells[i] === undefined) cells[i] = ASSIGNED_CELLS.get(`${a.source}:${a.graded}:${matchers[i](p.category)}`);
      }
      for (let i = 0; i < reviewers.length; i++) {
        if (cells[i] !== undefined) continue;
        const conflict = p.conflicts.find((c) => c.reviewerId === reviewers[i].id);
        cells[i] = refusalOf(reviewers[i], p.team, conflict?.reason) ?? FREE_CELLS[`${matchers[i](p.category)}`];
      }
      return {
        id: p.id,
        title: p.title,
        category: p.category,
        state: p.state,
        piName: p.piName,
        count: p.assignments.length,
        notDiscussed: p.notDiscussed,
        cells: cells as MatrixCell[],
      };
    }),
    loadRange: { lowest: memberLoads.length ? Math.min(...memberLoads) : 0, highest: memberLoads.length ? Math.max(...memberLoads) : 0 },
  };
}

/**
 * The matrix of a panel (the answer of GET …/matrix, and of the assignment writes). One read of
 * everything it shows (readMatrixSource: the panel with its cycle, its members, its proposals
 * each with its assignments, conflicts and team, aggregated in SQL); then each cell from maps
 * (the shared eligibility rule per free pair, the expertise of each member normalized once).
 */
export async function getMatrix(ctx: AppContext, panelId: number, db: Knex = ctx.db): Promise<AssignmentMatrix> {
  return buildMatrix(panelId, await readMatrixSource(db, panelId));
}

/**
 * GET /api/review/panels/:panelId/matrix (facility managers) as JSON bytes with their ETag. The
 * review's read versions are read first; while they are those a kept answer of the panel was
 * built under, it is sent again without reading its source (see kept-answers.ts).
 */
export async function getMatrixBody(ctx: AppContext, panelId: number, kept: KeptAnswers): Promise<KeptBody> {
  const versions = await readReviewVersions(ctx.db);
  return kept.get(`panel:${panelId}`, versions, ctx.now().getTime(), async () => ({
    json: JSON.stringify(buildMatrix(panelId, await readMatrixSource(ctx.db, panelId))),
  }));
}

/**
 * PUT /api/review/panels/:panelId/assignments: assigns or unassigns one reviewer by hand.
 * The reviewer must be a member and eligible (409 `reviewer_ineligible` with the reason);
 * an automatic cell that is set by hand becomes manual (so automatic runs keep it); a graded
 * cell cannot be unassigned (409 `assignment_graded`). A newly assigned reviewer is e-mailed.
 */
export async function toggleAssignment(
  ctx: AppContext,
  actor: SessionUser,
  panelId: number,
  input: AssignmentToggleInput,
): Promise<AssignmentMatrix> {
  const mailIds = await ctx.db.transaction(async (trx) => {
    const panel = await requirePanel(trx, panelId, { forUpdate: true });
    requireUnlocked(panel);
    const proposal = (await listProposalsOfPanel(trx, panelId)).find((p) => p.id === input.proposalId);
    if (!proposal) {
      throw new AppError('proposal_not_in_panel', `proposalId: proposal ${input.proposalId} is not in panel ${panel.name}`, 409, {
        proposalId: [`not in panel ${panel.name}`],
      });
    }
    const reviewer = (await membersOf(trx, panelId)).find((r) => r.id === input.reviewerId);
    if (!reviewer) {
      throw new AppError('reviewer_not_member', `reviewerId: account ${input.reviewerId} is not a reviewer of panel ${panel.name}`, 409, {
        reviewerId: [`not a member of panel ${panel.name}`],
      });
    }
    const existing = (await assignmentsOfPanel(trx, panelId)).find((a) => a.proposalId === proposal.id && a.reviewerId === reviewer.id);
    if (!input.assigned) {
      if (!existing) return [];
      if (existing.graded) {
        throw new AppError('assignment_graded', `${reviewer.displayName} has graded “${proposal.title}”; the assignment stays`, 409);
      }
      await deleteAssignments(trx, [existing.id]);
      await touchPanel(trx, panelId);
      return [];
    }
    if (existing) {
      if (existing.source === 'automatic') await setAssignmentSource(trx, existing.id, 'manual', actor.id);
      return [];
    }
    const refusal = (await loadEligibility(trx, [proposal.id], [reviewer])).refusal(proposal.id, reviewer.id);
    if (refusal) {
      const why = refusal.state === 'conflict' ? `declared a conflict (${refusal.reason})` : refusal.label.toLowerCase();
      throw new AppError('reviewer_ineligible', `${reviewer.displayName} cannot review “${proposal.title}”: ${why}`, 409, {
        reviewerId: [refusal.state === 'conflict' ? 'declared a conflict' : refusal.label],
      });
    }
    const ids = await insertAssignments(trx, [{ proposalId: proposal.id, reviewerId: reviewer.id }], 'manual', actor.id);
    await touchPanel(trx, panelId);
    return notifyAssigned(ctx, trx, ids);
  });
  await deliverMail(ctx, mailIds);
  return getMatrix(ctx, panelId);
}

/**
 * POST /api/review/panels/:panelId/assign-automatically: k reviewers per proposal of the panel
 * (shared/src/review/assignment.ts). Manual cells, team cells and graded cells stay and count;
 * earlier automatic cells without a grade are replaced. When the constraints cannot all hold,
 * 409 `assignment_infeasible` names the proposals (and reviewers) at fault, and nothing changes.
 */
export async function assignAutomatically(ctx: AppContext, actor: SessionUser, panelId: number): Promise<AutomaticAssignmentResult> {
  const outcome = await ctx.db.transaction(async (trx) => {
    const panel = await requirePanel(trx, panelId, { forUpdate: true });
    requireUnlocked(panel);
    const cycle = await requireCycle(trx, panel.cycleId);
    const reviewers = await membersOf(trx, panelId);
    const proposals = await listProposalsOfPanel(trx, panelId);
    const assignments = await assignmentsOfPanel(trx, panelId);
    if (!proposals.length) throw new AppError('panel_empty', `Panel ${panel.name} has no proposals to assign`, 409);
    const replaced = assignments.filter((a) => a.source === 'automatic' && !a.graded);
    const fixed = assignments.filter((a) => !(a.source === 'automatic' && !a.graded));
    const eligibility = await loadEligibility(
      trx,
      proposals.map((p) => p.id),
      reviewers,
    );
    const expertise = new Map(reviewers.map((r) => [r.id, r.expertise]));
    const category = new Map(proposals.map((p) => [p.id, p.category]));
    const result = assignReviewers({
      proposals,
      reviewers,
      reviewersPerProposal: cycle.reviewersPerProposal,
      fixed,
      eligible: eligibility.eligible,
      prefers: (p, r) => expertiseMatches(category.get(p) ?? null, expertise.get(r) ?? []),
    });
    if (!result.ok) throw infeasible(cycle, proposals, reviewers, result);
    // Unchanged automatic pairs keep their row (and notified_at); only the difference is written.
    const keep = new Set(result.assignments.map((a) => `${a.proposalId}:${a.reviewerId}`));
    const removed = replaced.filter((a) => !keep.has(`${a.proposalId}:${a.reviewerId}`));
    const before = new Set(replaced.map((a) => `${a.proposalId}:${a.reviewerId}`));
    const fresh = result.assignments.filter((a) => !before.has(`${a.proposalId}:${a.reviewerId}`));
    await deleteAssignments(
      trx,
      removed.map((a) => a.id),
    );
    const ids = await insertAssignments(trx, fresh, 'automatic', actor.id);
    if (ids.length || removed.length) await touchPanel(trx, panelId);
    return {
      mailIds: await notifyAssigned(ctx, trx, ids),
      added: fresh.length,
      removed: removed.length,
      expertiseMatches: result.assignments.filter((a) => a.expertiseMatch).length,
    };
  });
  await deliverMail(ctx, outcome.mailIds);
  return {
    added: outcome.added,
    removed: outcome.removed,
    expertiseMatches: outcome.expertiseMatches,
    matrix: await getMatrix(ctx, panelId),
  };
}

function infeasible(
  cycle: CycleReview,
  proposals: { id: number; title: string }[],
  reviewers: ReviewerAccount[],
  result: Extract<ReturnType<typeof assignReviewers>, { ok: false }>,
): AppError {
  const titles = new Map(proposals.map((p) => [p.id, p.title]));
  const names = new Map(reviewers.map((r) => [r.id, r.displayName]));
  const details: AssignmentInfeasibleDetails = {
    proposals: result.proposals.map((p) => ({ ...p, title: titles.get(p.id) ?? `#${p.id}` })),
    reviewers: result.reviewers.map((r) => ({ ...r, displayName: names.get(r.id) ?? `#${r.id}` })),
  };
  const parts: string[] = [];
  if (details.proposals.length) {
    const list = details.proposals.map((p) => `“${p.title}” (${p.eligibleReviewers} eligible)`).join(', ');
    parts.push(`these proposals cannot get ${plural(cycle.reviewersPerProposal, 'eligible reviewer')} with balanced loads: ${list}`);
  }
  const over = details.reviewers.filter((r) => r.problem === 'over');
  if (over.length) {
    parts.push(
      `these reviewers hold more assignments by hand than a balanced load allows (at most ${over[0].highest}): ${over.map((r) => `${r.displayName} (${r.load})`).join(', ')}`,
    );
  }
  const under = details.reviewers.filter((r) => r.problem === 'under');
  if (under.length) {
    parts.push(
      `these reviewers are eligible for too few proposals to reach a balanced load of ${under[0].lowest}: ${under.map((r) => `${r.displayName} (${r.load})`).join(', ')}`,
    );
  }
  const message = `No assignment meets the rules: ${parts.join('; ')}. Add reviewers to the panel, lower the reviewers per proposal, or change the cells set by hand.`;
  return new AppError('assignment_infeasible', message, 409, undefined, { ...details });
}

/**
 * Writes one mail per reviewer of the new assignments to the outbox, in the transaction that
 * made them, and answers the outbox ids (deliverMail after the commit). The rows' `notified_at`
 * is set when the mail is handed to the relay. The mail names the cycle, the number of
 * proposals and the deadline, never a team.
 */
export async function notifyAssigned(ctx: AppContext, trx: Knex.Transaction, assignmentIds: number[]): Promise<number[]> {
  if (!assignmentIds.length) return [];
  const rows = await trx('review_assignments as ra')
    .join('proposals as p', 'p.id', 'ra.proposal_id')
    .join('cycles as c', 'c.id', 'p.cycle_id')
    .join('accounts as a', 'a.id', 'ra.reviewer_account_id')
    .whereIn('ra.id', assignmentIds)
    .orderBy('ra.id')
    .select('ra.id', 'ra.reviewer_account_id', 'a.email', 'a.display_name', 'p.title', 'c.code', 'c.review_deadline');
  const byReviewer = new Map<number, typeof rows>();
  for (const r of rows) byReviewer.set(r.reviewer_account_id, [...(byReviewer.get(r.reviewer_account_id) ?? []), r]);
  const mailIds: number[] = [];
  for (const list of byReviewer.values()) {
    const first = list[0];
    const cycles = [...new Set(list.map((r) => r.code as string))].join(', ');
    const deadline = first.review_deadline
      ? `Grades are due by ${formatUtc((first.review_deadline as Date).toISOString())}.`
      : 'The review deadline will be announced.';
    const text = [
      `Hello ${first.display_name},`,
      '',
      `You have been asked to review ${plural(list.length, 'proposal')} in cycle ${cycles}:`,
      ...list.map((r) => `- ${r.title}`),
      '',
      deadline,
      `Your reviews: ${ctx.config.publicUrl}/review/my`,
      '',
      'If you cannot review one of them fairly, declare a conflict there.',
    ].join('\n');
    mailIds.push(
      await enqueueMail(trx, { to: first.email, subject: `Proposals to review in ${cycles}`, text }, 'review_assignment', {
        onSent: { mark: 'assignments_notified', assignmentIds: list.map((r) => r.id as number) },
      }),
    );
  }
  return mailIds;
}
