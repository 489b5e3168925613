import fc from 'fast-check';
import {
  assignReviewers,
  expertiseMatcher,
  expertiseMatches,
  ineligibleReason,
  normalizeAffiliation,
  type AssignmentProblem,
} from './assignment';

/** A random problem: P proposals, R reviewers, a random ineligibility matrix, some fixed pairs. */
const problemArb = fc
  .record({
    P: fc.integer({ min: 1, max: 14 }),
    R: fc.integer({ min: 1, max: 8 }),
    k: fc.integer({ min: 1, max: 4 }),
    seed: fc.array(fc.boolean(), { minLength: 14 * 8, maxLength: 14 * 8 }),
    ineligibleShare: fc.constantFrom(0, 0.1, 0.3, 0.6),
    fixedPicks: fc.array(fc.tuple(fc.nat(13), fc.nat(7)), { maxLength: 6 }),
    noise: fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: 14 * 8, maxLength: 14 * 8 }),
  })
  .map(({ P, R, k, seed, ineligibleShare, fixedPicks, noise }) => {
    const ineligible = new Set<string>();
    for (let p = 0; p < P; p++) for (let r = 0; r < R; r++) if (noise[p * 8 + r] < ineligibleShare) ineligible.add(`${p + 1}:${r + 101}`);
    const fixed = fixedPicks
      .filter(([p, r]) => p < P && r < R && !ineligible.has(`${p + 1}:${r + 101}`))
      .map(([p, r]) => ({ proposalId: p + 1, reviewerId: r + 101 }));
    const problem: AssignmentProblem = {
      proposals: Array.from({ length: P }, (_, i) => ({ id: i + 1 })),
      reviewers: Array.from({ length: R }, (_, i) => ({ id: i + 101 })),
      reviewersPerProposal: k,
      fixed,
      eligible: (p, r) => !ineligible.has(`${p}:${r}`),
      prefers: (p, r) => seed[(p - 1) * 8 + (r - 101)],
    };
    return problem;
  });

/** Brute force (tiny cases only): is there any assignment meeting the hard constraints? */
function feasibleByBruteForce(problem: AssignmentProblem): boolean {
  const k = problem.reviewersPerProposal;
  const R = problem.reviewers.map((r) => r.id);
  // A pair fixed twice is one assignment (the database holds each pair once).
  const fixed = [...new Map(problem.fixed.map((f) => [`${f.proposalId}:${f.reviewerId}`, f])).values()];
  const fixedLoad = new Map(R.map((r) => [r, fixed.filter((f) => f.reviewerId === r).length]));
  const fixedOf = (p: number) => new Set(problem.fixed.filter((f) => f.proposalId === p).map((f) => f.reviewerId));
  const choices = problem.proposals.map((p) => {
    const need = Math.max(0, k - fixedOf(p.id).size);
    const cands = R.filter((r) => !fixedOf(p.id).has(r) && problem.eligible(p.id, r));
    const subsets: number[][] = [];
    const pick = (start: number, acc: number[]) => {
      if (acc.length === need) return void subsets.push([...acc]);
      for (let i = start; i < cands.length; i++) pick(i + 1, [...acc, cands[i]]);
    };
    pick(0, []);
    return subsets;
  });
  const load = new Map(fixedLoad);
  const search = (i: number): boolean => {
    if (i === choices.length) {
      const loads = [...load.values()];
      return Math.max(...loads) - Math.min(...loads) <= 1;
    }
    for (const s of choices[i]) {
      for (const r of s) load.set(r, load.get(r)! + 1);
      const ok = search(i + 1);
      for (const r of s) load.set(r, load.get(r)! - 1);
      if (ok) return true;
    }
    return false;
  };
  return search(0);
}

describe('assignReviewers', () => {
  it('random problems: a success has no ineligible or repeated cell, k per proposal and loads within one', () => {
    fc.assert(
      fc.property(problemArb, (problem) => {
        const result = assignReviewers(problem);
        if (!result.ok) return;
        const k = problem.reviewersPerProposal;
        const pairs = new Set(problem.fixed.map((f) => `${f.proposalId}:${f.reviewerId}`));
        for (const a of result.assignments) {
          expect(problem.eligible(a.proposalId, a.reviewerId)).toBe(true);
          expect(pairs.has(`${a.proposalId}:${a.reviewerId}`)).toBe(false);
          pairs.add(`${a.proposalId}:${a.reviewerId}`);
        }
        for (const p of problem.proposals) {
          const count = [...pairs].filter((key) => key.startsWith(`${p.id}:`)).length;
          const fixedCount = new Set(problem.fixed.filter((f) => f.proposalId === p.id).map((f) => f.reviewerId)).size;
          expect(count).toBe(Math.max(k, fixedCount));
        }
        const loads = problem.reviewers.map((r) => [...pairs].filter((key) => key.endsWith(`:${r.id}`)).length);
        expect(Math.max(...loads) - Math.min(...loads)).toBeLessThanOrEqual(1);
        problem.reviewers.forEach((r, i) => expect(result.loads.get(r.id)).toBe(loads[i]));
      }),
      { numRuns: 300 },
    );
  });

  it('random small problems: reports infeasible exactly when brute force finds no assignment', () => {
    const small = problemArb.filter((p) => p.proposals.length <= 5 && p.reviewers.length <= 4);
    fc.assert(
      fc.property(small, (problem) => {
        expect(assignReviewers(problem).ok).toBe(feasibleByBruteForce(problem));
      }),
      { numRuns: 300 },
    );
  });

  it('a proposal with fewer than k eligible reviewers: infeasible, naming that proposal and its count', () => {
    // Worked by hand in this test: 3 reviewers, k = 2; proposal 2 may only go to reviewer 11.
    const result = assignReviewers({
      proposals: [{ id: 1 }, { id: 2 }, { id: 3 }],
      reviewers: [{ id: 10 }, { id: 11 }, { id: 12 }],
      reviewersPerProposal: 2,
      fixed: [],
      eligible: (p, r) => p !== 2 || r === 11,
    });
    expect(result).toEqual({ ok: false, proposals: [{ id: 2, eligibleReviewers: 1, needed: 2 }], reviewers: [] });
  });

  it('a reviewer eligible for too few proposals to reach the balanced load: infeasible, naming the reviewer', () => {
    // Worked by hand in this test: 4 proposals × k = 1 over 2 reviewers → loads 2 and 2, but
    // reviewer 11 may take only proposal 1, so its load cannot reach 2.
    const result = assignReviewers({
      proposals: [{ id: 1 }, { id: 2 }, { id: 3 }, { id: 4 }],
      reviewers: [{ id: 10 }, { id: 11 }],
      reviewersPerProposal: 1,
      fixed: [],
      eligible: (p, r) => r === 10 || p === 1,
    });
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.reviewers).toEqual([{ id: 11, problem: 'under', load: 1, lowest: 2, highest: 2 }]);
  });

  it('fixed pairs above the balanced load: infeasible with the reviewer named "over"', () => {
    // Worked by hand in this test: 2 proposals, k = 1, 2 reviewers; both proposals fixed on 10 → total 2, loads must be 1 and 1.
    const result = assignReviewers({
      proposals: [{ id: 1 }, { id: 2 }],
      reviewers: [{ id: 10 }, { id: 11 }],
      reviewersPerProposal: 1,
      fixed: [
        { proposalId: 1, reviewerId: 10 },
        { proposalId: 2, reviewerId: 10 },
      ],
      eligible: () => true,
    });
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.reviewers).toEqual([{ id: 10, problem: 'over', load: 2, lowest: 1, highest: 1 }]);
  });

  it('keeps fixed pairs and tops up: a proposal with one fixed reviewer gets k − 1 new ones', () => {
    const result = assignReviewers({
      proposals: [{ id: 1 }, { id: 2 }],
      reviewers: [{ id: 10 }, { id: 11 }, { id: 12 }],
      reviewersPerProposal: 2,
      fixed: [{ proposalId: 1, reviewerId: 12 }],
      eligible: () => true,
    });
    expect(result.ok).toBe(true);
    if (result.ok) {
      expect(result.assignments.filter((a) => a.proposalId === 1)).toHaveLength(1);
      expect(result.assignments.filter((a) => a.proposalId === 2)).toHaveLength(2);
      expect(result.assignments.some((a) => a.proposalId === 1 && a.reviewerId === 12)).toBe(false);
    }
  });

  it('prefers reviewers whose expertise matches when the loads allow it', () => {
    // Worked by hand in this test: k = 1, 2 proposals, 2 reviewers, each an expert of one → the
    // balanced answer that gives both proposals their expert exists, and is found.
    const result = assignReviewers({
      proposals: [{ id: 1 }, { id: 2 }],
      reviewers: [{ id: 10 }, { id: 11 }],
      reviewersPerProposal: 1,
      fixed: [],
      eligible: () => true,
      prefers: (p, r) => (p === 1 && r === 11) || (p === 2 && r === 10),
    });
    expect(result.ok && result.assignments.map((a) => [a.proposalId, a.reviewerId, a.expertiseMatch])).toEqual([
      [1, 11, true],
      [2, 10, true],
    ]);
  });

  it('a large panel (2000 proposals, 60 reviewers, k = 3, 10 % ineligible) is solved within the constraints', () => {
    const P = 2000;
    const R = 60;
    const blocked = (p: number, r: number) => (p * 7919 + r * 104729) % 10 === 0;
    const result = assignReviewers({
      proposals: Array.from({ length: P }, (_, i) => ({ id: i + 1 })),
      reviewers: Array.from({ length: R }, (_, i) => ({ id: 10_001 + i })),
      reviewersPerProposal: 3,
      fixed: [],
      eligible: (p, r) => !blocked(p, r),
      prefers: (p, r) => (p + r) % 5 === 0,
    });
    expect(result.ok).toBe(true);
    if (result.ok) {
      expect(result.assignments).toHaveLength(6000);
      expect(result.assignments.every((a) => !blocked(a.proposalId, a.reviewerId))).toBe(true);
      const loads = [...result.loads.values()];
      expect(Math.min(...loads)).toBe(100);
      expect(Math.max(...loads)).toBe(100);
    }
  });
});

describe('ineligibleReason', () => {
  const reviewer = { id: 7, email: 'rev@example.test', affiliation: '  Northern   Test Station ' };
  it('a team member (invited by e-mail only) is ineligible as team member', () => {
    expect(
      ineligibleReason({
        reviewer,
        team: [{ accountId: null, email: 'REV@example.test', active: false, affiliation: null }],
        conflicted: false,
      }),
    ).toBe('team_member');
  });
  it('a shared affiliation with an active member counts, case- and space-insensitively; an invited one does not', () => {
    const member = { accountId: 8, email: 'x@example.test', affiliation: 'northern test station' };
    expect(ineligibleReason({ reviewer, team: [{ ...member, active: true }], conflicted: false })).toBe('same_affiliation');
    expect(ineligibleReason({ reviewer, team: [{ ...member, active: false }], conflicted: false })).toBeNull();
  });
  it('empty affiliations never match; a conflict is reported', () => {
    const r = { ...reviewer, affiliation: '  ' };
    expect(
      ineligibleReason({
        reviewer: r,
        team: [{ accountId: 8, email: 'x@example.test', active: true, affiliation: '' }],
        conflicted: false,
      }),
    ).toBeNull();
    expect(ineligibleReason({ reviewer: r, team: [], conflicted: true })).toBe('conflict');
    expect(normalizeAffiliation(' A  b ')).toBe('a b');
  });
  it('expertiseMatches compares names case-insensitively; no category never matches', () => {
    expect(expertiseMatches('Open clusters', ['open clusters'])).toBe(true);
    expect(expertiseMatches(null, ['open clusters'])).toBe(false);
  });
  it('expertiseMatcher answers as expertiseMatches for every category (worked by hand in this test)', () => {
    const expertise = [' Open Clusters', 'methods ', '  '];
    const matches = expertiseMatcher(expertise);
    for (const category of ['open clusters', 'OPEN CLUSTERS  ', 'Methods', 'Field stars', '', '   ', null]) {
      expect(matches(category)).toBe(expertiseMatches(category, expertise));
    }
    expect(matches('methods')).toBe(true);
    expect(matches('Field stars')).toBe(false);
    expect(expertiseMatcher([])('Methods')).toBe(false);
  });
});
