/**
 * Test set-up of the reviewer's side: submitted proposals with targets and computed plans, a
 * cycle whose call has closed, and assignments and conflicts written straight into the
 * database (the manager's assignment routes belong to the panels part and are not used here).
 */
import type { Harness } from '../../../../../../test/support/api-harness';
import { makeReady, proposerWithDraft, target } from '../../../../../../test/api/support/proposal-kit';

/** A submitted proposal with its PI. */
export async function submittedProposal(h: Harness, cycleId: number, nodeIds: number[], title = 'Test proposal') {
  const made = await proposerWithDraft(h, cycleId, title);
  await makeReady(h, made.browser, made.proposal.id, nodeIds, [target(), target({ colour: 2.0, magnitude: 14 })]);
  const res = await made.browser.post(`/api/proposals/${made.proposal.id}/submit`);
  if (res.status !== 200) throw new Error(`submit failed: ${res.status} ${JSON.stringify(res.body)}`);
  return { ...made, id: made.proposal.id };
}

/** Closes the cycle's call (an hour ago) and sets its review settings. */
export async function closeCall(
  h: Harness,
  cycleId: number,
  options: { anonymous?: boolean; reviewDeadline?: Date | null } = {},
): Promise<void> {
  const now = Date.now();
  await h.created.ctx
    .db('cycles')
    .where({ id: cycleId })
    .update({
      call_opens_at: new Date(now - 3 * 86400_000),
      call_closes_at: new Date(now - 3600_000),
      anonymous_review: options.anonymous ?? false,
      review_deadline: options.reviewDeadline === undefined ? new Date(now + 14 * 86400_000) : options.reviewDeadline,
    });
}

/** Assigns the reviewer to the proposal (as the manager would). */
export async function assign(h: Harness, proposalId: number, reviewerId: number, review: { grade?: number | null } = {}): Promise<number> {
  const [row] = await h.created.ctx
    .db('review_assignments')
    .insert({ proposal_id: proposalId, reviewer_account_id: reviewerId, source: 'manual', grade: review.grade ?? null })
    .returning('id');
  return row.id;
}
