/**
 * Test set-up of the manager's review routes: proposals written straight into the database in
 * the state a test needs (with their PI as an active team member), closed calls, reviewers
 * with affiliations and expertise. Target plans are not needed by these routes, so none are
 * computed.
 */
import type { ProposalState } from '@spincycle/shared/proposals/proposal-states';
import { Browser, createAccount, type Harness } from '../../../../../../test/support/api-harness';

let counter = 0;

/** A proposal of the cycle in the given state, its PI an active member (signed-in browser on request). */
export async function insertProposal(
  h: Harness,
  cycleId: number,
  options: { state?: ProposalState; category?: string | null; title?: string; piAffiliation?: string } = {},
) {
  const db = h.created.ctx.db;
  const pi = await createAccount(h, ['proposer']);
  if (options.piAffiliation !== undefined) await db('accounts').where({ id: pi.id }).update({ affiliation: options.piAffiliation });
  const state = options.state ?? 'submitted';
  const [{ id }] = await db('proposals')
    .insert({
      cycle_id: cycleId,
      pi_account_id: pi.id,
      title: options.title ?? `Panel test proposal ${++counter}`,
      category: options.category === undefined ? 'Open clusters' : options.category,
      state,
      submitted_at: state === 'draft' ? null : new Date(),
    })
    .returning('id');
  await db('proposal_members').insert({ proposal_id: id, account_id: pi.id, email: pi.email, role: 'pi', accepted_at: new Date() });
  return { id: id as number, pi, signIn: () => new Browser(h).signIn(pi.email) };
}

/** An account with the reviewer role, its affiliation and expertise set. */
export async function insertReviewer(h: Harness, options: { affiliation?: string; expertise?: string[]; displayName?: string } = {}) {
  const account = await createAccount(h, ['reviewer'], { displayName: options.displayName });
  await h.created.ctx
    .db('accounts')
    .where({ id: account.id })
    .update({ affiliation: options.affiliation ?? `Reviewer Institute ${++counter}`, expertise: options.expertise ?? [] });
  return account;
}

/** Closes the cycle's call an hour ago; sets the review mode and deadline. */
export async function closeCall(
  h: Harness,
  cycleId: number,
  options: { mode?: 'panel' | 'distributed'; reviewDeadline?: Date | null; k?: number; anonymous?: boolean } = {},
): Promise<void> {
  const now = Date.now();
  await h.created.ctx
    .db('cycles')
    .where({ id: cycleId })
    .update({
      call_opens_at: new Date(now - 3 * 86400_000),
      call_closes_at: new Date(now - 3600_000),
      review_mode: options.mode ?? 'panel',
      reviewers_per_proposal: options.k ?? 2,
      anonymous_review: options.anonymous ?? false,
      review_deadline: options.reviewDeadline === undefined ? new Date(now + 14 * 86400_000) : options.reviewDeadline,
    });
}

/** Writes a grade on an assignment (as the reviewer would). */
export async function gradeAssignment(h: Harness, proposalId: number, reviewerId: number, grade = 7.5): Promise<void> {
  await h.created.ctx.db('review_assignments').where({ proposal_id: proposalId, reviewer_account_id: reviewerId }).update({ grade });
}
