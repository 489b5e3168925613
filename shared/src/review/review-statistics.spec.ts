import { computePanelStatistics, median, normaliseReviewers, zScore } from './review-statistics';

/*
 * Worked by hand in this test (population sd, z = 0 for a reviewer with zero spread):
 *   reviewer 1 graded P1 8, P2 6, P3 4 → mean 6, sd = √((4 + 0 + 4)/3) = √(8/3) = 1.632993
 *              z: P1 2/1.632993 = 1.224745, P2 0, P3 −1.224745
 *   reviewer 2 graded P1 9, P2 9        → mean 9, sd 0 → z 0, 0
 *   reviewer 3 graded P2 2, P3 6        → mean 4, sd = √((4 + 4)/2) = 2 → z −1, +1
 *   reviewer 4 graded P3 5              → one grade → z 0
 *   P1: raw 8, 9    mean 8.5, median 8.5, spread 1, normalised mean (1.224745 + 0)/2 = 0.612372
 *   P2: raw 6, 9, 2 mean 17/3 = 5.666667, median 6, spread 7 (> 3: flagged), normalised (0 + 0 − 1)/3 = −0.333333
 *   P3: raw 4, 6, 5 mean 5, median 5, spread 2, normalised (−1.224745 + 1 + 0)/3 = −0.074915
 *   P4: no grades → nulls, not flagged
 */
const ENTRIES = [
  { proposalId: 1, reviewerId: 1, grade: 8 },
  { proposalId: 2, reviewerId: 1, grade: 6 },
  { proposalId: 3, reviewerId: 1, grade: 4 },
  { proposalId: 1, reviewerId: 2, grade: 9 },
  { proposalId: 2, reviewerId: 2, grade: 9 },
  { proposalId: 2, reviewerId: 3, grade: 2 },
  { proposalId: 3, reviewerId: 3, grade: 6 },
  { proposalId: 3, reviewerId: 4, grade: 5 },
];

describe('computePanelStatistics', () => {
  const stats = computePanelStatistics([1, 2, 3, 4], ENTRIES, 3);
  const row = (id: number) => stats.proposals.find((p) => p.proposalId === id)!;

  it('worked example (worked by hand in this test): per-reviewer mean and population sd', () => {
    expect(stats.reviewers.map((r) => [r.reviewerId, r.gradeCount])).toEqual([
      [1, 3],
      [2, 2],
      [3, 2],
      [4, 1],
    ]);
    expect(stats.reviewers[0].mean).toBeCloseTo(6, 9);
    expect(stats.reviewers[0].sd).toBeCloseTo(1.632993, 6);
    expect(stats.reviewers[1].sd).toBe(0);
    expect(stats.reviewers[2].sd).toBeCloseTo(2, 9);
  });

  it('worked example (worked by hand in this test): raw and normalised grades side by side', () => {
    expect(row(1).grades).toEqual([
      { reviewerId: 1, raw: 8, normalised: expect.closeTo(1.224745, 6) },
      { reviewerId: 2, raw: 9, normalised: 0 },
    ]);
    expect(row(3).grades.map((g) => g.normalised)).toEqual([expect.closeTo(-1.224745, 6), expect.closeTo(1, 9), 0]);
  });

  it('worked example (worked by hand in this test): mean, median, normalised mean, spread, flag', () => {
    expect(row(1)).toMatchObject({ gradeCount: 2, mean: 8.5, median: 8.5, spread: 1, flagged: false });
    expect(row(1).normalisedMean).toBeCloseTo(0.612372, 6);
    expect(row(2)).toMatchObject({ gradeCount: 3, median: 6, spread: 7, flagged: true });
    expect(row(2).mean).toBeCloseTo(5.666667, 6);
    expect(row(2).normalisedMean).toBeCloseTo(-0.333333, 6);
    expect(row(3)).toMatchObject({ mean: 5, median: 5, spread: 2, flagged: false });
    expect(row(3).normalisedMean).toBeCloseTo(-0.074915, 6);
    expect(row(4)).toEqual({
      proposalId: 4,
      grades: [],
      gradeCount: 0,
      mean: null,
      median: null,
      normalisedMean: null,
      spread: null,
      flagged: false,
    });
  });

  it('flag: a spread equal to the threshold is not flagged, even with floating-point noise (7.1 − 4.1)', () => {
    const s = computePanelStatistics(
      [1],
      [
        { proposalId: 1, reviewerId: 1, grade: 7.1 },
        { proposalId: 1, reviewerId: 2, grade: 4.1 },
      ],
      3,
    );
    expect(s.proposals[0].flagged).toBe(false);
    expect(
      computePanelStatistics(
        [1],
        [
          { proposalId: 1, reviewerId: 1, grade: 7.2 },
          { proposalId: 1, reviewerId: 2, grade: 4.1 },
        ],
        3,
      ).proposals[0].flagged,
    ).toBe(true);
  });

  it('a reviewer with one grade or with equal grades gets z = 0 (no information about their scale)', () => {
    const reviewers = normaliseReviewers([
      { proposalId: 1, reviewerId: 7, grade: 3 },
      { proposalId: 2, reviewerId: 8, grade: 5 },
      { proposalId: 3, reviewerId: 8, grade: 5 },
    ]);
    expect(zScore(3, reviewers.get(7)!)).toBe(0);
    expect(zScore(5, reviewers.get(8)!)).toBe(0);
  });

  it('median: odd and even counts (common practice, no source)', () => {
    expect(median([3, 1, 2])).toBe(2);
    expect(median([4, 1, 3, 2])).toBe(2.5);
  });
});
