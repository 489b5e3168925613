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
  /** One-line sky verdict, e.g. "observable on 112 of 180 nights; longest gap 9 nights; cadence fits". */
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

export interface ProposalPlans {
  run: PlanRunStatus;
  plans: TargetPlanRow[];
  /** Targets whose plan failed to compute at all (bad science input), with the message. */
  errors: { targetId: number; nodeId: number; message: string }[];
}
