/**
 * Reviewer assignment: who may review a proposal (eligibility) and the automatic assignment of
 * k reviewers per proposal among a panel's members. Pure functions, no I/O: the server reads
 * the rows, calls these, and writes the result.
 */

/** Why a reviewer may not review a proposal. */
export type IneligibleReason = 'team_member' | 'conflict' | 'same_affiliation';

/** Plain words for each reason (tooltips, error messages). */
export const INELIGIBLE_REASON_LABELS: Record<IneligibleReason, string> = {
  team_member: 'Member of the proposing team',
  conflict: 'Declared a conflict',
  same_affiliation: 'Same affiliation as a team member',
};

/** Affiliations compare case- and whitespace-insensitively; an empty one never matches. */
export function normalizeAffiliation(affiliation: string | null | undefined): string {
  return (affiliation ?? '').toLowerCase().replace(/\s+/g, ' ').trim();
}

export interface EligibilityInput {
  reviewer: { id: number; email: string; affiliation: string | null };
  /** Every team member row of the proposal, active or invited. */
  team: { accountId: number | null; email: string; active: boolean; affiliation: string | null }[];
  /** Whether the reviewer declared a conflict with the proposal. */
  conflicted: boolean;
}

/**
 * The shared rule (review parts 1–3): a reviewer is ineligible when on the team (active, or
 * invited as that account or e-mail), when conflicted, or when sharing an affiliation with an
 * active team member. Returns the first reason in that order, or null when eligible.
 */
export function ineligibleReason(input: EligibilityInput): IneligibleReason | null {
  const email = input.reviewer.email.toLowerCase();
  if (input.team.some((m) => m.accountId === input.reviewer.id || m.email.toLowerCase() === email)) return 'team_member';
  if (input.conflicted) return 'conflict';
  const mine = normalizeAffiliation(input.reviewer.affiliation);
  if (mine && input.team.some((m) => m.active && normalizeAffiliation(m.affiliation) === mine)) return 'same_affiliation';
  return null;
}

/** One proposal to be given reviewers. */
export interface AssignmentProposal {
  id: number;
}

/** One reviewer who may be given proposals. */
export interface AssignmentReviewer {
  id: number;
}

/** The form in which a category and an expertise entry compare (exact name, case-insensitive). */
export function normalizeCategory(name: string): string {
  return name.trim().toLowerCase();
}

/** Whether a reviewer's declared expertise contains the proposal's category (exact name, case-insensitive). */
export function expertiseMatches(category: string | null, expertise: readonly string[]): boolean {
  if (!category) return false;
  const c = normalizeCategory(category);
  return expertise.some((e) => normalizeCategory(e) === c);
}

/**
 * {@link expertiseMatches} for many proposals against one reviewer: the reviewer's expertise
 * normalized once. `matches(category)` answers as `expertiseMatches(category, expertise)` does.
 */
export function expertiseMatcher(expertise: readonly string[]): (category: string | null) => boolean {
  const names = new Set(expertise.map(normalizeCategory));
  return (category) => !!category && names.has(normalizeCategory(category));
}

export interface AssignmentProblem {
  proposals: readonly AssignmentProposal[];
  reviewers: readonly AssignmentReviewer[];
  /** Reviewers each proposal must have (k ≥ 1). */
  reviewersPerProposal: number;
  /**
   * Assignments that stay as they are (manual ones, graded ones). They count towards each
   * proposal's k and, for reviewers in `reviewers`, towards their load. Pairs naming a reviewer
   * outside `reviewers` count towards the proposal only; pairs naming a proposal outside
   * `proposals` count towards the reviewer's load only (its other proposals in the panel).
   */
  fixed: readonly { proposalId: number; reviewerId: number }[];
  /** Whether the reviewer may review the proposal (the eligibility rule). */
  eligible: (proposalId: number, reviewerId: number) => boolean;
  /** Whether the pair is preferred (the reviewer's expertise contains the proposal's category). */
  prefers?: (proposalId: number, reviewerId: number) => boolean;
}

export interface AssignmentPair {
  proposalId: number;
  reviewerId: number;
  /** Whether the pair is a preferred one (expertise contains the category). */
  expertiseMatch: boolean;
}

export type AssignmentResult =
  | {
      ok: true;
      /** The new pairs (never one of `fixed`). */
      assignments: AssignmentPair[];
      /** Each reviewer's load afterwards (fixed + new), by reviewer id. */
      loads: Map<number, number>;
    }
  | {
      ok: false;
      /** Proposals that cannot get k eligible reviewers (with the balanced loads), with how many they could get. */
      proposals: { id: number; eligibleReviewers: number; needed: number }[];
      /** Reviewers whose load cannot be balanced: `over` by the fixed assignments, `under` for lack of eligible proposals. */
      reviewers: { id: number; problem: 'over' | 'under'; load: number; lowest: number; highest: number }[];
    };

/**
 * Assigns reviewers so that, together with the fixed pairs:
 * 1. every proposal has at least k reviewers (exactly k unless the fixed pairs already exceed k);
 * 2. no pair is ineligible and no pair repeats a fixed one;
 * 3. the loads of all reviewers (fixed + new) differ by at most one: with T the total load and
 *    R the number of reviewers, each load is ⌊T/R⌋ or ⌈T/R⌉;
 * 4. among the assignments meeting 1–3, preferred pairs (`prefers`: the reviewer's expertise
 *    contains the proposal's category) are favoured (a preference, not a guarantee: a greedy first choice followed by
 *    single moves and pairwise exchanges that never break 1–3).
 * When 1–3 cannot all hold, nothing is assigned and the result names the proposals that cannot
 * get k eligible reviewers and the reviewers whose load cannot be balanced.
 *
 * Method: a bipartite flow with lower and upper bounds on the reviewers' loads (⌊T/R⌋..⌈T/R⌉),
 * solved in two phases by augmenting paths (Ford–Fulkerson from a greedy start): first up to the
 * lower bounds, then up to the upper bounds. Augmenting paths never lower the flow into the
 * sink, so the lower bounds reached in phase 1 hold afterwards; phase 1 reaches every lower
 * bound and phase 2 every proposal's need exactly when a bounded flow exists (max-flow
 * min-cut), so the answer "infeasible" is exact. Polynomial: O(F·E) for F units of flow and E
 * eligible pairs in the worst case; the greedy start leaves few units to augment in practice.
 */
export function assignReviewers(problem: AssignmentProblem): AssignmentResult {
  const k = problem.reviewersPerProposal;
  const reviewers = [...problem.reviewers].sort((a, b) => a.id - b.id);
  const proposals = [...problem.proposals].sort((a, b) => a.id - b.id);
  const rIndex = new Map(reviewers.map((r, i) => [r.id, i]));
  const pIndex = new Map(proposals.map((p, i) => [p.id, i]));
  const R = reviewers.length;
  const P = proposals.length;

  const fixedLoad = new Array<number>(R).fill(0);
  const fixedCount = new Array<number>(P).fill(0);
  const fixedSets: Set<number>[] = proposals.map(() => new Set<number>());
  const seenFixed = new Set<string>();
  for (const f of problem.fixed) {
    const key = `${f.proposalId}:${f.reviewerId}`;
    if (seenFixed.has(key)) continue;
    seenFixed.add(key);
    const ri = rIndex.get(f.reviewerId);
    const pi = pIndex.get(f.proposalId);
    if (ri !== undefined) fixedLoad[ri]++;
    if (pi !== undefined) {
      fixedCount[pi]++;
      fixedSets[pi].add(f.reviewerId);
    }
  }
  const need = proposals.map((_, i) => Math.max(0, k - fixedCount[i]));

  // Candidates: eligible reviewers not already fixed on the proposal.
  const candidates: number[][] = proposals.map((p, pi) =>
    reviewers.flatMap((r, ri) => (!fixedSets[pi].has(r.id) && problem.eligible(p.id, r.id) ? [ri] : [])),
  );
  // Preferred pairs among the candidates, asked once each.
  const prefers = problem.prefers;
  const preferred: Set<number>[] = proposals.map((p, pi) =>
    prefers ? new Set(candidates[pi].filter((ri) => prefers(p.id, reviewers[ri].id))) : new Set<number>(),
  );
  const matches = (pi: number, ri: number) => preferred[pi].has(ri);

  const short = proposals.flatMap((p, pi) =>
    candidates[pi].length < need[pi] ? [{ id: p.id, eligibleReviewers: fixedCount[pi] + candidates[pi].length, needed: k }] : [],
  );
  const totalNeed = need.reduce((s, n) => s + n, 0);
  const total = fixedLoad.reduce((s, n) => s + n, 0) + totalNeed;
  const lowest = R ? Math.floor(total / R) : 0;
  const highest = R ? Math.ceil(total / R) : 0;
  const over = reviewers.flatMap((r, ri) =>
    fixedLoad[ri] > highest ? [{ id: r.id, problem: 'over' as const, load: fixedLoad[ri], lowest, highest }] : [],
  );
  if (short.length || over.length) return { ok: false, proposals: short, reviewers: over };
  if (totalNeed === 0) {
    return { ok: true, assignments: [], loads: new Map(reviewers.map((r, ri) => [r.id, fixedLoad[ri]])) };
  }

  // The flow: assigned[pi] holds the new reviewers of proposal pi; flow[ri] the new load of ri.
  const assigned: Set<number>[] = proposals.map(() => new Set<number>());
  const byReviewer: Set<number>[] = reviewers.map(() => new Set<number>());
  const flow = new Array<number>(R).fill(0);
  const lower = reviewers.map((_, ri) => Math.max(0, lowest - fixedLoad[ri]));
  const upper = reviewers.map((_, ri) => highest - fixedLoad[ri]);
  const add = (pi: number, ri: number) => {
    assigned[pi].add(ri);
    byReviewer[ri].add(pi);
    flow[ri]++;
  };
  const remove = (pi: number, ri: number) => {
    assigned[pi].delete(ri);
    byReviewer[ri].delete(pi);
    flow[ri]--;
  };

  // Proposals with the fewest candidates first: they have the least room.
  const order = proposals.map((_, i) => i).sort((a, b) => candidates[a].length - need[a] - (candidates[b].length - need[b]) || a - b);

  /** Greedy fill up to `cap`: expertise first, then the least-loaded reviewer. */
  const greedy = (cap: number[]) => {
    for (const pi of order) {
      while (assigned[pi].size < need[pi]) {
        let best = -1;
        for (const ri of candidates[pi]) {
          if (assigned[pi].has(ri) || flow[ri] >= cap[ri]) continue;
          if (best < 0) {
            best = ri;
            continue;
          }
          const m = Number(matches(pi, ri)) - Number(matches(pi, best));
          const room = cap[ri] - flow[ri] - (cap[best] - flow[best]);
          if (m > 0 || (m === 0 && room > 0)) best = ri;
        }
        if (best < 0) break;
        add(pi, best);
      }
    }
  };

  /**
   * One augmenting path from any proposal short of its need to a reviewer below `cap`: a
   * breadth-first search over reviewers, stepping from a reviewer to another through a proposal
   * the first holds and the second may take instead. Returns false when none exists.
   */
  const augment = (cap: number[]): boolean => {
    // parent[ri] = [proposal through which ri was reached, reviewer before it (−1: a deficit proposal)].
    const parent = new Array<[number, number] | null>(R).fill(null);
    const queue: number[] = [];
    for (const pi of order) {
      if (assigned[pi].size >= need[pi]) continue;
      for (const ri of candidates[pi]) {
        if (parent[ri] || assigned[pi].has(ri)) continue;
        parent[ri] = [pi, -1];
        queue.push(ri);
      }
    }
    for (let head = 0; head < queue.length; head++) {
      const ri = queue[head];
      if (flow[ri] < cap[ri]) {
        // Walk back: each step gives proposal `pi` reviewer `cur` and takes it from `prev`.
        let cur = ri;
        for (;;) {
          const [pi, prev] = parent[cur]!;
          add(pi, cur);
          if (prev < 0) return true;
          remove(pi, prev);
          cur = prev;
        }
      }
      for (const pi of byReviewer[ri]) {
        for (const rj of candidates[pi]) {
          if (parent[rj] || assigned[pi].has(rj)) continue;
          parent[rj] = [pi, ri];
          queue.push(rj);
        }
      }
    }
    return false;
  };

  // Phase 1: reach every reviewer's lower bound.
  greedy(lower);
  while (flow.some((f, ri) => f < lower[ri]) && augment(lower));
  const under = reviewers.flatMap((r, ri) =>
    flow[ri] < lower[ri] ? [{ id: r.id, problem: 'under' as const, load: fixedLoad[ri] + flow[ri], lowest, highest }] : [],
  );
  // Phase 2: give every proposal its need within the upper bounds.
  greedy(upper);
  while (assigned.some((a, pi) => a.size < need[pi]) && augment(upper));
  const unmet = proposals.flatMap((p, pi) =>
    assigned[pi].size < need[pi] ? [{ id: p.id, eligibleReviewers: fixedCount[pi] + candidates[pi].length, needed: k }] : [],
  );
  if (under.length || unmet.length) return { ok: false, proposals: unmet, reviewers: under };

  improveExpertise(assigned, byReviewer, flow, lower, upper, candidates, matches);

  const assignments: AssignmentPair[] = [];
  proposals.forEach((p, pi) => {
    for (const ri of [...assigned[pi]].sort((a, b) => a - b)) {
      assignments.push({ proposalId: p.id, reviewerId: reviewers[ri].id, expertiseMatch: matches(pi, ri) });
    }
  });
  return { ok: true, assignments, loads: new Map(reviewers.map((r, ri) => [r.id, fixedLoad[ri] + flow[ri]])) };
}

/**
 * Raises the number of expertise matches without leaving the bounds: a non-matching pair
 * (p, r) moves to a matching reviewer r' when r can lose one and r' take one; otherwise it is
 * exchanged with a pair (q, r') when r may take q and the exchange does not cost q its match.
 */
function improveExpertise(
  assigned: Set<number>[],
  byReviewer: Set<number>[],
  flow: number[],
  lower: number[],
  upper: number[],
  candidates: number[][],
  matches: (pi: number, ri: number) => boolean,
): void {
  const candidateSets = candidates.map((c) => new Set(c));
  for (let pi = 0; pi < assigned.length; pi++) {
    for (const ri of [...assigned[pi]]) {
      if (matches(pi, ri)) continue;
      for (const rj of candidates[pi]) {
        if (assigned[pi].has(rj) || !matches(pi, rj)) continue;
        if (flow[ri] > lower[ri] && flow[rj] < upper[rj]) {
          assigned[pi].delete(ri);
          byReviewer[ri].delete(pi);
          flow[ri]--;
          assigned[pi].add(rj);
          byReviewer[rj].add(pi);
          flow[rj]++;
          break;
        }
        let swapped = false;
        for (const qi of byReviewer[rj]) {
          if (qi === pi || assigned[qi].has(ri) || !candidateSets[qi].has(ri)) continue;
          if (matches(qi, rj) && !matches(qi, ri)) continue;
          // p: ri → rj, q: rj → ri; loads unchanged.
          assigned[pi].delete(ri);
          byReviewer[ri].delete(pi);
          assigned[pi].add(rj);
          byReviewer[rj].add(pi);
          assigned[qi].delete(rj);
          byReviewer[rj].delete(qi);
          assigned[qi].add(ri);
          byReviewer[ri].add(qi);
          swapped = true;
          break;
        }
        if (swapped) break;
      }
    }
  }
}
