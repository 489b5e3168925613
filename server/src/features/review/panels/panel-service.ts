import type { Knex } from 'knex';
import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import { callStatusAt } from '@spincycle/shared/facility/facility-types';
import { PROPOSAL_STATE_LABELS } from '@spincycle/shared/proposals/proposal-states';
import type {
  CycleReviewProposal,
  Expertise,
  MyPanel,
  ExpertiseInput,
  Panel,
  PanelInput,
  PanelProposalsInput,
  PanelUpdate,
  ReviewerAccount,
  ReviewSettings,
  ReviewSettingsInput,
} from '@spincycle/shared/review/panels';
import type { AppContext } from '../../../app-context';
import { isUniqueViolation } from '../../../db/unique-violation';
import { AppError, invalidField } from '../../../http/app-error';
import { formatUtc, formatUtcTime } from '../../cycles/cycle-service';
import {
  allCategories,
  assignmentsOfPanel,
  assignmentsOfProposals,
  countAssignmentsOfCycle,
  deleteAssignments,
  deletePanelRow,
  findCycleReview,
  findExpertise,
  findPanel,
  findProposalsForUpdate,
  insertPanel,
  listPanelsOfCycle,
  listReviewerAccounts,
  listSubmittedOfCycle,
  membersOfPanels,
  panelsOfAccount,
  proposalCounts,
  replacePanelMembers,
  setPanelOfProposals,
  touchPanel,
  updateExpertise,
  updatePanelRow,
  updateReviewSettings,
  type CycleReview,
  type StoredPanel,
} from './panel-repository';

/** The cycle (404 `cycle_not_found` when it does not exist). */
export async function requireCycle(db: Knex, cycleId: number, options: { forUpdate?: boolean } = {}): Promise<CycleReview> {
  const cycle = await findCycleReview(db, cycleId, options);
  if (!cycle) throw new AppError('cycle_not_found', `No cycle ${cycleId}`, 404);
  return cycle;
}

/** The panel (404 `panel_not_found`). */
export async function requirePanel(db: Knex, panelId: number, options: { forUpdate?: boolean } = {}): Promise<StoredPanel> {
  const panel = await findPanel(db, panelId, options);
  if (!panel) throw new AppError('panel_not_found', `No panel ${panelId}`, 404);
  return panel;
}

/** 409 `standing_locked` once the chair locked the panel's standing. */
export function requireUnlocked(panel: StoredPanel): void {
  if (panel.standingLocked) {
    throw new AppError(
      'standing_locked',
      `The standing of panel ${panel.name} is locked; its proposals and reviewers can no longer change`,
      409,
    );
  }
}

/** 409 `call_open` until the cycle's call closes. */
export function requireCallClosed(ctx: AppContext, cycle: CycleReview, action: string): void {
  if (callStatusAt(cycle, ctx.now()) !== 'closed') {
    throw new AppError(
      'call_open',
      `Proposals can be ${action} once the call for ${cycle.code} closes at ${formatUtc(cycle.callClosesAt)}`,
      409,
    );
  }
}

/* ---------- settings ---------- */

async function settingsOf(ctx: AppContext, db: Knex, cycle: CycleReview): Promise<ReviewSettings> {
  return {
    cycleId: cycle.id,
    cycleCode: cycle.code,
    cycleTitle: cycle.title,
    callClosesAt: cycle.callClosesAt,
    callClosed: callStatusAt(cycle, ctx.now()) === 'closed',
    anonymousReview: cycle.anonymousReview,
    categories: cycle.categories,
    reviewMode: cycle.reviewMode,
    reviewersPerProposal: cycle.reviewersPerProposal,
    reviewDeadline: cycle.reviewDeadline,
    setAsideLateTeams: cycle.setAsideLateTeams,
    hasAssignments: (await countAssignmentsOfCycle(db, cycle.id)) > 0,
  };
}

/** GET /api/review/cycles/:cycleId/settings. */
export async function getReviewSettings(ctx: AppContext, cycleId: number): Promise<ReviewSettings> {
  return settingsOf(ctx, ctx.db, await requireCycle(ctx.db, cycleId));
}

/**
 * PUT /api/review/cycles/:cycleId/settings. The deadline must fall after the call closes; the
 * review mode cannot change once reviewers are assigned in the cycle (their assignments belong
 * to the other mode).
 */
export async function putReviewSettings(ctx: AppContext, cycleId: number, input: ReviewSettingsInput): Promise<ReviewSettings> {
  await ctx.db.transaction(async (trx) => {
    const cycle = await requireCycle(trx, cycleId, { forUpdate: true });
    if (input.reviewDeadline && Date.parse(input.reviewDeadline) <= Date.parse(cycle.callClosesAt)) {
      throw invalidField('reviewDeadline', `must be after the call closes (${formatUtc(cycle.callClosesAt)})`);
    }
    if (input.reviewMode !== cycle.reviewMode && (await countAssignmentsOfCycle(trx, cycleId)) > 0) {
      throw new AppError('mode_locked', 'The review mode cannot change once reviewers are assigned in this cycle', 409, {
        reviewMode: ['cannot change once reviewers are assigned'],
      });
    }
    await updateReviewSettings(trx, cycleId, input);
  });
  return getReviewSettings(ctx, cycleId);
}

/* ---------- reviewers and expertise ---------- */

/** GET /api/review/reviewers: every enabled account holding the reviewer role. */
export async function listReviewers(ctx: AppContext): Promise<ReviewerAccount[]> {
  return listReviewerAccounts(ctx.db);
}

/** GET /api/review/me/expertise. */
export async function getExpertise(ctx: AppContext, viewer: SessionUser): Promise<Expertise> {
  const [expertise, suggestions] = await Promise.all([findExpertise(ctx.db, viewer.id), allCategories(ctx.db)]);
  return { expertise, suggestions };
}

/** PUT /api/review/me/expertise. */
export async function putExpertise(ctx: AppContext, viewer: SessionUser, input: ExpertiseInput): Promise<Expertise> {
  await updateExpertise(ctx.db, viewer.id, input.expertise);
  return getExpertise(ctx, viewer);
}

/** GET /api/review/me/panels (reviewers): the panels the viewer sits on, and whether each has reached its panel stage. */
export async function getMyPanels(ctx: AppContext, viewer: SessionUser): Promise<MyPanel[]> {
  const now = ctx.now().getTime();
  return (await panelsOfAccount(ctx.db, viewer.id)).map((r) => ({
    panelId: r.panel_id,
    panelName: r.panel_name,
    cycleId: r.cycle_id,
    cycleCode: r.cycle_code,
    cycleTitle: r.cycle_title,
    isChair: r.chair_account_id === viewer.id,
    reviewDeadline: r.review_deadline?.toISOString() ?? null,
    panelStage: r.review_deadline !== null && r.review_deadline.getTime() <= now,
    standingLockedAt: r.standing_locked_at?.toISOString() ?? null,
    proposals: r.proposals,
  }));
}

/* ---------- panels ---------- */

async function toPanels(db: Knex, panels: StoredPanel[]): Promise<Panel[]> {
  const ids = panels.map((p) => p.id);
  const [members, counts] = await Promise.all([membersOfPanels(db, ids), proposalCounts(db, ids)]);
  const accounts = new Map((await listReviewerAccounts(db, [...new Set([...members.values()].flat())])).map((a) => [a.id, a]));
  return panels.map(({ updatedAt: _u, ...p }) => ({
    ...p,
    // Members who lost the reviewer role or were disabled drop out of the list.
    members: (members.get(p.id) ?? [])
      .flatMap((id) => accounts.get(id) ?? [])
      .sort((a, b) => a.displayName.localeCompare(b.displayName) || a.id - b.id),
    proposalCount: counts.get(p.id) ?? 0,
  }));
}

/** GET /api/review/cycles/:cycleId/panels. */
export async function listPanels(ctx: AppContext, cycleId: number): Promise<Panel[]> {
  await requireCycle(ctx.db, cycleId);
  return toPanels(ctx.db, await listPanelsOfCycle(ctx.db, cycleId));
}

/** GET /api/review/panels/:panelId. */
export async function getPanel(ctx: AppContext, panelId: number): Promise<Panel> {
  const [panel] = await toPanels(ctx.db, [await requirePanel(ctx.db, panelId)]);
  return panel;
}

/** 400 naming each member who is not an enabled reviewer (`memberIds.<i>`). */
async function checkMembers(db: Knex, memberIds: number[]): Promise<void> {
  const known = new Set((await listReviewerAccounts(db, memberIds)).map((a) => a.id));
  const fieldErrors: Record<string, string[]> = {};
  memberIds.forEach((id, i) => {
    if (!known.has(id)) fieldErrors[`memberIds.${i}`] = [`account ${id} is not a reviewer`];
  });
  const keys = Object.keys(fieldErrors);
  if (keys.length) throw new AppError('validation_failed', `${keys[0]}: ${fieldErrors[keys[0]][0]}`, 400, fieldErrors);
}

const nameTaken = (name: string) =>
  new AppError('name_taken', `The cycle has a panel named ${name} already`, 409, { name: [`a panel named ${name} exists already`] });

/** POST /api/review/cycles/:cycleId/panels. */
export async function createPanel(ctx: AppContext, cycleId: number, input: PanelInput): Promise<Panel> {
  try {
    const id = await ctx.db.transaction(async (trx) => {
      const cycle = await requireCycle(trx, cycleId);
      if (cycle.reviewMode !== 'panel') {
        throw new AppError('distributed_review', `Cycle ${cycle.code} is reviewed by team reviewers, not by panels`, 409);
      }
      await checkMembers(trx, input.memberIds);
      const panelId = await insertPanel(trx, cycleId, input.name, input.chairId);
      await replacePanelMembers(trx, panelId, input.memberIds);
      return panelId;
    });
    return getPanel(ctx, id);
  } catch (err) {
    if (isUniqueViolation(err)) throw nameTaken(input.name);
    throw err;
  }
}

/** 409 `version_conflict` when someone saved the panel since the caller read it. */
function checkVersion(panel: StoredPanel, version: number): void {
  if (panel.version !== version) {
    throw new AppError(
      'version_conflict',
      `Someone else changed panel ${panel.name} at ${formatUtcTime(panel.updatedAt)}; reload to see their changes`,
      409,
      { version: [`the current version is ${panel.version}, not ${version}`] },
    );
  }
}

/**
 * PUT /api/review/panels/:panelId. A member who leaves loses their assignments in the panel
 * that have no grade yet; a member with a grade in the panel cannot leave (409 `member_graded`).
 */
export async function updatePanel(ctx: AppContext, panelId: number, input: PanelUpdate): Promise<Panel> {
  try {
    await ctx.db.transaction(async (trx) => {
      const panel = await requirePanel(trx, panelId, { forUpdate: true });
      checkVersion(panel, input.version);
      await checkMembers(trx, input.memberIds);
      const before = (await membersOfPanels(trx, [panelId])).get(panelId) ?? [];
      const leaving = new Set(before.filter((id) => !input.memberIds.includes(id)));
      if (leaving.size) {
        const theirs = (await assignmentsOfPanel(trx, panelId)).filter((a) => leaving.has(a.reviewerId));
        const graded = [...new Set(theirs.filter((a) => a.graded).map((a) => a.reviewerId))];
        if (graded.length) {
          const names = (await listReviewerAccounts(trx, graded)).map((a) => a.displayName).join(', ');
          throw new AppError('member_graded', `These members have graded proposals of the panel and cannot leave it: ${names}`, 409, {
            memberIds: [`graded already: ${names}`],
          });
        }
        if (panel.standingLocked && theirs.length) requireUnlocked(panel);
        await deleteAssignments(
          trx,
          theirs.map((a) => a.id),
        );
      }
      await updatePanelRow(trx, panelId, input.name, input.chairId);
      await replacePanelMembers(trx, panelId, input.memberIds);
    });
  } catch (err) {
    if (isUniqueViolation(err)) throw nameTaken(input.name);
    throw err;
  }
  return getPanel(ctx, panelId);
}

/**
 * DELETE /api/review/panels/:panelId?version=. Its proposals return to "submitted" and their
 * assignments go; refused (409 `panel_graded`) once any of its proposals has a grade.
 */
export async function deletePanel(ctx: AppContext, panelId: number, version: number): Promise<void> {
  await ctx.db.transaction(async (trx) => {
    const panel = await requirePanel(trx, panelId, { forUpdate: true });
    checkVersion(panel, version);
    const assignments = await assignmentsOfPanel(trx, panelId);
    if (assignments.some((a) => a.graded)) {
      throw new AppError('panel_graded', `Panel ${panel.name} has graded proposals and cannot be deleted`, 409);
    }
    const proposals = await trx('proposals').where({ panel_id: panelId }).pluck('id');
    await deleteAssignments(
      trx,
      assignments.map((a) => a.id),
    );
    await setPanelOfProposals(trx, proposals, null, 'submitted');
    await deletePanelRow(trx, panelId);
  });
}

/* ---------- proposals to panels ---------- */

/** GET /api/review/cycles/:cycleId/proposals: the cycle's submitted proposals and their panels. */
export async function listCycleReviewProposals(ctx: AppContext, cycleId: number): Promise<CycleReviewProposal[]> {
  await requireCycle(ctx.db, cycleId);
  return (await listSubmittedOfCycle(ctx.db, cycleId)).map((p) => ({
    id: p.id,
    title: p.title,
    category: p.category,
    state: p.state,
    piName: p.piName,
    panelId: p.panelId,
    graded: p.graded,
  }));
}

/**
 * PUT /api/review/panels/:panelId/proposals: the panel's proposals become exactly the list.
 * A listed proposal must be of the panel's cycle and submitted (or in review without grades,
 * when it moves from another panel); it becomes "in review". A proposal that leaves the panel
 * returns to "submitted" and loses its assignments, unless it has a grade (409). Every refused
 * row is named (`proposalIds.<i>`), and nothing is written.
 */
export async function putPanelProposals(ctx: AppContext, panelId: number, input: PanelProposalsInput): Promise<Panel> {
  await ctx.db.transaction(async (trx) => {
    const panel = await requirePanel(trx, panelId, { forUpdate: true });
    requireUnlocked(panel);
    const cycle = await requireCycle(trx, panel.cycleId);
    if (cycle.reviewMode !== 'panel') {
      throw new AppError('distributed_review', `Cycle ${cycle.code} is reviewed by team reviewers, not by panels`, 409);
    }
    requireCallClosed(ctx, cycle, 'assigned to panels');
    const wanted = [...new Set(input.proposalIds)];
    const current = await trx('proposals').where({ panel_id: panelId }).pluck('id');
    const rows = new Map((await findProposalsForUpdate(trx, [...new Set([...wanted, ...current])])).map((p) => [p.id, p]));
    const fieldErrors: Record<string, string[]> = {};
    const refuse = (key: string, message: string) => (fieldErrors[key] = [...(fieldErrors[key] ?? []), message]);
    input.proposalIds.forEach((id, i) => {
      const p = rows.get(id);
      if (input.proposalIds.indexOf(id) !== i) refuse(`proposalIds.${i}`, `proposal ${id} is listed twice`);
      else if (!p || p.cycleId !== panel.cycleId) refuse(`proposalIds.${i}`, `no proposal ${id} in cycle ${cycle.code}`);
      else if (p.panelId === panelId) return;
      else if (p.state === 'draft') refuse(`proposalIds.${i}`, `“${p.title}” is a draft (not submitted or withdrawn)`);
      else if (p.state !== 'submitted' && !(p.state === 'in_review' && !p.graded)) {
        refuse(`proposalIds.${i}`, `“${p.title}” is ${PROPOSAL_STATE_LABELS[p.state].toLowerCase()} and cannot move to a panel`);
      }
    });
    const leaving = current.filter((id: number) => !wanted.includes(id));
    for (const id of leaving) {
      const p = rows.get(id)!;
      if (p.graded) refuse('proposalIds', `“${p.title}” has grades and cannot leave the panel`);
    }
    const keys = Object.keys(fieldErrors);
    if (keys.length) {
      throw new AppError('proposal_not_assignable', `${keys[0]}: ${fieldErrors[keys[0]][0]}`, 409, fieldErrors);
    }
    const joining = wanted.filter((id) => rows.get(id)!.panelId !== panelId);
    const moving = joining.filter((id) => rows.get(id)!.panelId !== null);
    // Leaving the panel, or moving from another one: their reviewers belonged to the old panel.
    const stale = await assignmentsOfProposals(trx, [...leaving, ...moving]);
    await deleteAssignments(
      trx,
      stale.map((a) => a.id),
    );
    await setPanelOfProposals(trx, leaving, null, 'submitted');
    await setPanelOfProposals(trx, joining, panelId, 'in_review');
    for (const other of new Set(moving.map((id) => rows.get(id)!.panelId!))) await touchPanel(trx, other);
    if (joining.length || leaving.length) await touchPanel(trx, panelId);
  });
  return getPanel(ctx, panelId);
}
