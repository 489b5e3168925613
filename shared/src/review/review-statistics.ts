/**
 * Review statistics of one panel (pure, no I/O): each reviewer's grades normalised within
 * their own set, and per proposal the raw and normalised grades side by side with their
 * mean, median, spread and a flag for discussion.
 *
 * Normalisation (a z-score per reviewer; common practice, no source):
 *   z = (g − mean_r) / sd_r
 * where mean_r and sd_r are the mean and the POPULATION standard deviation (divide by n, not
 * n − 1) of every grade reviewer r gave in this panel. Why population: sd_r describes the
 * reviewer's own set of grades, it does not estimate a wider population, and it stays defined
 * for a set of one. When a reviewer gave one grade, or all their grades are equal (sd_r = 0),
 * nothing tells their generous from their harsh grades, so every one of their grades gets
 * z = 0 (it neither raises nor lowers a proposal's normalised mean).
 *
 * Per proposal: mean and median of the raw grades, the normalised mean (mean of the z-scores)
 * and the spread (max − min of the raw grades); flagged for discussion when the spread is
 * strictly greater than the panel's spread threshold. A proposal without grades has nulls.
 */

/** One grade of one reviewer on one proposal (0.0–10.0). */
export interface GradeEntry {
  proposalId: number;
  reviewerId: number;
  grade: number;
}

/** A reviewer's own set of grades in the panel. */
export interface ReviewerNormalisation {
  reviewerId: number;
  gradeCount: number;
  /** Mean of the reviewer's grades. */
  mean: number;
  /** Population standard deviation of the reviewer's grades (0 for one grade). */
  sd: number;
}

/** One grade of a proposal, raw and normalised. */
export interface ProposalGrade {
  reviewerId: number;
  raw: number;
  /** The reviewer's z-score of this grade (0 when their sd is 0 or they gave one grade). */
  normalised: number;
}

/** A proposal's statistics; the numbers are null when it has no grade yet. */
export interface ProposalStatistics {
  proposalId: number;
  grades: ProposalGrade[];
  gradeCount: number;
  mean: number | null;
  median: number | null;
  /** Mean of the z-scores: the normalised mean that orders the standing. */
  normalisedMean: number | null;
  /** max − min of the raw grades (0 with one grade). */
  spread: number | null;
  /** spread > the panel's spread threshold. */
  flagged: boolean;
}

export interface PanelStatistics {
  reviewers: ReviewerNormalisation[];
  /** In the order of `proposalIds`. */
  proposals: ProposalStatistics[];
}

/** An sd below this counts as zero (grades have one decimal, so real spreads are ≥ 0.05). */
const ZERO_SD = 1e-9;

/** Median of a non-empty list (mean of the two middle values for an even count). */
export function median(values: readonly number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = Math.floor(sorted.length / 2);
  return sorted.length % 2 === 1 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

const mean = (values: readonly number[]) => values.reduce((s, v) => s + v, 0) / values.length;

/** Mean and population sd of each reviewer's grades. */
export function normaliseReviewers(entries: readonly GradeEntry[]): Map<number, ReviewerNormalisation> {
  const byReviewer = new Map<number, number[]>();
  for (const e of entries) byReviewer.set(e.reviewerId, [...(byReviewer.get(e.reviewerId) ?? []), e.grade]);
  const out = new Map<number, ReviewerNormalisation>();
  for (const [reviewerId, grades] of byReviewer) {
    const m = mean(grades);
    const sd = Math.sqrt(grades.reduce((s, g) => s + (g - m) ** 2, 0) / grades.length);
    out.set(reviewerId, { reviewerId, gradeCount: grades.length, mean: m, sd });
  }
  return out;
}

/** z-score of a grade for a reviewer (0 when the reviewer's sd is zero; see the file's comment). */
export function zScore(grade: number, reviewer: ReviewerNormalisation): number {
  return reviewer.sd < ZERO_SD ? 0 : (grade - reviewer.mean) / reviewer.sd;
}

/**
 * The panel's statistics. `proposalIds` lists every proposal of the panel (those without
 * grades get a row of nulls); `entries` holds every grade given in the panel, since each
 * reviewer's normalisation uses their whole set.
 */
export function computePanelStatistics(
  proposalIds: readonly number[],
  entries: readonly GradeEntry[],
  spreadThreshold: number,
): PanelStatistics {
  const reviewers = normaliseReviewers(entries);
  const byProposal = new Map<number, GradeEntry[]>();
  for (const e of entries) byProposal.set(e.proposalId, [...(byProposal.get(e.proposalId) ?? []), e]);
  const proposals = proposalIds.map((proposalId): ProposalStatistics => {
    const own = (byProposal.get(proposalId) ?? []).slice().sort((a, b) => a.reviewerId - b.reviewerId);
    if (own.length === 0) {
      return { proposalId, grades: [], gradeCount: 0, mean: null, median: null, normalisedMean: null, spread: null, flagged: false };
    }
    const grades = own.map((e) => ({ reviewerId: e.reviewerId, raw: e.grade, normalised: zScore(e.grade, reviewers.get(e.reviewerId)!) }));
    const raws = grades.map((g) => g.raw);
    const spread = Math.max(...raws) - Math.min(...raws);
    return {
      proposalId,
      grades,
      gradeCount: grades.length,
      mean: mean(raws),
      median: median(raws),
      normalisedMean: mean(grades.map((g) => g.normalised)),
      spread,
      // Grades have one decimal: compare at 1e-9 so that 7.1 − 4.1 (2.9999999999999996) is 3.
      flagged: spread - spreadThreshold > 1e-9,
    };
  });
  return { reviewers: [...reviewers.values()].sort((a, b) => a.reviewerId - b.reviewerId), proposals };
}
