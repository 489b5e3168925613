import type { Role } from '@spincycle/shared/accounts/roles';

/** A page a role card links to. */
export interface RoleLink {
  label: string;
  path: string;
}

/** What each role does in Spincycle and which existing pages serve it. */
export interface RoleGuide {
  summary: string;
  links: RoleLink[];
}

const NETWORK: RoleLink = { label: 'Network', path: '/network' };
const PLANNER: RoleLink = { label: 'Target planner', path: '/planner' };
const PROPOSALS: RoleLink = { label: 'Proposals', path: '/proposals' };
const CYCLES: RoleLink = { label: 'Cycles', path: '/cycles' };

/** Links only to pages that exist; the review, award and billing pages come with their own features. */
export const ROLE_GUIDE: Record<Role, RoleGuide> = {
  proposer: {
    summary:
      'Write a proposal for an open cycle, let Spincycle work out each target plan (period, amplitude, cadence, visits, node-hours and sky window), submit it before the call closes, then follow your program.',
    links: [PROPOSALS, PLANNER, NETWORK],
  },
  reviewer: {
    summary:
      'Declare conflicts, grade the proposals assigned to your panel from 0.0 to 10.0 and comment on them; a panel chair also agrees the standing.',
    links: [PLANNER, NETWORK],
  },
  facility_manager: {
    summary:
      'Keep nodes and sites up to date, open cycles with node-hours per node, form panels, decide awards against capacity and turn awards into night plans.',
    links: [CYCLES, PLANNER, NETWORK],
  },
  billing_contact: {
    summary: 'Receive the invoices for awarded node-hours, pay them by card and download the receipts.',
    links: [NETWORK],
  },
  administrator: {
    summary: 'Manage accounts: give and take away roles, and disable accounts that should no longer sign in.',
    links: [{ label: 'Accounts', path: '/admin/accounts' }, NETWORK],
  },
};
