import type { Knex } from 'knex';
import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import { hasAnyRole } from '@spincycle/shared/accounts/roles';
import { computePanelStatistics } from '@spincycle/shared/review/review-statistics';
import {
  compareByMerit,
  initialStandingOrder,
  moveInStanding,
  selectNotDiscussed,
  type PanelHeader,
  type PanelStanding,
  type PanelStatisticsReport,
  type PanelViewerRole,
  type StandingMoveInput,
  type StatisticsRow,
} from '@spincycle/shared/review/standing';
import type { AppContext } from '../../../app-context';
import { AppError, invalidField } from '../../../http/app-error';
import {
  findPanel,
  insertStandingMove,
  listPanelGrades,
  listPanelProposals,
  listStandingMoves,
  listStandingPositions,
  lockStandingRows,
  proposalsHiddenFrom,
  storeSpreadThreshold,
  storeTriage,
  writeStanding,
  type StoredPanel,
} from './standing-repository';

/** "Panel stage": the cycle's review deadline is set and has passed (grades are locked). */
export function isPanelStage(reviewDeadline: Date | null, now: Date): boolean {
  return reviewDeadline !== null && reviewDeadline.getTime() <= now.getTime();
}

/** The panel as the viewer reaches it. */
export interface PanelAccess {
  panel: StoredPanel;
  role: PanelViewerRole;
}

const notAllowed = () =>
  new AppError('forbidden', "Only a facility manager or the panel's chair can see the panel's grades and standing", 403);

/**
 * Who may open a panel's statistics, standing and exports: facility managers always; the
 * panel's chair (an account with the reviewer role named chair of this panel) once the cycle's
 * review deadline has passed; everyone else 403. A panel that does not exist is a 404 for
 * managers and the same 403 for everyone else (its existence is not revealed to them).
 */
export async function accessPanel(
  ctx: AppContext,
  db: Knex,
  viewer: SessionUser,
  panelId: number,
  options: { forUpdate?: boolean } = {},
): Promise<PanelAccess> {
  const panel = await findPanel(db, panelId, options);
  const manager = hasAnyRole(viewer, 'facility_manager');
  if (!panel) throw manager ? new AppError('panel_not_found', `No panel ${panelId}`, 404) : notAllowed();
  if (manager) return { panel, role: 'manager' };
  if (panel.chairAccountId === viewer.id && hasAnyRole(viewer, 'reviewer')) {
    if (isPanelStage(panel.reviewDeadline, ctx.now())) return { panel, role: 'chair' };
    throw new AppError('not_panel_stage', "The panel's grades open to its chair once the cycle's review deadline has passed", 403);
  }
  throw notAllowed();
}

function header(ctx: AppContext, access: PanelAccess): PanelHeader {
  const { panel, role } = access;
  return {
    id: panel.id,
    name: panel.name,
    cycleId: panel.cycleId,
    cycleCode: panel.cycleCode,
    reviewDeadline: panel.reviewDeadline?.toISOString() ?? null,
    panelStage: isPanelStage(panel.reviewDeadline, ctx.now()),
    spreadThreshold: panel.spreadThreshold,
    triageFraction: panel.triageFraction,
    standingLockedAt: panel.standingLockedAt?.toISOString() ?? null,
    standingLockedBy: panel.standingLockedBy,
    teamHidden: role === 'chair' && panel.anonymousReview,
    viewerRole: role,
    version: panel.version,
  };
}

/** Everything computed about the panel: all rows (for orderings) and the ids the viewer may see. */
interface PanelData {
  report: PanelStatisticsReport;
  /** Every proposal of the panel, with statistics, in merit order. */
  allRows: StatisticsRow[];
  visible: Set<number>;
}

async function loadPanelData(ctx: AppContext, db: Knex, viewer: SessionUser, access: PanelAccess): Promise<PanelData> {
  const { panel } = access;
  const proposals = await listPanelProposals(db, panel.id);
  const { grades, reviewers } = await listPanelGrades(db, panel.id);
  const stats = computePanelStatistics(
    proposals.map((p) => p.id),
    grades,
    panel.spreadThreshold,
  );
  const teamHidden = access.role === 'chair' && panel.anonymousReview;
  const allRows: StatisticsRow[] = proposals
    .map((p, i) => ({
      ...stats.proposals[i],
      title: p.title,
      state: p.state,
      team: teamHidden ? null : { piName: p.piName, piAffiliation: p.piAffiliation },
      notDiscussed: p.notDiscussed,
    }))
    .sort(compareByMerit);
  const hidden =
    access.role === 'chair'
      ? await proposalsHiddenFrom(
          db,
          proposals.map((p) => p.id),
          viewer,
        )
      : new Set<number>();
  const visible = new Set(proposals.map((p) => p.id).filter((id) => !hidden.has(id)));
  const byReviewer = new Map(stats.reviewers.map((r) => [r.reviewerId, r]));
  return {
    allRows,
    visible,
    report: {
      panel: header(ctx, access),
      reviewers: reviewers.map((r) => {
        const n = byReviewer.get(r.id);
        return { id: r.id, displayName: r.displayName, gradeCount: n?.gradeCount ?? 0, meanGrade: n?.mean ?? null, sdGrade: n?.sd ?? null };
      }),
      // A chair's rows leave out the proposals they are conflicted with or on the team of.
      proposals: allRows.filter((r) => visible.has(r.proposalId)),
    },
  };
}

/** GET /api/review/panels/:panelId/statistics. */
export async function getPanelStatistics(ctx: AppContext, viewer: SessionUser, panelId: number): Promise<PanelStatisticsReport> {
  const access = await accessPanel(ctx, ctx.db, viewer, panelId);
  return (await loadPanelData(ctx, ctx.db, viewer, access)).report;
}

/** PUT …/spread-threshold (chair from the panel stage, or a manager): the statistics with the new flags. */
export async function setSpreadThreshold(
  ctx: AppContext,
  viewer: SessionUser,
  panelId: number,
  spreadThreshold: number,
): Promise<PanelStatisticsReport> {
  await ctx.db.transaction(async (trx) => {
    await accessPanel(ctx, trx, viewer, panelId, { forUpdate: true });
    await storeSpreadThreshold(trx, panelId, spreadThreshold);
  });
  return getPanelStatistics(ctx, viewer, panelId);
}

const lockedError = (panel: StoredPanel) =>
  new AppError(
    'standing_locked',
    `The standing of ${panel.name} was locked${panel.standingLockedBy ? ` by ${panel.standingLockedBy}` : ''} and can no longer change`,
    409,
  );

/**
 * PUT …/triage (facility managers): stores the fraction and marks the lowest ⌊fraction × n⌋
 * graded proposals not discussed (`selectNotDiscussed`: the tie rule is there), the others
 * discussed. Refused once the standing is locked.
 */
export async function setTriage(ctx: AppContext, viewer: SessionUser, panelId: number, fraction: number): Promise<PanelStatisticsReport> {
  await ctx.db.transaction(async (trx) => {
    const access = await accessPanel(ctx, trx, viewer, panelId, { forUpdate: true });
    if (access.role !== 'manager') throw new AppError('forbidden', 'This needs the facility manager role', 403);
    if (access.panel.standingLockedAt) throw lockedError(access.panel);
    const { allRows } = await loadPanelData(ctx, trx, viewer, access);
    await storeTriage(trx, panelId, fraction, [...selectNotDiscussed(allRows, fraction)]);
  });
  return getPanelStatistics(ctx, viewer, panelId);
}

/**
 * Brings the stored standing in line with the panel's proposals, inside the caller's
 * transaction (panel row locked): on first use it is created from the merit order with the
 * not-discussed proposals last; later, proposals that joined the panel are appended (in merit
 * order), those that left are dropped and positions closed up. A locked standing is not touched.
 * Returns the order, position 1 first.
 */
async function syncStanding(trx: Knex, panel: StoredPanel, allRows: StatisticsRow[]): Promise<number[]> {
  const stored = (await listStandingPositions(trx, panel.id)).map((p) => p.proposalId);
  if (panel.standingLockedAt) return stored;
  const members = new Set(allRows.map((r) => r.proposalId));
  let order: number[];
  if (stored.length === 0) {
    order = initialStandingOrder(allRows);
  } else {
    const kept = stored.filter((id) => members.has(id));
    const known = new Set(kept);
    const added = allRows.filter((r) => !known.has(r.proposalId)).map((r) => r.proposalId);
    order = [...kept, ...added];
  }
  const unchanged = order.length === stored.length && order.every((id, i) => stored[i] === id);
  if (!unchanged) await writeStanding(trx, panel.id, order);
  return order;
}

async function standingView(ctx: AppContext, trx: Knex, viewer: SessionUser, access: PanelAccess): Promise<PanelStanding> {
  const data = await loadPanelData(ctx, trx, viewer, access);
  const order = await syncStanding(trx, access.panel, data.allRows);
  const rows = new Map(data.allRows.map((r) => [r.proposalId, r]));
  const moves = await listStandingMoves(trx, access.panel.id);
  return {
    panel: data.report.panel,
    entries: order
      .map((id, i) => ({ position: i + 1, proposal: rows.get(id)! }))
      .filter((e) => e.proposal && data.visible.has(e.proposal.proposalId)),
    moves: moves.filter((m) => data.visible.has(m.proposalId)),
    locked: access.panel.standingLockedAt !== null,
  };
}

/** GET …/standing (and POST …/standing/initialise): created on first read. */
export async function getStanding(ctx: AppContext, viewer: SessionUser, panelId: number): Promise<PanelStanding> {
  return ctx.db.transaction(async (trx) => {
    const access = await accessPanel(ctx, trx, viewer, panelId, { forUpdate: true });
    return standingView(ctx, trx, viewer, access);
  });
}

/**
 * POST …/standing/moves (the chair from the panel stage, or a manager): moves one proposal to
 * a position, shifting those in between, and records the move with its reason. 409 once locked.
 */
export async function moveInPanelStanding(
  ctx: AppContext,
  viewer: SessionUser,
  panelId: number,
  input: StandingMoveInput,
): Promise<PanelStanding> {
  return ctx.db.transaction(async (trx) => {
    const access = await accessPanel(ctx, trx, viewer, panelId, { forUpdate: true });
    if (access.panel.standingLockedAt) throw lockedError(access.panel);
    const data = await loadPanelData(ctx, trx, viewer, access);
    const order = await syncStanding(trx, access.panel, data.allRows);
    const from = order.indexOf(input.proposalId) + 1;
    // A proposal the chair may not see answers like one that is not in the panel.
    if (from === 0 || !data.visible.has(input.proposalId)) {
      throw new AppError('proposal_not_in_standing', `Proposal ${input.proposalId} is not in the standing of ${access.panel.name}`, 404);
    }
    if (input.toPosition > order.length) throw invalidField('toPosition', `must be between 1 and ${order.length}`);
    if (input.toPosition === from) throw invalidField('toPosition', `the proposal is already at position ${from}`);
    await writeStanding(trx, panelId, moveInStanding(order, from, input.toPosition));
    await insertStandingMove(trx, {
      panelId,
      proposalId: input.proposalId,
      fromPosition: from,
      toPosition: input.toPosition,
      reason: input.reason,
      movedBy: viewer.id,
      movedAt: ctx.now(),
    });
    return standingView(ctx, trx, viewer, { ...access, panel: (await findPanel(trx, panelId))! });
  });
}

/**
 * POST …/standing/lock (the chair from the panel stage, or a manager, once the review deadline
 * has passed): the standing becomes final and every proposal of the panel in review becomes
 * ranked, in one transaction. 409 when already locked or before the deadline.
 */
export async function lockStanding(ctx: AppContext, viewer: SessionUser, panelId: number): Promise<PanelStanding> {
  return ctx.db.transaction(async (trx) => {
    const access = await accessPanel(ctx, trx, viewer, panelId, { forUpdate: true });
    if (access.panel.standingLockedAt) throw lockedError(access.panel);
    if (!isPanelStage(access.panel.reviewDeadline, ctx.now())) {
      throw new AppError('not_panel_stage', "The standing can be locked once the cycle's review deadline has passed", 409);
    }
    const data = await loadPanelData(ctx, trx, viewer, access);
    await syncStanding(trx, access.panel, data.allRows);
    await lockStandingRows(trx, panelId, viewer.id, ctx.now());
    return standingView(ctx, trx, viewer, { ...access, panel: (await findPanel(trx, panelId))! });
  });
}
