import type { ProposalMember } from './proposal-schemas';

/**
 * A caution given with a team change that went through: the PI may go ahead, and the
 * facility's own rules decide what follows. `reviewer_conflict`: the invited person is a
 * reviewer, and would have a conflict of interest in the review of the cycle.
 */
export interface TeamWarning {
  code: 'reviewer_conflict';
  message: string;
}

/** POST /api/proposals/:id/members answers the team row with the cautions that apply to it. */
export interface InvitedMember extends ProposalMember {
  warnings: TeamWarning[];
}

/** The cautions of an invitation answer (none when the server sent none). */
export function warningsOf(member: ProposalMember): TeamWarning[] {
  return (member as Partial<InvitedMember>).warnings ?? [];
}
