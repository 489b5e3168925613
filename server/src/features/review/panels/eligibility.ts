import type { Knex } from 'knex';
import { ineligibleReason, INELIGIBLE_REASON_LABELS, type IneligibleReason } from '@spincycle/shared/review/assignment';
import { conflictsOfProposals, teamsOfProposals } from './panel-repository';

/** Why a pair is refused, or null when the reviewer may review the proposal. */
export type Refusal = { state: 'conflict'; reason: string } | { state: 'ineligible'; reason: IneligibleReason; label: string } | null;

/** Eligibility of every pair of proposals × reviewers, from one read of the teams and conflicts. */
export interface Eligibility {
  refusal(proposalId: number, reviewerId: number): Refusal;
  eligible(proposalId: number, reviewerId: number): boolean;
}

/**
 * Reads the teams and declared conflicts of the proposals and applies the shared rule
 * (shared/src/review/assignment.ts, `ineligibleReason`): team member first, then a declared
 * conflict (with the reviewer's own words), then a shared affiliation.
 */
export async function loadEligibility(
  db: Knex,
  proposalIds: number[],
  reviewers: { id: number; email: string; affiliation: string | null }[],
): Promise<Eligibility> {
  // One after the other: `db` may be a transaction, which runs one query at a time.
  const team = await teamsOfProposals(db, proposalIds);
  const conflicts = await conflictsOfProposals(db, proposalIds);
  const teams = new Map<number, typeof team>();
  for (const m of team) teams.set(m.proposalId, [...(teams.get(m.proposalId) ?? []), m]);
  const conflictReasons = new Map(conflicts.map((c) => [`${c.proposalId}:${c.reviewerId}`, c.reason]));
  const byId = new Map(reviewers.map((r) => [r.id, r]));
  const cache = new Map<string, Refusal>();
  const refusal = (proposalId: number, reviewerId: number): Refusal => {
    const key = `${proposalId}:${reviewerId}`;
    const cached = cache.get(key);
    if (cached !== undefined) return cached;
    const reviewer = byId.get(reviewerId);
    let result: Refusal = null;
    if (reviewer) {
      const conflictReason = conflictReasons.get(key);
      const reason = ineligibleReason({ reviewer, team: teams.get(proposalId) ?? [], conflicted: conflictReason !== undefined });
      if (reason === 'conflict') result = { state: 'conflict', reason: conflictReason! };
      else if (reason) result = { state: 'ineligible', reason, label: INELIGIBLE_REASON_LABELS[reason] };
    }
    cache.set(key, result);
    return result;
  };
  return { refusal, eligible: (p, r) => refusal(p, r) === null };
}
