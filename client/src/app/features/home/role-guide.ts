import type { Role } from '@spincycle/shared/accounts/roles';

/** A page a role card links to. */
export interface RoleLink {
  label: string;
  path: string;
}

/**
 * Work of a role that Spincycle does not do yet: what will come and when in the cycle it
 * will be needed. Shown as plain text, never as a link, until the pages exist.
 */
export interface UpcomingWork {
  what: string;
  when: string;
}

/** What each role does in Spincycle and which existing pages serve it. */
export interface RoleGuide {
  summary: string;
  /** Set while the role's own pages are still to come. */
  upcoming?: UpcomingWork;
  links: RoleLink[];
}

const NETWORK: RoleLink = { label: 'Network', path: '/network' };
const PLANNER: RoleLink = { label: 'Target planner', path: '/planner' };
const PROPOSALS: RoleLink = { label: 'Proposals', path: '/proposals' };
const CYCLES: RoleLink = { label: 'Cycles', path: '/cycles' };

/**
 * Links only to pages that exist (role-guide.spec.ts checks them against the app's routes). A
 * role whose pages are still to come would say what will come and when in the cycle, without a
 * link (`upcoming`); every role has its pages now.
 */
export const ROLE_GUIDE: Record<Role, RoleGuide> = {
  proposer: {
    summary:
      'Write a proposal for an open cycle, let Spincycle work out each target plan (period, amplitude, cadence, visits, node-hours and sky window), submit it before the call closes, then follow your program.',
    links: [PROPOSALS, PLANNER, NETWORK],
  },
  reviewer: {
    summary:
      'Review the proposals of a cycle on a panel: declare your conflicts, grade the proposals assigned to you from 0.0 to 10.0 and comment on them; a panel chair also agrees the standing.',
    links: [{ label: 'My reviews', path: '/review/my' }, PLANNER, NETWORK],
  },
  facility_manager: {
    summary:
      'Keep nodes and sites up to date, open cycles with node-hours per node, form panels, decide awards against capacity, turn awards into night plans and invoice the node-hours awarded.',
    links: [
      CYCLES,
      { label: 'Review', path: '/review/manage' },
      { label: 'Awards', path: '/awards' },
      { label: 'Night plans', path: '/night-plans' },
      { label: 'Fees', path: '/fees/manage' },
      PLANNER,
      NETWORK,
    ],
  },
  billing_contact: {
    summary:
      "Settle the fees of your teams' programs: the invoices for the node-hours awarded, at each node's published rate, payment by card and the receipts. Invoices come after a cycle's awards are released.",
    links: [{ label: 'Fees', path: '/fees' }, NETWORK],
  },
  administrator: {
    summary: 'Manage accounts: give and take away roles, and disable accounts that should no longer sign in.',
    links: [{ label: 'Accounts', path: '/admin/accounts' }, NETWORK],
  },
};
