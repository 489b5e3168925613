import type { TeamWarning } from '@spincycle/shared/proposals/team-warnings';

/**
 * Why: a reviewer on a proposing team cannot grade that proposal, and the facility may need to
 * change its panels; the PI should know before the person joins. Spincycle does not forbid it:
 * whether a reviewer may also propose in a cycle is for the facility's own rules.
 *
 * Reviewers are not yet assigned to the panels of a cycle, so anyone holding the reviewer role
 * counts as a reviewer of the proposal's cycle.
 */
export function reviewerConflictWarning(email: string, cycleCode: string): TeamWarning {
  return {
    code: 'reviewer_conflict',
    message:
      `${email} is a reviewer in Spincycle. On this team they would have a conflict of interest in the review of cycle ${cycleCode}: ` +
      `they could not grade this proposal, and the facility may have to change its panels. The invitation has been sent; ` +
      `whether a reviewer may also propose in the same cycle is for the facility's own rules, so check them before they join.`,
  };
}
