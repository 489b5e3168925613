/**
 * A panel's statistics, triage and standing: request schemas, response shapes and the pure
 * orderings the server applies (GET/PUT/POST /api/review/panels/:panelId/…).
 */
import { z } from 'zod';
import { safeMultiLineText } from '../http/text';
import { idSchema } from '../http/ids';
import type { ProposalState } from '../proposals/proposal-states';
import type { ProposalStatistics } from './review-statistics';

/** Largest triage fraction (the database allows 0–0.9). */
export const MAX_TRIAGE_FRACTION = 0.9;

/** PUT …/triage (facility managers): the share of the panel's graded proposals not discussed. */
export const triageSchema = z.object({
  fraction: z
    .number({ message: 'must be a number between 0 and 0.9' })
    .min(0, { message: 'must be between 0 and 0.9' })
    .max(MAX_TRIAGE_FRACTION, { message: 'must be between 0 and 0.9' }),
});
export type TriageInput = z.infer<typeof triageSchema>;

/** PUT …/spread-threshold (the chair from the panel stage, or a facility manager). */
export const spreadThresholdSchema = z.object({
  spreadThreshold: z
    .number({ message: 'must be a number of grade points between 0 and 10' })
    .min(0, { message: 'must be between 0 and 10 grade points' })
    .max(10, { message: 'must be between 0 and 10 grade points' }),
});
export type SpreadThresholdInput = z.infer<typeof spreadThresholdSchema>;

/** POST …/standing/moves: move one proposal to a position, with the reason (kept in the history). */
export const standingMoveSchema = z.object({
  proposalId: idSchema,
  toPosition: z
    .number({ message: 'must be a whole number of at least 1' })
    .int({ message: 'must be a whole number of at least 1' })
    .min(1, { message: 'must be a whole number of at least 1' })
    .max(100_000, { message: 'must be at most the number of proposals in the standing' }),
  reason: safeMultiLineText(
    z
      .string({ message: 'give the reason for the move' })
      .trim()
      .min(1, { message: 'give the reason for the move' })
      .max(500, { message: 'must be at most 500 characters' }),
  ),
});
export type StandingMoveInput = z.infer<typeof standingMoveSchema>;

/** How the viewer reaches the panel: a facility manager, or its chair (from the panel stage). */
export type PanelViewerRole = 'manager' | 'chair';

/** The panel as the statistics, standing and exports show it. */
export interface PanelHeader {
  id: number;
  name: string;
  cycleId: number;
  cycleCode: string;
  /** Null when the cycle has no review deadline yet. */
  reviewDeadline: string | null;
  /** The review deadline has passed: grades are locked and the chair sees them. */
  panelStage: boolean;
  spreadThreshold: number;
  triageFraction: number;
  standingLockedAt: string | null;
  standingLockedBy: string | null;
  /** Team names are withheld from this viewer (an anonymous cycle, seen by the chair). */
  teamHidden: boolean;
  viewerRole: PanelViewerRole;
  version: number;
}

/** The proposing team, only for viewers allowed to see it. */
export interface TeamSummary {
  piName: string;
  piAffiliation: string;
}

/** One reviewer column of the panel's grade matrix. */
export interface PanelReviewer {
  id: number;
  displayName: string;
  gradeCount: number;
  /** Mean and population sd of this reviewer's grades in the panel (null without grades). */
  meanGrade: number | null;
  sdGrade: number | null;
}

/** One proposal row of the statistics (and of each standing entry). */
export interface StatisticsRow extends ProposalStatistics {
  title: string;
  state: ProposalState;
  /** Null when the viewer may not see the team (an anonymous cycle, seen by the chair). */
  team: TeamSummary | null;
  notDiscussed: boolean;
}

/** GET /api/review/panels/:panelId/statistics. Rows best first by normalised mean. */
export interface PanelStatisticsReport {
  panel: PanelHeader;
  reviewers: PanelReviewer[];
  proposals: StatisticsRow[];
}

/** One recorded move of the standing. */
export interface StandingMove {
  id: number;
  proposalId: number;
  proposalTitle: string;
  fromPosition: number;
  toPosition: number;
  reason: string;
  movedBy: string | null;
  movedAt: string;
}

/** One place of the standing. */
export interface StandingEntry {
  position: number;
  proposal: StatisticsRow;
}

/** GET /api/review/panels/:panelId/standing. */
export interface PanelStanding {
  panel: PanelHeader;
  /** Position 1 is the best. The chair does not get proposals they are conflicted with or on the team of. */
  entries: StandingEntry[];
  /** Newest first. */
  moves: StandingMove[];
  locked: boolean;
}

/** Two normalised means closer than this count as equal (they are means of floating-point z-scores). */
const TIE = 1e-9;

/**
 * Orders proposals best first: by normalised mean (higher first), equal means (within 1e-9) by
 * the raw mean (higher first), then by proposal id (lower first, so the order is total and
 * repeatable). Proposals without grades come after every graded one.
 */
export function compareByMerit(a: ProposalStatistics, b: ProposalStatistics): number {
  if (a.normalisedMean === null || b.normalisedMean === null) {
    if (a.normalisedMean !== b.normalisedMean) return a.normalisedMean === null ? 1 : -1;
    return a.proposalId - b.proposalId;
  }
  if (Math.abs(a.normalisedMean - b.normalisedMean) > TIE) return b.normalisedMean - a.normalisedMean;
  if (a.mean !== null && b.mean !== null && Math.abs(a.mean - b.mean) > TIE) return b.mean - a.mean;
  return a.proposalId - b.proposalId;
}

/**
 * Triage: the proposals marked "not discussed" for a fraction f. Of the n proposals that have at
 * least one grade, the last ⌊f × n⌋ in the merit order (`compareByMerit`) are marked; proposals
 * without grades are never marked (there is nothing to judge them by). Tie rule: ties follow the
 * merit order's own, so of two proposals with equal normalised means the lower raw mean is
 * marked first, and if that is equal too, the higher proposal id.
 */
export function selectNotDiscussed(statistics: readonly ProposalStatistics[], fraction: number): Set<number> {
  const graded = statistics.filter((s) => s.normalisedMean !== null).sort(compareByMerit);
  // The small epsilon keeps 0.3 × 10 (= 3.0000000000000004 or 2.9999999999999996) at 3.
  const count = Math.floor(fraction * graded.length + 1e-9);
  return new Set(graded.slice(graded.length - count).map((s) => s.proposalId));
}

/**
 * The standing a panel starts from: merit order (`compareByMerit`), with the proposals marked
 * "not discussed" after all the others (in merit order among themselves).
 */
export function initialStandingOrder(statistics: readonly (ProposalStatistics & { notDiscussed: boolean })[]): number[] {
  const sorted = [...statistics].sort((a, b) => {
    if (a.notDiscussed !== b.notDiscussed) return a.notDiscussed ? 1 : -1;
    return compareByMerit(a, b);
  });
  return sorted.map((s) => s.proposalId);
}

/**
 * The standing after moving one proposal from `from` to `to` (1-based positions in `order`):
 * the proposals in between shift by one place towards `from`.
 */
export function moveInStanding<T>(order: readonly T[], from: number, to: number): T[] {
  const out = [...order];
  const [moved] = out.splice(from - 1, 1);
  out.splice(to - 1, 0, moved);
  return out;
}
