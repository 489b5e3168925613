import type { Knex } from 'knex';
import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import type {
  DeclareConflictInput,
  MyReviewCycle,
  MyReviewRow,
  MyReviews,
  ReviewLock,
  ReviewProposal,
  SaveReviewInput,
  SubmitReviewsResult,
} from '@spincycle/shared/review/reviewing';
import { assessProposal, type TechnicalAssessmentSummary } from '@spincycle/shared/review/technical-assessment';
import type { SkyWindowsReport } from '@spincycle/shared/sky/index';
import type { AppContext } from '../../../app-context';
import { AppError } from '../../../http/app-error';
import { deliverMail, enqueueMail } from '../../../mail/outbox';
import { findCycleById } from '../../cycles/cycle-repository';
import { formatUtc } from '../../cycles/cycle-service';
import { targetSkyReport } from '../../proposals/plans/plan-service';
import { findJustificationContent } from '../../proposals/justification/justification-repository';
import type { KeptAnswers, KeptBody } from '../kept-answers';
import { readReviewVersions } from '../review-read-version';
import { AssessmentCache, keepAssessment, type AssessmentWanted, type KeptAssessment } from './assessment-cache';
import {
  findAssignment,
  hasJustification,
  listAssessmentInputs,
  listAssignmentsOf,
  listFacilityManagerEmails,
  listRequestedNodes,
  listTargetsWithPlans,
  lockAssignmentsOfCycle,
  markSubmitted,
  recordConflict,
  updateReview,
  type AssessmentInputs,
  type StoredAssignment,
} from './reviewing-repository';

/**
 * The same 404 for a proposal that does not exist, one the reviewer is not assigned to, and one
 * they declared a conflict with: the reviewer learns nothing about proposals outside their list.
 */
const notAssigned = (id: number) => new AppError('proposal_not_found', `No proposal ${id} is assigned to you`, 404);

/** Why the review can no longer change at `now`: submitted, or the cycle's review deadline passed. */
export function lockOf(a: Pick<StoredAssignment, 'submittedAt' | 'reviewDeadline'>, now: Date): ReviewLock {
  if (a.submittedAt) return 'submitted';
  if (a.reviewDeadline && a.reviewDeadline.getTime() <= now.getTime()) return 'deadline';
  return null;
}

function lockedError(a: StoredAssignment, lock: Exclude<ReviewLock, null>, what: string): AppError {
  return lock === 'submitted'
    ? new AppError(
        'review_locked',
        `Your reviews for ${a.cycleCode} were submitted at ${formatUtc(a.submittedAt!.toISOString())}; ${what}`,
        409,
      )
    : new AppError(
        'review_locked',
        `The review deadline of ${a.cycleCode} passed at ${formatUtc(a.reviewDeadline!.toISOString())}; ${what}`,
        409,
      );
}

function assessmentOf(a: StoredAssignment, inputs: Map<number, AssessmentInputs>): KeptAssessment {
  const entry = inputs.get(a.proposalId) ?? { targets: [], plans: [] };
  return keepAssessment(assessProposal({ ...entry, campaignDays: a.campaignDays, completenessGoal: a.completenessGoal }));
}

/** The key of everything the assessment of the assignment's proposal depends on (see assessment-cache.ts). */
function assessmentWanted(a: StoredAssignment): AssessmentWanted {
  return {
    proposalId: a.proposalId,
    key: a.planVersions === null ? undefined : `${a.proposalId}:${a.planVersions}:${a.campaignDays}:${a.completenessGoal}`,
  };
}

/**
 * The assessments of the assignments' proposals, by proposal id: those `cache` keeps, and the
 * others computed from one batched read of their plans (and kept).
 */
async function assessmentsOf(db: Knex, assignments: StoredAssignment[], cache: AssessmentCache): Promise<Map<number, KeptAssessment>> {
  const byProposal = new Map(assignments.map((a) => [a.proposalId, a]));
  return cache.getMany([...byProposal.values()].map(assessmentWanted), async (ids) => {
    const inputs = await listAssessmentInputs(db, ids);
    return new Map(ids.map((id) => [id, assessmentOf(byProposal.get(id)!, inputs)]));
  });
}

function toRow(a: StoredAssignment, assessment: TechnicalAssessmentSummary, now: Date): MyReviewRow {
  const lock = lockOf(a, now);
  return {
    proposalId: a.proposalId,
    title: a.title,
    category: a.category,
    abstractShort: a.abstractShort,
    cycleId: a.cycleId,
    cycleCode: a.cycleCode,
    reviewDeadline: a.reviewDeadline?.toISOString() ?? null,
    locked: lock !== null,
    lockedBecause: lock,
    grade: a.grade,
    strengths: a.strengths,
    weaknesses: a.weaknesses,
    committeeNote: a.committeeNote,
    savedAt: a.savedAt?.toISOString() ?? null,
    submittedAt: a.submittedAt?.toISOString() ?? null,
    version: a.version,
    assessment,
    team: a.anonymousReview ? null : a.team,
  };
}

/**
 * GET /api/review/my (reviewers): the reviewer's own assignments and nothing of anyone else's
 * reviews. One query for the assignments (with their reviews, read on every request) and the
 * versions of their proposals' plans; the technical assessments come from `cache`, and those it
 * does not keep from one more query for every target and the assessment's numbers of their
 * plans for all those proposals at once.
 */
export async function listMyReviews(
  ctx: AppContext,
  viewer: SessionUser,
  cycleId?: number,
  cache = new AssessmentCache(),
): Promise<MyReviews> {
  const assignments = await listAssignmentsOf(ctx.db, viewer.id, cycleId);
  const assessments = await assessmentsOf(ctx.db, assignments, cache);
  const now = ctx.now();
  const reviews = assignments.map((a) => toRow(a, assessments.get(a.proposalId)!.summary, now));
  const cycles = new Map<number, MyReviewCycle>();
  for (const a of assignments) {
    const c = cycles.get(a.cycleId) ?? {
      id: a.cycleId,
      code: a.cycleCode,
      title: a.cycleTitle,
      reviewDeadline: a.reviewDeadline?.toISOString() ?? null,
      anonymousReview: a.anonymousReview,
      assigned: 0,
      graded: 0,
      submitted: 0,
    };
    c.assigned++;
    if (a.grade !== null) c.graded++;
    if (a.submittedAt) c.submitted++;
    cycles.set(a.cycleId, c);
  }
  return { cycles: [...cycles.values()], reviews };
}

/** The first time after `now` (epoch ms) at which a row of `mine` locks by its deadline passing; undefined when none will. */
export function nextDeadlineLock(mine: MyReviews, now: number): number | undefined {
  let next: number | undefined;
  for (const r of mine.reviews) {
    if (r.locked || r.reviewDeadline === null) continue;
    const at = Date.parse(r.reviewDeadline);
    if (at > now && (next === undefined || at < next)) next = at;
  }
  return next;
}

/**
 * GET /api/review/my as JSON bytes with their ETag. The review's read versions are read first;
 * while they are those a kept answer of this reviewer (and cycle filter) was built under, and no
 * deadline has passed since, it is sent again without reading the assignments (kept-answers.ts).
 */
export async function getMyReviewsBody(
  ctx: AppContext,
  viewer: SessionUser,
  cycleId: number | undefined,
  assessments: AssessmentCache,
  kept: KeptAnswers,
): Promise<KeptBody> {
  const versions = await readReviewVersions(ctx.db);
  const now = ctx.now().getTime();
  return kept.get(`my:${viewer.id}:${cycleId ?? ''}`, versions, now, async () => {
    const mine = await listMyReviews(ctx, viewer, cycleId, assessments);
    return { json: JSON.stringify(mine), validUntil: nextDeadlineLock(mine, now) };
  });
}

/** The visible assignment or 404. */
async function requireAssignment(ctx: AppContext, viewer: SessionUser, proposalId: number): Promise<StoredAssignment> {
  const a = await findAssignment(ctx.db, viewer.id, proposalId, { withAbstract: true });
  if (!a) throw notAssigned(proposalId);
  return a;
}

/** GET /api/review/my/:proposalId: the proposal as its reviewer reads it, with the full assessment. */
export async function getReviewProposal(
  ctx: AppContext,
  viewer: SessionUser,
  proposalId: number,
  cache = new AssessmentCache(),
): Promise<ReviewProposal> {
  const a = await requireAssignment(ctx, viewer, proposalId);
  const [assessments, nodes, targets, justification] = await Promise.all([
    assessmentsOf(ctx.db, [a], cache),
    listRequestedNodes(ctx.db, proposalId),
    listTargetsWithPlans(ctx.db, proposalId),
    hasJustification(ctx.db, proposalId),
  ]);
  const { assessment, summary } = assessments.get(proposalId)!;
  return {
    review: toRow(a, summary, ctx.now()),
    abstract: a.abstract,
    completenessGoal: a.completenessGoal,
    nodes,
    targets,
    assessment,
    justificationUrl: justification ? `/api/review/my/${proposalId}/justification` : null,
    team: a.anonymousReview ? null : a.team,
  };
}

/**
 * GET /api/review/my/:proposalId/targets/:targetId/sky?nodeId=: a target's sky windows from a
 * node of the cycle, for the reviewer assigned to the proposal (404 otherwise, as every route).
 */
export async function getReviewTargetSky(
  ctx: AppContext,
  viewer: SessionUser,
  proposalId: number,
  targetId: number,
  nodeId: number,
): Promise<SkyWindowsReport> {
  const a = await requireAssignment(ctx, viewer, proposalId);
  const cycle = await findCycleById(ctx.db, a.cycleId);
  if (!cycle) throw notAssigned(proposalId);
  return targetSkyReport(ctx, { cycle, proposalId, completeness: a.completenessGoal }, targetId, nodeId);
}

/**
 * GET /api/review/my/:proposalId/justification: the PDF under a neutral name that never carries
 * the uploaded file's name (which may name the team).
 */
export async function getReviewJustification(
  ctx: AppContext,
  viewer: SessionUser,
  proposalId: number,
): Promise<{ filename: string; content: Buffer }> {
  await requireAssignment(ctx, viewer, proposalId);
  const file = await findJustificationContent(ctx.db, proposalId);
  if (!file) throw new AppError('justification_not_found', 'The team has not uploaded a justification PDF', 404);
  return { filename: `proposal-${proposalId}-justification.pdf`, content: file.content };
}

/**
 * PUT /api/review/my/:proposalId/review: saves the reviewer's grade and comments on one row.
 * 409 `review_locked` after submission or the deadline; 409 `version_conflict` (with the stored
 * row) when another tab saved first.
 */
export async function saveReview(ctx: AppContext, viewer: SessionUser, proposalId: number, input: SaveReviewInput): Promise<MyReviewRow> {
  return ctx.db.transaction(async (trx) => {
    const a = await findAssignment(trx, viewer.id, proposalId, { forUpdate: true });
    if (!a) throw notAssigned(proposalId);
    const now = ctx.now();
    const lock = lockOf(a, now);
    if (lock) throw lockedError(a, lock, 'grades can no longer change');
    if (a.version !== input.version) {
      const inputs = await listAssessmentInputs(trx, [proposalId]);
      throw new AppError(
        'version_conflict',
        'This review was saved elsewhere (another tab or window) since you opened it: the saved version is shown',
        409,
        undefined,
        { current: toRow(a, assessmentOf(a, inputs).summary, now) },
      );
    }
    const saved = await updateReview(trx, a.assignmentId, input.version, input, now);
    if (!saved) throw new AppError('version_conflict', 'This review changed while saving; reload it', 409);
    const inputs = await listAssessmentInputs(trx, [proposalId]);
    const updated: StoredAssignment = {
      ...a,
      grade: input.grade,
      strengths: input.strengths,
      weaknesses: input.weaknesses,
      committeeNote: input.committeeNote,
      savedAt: saved.savedAt,
      version: saved.version,
    };
    return toRow(updated, assessmentOf(updated, inputs).summary, now);
  });
}

/**
 * POST /api/review/my/submit: submits every review of the reviewer in the cycle at once, after
 * which they lock. 400 `grades_missing` naming the proposals without a grade; 404 when the
 * reviewer has nothing assigned in the cycle; 409 after the deadline or when already submitted.
 */
export async function submitReviews(ctx: AppContext, viewer: SessionUser, cycleId: number): Promise<SubmitReviewsResult> {
  return ctx.db.transaction(async (trx) => {
    const rows = await lockAssignmentsOfCycle(trx, viewer.id, cycleId);
    if (!rows.length) throw new AppError('cycle_not_found', `No proposals of cycle ${cycleId} are assigned to you`, 404);
    const now = ctx.now();
    const open = rows.filter((a) => !a.submittedAt);
    if (!open.length) throw lockedError(rows[0], 'submitted', 'there is nothing left to submit');
    const lock = lockOf(open[0], now);
    if (lock) throw lockedError(open[0], lock, 'reviews can no longer be submitted');
    const missing = open.filter((a) => a.grade === null);
    if (missing.length) {
      const list = missing.map((a) => `#${a.proposalId} “${a.title}”`).join(', ');
      throw new AppError(
        'grades_missing',
        `Give a grade to every proposal before submitting; without a grade: ${list}`,
        400,
        { grade: missing.map((a) => `proposal ${a.proposalId} has no grade`) },
        { proposalIds: missing.map((a) => a.proposalId) },
      );
    }
    await markSubmitted(
      trx,
      open.map((a) => a.assignmentId),
      now,
    );
    return { cycleId, submitted: open.length, submittedAt: now.toISOString() };
  });
}

/**
 * POST /api/review/my/:proposalId/conflict: the reviewer declares a conflict of interest (any
 * time before their review locks, without having to open the proposal). The assignment and any
 * grade go in the same transaction as the conflict is recorded, with the mail that tells the
 * facility managers (through the outbox, handed to the relay after the commit; a failed send is
 * retried by the worker, the conflict stands). From then on every
 * route about the proposal answers this reviewer 404.
 */
export async function declareConflict(
  ctx: AppContext,
  viewer: SessionUser,
  proposalId: number,
  input: DeclareConflictInput,
): Promise<{ proposalId: number; declaredAt: string }> {
  const now = ctx.now();
  const mailId = await ctx.db.transaction(async (trx) => {
    const found = await findAssignment(trx, viewer.id, proposalId, { forUpdate: true });
    if (!found) throw notAssigned(proposalId);
    const lock = lockOf(found, now);
    if (lock) throw lockedError(found, lock, 'ask the facility managers to record a conflict now');
    await recordConflict(trx, {
      assignmentId: found.assignmentId,
      proposalId,
      reviewerId: viewer.id,
      reason: input.reason,
      declaredAt: now,
    });
    const to = await listFacilityManagerEmails(trx);
    if (!to.length) return null;
    return enqueueMail(
      trx,
      {
        to,
        subject: `Conflict declared: proposal #${proposalId} (${found.cycleCode})`,
        text: [
          'Hello,',
          '',
          `${viewer.displayName} (${viewer.email}) declared a conflict of interest with proposal #${proposalId} “${found.title}” of cycle ${found.cycleCode}.`,
          '',
          `Reason given: ${input.reason}`,
          '',
          'The assignment and any grade were removed. The proposal may need another reviewer.',
        ].join('\n'),
      },
      'conflict_declared',
    );
  });
  if (mailId !== null) await deliverMail(ctx, [mailId]);
  return { proposalId, declaredAt: now.toISOString() };
}
