/**
 * The reviewer's side of review (/api/review/my…): the grading table, conflicts, reading a
 * proposal, saving and submitting grades. Team names and affiliations travel only when the
 * cycle is not anonymous.
 */
import { z } from 'zod';
import { idParam, idSchema, versionSchema } from '../http/ids';
import type { TechnicalAssessment, TechnicalAssessmentSummary } from './technical-assessment';

/** Lowest and highest grade (higher is better). */
export const GRADE_MIN = 0;
export const GRADE_MAX = 10;

const gradeMessage = `must be a number from ${GRADE_MIN.toFixed(1)} to ${GRADE_MAX.toFixed(1)}`;
const oneDecimalMessage = 'must have at most one decimal (for example 7.2 or 7.3)';

/** Whether x has at most one decimal (tolerant of binary fractions such as 0.1 + 0.2). */
export function hasOneDecimal(x: number): boolean {
  return Math.abs(x * 10 - Math.round(x * 10)) < 1e-6;
}

/** A grade: 0.0–10.0 with one decimal, or null (not graded yet). */
export const gradeSchema = z
  .number({ message: gradeMessage })
  .min(GRADE_MIN, { message: gradeMessage })
  .max(GRADE_MAX, { message: gradeMessage })
  .refine(hasOneDecimal, { message: oneDecimalMessage })
  .transform((x) => Math.round(x * 10) / 10)
  .nullable();

/** Longest comments, as the database allows them. */
export const STRENGTHS_MAX = 4000;
export const WEAKNESSES_MAX = 4000;
export const COMMITTEE_NOTE_MAX = 2000;
export const CONFLICT_REASON_MAX = 500;

const text = (max: number) => z.string({ message: 'must be text' }).max(max, { message: `must be at most ${max} characters` });

/** PUT /api/review/my/:proposalId/review: the whole review as the reviewer last saw it. */
export const saveReviewSchema = z.object({
  /** The version the reviewer read (optimistic concurrency: another tab's save answers 409). */
  version: versionSchema,
  grade: gradeSchema,
  strengths: text(STRENGTHS_MAX),
  weaknesses: text(WEAKNESSES_MAX),
  /** Seen by the committee only, never by the team. */
  committeeNote: text(COMMITTEE_NOTE_MAX),
});
export type SaveReviewInput = z.infer<typeof saveReviewSchema>;

/** POST /api/review/my/:proposalId/conflict. */
export const declareConflictSchema = z.object({
  /** Why the reviewer cannot grade the proposal; read by the facility managers. */
  reason: z
    .string({ message: 'must be text' })
    .trim()
    .min(1, { message: 'give a reason' })
    .max(CONFLICT_REASON_MAX, { message: `must be at most ${CONFLICT_REASON_MAX} characters` }),
});
export type DeclareConflictInput = z.infer<typeof declareConflictSchema>;

/** POST /api/review/my/submit: submits every review of the reviewer in the cycle. */
export const submitReviewsSchema = z.object({ cycleId: idSchema });
export type SubmitReviewsInput = z.infer<typeof submitReviewsSchema>;

/** GET /api/review/my?cycleId=. */
export const myReviewsQuerySchema = z.object({ cycleId: idParam.optional() });

/** `:proposalId` route parameter. */
export const reviewProposalParamsSchema = z.object({ proposalId: idParam });

/** GET /api/review/my/:proposalId/targets/:targetId/sky?nodeId=: a target's sky windows from a node. */
export const reviewTargetParamsSchema = z.object({ proposalId: idParam, targetId: idParam });
export const reviewSkyQuerySchema = z.object({ nodeId: idParam });

/** Why a review can no longer change. */
export type ReviewLock = 'submitted' | 'deadline' | null;

/** The proposing team, only when the cycle is not anonymous. */
export interface ReviewTeam {
  piName: string;
  /** Distinct affiliations of the active team members. */
  affiliations: string[];
}

/** One row of the reviewer's grading table (GET /api/review/my). */
export interface MyReviewRow {
  proposalId: number;
  title: string;
  category: string | null;
  /** The first 300 characters of the abstract. */
  abstractShort: string;
  cycleId: number;
  cycleCode: string;
  /** Grades lock at this instant; null until the manager sets it. */
  reviewDeadline: string | null;
  locked: boolean;
  lockedBecause: ReviewLock;
  grade: number | null;
  strengths: string;
  weaknesses: string;
  committeeNote: string;
  savedAt: string | null;
  submittedAt: string | null;
  version: number;
  assessment: TechnicalAssessmentSummary;
  /** Null in an anonymous cycle. */
  team: ReviewTeam | null;
}

/** A cycle in which the reviewer has assignments. */
export interface MyReviewCycle {
  id: number;
  code: string;
  title: string;
  reviewDeadline: string | null;
  anonymousReview: boolean;
  assigned: number;
  graded: number;
  submitted: number;
}

export interface MyReviews {
  cycles: MyReviewCycle[];
  reviews: MyReviewRow[];
}

/** One stored plan as the reviewer reads it. */
export interface ReviewPlan {
  nodeId: number;
  nodeCode: string;
  feasible: boolean;
  reasons: string[];
  skyVerdict: string;
  periodDays: number;
  amplitudePpm: number;
  perVisitPrecisionPpm: number;
  visits: number;
  visitsPerNight: number;
  cadenceDays: number;
  baselineDays: number;
  nodeHours: number;
  completeness: number | null;
}

export interface ReviewTarget {
  id: number;
  name: string;
  raDeg: number;
  decDeg: number;
  magnitude: number;
  magnitudeBand: string;
  /** Colour, its system, reddening and age (for the period–colour chart of a cluster). */
  colour: number;
  colourSystem: 'BV' | 'BPRP';
  reddeningEbv: number | null;
  ageMyr: number;
  ageUncertaintyMyr: number | null;
  /** The stored plans on the requested nodes, by node code. */
  plans: ReviewPlan[];
}

/** GET /api/review/my/:proposalId: what a reviewer reads. */
export interface ReviewProposal {
  review: MyReviewRow;
  abstract: string;
  completenessGoal: number;
  nodes: { id: number; code: string; name: string }[];
  targets: ReviewTarget[];
  assessment: TechnicalAssessment;
  /** URL of the justification PDF (inline), or null when none was uploaded. */
  justificationUrl: string | null;
  /** Null in an anonymous cycle. */
  team: ReviewTeam | null;
}

/** POST /api/review/my/submit answer. */
export interface SubmitReviewsResult {
  cycleId: number;
  submitted: number;
  submittedAt: string;
}
