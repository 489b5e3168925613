/**
 * Proposal states (DESIGN.md): draft → submitted → in review → ranked → awarded / reserve /
 * not awarded. Withdrawing a submitted proposal before the call closes returns it to draft.
 */
export const PROPOSAL_STATES = ['draft', 'submitted', 'in_review', 'ranked', 'awarded', 'reserve', 'not_awarded'] as const;
export type ProposalState = (typeof PROPOSAL_STATES)[number];

export const PROPOSAL_STATE_LABELS: Record<ProposalState, string> = {
  draft: 'Draft',
  submitted: 'Submitted',
  in_review: 'In review',
  ranked: 'Ranked',
  awarded: 'Awarded',
  reserve: 'Reserve',
  not_awarded: 'Not awarded',
};

/** Only drafts can be edited. */
export const isEditableState = (state: ProposalState): boolean => state === 'draft';
