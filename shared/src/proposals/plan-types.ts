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
  visitsPerNight: number;
  cadenceDays: number;
  baselineDays: number;
  usableNights: number;
  nodeHours: number;
  feeMinor: number;
  currency: string;
  /** Every number of the plan, explained (for the side panel). */
  quantities: Record<string, Explained<number | null>>;
  flags: ScienceFlag[];
  relationLabel: string;
}

export interface ProposalPlans {
  run: PlanRunStatus;
  plans: TargetPlanRow[];
  /** Targets whose plan failed to compute at all (bad science input), with the message. */
  errors: { targetId: number; nodeId: number; message: string }[];
}
