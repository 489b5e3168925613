import type { Knex } from 'knex';
import {
  ineligibleReason,
  INELIGIBLE_REASON_LABELS,
  type EligibilityInput,
  type IneligibleReason,
} from '@spincycle/shared/review/assignment';
import { conflictsOfProposals, teamsOfProposals } from './panel-repository';

/** Why a pair is refused, or null when the reviewer may review the proposal. */
export type Refusal = { state: 'conflict'; reason: string } | { state: 'ineligible'; reason: IneligibleReason; label: string } | null;

/** Eligibility of every pair of proposals × reviewers, from one read of the teams and conflicts. */
export interface Eligibility {
  refusal(proposalId: number, reviewerId: number): Refusal;
  eligible(proposalId: number, reviewerId: number): boolean;
}

/** One refusal object per reason (read-only, shared by every pair refused for it). */
const INELIGIBLE: Record<Exclude<IneligibleReason, 'conflict'>, Refusal> = {
  team_member: Object.freeze({ state: 'ineligible', reason: 'team_member', label: INELIGIBLE_REASON_LABELS.team_member }),
  same_affiliation: Object.freeze({ state: 'ineligible', reason: 'same_affiliation', label: INELIGIBLE_REASON_LABELS.same_affiliation }),
};

/**
 * The shared rule (shared/src/review/assignment.ts, `ineligibleReason`) for one pair: team
 * member first, then a declared conflict (with the reviewer's own words, `conflictReason`),
 * then a shared affiliation.
 */
export function refusalOf(
  reviewer: EligibilityInput['reviewer'],
  team: EligibilityInput['team'],
  conflictReason: string | undefined,
): Refusal {
  const reason = ineligibleReason({ reviewer, team, conflicted: conflictReason !== undefined });
  if (reason === 'conflict') return { state: 'conflict', reason: conflictReason! };
  return reason ? INELIGIBLE[reason] : null;
}

/** Reads the teams and declared conflicts of the proposals and applies {@link refusalOf}. */
export async function loadEligibility(
  db: Knex,
  proposalIds: number[],
  reviewers: { id: number; email: string; affiliation: string | null }[],
): Promise<Eligibility> {
  // One after the other: `db` may be a transaction, which runs one query at a time.
  const team = await teamsOfProposals(db, proposalIds);
  const conflicts = await conflictsOfProposals(db, proposalIds);
  const teams = new Map<number, typeof team>();
  for (const m of team) {
    const list = teams.get(m.proposalId);
    if (list) list.push(m);
    else teams.set(m.proposalId, [m]);
  }
  const conflictReasons = new Map(conflicts.map((c) => [`${c.proposalId}:${c.reviewerId}`, c.reason]));
  const byId = new Map(reviewers.map((r) => [r.id, r]));
  const cache = new Map<string, Refusal>();
  const refusal = (proposalId: number, reviewerId: number): Refusal => {
    const key = `${proposalId}:${reviewerId}`;
    const cached = cache.get(key);
    if (cached !== undefined) return cached;
    const reviewer = byId.get(reviewerId);
    const result = reviewer ? refusalOf(reviewer, teams.get(proposalId) ?? [], conflictReasons.get(key)) : null;
    cache.set(key, result);
    return result;
  };
  return { refusal, eligible: (p, r) => refusal(p, r) === null };
}
