import type { Knex } from 'knex';
import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import { hasAnyRole } from '@spincycle/shared/accounts/roles';
import type {
  AuditEntry,
  AwardBoard,
  AwardBoardRow,
  AwardCycleSummary,
  AwardDecision,
  AwardInput,
  AwardNodeCapacity,
  AwardNodeRequest,
  AwardOutcome,
  ProgramState,
  ReleaseResult,
  TeamDecision,
} from '@spincycle/shared/awards/awards';
import type { ProposalState } from '@spincycle/shared/proposals/proposal-states';
import { computePanelStatistics } from '@spincycle/shared/review/review-statistics';
import type { AppContext } from '../../app-context';
import { inParallel } from '../../db/in-parallel';
import { AppError, invalidField } from '../../http/app-error';
import { accessProposal } from '../proposals/proposal-access';
import { deliverMail } from '../../mail/outbox';
import { anonymiseComments, enqueueDecisionMail } from './award-mail';
import {
  awardedHoursByNode,
  BOARD_STATES,
  createPrograms,
  findAward,
  findAwardCycle,
  findAwardProposal,
  findProgramState,
  findReleasedDecisionProposal,
  insertAudit,
  listAudit,
  listAwardCycleSummaries,
  listAwardsOfCycle,
  listBoardProposals,
  listCycleNodes,
  listCyclePanels,
  listFeasiblePlans,
  listGradesOfPanels,
  listNodeNames,
  listProgramStates,
  listRequestedNodes,
  listReviewComments,
  listTargetIds,
  listTargetNames,
  listTargetsOf,
  lockCycleNodes,
  markReleased,
  setProposalStates,
  writeAward,
  writeProgram,
  type AuditInsert,
  type AwardCycle,
  type StoredAward,
} from './award-repository';

/** Node-hours are kept with two decimals; sums are rounded the same way. */
const round2 = (x: number) => Math.round(x * 100) / 100;
/** Sums of numeric(…, 2) values compared with a tolerance far below a hundredth. */
const EPS = 1e-6;

const cycleNotFound = (cycleId: number) => new AppError('cycle_not_found', `No cycle ${cycleId}`, 404);
const proposalNotFound = (proposalId: number) => new AppError('proposal_not_found', `No proposal ${proposalId}`, 404);

function toDecision(a: StoredAward): AwardDecision {
  return {
    outcome: a.outcome,
    nodes: a.nodes,
    targetIds: a.targetIds,
    overrideReason: a.overrideReason,
    decidedAt: a.decidedAt.toISOString(),
    decidedBy: a.decidedBy,
    version: a.version,
    mailedAt: a.mailedAt?.toISOString() ?? null,
  };
}

/** The decision as the audit log keeps it (before/after). */
const auditDecision = (a: Pick<StoredAward, 'outcome' | 'nodes' | 'targetIds' | 'overrideReason'>) => ({
  outcome: a.outcome,
  nodes: a.nodes,
  targetIds: a.targetIds,
  overrideReason: a.overrideReason,
});

/**
 * The award board of a cycle (see `AwardBoard`): nodes with their capacity and what the
 * decisions use of it, panels, and the proposals of the locked standings with their requests,
 * mean z (computed within each panel, as the standing shows it) and decision.
 */
export async function loadAwardBoard(db: Knex, cycle: AwardCycle): Promise<AwardBoard> {
  const [nodes, panels, proposals, awards, programs] = await inParallel(db, [
    () => listCycleNodes(db, cycle.id),
    () => listCyclePanels(db, cycle.id),
    () => listBoardProposals(db, cycle.id),
    () => listAwardsOfCycle(db, cycle.id),
    () => listProgramStates(db, cycle.id),
  ] as const);
  const ids = proposals.map((p) => p.id);
  const lockedPanelIds = panels.filter((p) => p.standingLockedAt).map((p) => p.id);
  const [targets, plans, requested, gradesByPanel] = await inParallel(db, [
    () => listTargetsOf(db, ids),
    () => listFeasiblePlans(db, ids),
    () => listRequestedNodes(db, ids),
    () => listGradesOfPanels(db, lockedPanelIds),
  ] as const);

  const meanZ = new Map<number, number | null>();
  for (const { proposalIds, grades } of gradesByPanel.values()) {
    // The spread threshold only sets the flag, which the board does not show.
    const stats = computePanelStatistics(proposalIds, grades, 10);
    for (const s of stats.proposals) meanZ.set(s.proposalId, s.normalisedMean);
  }
  const awardOf = new Map(awards.map((a) => [a.proposalId, a]));

  const rows: AwardBoardRow[] = proposals.map((p) => {
    const award = awardOf.get(p.id) ?? null;
    const own = targets.filter((t) => t.proposalId === p.id);
    const chosen = award?.targetIds ? new Set(award.targetIds) : null;
    const ownPlans = plans.filter((pl) => pl.proposalId === p.id);
    const requests: AwardNodeRequest[] = (requested.get(p.id) ?? []).map((nodeId) => {
      const onNode = ownPlans.filter((pl) => pl.nodeId === nodeId);
      return {
        nodeId,
        requestedHours: round2(onNode.reduce((s, pl) => s + pl.nodeHours, 0)),
        neededForAwardedTargets: round2(onNode.filter((pl) => !chosen || chosen.has(pl.targetId)).reduce((s, pl) => s + pl.nodeHours, 0)),
      };
    });
    return {
      proposalId: p.id,
      title: p.title,
      piName: p.piName,
      panelId: p.panelId,
      panelName: p.panelName,
      position: p.position,
      meanZ: meanZ.get(p.id) ?? null,
      state: p.state,
      targetCount: own.length,
      feasibleTargets: own.filter((t) => t.feasible).length,
      targets: own.map((t) => ({ id: t.id, name: t.name, feasible: t.feasible })),
      requests,
      award: award ? toDecision(award) : null,
      programState: programs.get(p.id) ?? null,
    };
  });

  const sumOn = (nodeId: number, outcome: AwardOutcome) =>
    round2(
      awards
        .filter((a) => a.outcome === outcome)
        .flatMap((a) => a.nodes)
        .filter((n) => n.nodeId === nodeId)
        .reduce((s, n) => s + n.nodeHours, 0),
    );
  const capacity: AwardNodeCapacity[] = nodes.map((n) => {
    const awarded = sumOn(n.nodeId, 'awarded');
    return {
      nodeId: n.nodeId,
      code: n.code,
      name: n.name,
      siteName: n.siteName,
      offeredHours: n.offeredHours,
      weatherLossFraction: n.weatherLossFraction,
      clearHours: round2(n.offeredHours * (1 - n.weatherLossFraction)),
      awardedHours: awarded,
      remainingHours: round2(n.offeredHours - awarded),
      reserveHours: sumOn(n.nodeId, 'reserve'),
      requestedHours: round2(
        rows
          .flatMap((r) => r.requests)
          .filter((q) => q.nodeId === n.nodeId)
          .reduce((s, q) => s + q.requestedHours, 0),
      ),
    };
  });

  return {
    cycle: {
      id: cycle.id,
      code: cycle.code,
      title: cycle.title,
      campaignStart: cycle.campaignStart,
      campaignEnd: cycle.campaignEnd,
      releasedAt: cycle.releasedAt?.toISOString() ?? null,
    },
    nodes: capacity,
    panels: panels.map((p) => ({ id: p.id, name: p.name, standingLocked: p.standingLockedAt !== null, proposals: p.proposals })),
    rows,
    undecided: rows.filter((r) => !r.award).length,
  };
}

/** GET /api/awards/cycles. */
export async function listAwardCycles(ctx: AppContext): Promise<AwardCycleSummary[]> {
  const rows = await listAwardCycleSummaries(ctx.db);
  return rows.map((r) => ({
    id: r.id,
    code: r.code,
    title: r.title,
    lockedPanels: r.locked_panels,
    panels: r.panels,
    ranked: r.ranked,
    decided: r.decided,
    releasedAt: r.awards_released_at?.toISOString() ?? null,
  }));
}

/** GET /api/awards/cycles/:cycleId. */
export async function getAwardBoard(ctx: AppContext, cycleId: number): Promise<AwardBoard> {
  const cycle = await findAwardCycle(ctx.db, cycleId);
  if (!cycle) throw cycleNotFound(cycleId);
  return loadAwardBoard(ctx.db, cycle);
}

/** The input after the checks that need the database: nodes and targets of the proposal and cycle. */
interface CheckedInput {
  nodes: { nodeId: number; nodeHours: number }[];
  targetIds: number[] | null;
  overrideReason: string | null;
}

/** Outcome rules and the nodes and targets named (400 naming the field). */
function checkInput(input: AwardInput, offered: Map<number, number>, cycleCode: string, proposalTargets: number[]): CheckedInput {
  if (input.outcome === 'awarded' && input.nodes.length === 0) {
    throw invalidField('nodes', 'must list at least one node with its node-hours for an award');
  }
  if (input.outcome === 'not_awarded') {
    if (input.nodes.length) throw invalidField('nodes', 'must be empty for a proposal not awarded');
    if (input.targetIds !== null) throw invalidField('targetIds', 'must be null for a proposal not awarded');
  }
  const seenNodes = new Set<number>();
  input.nodes.forEach((n, i) => {
    if (!offered.has(n.nodeId)) throw invalidField(`nodes.${i}.nodeId`, `node ${n.nodeId} is not offered in cycle ${cycleCode}`);
    if (seenNodes.has(n.nodeId)) throw invalidField(`nodes.${i}.nodeId`, `node ${n.nodeId} is listed twice`);
    seenNodes.add(n.nodeId);
  });
  let targetIds = input.targetIds;
  if (targetIds !== null) {
    if (!targetIds.length) throw invalidField('targetIds', 'must list at least one target, or be null for every target');
    const own = new Set(proposalTargets);
    const seen = new Set<number>();
    targetIds.forEach((id, i) => {
      if (!own.has(id)) throw invalidField(`targetIds.${i}`, `target ${id} is not a target of this proposal`);
      if (seen.has(id)) throw invalidField(`targetIds.${i}`, `target ${id} is listed twice`);
      seen.add(id);
    });
    // Naming every target is the same as "every target": stored as null, like the schema says.
    targetIds = seen.size === own.size ? null : [...targetIds].sort((a, b) => a - b);
  }
  const overrideReason = input.overrideReason?.trim() ? input.overrideReason.trim() : null;
  return { nodes: input.nodes.map((n) => ({ nodeId: n.nodeId, nodeHours: round2(n.nodeHours) })), targetIds, overrideReason };
}

/**
 * PUT /api/awards/proposals/:proposalId: decides or changes one proposal's award, in one
 * transaction with its audit entry (and, after the release, the proposal's state, its program
 * and their audit entries). The cycle's capacity rows are locked first, so two decisions of one
 * cycle never both take the same remaining node-hours. After the release the changed decision's
 * mail to the team goes to the outbox in the same transaction, and out after the commit.
 */
export async function decideAward(ctx: AppContext, viewer: SessionUser, proposalId: number, input: AwardInput): Promise<AwardBoard> {
  const outcome = await ctx.db.transaction(async (trx) => {
    const proposal = await findAwardProposal(trx, proposalId);
    if (!proposal) throw proposalNotFound(proposalId);
    const cycle = (await findAwardCycle(trx, proposal.cycleId, { lock: true }))!;
    const offered = await lockCycleNodes(trx, cycle.id);
    // Read again under the locks (a standing could have been locked meanwhile; harmless either way).
    const current = (await findAwardProposal(trx, proposalId))!;
    if (!current.panelId || !current.standingLockedAt || !current.hasPosition || !BOARD_STATES.includes(current.state)) {
      throw new AppError(
        'standing_not_locked',
        current.panelId
          ? `The standing of ${current.panelName} is not locked yet: decisions follow a locked standing`
          : 'This proposal is in no panel: decisions follow a locked standing',
        409,
      );
    }
    const checked = checkInput(input, offered, cycle.code, await listTargetIds(trx, proposalId));
    const before = await findAward(trx, proposalId, { forUpdate: true });
    if ((before?.version ?? 0) !== input.version) {
      const board = await loadAwardBoard(trx, cycle);
      throw new AppError(
        'stale_version',
        'This decision was changed by someone else since you opened it: check the current decision and try again',
        409,
        undefined,
        { row: board.rows.find((r) => r.proposalId === proposalId) },
      );
    }
    if (input.outcome === 'awarded') {
      const others = await awardedHoursByNode(trx, cycle.id, proposalId);
      const fieldErrors: Record<string, string[]> = {};
      const codes = await listNodeNames(
        trx,
        checked.nodes.map((n) => n.nodeId),
      );
      checked.nodes.forEach((n, i) => {
        const cap = offered.get(n.nodeId)!;
        const taken = round2(others.get(n.nodeId) ?? 0);
        if (taken + n.nodeHours > cap + EPS) {
          fieldErrors[`nodes.${i}.nodeHours`] = [
            `${codes.get(n.nodeId)?.code ?? `Node ${n.nodeId}`} offers ${cap.toFixed(2)} node-hours and ${taken.toFixed(2)} are already awarded; ` +
              `${n.nodeHours.toFixed(2)} more would leave ${round2(cap - taken - n.nodeHours).toFixed(2)}`,
          ];
        }
      });
      const over = Object.keys(fieldErrors);
      if (over.length && !checked.overrideReason) {
        throw new AppError(
          'capacity_exceeded',
          `This award would take ${over.length === 1 ? 'a node' : `${over.length} nodes`} past what the cycle offers: ${Object.values(
            fieldErrors,
          )
            .map((m) => m[0])
            .join('; ')}. Lower the node-hours, or give a reason for exceeding the capacity.`,
          409,
          fieldErrors,
        );
      }
    }

    const now = ctx.now();
    await writeAward(trx, {
      proposalId,
      cycleId: cycle.id,
      outcome: input.outcome,
      nodes: checked.nodes,
      targetIds: checked.targetIds,
      overrideReason: checked.overrideReason,
      decidedBy: viewer.id,
      decidedAt: now,
    });
    const note = input.note?.trim() || null;
    const reason = [checked.overrideReason && `Over capacity: ${checked.overrideReason}`, note].filter(Boolean).join(' — ') || null;
    const audit: AuditInsert[] = [
      {
        actorAccountId: viewer.id,
        cycleId: cycle.id,
        entity: 'award',
        entityId: proposalId,
        action: before ? 'changed' : 'decided',
        before: before ? auditDecision(before) : null,
        after: auditDecision({ outcome: input.outcome, ...checked }),
        reason,
        at: now,
      },
    ];
    if (cycle.releasedAt) audit.push(...(await applyReleasedOutcome(trx, viewer, cycle, proposalId, current.state, input.outcome, now)));
    await insertAudit(trx, audit);
    const mailId = cycle.releasedAt ? await enqueueDecisionMail(ctx, trx, { id: proposalId, title: current.title }, cycle, true) : null;
    return { cycle, mailId };
  });
  if (outcome.mailId !== null) await deliverMail(ctx, [outcome.mailId]);
  return getAwardBoard(ctx, outcome.cycle.id);
}

/**
 * After the release: the proposal takes the decision's outcome as its state, and its program
 * follows (awarded: scheduled when there is none, or back from withdrawn; away from awarded:
 * withdrawn). Returns the audit entries of what changed.
 */
async function applyReleasedOutcome(
  trx: Knex,
  viewer: SessionUser,
  cycle: AwardCycle,
  proposalId: number,
  state: ProposalState,
  outcome: AwardOutcome,
  now: Date,
): Promise<AuditInsert[]> {
  if (state !== outcome) await setProposalStates(trx, new Map([[proposalId, outcome]]));
  const program = await findProgramState(trx, proposalId, { forUpdate: true });
  let next: ProgramState | undefined;
  let action = '';
  if (outcome === 'awarded' && (!program || program === 'withdrawn')) {
    next = 'scheduled';
    action = program ? 'reinstated' : 'created';
  } else if (outcome !== 'awarded' && program && program !== 'withdrawn') {
    next = 'withdrawn';
    action = 'withdrawn';
  }
  if (!next) return [];
  await writeProgram(trx, proposalId, cycle.id, next);
  return [
    {
      actorAccountId: viewer.id,
      cycleId: cycle.id,
      entity: 'program',
      entityId: proposalId,
      action,
      before: program ? { state: program } : null,
      after: { state: next, proposalState: outcome },
      reason: null,
      at: now,
    },
  ];
}

const MAX_NAMED = 5;
const nameList = (names: string[]) =>
  names.length <= MAX_NAMED
    ? names.map((n) => `"${n}"`).join(', ')
    : `${names
        .slice(0, MAX_NAMED)
        .map((n) => `"${n}"`)
        .join(', ')} and ${names.length - MAX_NAMED} more`;

/**
 * POST /api/awards/cycles/:cycleId/release: in one transaction every decided proposal takes
 * its outcome as state, awarded ones get a scheduled program, the cycle is marked released,
 * with an audit entry per proposal and one for the release, and each team's mail goes to the
 * outbox. After the commit the mails go out; `mailed` counts those the relay took now, the
 * others are retried by the worker.
 */
export async function releaseAwards(ctx: AppContext, viewer: SessionUser, cycleId: number): Promise<ReleaseResult> {
  const { rows, programsCreated, mailIds } = await ctx.db.transaction(async (trx) => {
    const found = await findAwardCycle(trx, cycleId, { lock: true });
    if (!found) throw cycleNotFound(cycleId);
    await lockCycleNodes(trx, cycleId);
    if (found.releasedAt) {
      throw new AppError('already_released', `The decisions of ${found.code} were already released`, 409);
    }
    const unlocked = (await listCyclePanels(trx, cycleId)).filter((p) => !p.standingLockedAt && p.proposals > 0);
    if (unlocked.length) {
      throw new AppError(
        'standing_not_locked',
        `The standing of ${nameList(unlocked.map((p) => p.name))} is not locked yet: release once every panel has its standing`,
        409,
        undefined,
        { panelIds: unlocked.map((p) => p.id) },
      );
    }
    const board = await loadAwardBoard(trx, found);
    if (!board.rows.length) throw new AppError('nothing_to_release', `No proposal of ${found.code} is ranked yet`, 409);
    const undecided = board.rows.filter((r) => !r.award);
    if (undecided.length) {
      throw new AppError(
        'undecided',
        `${undecided.length === 1 ? 'One proposal has' : `${undecided.length} proposals have`} no decision yet: ${nameList(undecided.map((r) => r.title))}`,
        409,
        undefined,
        { proposalIds: undecided.map((r) => r.proposalId) },
      );
    }
    const now = ctx.now();
    await setProposalStates(trx, new Map(board.rows.map((r) => [r.proposalId, r.award!.outcome])));
    const awarded = board.rows.filter((r) => r.award!.outcome === 'awarded').map((r) => r.proposalId);
    const created = await createPrograms(trx, cycleId, awarded);
    await markReleased(trx, cycleId, viewer.id, now);
    const count = (o: AwardOutcome) => board.rows.filter((r) => r.award!.outcome === o).length;
    await insertAudit(trx, [
      ...board.rows.map((r): AuditInsert => ({
        actorAccountId: viewer.id,
        cycleId,
        entity: 'award',
        entityId: r.proposalId,
        action: 'released',
        before: { proposalState: r.state },
        after: { proposalState: r.award!.outcome, program: r.award!.outcome === 'awarded' ? 'scheduled' : null },
        reason: null,
        at: now,
      })),
      {
        actorAccountId: viewer.id,
        cycleId,
        entity: 'release',
        entityId: cycleId,
        action: 'released',
        before: null,
        after: { awarded: count('awarded'), reserve: count('reserve'), notAwarded: count('not_awarded'), programsCreated: created },
        reason: null,
        at: now,
      },
    ]);
    const mailIds: number[] = [];
    for (const r of board.rows) {
      const mailId = await enqueueDecisionMail(ctx, trx, { id: r.proposalId, title: r.title }, found, false);
      if (mailId !== null) mailIds.push(mailId);
    }
    return { rows: board.rows, programsCreated: created, mailIds };
  });
  const mailed = (await deliverMail(ctx, mailIds)).sent.length;
  return { board: await getAwardBoard(ctx, cycleId), mailed, mailFailures: rows.length - mailed, programsCreated };
}

/** GET /api/awards/cycles/:cycleId/audit. */
export async function getAuditLog(ctx: AppContext, cycleId: number): Promise<AuditEntry[]> {
  if (!(await findAwardCycle(ctx.db, cycleId))) throw cycleNotFound(cycleId);
  return (await listAudit(ctx.db, cycleId)).map((e) => ({ ...e, at: e.at.toISOString() }));
}

/**
 * GET /api/awards/proposals/:proposalId/decision: the team (PI and accepted co-investigators)
 * and facility managers, once the cycle's decisions are released; 404 for everyone else and
 * before the release (the decision's existence is not revealed).
 */
export async function getTeamDecision(ctx: AppContext, viewer: SessionUser, proposalId: number): Promise<TeamDecision> {
  if (!hasAnyRole(viewer, 'facility_manager')) await accessProposal(ctx.db, viewer, proposalId);
  const proposal = await findReleasedDecisionProposal(ctx.db, proposalId);
  const award = proposal?.awards_released_at ? await findAward(ctx.db, proposalId) : undefined;
  if (!proposal?.awards_released_at || !award) throw new AppError('proposal_not_found', `No decision on proposal ${proposalId}`, 404);
  const [names, allTargets, comments, program] = await inParallel(ctx.db, [
    () =>
      listNodeNames(
        ctx.db,
        award.nodes.map((n) => n.nodeId),
      ),
    () => listTargetIds(ctx.db, proposalId),
    () => listReviewComments(ctx.db, proposalId),
    () => findProgramState(ctx.db, proposalId),
  ] as const);
  return {
    proposalId,
    proposalTitle: proposal.title,
    cycleCode: proposal.code,
    outcome: award.outcome,
    nodes: award.nodes.map((n) => ({ ...n, code: names.get(n.nodeId)?.code ?? '', name: names.get(n.nodeId)?.name ?? '' })),
    awardedTargets: award.targetIds
      ? await listTargetNames(
          ctx.db,
          award.targetIds.filter((id) => allTargets.includes(id)),
        )
      : null,
    releasedAt: proposal.awards_released_at.toISOString(),
    programState: program ?? null,
    comments: anonymiseComments(comments),
  };
}
