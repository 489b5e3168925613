import type { Knex } from 'knex';
import { inParallel } from '../../../db/in-parallel';
import type { NodeRequest } from '@spincycle/shared/proposals/proposal-schemas';
import type {
  PlanExplanation,
  PlanListQuery,
  PlanMarker,
  PlanRunStatus,
  PlanSortKey,
  TargetPlanRow,
} from '@spincycle/shared/proposals/plan-types';

/** The computed part of a plan row, stored as `target_plans.result` (with every explained number). */
export type StoredPlanResult = Omit<TargetPlanRow, 'targetId' | 'targetName' | 'nodeId' | 'nodeCode'> & Pick<PlanExplanation, 'quantities'>;

/** One row to write into `target_plans`: a result or an error. */
export type PlanRowInsert =
  | { targetId: number; nodeId: number; result: StoredPlanResult; error?: undefined }
  | { targetId: number; nodeId: number; result?: undefined; error: string };

interface PlanRunRow {
  proposal_id: number;
  state: PlanRunStatus['state'];
  total: number;
  done: number;
  requested_at: Date | null;
  started_at: Date | null;
  finished_at: Date | null;
  error: string | null;
  inputs_hash: string | null;
  inputs_version: number;
  current_hash: string | null;
  current_hash_model: string | null;
  plans_version: number;
}

export interface StoredPlanRun extends Omit<PlanRunStatus, 'current'> {
  /** Hash of the inputs the stored plans were computed from. */
  inputsHash: string | null;
  /** Raised (by triggers) in the transaction of every change of the plans' inputs. */
  inputsVersion: number;
  /** Cached hash of today's inputs at `inputsVersion`, computed with model `currentHashModel`; null when not known. */
  currentHash: string | null;
  currentHashModel: string | null;
  /** Raised (by triggers) by every write of the proposal's `target_plans` rows. */
  plansVersion: number;
}

function toRun(r: PlanRunRow): StoredPlanRun {
  return {
    state: r.state,
    total: r.total,
    done: r.done,
    startedAt: r.started_at?.toISOString() ?? null,
    finishedAt: r.finished_at?.toISOString() ?? null,
    error: r.error,
    inputsHash: r.inputs_hash,
    inputsVersion: r.inputs_version,
    currentHash: r.current_hash,
    currentHashModel: r.current_hash_model,
    plansVersion: r.plans_version,
  };
}

/** The plan run of a proposal, if any. */
export async function findPlanRun(db: Knex, proposalId: number): Promise<StoredPlanRun | undefined> {
  const row: PlanRunRow | undefined = await db('plan_runs').where({ proposal_id: proposalId }).first();
  return row ? toRun(row) : undefined;
}

/**
 * Caches the hash of today's inputs, unless they changed since `inputsVersion` was read (the
 * version is read before the inputs, so a change committed in between also raises it).
 */
export async function storeCurrentInputsHash(
  db: Knex,
  proposalId: number,
  input: { hash: string; model: string; inputsVersion: number },
): Promise<void> {
  await db('plan_runs')
    .where({ proposal_id: proposalId, inputs_version: input.inputsVersion })
    .update({ current_hash: input.hash, current_hash_model: input.model });
}

/** The run of a new proposal: idle, its (empty) plans current for `inputsHash`. */
export async function insertIdlePlanRun(db: Knex, proposalId: number, inputsHash: string): Promise<void> {
  await db('plan_runs').insert({ proposal_id: proposalId, state: 'idle', inputs_hash: inputsHash });
}

/**
 * Records, inside the caller's transaction, that the proposals' plans must be computed again.
 * A run in progress keeps its `running` state (its own end notices the change and leaves the
 * run `queued`); any other run becomes `queued`.
 */
export async function markPlansRequested(db: Knex, proposalIds: number[]): Promise<void> {
  if (!proposalIds.length) return;
  await db.raw(
    `INSERT INTO plan_runs (proposal_id, state, requested_at)
     SELECT unnest(?::int[]), 'queued', clock_timestamp()
     ON CONFLICT (proposal_id) DO UPDATE SET
       requested_at = clock_timestamp(),
       state = CASE WHEN plan_runs.state = 'running' THEN 'running' ELSE 'queued' END,
       error = CASE WHEN plan_runs.state = 'running' THEN plan_runs.error ELSE NULL END`,
    [proposalIds],
  );
}

/** A new run starts: progress 0 of `total` targets. */
export async function startPlanRun(db: Knex, proposalId: number, total: number): Promise<void> {
  await db('plan_runs')
    .insert({ proposal_id: proposalId, state: 'running', total, done: 0, started_at: db.raw('clock_timestamp()') })
    .onConflict('proposal_id')
    .merge({ state: 'running', total, done: 0, started_at: db.raw('clock_timestamp()'), finished_at: null, error: null });
}

/** Progress of a running computation: targets done so far. */
export async function updatePlanProgress(db: Knex, proposalId: number, done: number): Promise<void> {
  await db('plan_runs').where({ proposal_id: proposalId }).update({ done });
}

/** The run ended with its plans stored; `state` is `queued` when the inputs changed meanwhile. */
export async function finishPlanRun(
  db: Knex,
  proposalId: number,
  input: { inputsHash: string; total: number; state: 'idle' | 'queued' },
): Promise<void> {
  await db('plan_runs')
    .where({ proposal_id: proposalId })
    .update({
      state: input.state,
      total: input.total,
      done: input.total,
      inputs_hash: input.inputsHash,
      finished_at: db.raw('clock_timestamp()'),
      error: null,
    });
}

/** The run failed: state `failed` with a message for the team. */
export async function failPlanRun(db: Knex, proposalId: number, message: string): Promise<void> {
  await db('plan_runs')
    .where({ proposal_id: proposalId })
    .update({ state: 'failed', error: message, finished_at: db.raw('clock_timestamp()') });
}

/** Runs left `queued` or `running` (e.g. by a worker that stopped), to queue again. */
export async function listUnfinishedPlanRuns(db: Knex): Promise<number[]> {
  return db('plan_runs').whereIn('state', ['queued', 'running']).pluck('proposal_id');
}

/** Replaces every stored plan of the proposal with `rows` (caller's transaction). */
export async function replaceTargetPlans(db: Knex, proposalId: number, inputsHash: string, rows: PlanRowInsert[]): Promise<void> {
  await db('target_plans').where({ proposal_id: proposalId }).del();
  const records = rows.map((r) => ({
    target_id: r.targetId,
    node_id: r.nodeId,
    proposal_id: proposalId,
    inputs_hash: inputsHash,
    feasible: r.result ? r.result.feasible : null,
    node_hours: r.result ? r.result.nodeHours : null,
    fee_minor: r.result ? r.result.feeMinor : null,
    currency: r.result ? r.result.currency : null,
    // pg would send a JS array as a PostgreSQL array: json values go as JSON text.
    result: r.result ? JSON.stringify(r.result) : null,
    // The row of the plans table, read by the list (the explained numbers stay in `result`).
    summary: r.result ? JSON.stringify(toPlanSummary(r.result)) : null,
    error: r.error ?? null,
    computed_at: db.fn.now(),
  }));
  // ~10 kB of JSON per plan: statements of 100 rows (~1 MB) were the quickest measured
  // (larger ones spend more time building one huge parameter list than they save in round trips).
  for (let i = 0; i < records.length; i += 100) await db('target_plans').insert(records.slice(i, i + 100));
}

/** What the plans table shows of a plan: everything but the explained quantities. */
export type StoredPlanSummary = Omit<StoredPlanResult, 'quantities'>;

/** The summary stored beside a result (`target_plans.summary`). */
export function toPlanSummary(result: StoredPlanResult): StoredPlanSummary {
  const { quantities: _quantities, ...summary } = result;
  return summary;
}

interface StoredPlanDbRow {
  target_id: number;
  node_id: number;
  target_name: string;
  node_code: string;
  summary: StoredPlanSummary | null;
  error: string | null;
}

const toPlanRow = (r: StoredPlanDbRow & { summary: StoredPlanSummary }): TargetPlanRow => ({
  targetId: r.target_id,
  targetName: r.target_name,
  nodeId: r.node_id,
  nodeCode: r.node_code,
  ...r.summary,
});

/** SQL of each sort key (numbers of the summary as float8); ties go in list order, then node code. */
const SORT_SQL: Record<PlanSortKey, string> = {
  target: 't.position',
  node: 'n.code',
  period: "(tp.summary->>'periodDays')::float8",
  amplitude: "(tp.summary->>'amplitudePpm')::float8",
  precision: "(tp.summary->>'perVisitPrecisionPpm')::float8",
  exposure: "(tp.summary->>'exposureSeconds')::float8",
  visits: "(tp.summary->>'visits')::float8",
  completeness: "(tp.summary->>'completeness')::float8",
  visitsPerNight: "(tp.summary->>'visitsPerNight')::float8",
  cadence: "(tp.summary->>'cadenceDays')::float8",
  baseline: "(tp.summary->>'baselineDays')::float8",
  usableNights: "(tp.summary->>'usableNights')::float8",
  nodeHours: 'tp.node_hours',
  fee: 'tp.fee_minor',
};

/**
 * One page of a proposal's stored plans (not errors), filtered and sorted, with the number
 * matching — as JSON text, ready to send: each row's stored summary (jsonb, ~4 kB) is read as
 * text and spliced after the row's ids, never parsed into objects and written out again (that
 * round trip was most of the list's cost under load). The rows are {@link TargetPlanRow}s.
 */
export async function listPlanPageJson(db: Knex, proposalId: number, query: PlanListQuery): Promise<{ rowsJson: string; matched: number }> {
  const descending = query.sort.startsWith('-');
  const key = (descending ? query.sort.slice(1) : query.sort) as PlanSortKey;
  const q = db('target_plans as tp')
    .join('targets as t', 't.id', 'tp.target_id')
    .join('nodes as n', 'n.id', 'tp.node_id')
    .where('tp.proposal_id', proposalId)
    .whereNotNull('tp.summary');
  if (query.feasible !== undefined) q.where('tp.feasible', query.feasible);
  if (query.nodeId !== undefined) q.where('tp.node_id', query.nodeId);
  const text = query.q;
  if (text) {
    // strpos, not LIKE: the text needs no escaping of % and _.
    q.where((w) => w.whereRaw('strpos(lower(t.name), lower(?)) > 0', [text]).orWhereRaw('strpos(lower(n.code), lower(?)) > 0', [text]));
  }
  const rows: (Omit<StoredPlanDbRow, 'summary' | 'error'> & { summary_json: string; matched: string | number })[] = await q
    .orderByRaw(`${SORT_SQL[key]} ${descending ? 'DESC' : 'ASC'} NULLS LAST, t.position, t.id, n.code`)
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize)
    .select(
      'tp.target_id',
      'tp.node_id',
      't.name as target_name',
      'n.code as node_code',
      db.raw('tp.summary::text AS summary_json'),
      db.raw('count(*) OVER () AS matched'),
    );
  // A page past the end has no row to carry the count: count separately then (rare).
  let matched = rows.length ? Number(rows[0].matched) : 0;
  if (!rows.length && query.page > 1) {
    const [{ n }] = await q.clone().clearSelect().clearOrder().clear('limit').clear('offset').count<{ n: string }[]>({ n: '*' });
    matched = Number(n);
  }
  return { rowsJson: `[${rows.map(toPlanRowJson).join(',')}]`, matched };
}

/** A row as JSON text: the ids of {@link toPlanRow}, then the summary's own members. */
function toPlanRowJson(r: { target_id: number; node_id: number; target_name: string; node_code: string; summary_json: string }): string {
  const head = `"targetId":${r.target_id},"targetName":${JSON.stringify(r.target_name)},"nodeId":${r.node_id},"nodeCode":${JSON.stringify(r.node_code)}`;
  const body = r.summary_json.trim();
  if (!body.startsWith('{') || !body.endsWith('}'))
    throw new Error(`stored plan summary of target ${r.target_id} on node ${r.node_id} is not a JSON object`);
  const members = body.slice(1, -1).trim();
  return members ? `{${head},${members}}` : `{${head}}`;
}

/** Counts of a proposal's stored plans (whatever the filter), and its error rows (on one node, if given). */
export async function planCountsAndErrors(
  db: Knex,
  proposalId: number,
  nodeId?: number,
): Promise<{ counts: { plans: number; infeasible: number }; errors: { targetId: number; nodeId: number; message: string }[] }> {
  const [totals, errorRows] = await inParallel(db, [
    () =>
      db('target_plans')
        .where({ proposal_id: proposalId })
        .first(
          db.raw('count(*) FILTER (WHERE summary IS NOT NULL) AS plans'),
          db.raw('count(*) FILTER (WHERE NOT feasible) AS infeasible'),
        ) as Promise<{ plans: string; infeasible: string }>,
    () => {
      const q = db('target_plans as tp')
        .join('targets as t', 't.id', 'tp.target_id')
        .join('nodes as n', 'n.id', 'tp.node_id')
        .where('tp.proposal_id', proposalId)
        .whereNotNull('tp.error');
      if (nodeId !== undefined) q.where('tp.node_id', nodeId);
      return q.orderBy(['t.position', 't.id', 'n.code']).select('tp.target_id', 'tp.node_id', 'tp.error') as Promise<
        { target_id: number; node_id: number; error: string }[]
      >;
    },
  ] as const);
  return {
    counts: { plans: Number(totals.plans), infeasible: Number(totals.infeasible) },
    errors: errorRows.map((r) => ({ targetId: r.target_id, nodeId: r.node_id, message: r.error })),
  };
}

/** Every stored plan of the proposal, in list order then node code (the summary PDF). */
export async function listStoredPlans(
  db: Knex,
  proposalId: number,
): Promise<{ plans: TargetPlanRow[]; errors: { targetId: number; nodeId: number; message: string }[] }> {
  const rows: StoredPlanDbRow[] = await db('target_plans as tp')
    .join('targets as t', 't.id', 'tp.target_id')
    .join('nodes as n', 'n.id', 'tp.node_id')
    .where('tp.proposal_id', proposalId)
    .orderBy('t.position')
    .orderBy('t.id')
    .orderBy('n.code')
    // The explained numbers (~90 % of each result) stay in the database: the side panel asks for them.
    .select('tp.target_id', 'tp.node_id', 't.name as target_name', 'n.code as node_code', 'tp.summary', 'tp.error');
  const plans: TargetPlanRow[] = [];
  const errors: { targetId: number; nodeId: number; message: string }[] = [];
  for (const r of rows) {
    if (r.summary) plans.push(toPlanRow({ ...r, summary: r.summary }));
    else errors.push({ targetId: r.target_id, nodeId: r.node_id, message: r.error ?? 'not computed' });
  }
  return { plans, errors };
}

/** Every explained number of one stored plan, or undefined when there is none (not computed, or an error row). */
export async function findPlanExplanation(
  db: Knex,
  proposalId: number,
  targetId: number,
  nodeId: number,
): Promise<PlanExplanation | undefined> {
  const row = await db('target_plans as tp')
    .join('targets as t', 't.id', 'tp.target_id')
    .join('nodes as n', 'n.id', 'tp.node_id')
    .where({ 'tp.proposal_id': proposalId, 'tp.target_id': targetId, 'tp.node_id': nodeId })
    .whereNotNull('tp.result')
    .first('t.name as target_name', 'n.code as node_code', 'tp.result');
  if (!row) return undefined;
  const result = row.result as StoredPlanResult;
  return {
    targetId,
    targetName: row.target_name,
    nodeId,
    nodeCode: row.node_code,
    currency: result.currency,
    relationLabel: result.relationLabel,
    quantities: result.quantities,
    flags: result.flags,
  };
}

/** Per requested node: totals of the stored plans on it (nodes without plans give zeros). */
export async function nodeRequestTotals(db: Knex, proposalId: number): Promise<NodeRequest[]> {
  const rows = await db('proposal_nodes as pn')
    .join('nodes as n', 'n.id', 'pn.node_id')
    .leftJoin('target_plans as tp', function () {
      this.on('tp.proposal_id', 'pn.proposal_id').andOn('tp.node_id', 'pn.node_id').andOnNotNull('tp.result');
    })
    .where('pn.proposal_id', proposalId)
    .groupBy('pn.node_id', 'n.code', 'n.currency')
    .orderBy('n.code')
    .select(
      'pn.node_id',
      'n.code',
      'n.currency',
      // Only feasible plans are requested: an infeasible one cannot be executed as it stands.
      db.raw('coalesce(sum(tp.node_hours) FILTER (WHERE tp.feasible), 0) AS node_hours'),
      db.raw('coalesce(sum(tp.fee_minor) FILTER (WHERE tp.feasible), 0)::bigint AS fee_minor'),
      db.raw('count(tp.target_id)::int AS targets'),
      db.raw('count(tp.target_id) FILTER (WHERE NOT tp.feasible)::int AS infeasible'),
      // Shown apart from the request, so that the team sees what the infeasible targets would cost.
      db.raw('coalesce(sum(tp.node_hours) FILTER (WHERE NOT tp.feasible), 0) AS infeasible_node_hours'),
    );
  return rows.map(
    (r: {
      node_id: number;
      code: string;
      currency: string;
      node_hours: number;
      fee_minor: number;
      targets: number;
      infeasible: number;
      infeasible_node_hours: number;
    }) => ({
      nodeId: r.node_id,
      nodeCode: r.code,
      nodeHours: Math.round(r.node_hours * 100) / 100,
      feeMinor: r.fee_minor,
      currency: r.currency,
      targets: r.targets,
      infeasibleTargets: r.infeasible,
      infeasibleNodeHours: Math.round(r.infeasible_node_hours * 100) / 100,
    }),
  );
}

/** How many stored plans of the proposal are errors. */
export async function countPlanErrors(db: Knex, proposalId: number): Promise<number> {
  const [{ n }] = await db('target_plans').where({ proposal_id: proposalId }).whereNotNull('error').count<{ n: number }[]>({ n: '*' });
  return n;
}

/** Every stored plan of a proposal as a chart marker (target, node, feasible, period), unpaged. */
export async function listPlanMarkers(db: Knex, proposalId: number): Promise<PlanMarker[]> {
  const rows = (await db('target_plans')
    .where({ proposal_id: proposalId })
    .whereNotNull('summary')
    .orderBy([{ column: 'target_id' }, { column: 'node_id' }])
    .select('target_id', 'node_id', 'feasible', db.raw("(summary->>'periodDays')::float8 AS period_days"))) as {
    target_id: number;
    node_id: number;
    feasible: boolean;
    period_days: number | null;
  }[];
  return rows.map((r) => ({ targetId: r.target_id, nodeId: r.node_id, feasible: r.feasible, periodDays: r.period_days }));
}
