import { computePanelStatistics } from './review-statistics';
import {
  compareByMerit,
  initialStandingOrder,
  moveInStanding,
  selectNotDiscussed,
  spreadThresholdSchema,
  standingMoveSchema,
  triageSchema,
} from './standing';

// The worked example of review-statistics.spec.ts: normalised means P1 0.612, P3 −0.075, P2 −0.333, P4 none.
const STATS = computePanelStatistics(
  [1, 2, 3, 4],
  [
    { proposalId: 1, reviewerId: 1, grade: 8 },
    { proposalId: 2, reviewerId: 1, grade: 6 },
    { proposalId: 3, reviewerId: 1, grade: 4 },
    { proposalId: 1, reviewerId: 2, grade: 9 },
    { proposalId: 2, reviewerId: 2, grade: 9 },
    { proposalId: 2, reviewerId: 3, grade: 2 },
    { proposalId: 3, reviewerId: 3, grade: 6 },
    { proposalId: 3, reviewerId: 4, grade: 5 },
  ],
  3,
).proposals;

describe('merit order and triage (worked by hand in review-statistics.spec.ts)', () => {
  it('orders by normalised mean, best first, ungraded last', () => {
    expect([...STATS].sort(compareByMerit).map((s) => s.proposalId)).toEqual([1, 3, 2, 4]);
  });

  it('ties on the normalised mean go by the raw mean, then by the lower id', () => {
    const base = { grades: [], gradeCount: 1, median: 5, spread: 0, flagged: false };
    const a = { ...base, proposalId: 9, normalisedMean: 0, mean: 6 };
    const b = { ...base, proposalId: 5, normalisedMean: 1e-12, mean: 5 };
    const c = { ...base, proposalId: 7, normalisedMean: 0, mean: 5 };
    expect([b, c, a].sort(compareByMerit).map((s) => s.proposalId)).toEqual([9, 5, 7]);
  });

  it('triage marks the lowest ⌊f × n⌋ graded proposals (n = 3 graded here)', () => {
    expect([...selectNotDiscussed(STATS, 0)]).toEqual([]);
    expect([...selectNotDiscussed(STATS, 0.3)]).toEqual([]); // ⌊0.9⌋ = 0
    expect([...selectNotDiscussed(STATS, 0.34)]).toEqual([2]); // ⌊1.02⌋ = 1
    expect([...selectNotDiscussed(STATS, 0.9)].sort()).toEqual([2, 3]); // ⌊2.7⌋ = 2
  });

  it('triage: 0.3 of 10 is 3 despite floating-point noise', () => {
    const ten = Array.from({ length: 10 }, (_, i) => ({ ...STATS[0], proposalId: i + 1, normalisedMean: i, mean: i }));
    expect([...selectNotDiscussed(ten, 0.3)].sort()).toEqual([1, 2, 3]);
  });

  it('the initial standing puts not-discussed proposals last', () => {
    const withFlags = STATS.map((s) => ({ ...s, notDiscussed: s.proposalId === 2 }));
    expect(initialStandingOrder(withFlags)).toEqual([1, 3, 4, 2]);
  });

  it('moveInStanding shifts the proposals in between', () => {
    expect(moveInStanding(['a', 'b', 'c', 'd'], 4, 2)).toEqual(['a', 'd', 'b', 'c']);
    expect(moveInStanding(['a', 'b', 'c', 'd'], 1, 3)).toEqual(['b', 'c', 'a', 'd']);
  });
});

describe('request schemas', () => {
  it('triage fraction 0–0.9', () => {
    expect(triageSchema.safeParse({ fraction: 0.9 }).success).toBe(true);
    expect(triageSchema.safeParse({ fraction: 0.95 }).success).toBe(false);
    expect(triageSchema.safeParse({ fraction: -0.1 }).success).toBe(false);
  });
  it('spread threshold 0–10', () => {
    expect(spreadThresholdSchema.safeParse({ spreadThreshold: 2.5 }).success).toBe(true);
    expect(spreadThresholdSchema.safeParse({ spreadThreshold: 11 }).success).toBe(false);
  });
  it('a move needs a reason of 1–500 characters', () => {
    expect(standingMoveSchema.safeParse({ proposalId: 1, toPosition: 2, reason: 'Stronger case' }).success).toBe(true);
    expect(standingMoveSchema.safeParse({ proposalId: 1, toPosition: 2, reason: '   ' }).success).toBe(false);
    expect(standingMoveSchema.safeParse({ proposalId: 1, toPosition: 2, reason: 'x'.repeat(501) }).success).toBe(false);
    expect(standingMoveSchema.safeParse({ proposalId: 1, toPosition: 0, reason: 'x' }).success).toBe(false);
  });
});
