/**
 * When a program becomes complete (DESIGN.md: scheduled → observing → complete, or withdrawn;
 * docs/night-plans.md). Our rules (no source):
 *
 * 1. By its visits. A program is complete when every awarded target of it has as many visit
 *    nights done as its plan needs: for every row of `night_plan_targets` of the program (the
 *    build's record of one awarded target on one node, with `visit_nights_required`), the
 *    distinct night dates of the done visits of that target on that node reach that number. A
 *    program with no such row (never built) is not complete by its visits. Checked in the
 *    transaction that marks visits done (one visit, or an execution upload), after the program's
 *    row is locked: two transactions that each mark one of the last two nights cannot both miss
 *    the completion (the second waits for the first and then counts its visit).
 *    Its planned visits that have not started at the instant of completion are removed in that
 *    transaction: the program needs no more, and their time is free for the next re-plan the
 *    manager asks for (nothing re-plans by itself). The figures' planned counts of the targets
 *    that lost visits are brought down to what is left. Planned visits that have already started
 *    stay planned, so that an execution log can still record them.
 * 2. By the campaign's end. Once the campaign's last night is over at every site, every
 *    scheduled or observing program of the cycle is complete. Nights are named by the date of
 *    the evening they begin, so the last night (`campaign_end`) ends on the morning of
 *    `campaign_end` + 1 in the site's time zone; that morning has come everywhere (time zones
 *    UTC−12 to UTC+14) by 00:00 UTC of `campaign_end` + 2, and from then on the campaign is over.
 *    (At 00:00 UTC of `campaign_end` + 1 the last night has not yet begun at a site in the
 *    Americas.) Run by a daily worker job (server/src/jobs/program-completion-job.ts) and at the
 *    start of the cycle's night-plan overview, so that a deployment without a running worker
 *    still shows the right state.
 *
 * Either way: one audit row per program (entity 'program', action 'complete', the state before
 * and after, the reason in words); a program already complete, or withdrawn, is left alone, so
 * every check may run any number of times and writes one row. Completion never changes a done or
 * missed visit. A complete program is no longer scheduled (SCHEDULED_PROGRAM_STATES): builds
 * and re-plans leave it out, keep its done visits (their time stays taken) and its target
 * figures, and drop its planned visits from the re-planned nights as they drop every planned
 * visit there (they are not planned again).
 */
import type { ProgramCompletionCause } from '@spincycle/shared/night-plans/night-plans';
import type { ProgramState } from '@spincycle/shared/awards/awards';
import type { Knex } from 'knex';
import { insertAudit } from '../awards/award-repository';
import { SCHEDULED_PROGRAM_STATES } from './night-plan-repository';

const MS_PER_DAY = 86_400_000;

/** Audit reason of a completion by visits. */
export const VISITS_DONE_REASON = 'Every target has the visit nights its plan needs.';

const dayWords = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' });

/** Audit reason of a completion by the campaign's end: "The campaign ended on 15 Apr 2027." */
export function campaignEndedReason(campaignEnd: string): string {
  return `The campaign ended on ${dayWords.format(new Date(`${campaignEnd}T00:00:00Z`))}.`;
}

/** The first instant at which the campaign whose last night is `campaignEnd` is over (00:00 UTC two days later; see the file comment). */
export function campaignOverAt(campaignEnd: string): Date {
  return new Date(Date.parse(`${campaignEnd}T00:00:00Z`) + 2 * MS_PER_DAY);
}

/** Whether the campaign whose last night is `campaignEnd` is over at `now` (see the file comment). */
export function isCampaignOver(campaignEnd: string, now: Date): boolean {
  return now.getTime() >= campaignOverAt(campaignEnd).getTime();
}

/** The latest `campaign_end` whose campaign is over at `now` (`YYYY-MM-DD`). */
function lastEndedCampaignEnd(now: Date): string {
  const today = Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), now.getUTCDate());
  return new Date(today - 2 * MS_PER_DAY).toISOString().slice(0, 10);
}

const isoDate = (d: Date | string): string => (typeof d === 'string' ? d.slice(0, 10) : d.toISOString().slice(0, 10));

/** A program made complete. */
export interface CompletedProgram {
  cycleId: number;
  proposalId: number;
  before: ProgramState;
  cause: ProgramCompletionCause;
  /** Planned visits removed (completion by visits only). */
  plannedVisitsRemoved: number;
}

/**
 * Rule 1, in the caller's transaction: the programs of the visits just marked done (`visitIds`)
 * whose awarded targets all have the visit nights their plans need become complete; their
 * planned visits starting after `at` are removed; one audit row each (actor: who marked the
 * visits). Returns the programs completed.
 */
export async function completeProgramsWithVisitsDone(
  trx: Knex.Transaction,
  cycleId: number,
  visitIds: number[],
  actorId: number | null,
  at: Date,
): Promise<CompletedProgram[]> {
  if (!visitIds.length) return [];
  // Lock the programs first (in id order, as every writer here does), then count.
  const programs = (await trx('programs')
    .where('cycle_id', cycleId)
    .whereIn('state', SCHEDULED_PROGRAM_STATES)
    .whereIn('proposal_id', trx('night_plan_visits').whereIn('id', visitIds).distinct('proposal_id'))
    .orderBy('proposal_id')
    .forUpdate()
    .select('proposal_id', 'state')) as { proposal_id: number; state: ProgramState }[];
  if (!programs.length) return [];

  const ids = programs.map((p) => p.proposal_id);
  const counts = (await trx('night_plan_targets as f')
    .whereIn('f.proposal_id', ids)
    .where('f.cycle_id', cycleId)
    .groupBy('f.proposal_id')
    .select(
      'f.proposal_id',
      trx.raw('count(*)::int AS figures'),
      trx.raw(
        `count(*) FILTER (WHERE f.visit_nights_required > (
           SELECT count(DISTINCT v.night_date) FROM night_plan_visits v
           WHERE v.cycle_id = f.cycle_id AND v.target_id = f.target_id AND v.node_id = f.node_id AND v.status = 'done'
         ))::int AS short`,
      ),
    )) as { proposal_id: number; figures: number; short: number }[];
  const done = new Set(counts.filter((c) => c.figures > 0 && c.short === 0).map((c) => c.proposal_id));
  const completing = programs.filter((p) => done.has(p.proposal_id));
  if (!completing.length) return [];

  const completedIds = completing.map((p) => p.proposal_id);
  await trx('programs')
    .whereIn('proposal_id', completedIds)
    .update({ state: 'complete', version: trx.raw('version + 1'), updated_at: at });
  const removed = (await trx('night_plan_visits')
    .where('cycle_id', cycleId)
    .whereIn('proposal_id', completedIds)
    .where('status', 'planned')
    .where('start_at', '>', at)
    .del()
    .returning(['proposal_id', 'target_id', 'node_id'])) as { proposal_id: number; target_id: number; node_id: number }[];
  const pairs = [...new Map(removed.map((r) => [`${r.target_id}:${r.node_id}`, r])).values()];
  for (let i = 0; i < pairs.length; i += 500) {
    const slice = pairs.slice(i, i + 500);
    await trx('night_plan_targets as f')
      .where('f.cycle_id', cycleId)
      .where((q) => {
        for (const p of slice) q.orWhere({ 'f.target_id': p.target_id, 'f.node_id': p.node_id });
      })
      .update({
        visits_planned: trx.raw(
          "(SELECT count(*) FROM night_plan_visits v WHERE v.cycle_id = f.cycle_id AND v.target_id = f.target_id AND v.node_id = f.node_id AND v.status <> 'missed')",
        ),
        visit_nights_planned: trx.raw(
          "(SELECT count(DISTINCT v.night_date) FROM night_plan_visits v WHERE v.cycle_id = f.cycle_id AND v.target_id = f.target_id AND v.node_id = f.node_id AND v.status <> 'missed')",
        ),
      });
  }
  const removedBy = new Map<number, number>();
  for (const r of removed) removedBy.set(r.proposal_id, (removedBy.get(r.proposal_id) ?? 0) + 1);

  const completed: CompletedProgram[] = completing.map((p) => ({
    cycleId,
    proposalId: p.proposal_id,
    before: p.state,
    cause: 'visits_done',
    plannedVisitsRemoved: removedBy.get(p.proposal_id) ?? 0,
  }));
  await insertAudit(
    trx,
    completed.map((c) => ({
      actorAccountId: actorId,
      cycleId,
      entity: 'program' as const,
      entityId: c.proposalId,
      action: 'complete',
      before: { state: c.before },
      after: { state: 'complete', cause: c.cause, plannedVisitsRemoved: c.plannedVisitsRemoved },
      reason: VISITS_DONE_REASON,
      at,
    })),
  );
  return completed;
}

/**
 * Rule 2, in a transaction of its own: every scheduled or observing program of a cycle whose
 * campaign is over at `now` becomes complete, with its audit row (no actor: the facility's
 * clock did it). `cycleIds` limits the sweep to those cycles. Returns the programs completed.
 */
export async function completeProgramsOfEndedCampaigns(
  db: Knex,
  now: Date,
  options: { cycleIds?: number[] } = {},
): Promise<CompletedProgram[]> {
  if (options.cycleIds && !options.cycleIds.length) return [];
  return db.transaction(async (trx) => {
    const q = trx('programs as g')
      .join('cycles as c', 'c.id', 'g.cycle_id')
      .whereIn('g.state', SCHEDULED_PROGRAM_STATES)
      .where('c.campaign_end', '<=', lastEndedCampaignEnd(now))
      .orderBy('g.proposal_id')
      .forUpdate('g')
      .select('g.proposal_id', 'g.cycle_id', 'g.state', 'c.campaign_end');
    if (options.cycleIds) q.whereIn('g.cycle_id', options.cycleIds);
    const rows = (await q) as { proposal_id: number; cycle_id: number; state: ProgramState; campaign_end: string | Date }[];
    if (!rows.length) return [];
    for (let i = 0; i < rows.length; i += 1000) {
      await trx('programs')
        .whereIn(
          'proposal_id',
          rows.slice(i, i + 1000).map((r) => r.proposal_id),
        )
        .update({ state: 'complete', version: trx.raw('version + 1'), updated_at: now });
    }
    const audit = rows.map((r) => ({
      actorAccountId: null,
      cycleId: r.cycle_id,
      entity: 'program' as const,
      entityId: r.proposal_id,
      action: 'complete',
      before: { state: r.state },
      after: { state: 'complete', cause: 'campaign_ended', campaignEnd: isoDate(r.campaign_end) },
      reason: campaignEndedReason(isoDate(r.campaign_end)),
      at: now,
    }));
    for (let i = 0; i < audit.length; i += 1000) await insertAudit(trx, audit.slice(i, i + 1000));
    return rows.map((r) => ({
      cycleId: r.cycle_id,
      proposalId: r.proposal_id,
      before: r.state,
      cause: 'campaign_ended' as const,
      plannedVisitsRemoved: 0,
    }));
  });
}

/**
 * The overview's cheap check: nothing at all while the cycle's campaign runs; once it is over,
 * the sweep of that cycle (an UPDATE of its programs still scheduled or observing, usually none).
 */
export async function completeIfCampaignEnded(
  db: Knex,
  cycle: { id: number; campaignEnd: string },
  now: Date,
): Promise<CompletedProgram[]> {
  if (!isCampaignOver(cycle.campaignEnd, now)) return [];
  return completeProgramsOfEndedCampaigns(db, now, { cycleIds: [cycle.id] });
}

/** Why each complete program of `proposalIds` became complete, from its latest 'complete' audit row. */
export async function findCompletions(
  db: Knex,
  proposalIds: number[],
): Promise<Map<number, { cause: ProgramCompletionCause; at: string; campaignEnd: string | null }>> {
  const out = new Map<number, { cause: ProgramCompletionCause; at: string; campaignEnd: string | null }>();
  if (!proposalIds.length) return out;
  const rows = (await db('audit_log')
    // The programs' cycles first: the log is indexed by cycle.
    .whereIn('cycle_id', db('programs').whereIn('proposal_id', proposalIds).distinct('cycle_id'))
    .where({ entity: 'program', action: 'complete' })
    .whereIn('entity_id', proposalIds)
    .distinctOn('entity_id')
    .orderBy([{ column: 'entity_id' }, { column: 'at', order: 'desc' }, { column: 'id', order: 'desc' }])
    .select('entity_id', 'at', 'after')) as { entity_id: number; at: Date; after: { cause?: string; campaignEnd?: string } | null }[];
  for (const r of rows) {
    const cause: ProgramCompletionCause = r.after?.cause === 'campaign_ended' ? 'campaign_ended' : 'visits_done';
    out.set(r.entity_id, {
      cause,
      at: r.at.toISOString(),
      campaignEnd: cause === 'campaign_ended' ? (r.after?.campaignEnd ?? null) : null,
    });
  }
  return out;
}
