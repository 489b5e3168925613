import { z } from 'zod';
import { idParam } from '../http/ids';
import type { Explained, ScienceFlag } from '../science/explained';
import type { PlanSuggestion } from '../planning/node-target-plan';

/** State of the background computation of a proposal's target plans. */
export interface PlanRunStatus {
  /** `idle` when the stored plans match the current targets and nodes. */
  state: 'idle' | 'queued' | 'running' | 'failed';
  total: number;
  done: number;
  startedAt: string | null;
  finishedAt: string | null;
  error: string | null;
  /** False when targets or nodes changed since the stored plans were computed. */
  current: boolean;
}

/** The stored plan of one target on one node (GET /api/proposals/:id/plans). */
export interface TargetPlanRow {
  targetId: number;
  targetName: string;
  nodeId: number;
  nodeCode: string;
  feasible: boolean;
  /** Why it is infeasible (science blocks and sky window), empty when feasible. */
  reasons: string[];
  suggestions: PlanSuggestion[];
  /** One-line sky verdict, e.g. "112 of 180 nights can hold the 2 visits; longest gap 9 nights; cadence fits". */
  skyVerdict: string;
  periodDays: number;
  shortestPeriodDays: number;
  longestPeriodDays: number;
  amplitudePpm: number;
  perVisitPrecisionPpm: number;
  exposureSeconds: number;
  visits: number;
  /** Probability that the plan recovers the period (0–1); null for plans stored before it was part of the row. */
  completeness: number | null;
  visitsPerNight: number;
  cadenceDays: number;
  baselineDays: number;
  usableNights: number;
  nodeHours: number;
  feeMinor: number;
  currency: string;
  /**
   * The "why" line of the numbers shown in the plans table, by quantity key (see
   * PLAN_TABLE_QUANTITIES); every number with its source comes from the plan's explanation.
   */
  why: Partial<Record<PlanTableQuantity, string>>;
  flags: ScienceFlag[];
  relationLabel: string;
}

/** The quantities the plans table shows, whose why line travels with each row. */
export const PLAN_TABLE_QUANTITIES = [
  'periodDays',
  'semiAmplitudePpm',
  'amplitudeRperPpm',
  'perVisitPrecisionPpm',
  'exposureSeconds',
  'exposuresPerVisit',
  'visits',
  'completeness',
  'visitsPerNight',
  'sampleIntervalDays',
  'nightStepDays',
  'baselineDays',
  'nodeHours',
  'feeMinor',
] as const;
export type PlanTableQuantity = (typeof PLAN_TABLE_QUANTITIES)[number];

/**
 * Every number of one stored plan, explained (GET /api/proposals/:id/targets/:targetId/plan?nodeId=N):
 * the side panel loads it on demand, so the plans list stays small.
 */
export interface PlanExplanation {
  targetId: number;
  targetName: string;
  nodeId: number;
  nodeCode: string;
  currency: string;
  relationLabel: string;
  quantities: Record<string, Explained<number | null>>;
  flags: ScienceFlag[];
}

/** Largest page of the plans list. */
export const PLAN_LIST_MAX_PAGE_SIZE = 200;
/** Page size of the plans list when the query names none. */
export const PLAN_LIST_DEFAULT_PAGE_SIZE = 50;

/** Columns the plans list sorts by (`sort=nodeHours`, descending `sort=-nodeHours`); `target` is list order. */
export const PLAN_SORT_KEYS = [
  'target',
  'node',
  'period',
  'amplitude',
  'precision',
  'exposure',
  'visits',
  'completeness',
  'visitsPerNight',
  'cadence',
  'baseline',
  'usableNights',
  'nodeHours',
  'fee',
] as const;
export type PlanSortKey = (typeof PLAN_SORT_KEYS)[number];

const pageMessage = 'must be a whole number from 1';
/** A positive whole number in a query string (digits only). */
const positiveParam = (max: number, message: string) =>
  z
    .string({ message })
    .regex(/^\d{1,9}$/, { message })
    .transform(Number)
    .pipe(z.number().int().min(1, { message }).max(max, { message }));

/** Query of GET /api/proposals/:id/plans: a page of the plans, filtered and sorted on the server. */
export const planListQuerySchema = z.object({
  /** 1-based page number. */
  page: positiveParam(1_000_000, pageMessage).default(1),
  /** Rows per page, 1–200. */
  pageSize: positiveParam(PLAN_LIST_MAX_PAGE_SIZE, `must be a whole number from 1 to ${PLAN_LIST_MAX_PAGE_SIZE}`).default(
    PLAN_LIST_DEFAULT_PAGE_SIZE,
  ),
  /** Only feasible (`true`) or only infeasible (`false`) plans. */
  feasible: z
    .enum(['true', 'false'], { message: 'must be true or false' })
    .transform((v) => v === 'true')
    .optional(),
  /** Only the plans on this node. */
  nodeId: idParam.optional(),
  /** Only targets or nodes whose name contains this text (case-insensitive). */
  q: z.string({ message: 'must be text' }).trim().max(200, { message: 'must be at most 200 characters' }).optional(),
  /** A column of PLAN_SORT_KEYS, `-` in front for descending; list order by default. */
  sort: z
    .string({ message: 'must be a column name' })
    .regex(new RegExp(`^-?(${PLAN_SORT_KEYS.join('|')})$`), {
      message: `must be one of ${PLAN_SORT_KEYS.join(', ')}, with - in front for descending`,
    })
    .default('target'),
});
export type PlanListQuery = z.infer<typeof planListQuerySchema>;
/** The query as the client sends it (all optional). */
export interface PlanListParams {
  page?: number;
  pageSize?: number;
  feasible?: boolean;
  nodeId?: number;
  q?: string;
  sort?: string;
}

/**
 * One stored plan reduced to what a chart of all targets needs (GET /api/proposals/:id/plans/markers):
 * every plan of the proposal, unpaged, about 60 bytes each.
 */
export interface PlanMarker {
  targetId: number;
  nodeId: number;
  feasible: boolean;
  periodDays: number | null;
}

export interface ProposalPlans {
  run: PlanRunStatus;
  /** One page of the plans matching the query. */
  plans: TargetPlanRow[];
  /** The page shown (1-based) and its size. */
  page: number;
  pageSize: number;
  /** Plans matching the query's filters, over all pages. */
  matched: number;
  /** Every stored plan of the proposal (not errors), and how many of them are infeasible: whatever the filter. */
  counts: { plans: number; infeasible: number };
  /** Targets whose plan failed to compute at all (bad science input), with the message (on the query's node, if any). */
  errors: { targetId: number; nodeId: number; message: string }[];
}
