import type { ProposalMember } from '@spincycle/shared/proposals/proposal-schemas';

/**
 * A caution the server gives with a team change that went through (mirrors
 * server/src/features/proposals/team/review-conflict.ts): `reviewer_conflict` when the invited
 * person is a reviewer, and would have a conflict of interest in the review of the cycle.
 */
export interface TeamWarning {
  code: 'reviewer_conflict';
  message: string;
}

/** POST /api/proposals/:id/members answers the team row with its cautions. */
export type InvitedMember = ProposalMember & { warnings?: TeamWarning[] };

/** The cautions of an invitation answer (none when the server sent none). */
export function warningsOf(member: ProposalMember): TeamWarning[] {
  return (member as InvitedMember).warnings ?? [];
}
