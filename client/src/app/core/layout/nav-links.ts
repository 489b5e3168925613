import { hasAnyRole, type Role } from '@spincycle/shared/accounts/roles';

/** One entry of the main navigation. */
export interface NavLink {
  path: string;
  label: string;
  /** A Material Symbols ligature. */
  icon: string;
  /** Shown only to holders of one of these roles; absent = every signed-in person. */
  roles?: Role[];
  /** Active only on this exact URL (for the home link). */
  exact?: boolean;
}

/** The pages that exist so far, in the order they appear in the sidenav. */
export const NAV_LINKS: readonly NavLink[] = [
  { path: '/', label: 'Home', icon: 'home', exact: true },
  { path: '/proposals', label: 'Proposals', icon: 'description', roles: ['proposer'] },
  { path: '/review/my', label: 'My reviews', icon: 'rate_review', roles: ['reviewer'] },
  { path: '/fees', label: 'Fees', icon: 'receipt_long', roles: ['billing_contact', 'proposer'] },
  { path: '/planner', label: 'Target planner', icon: 'query_stats' },
  { path: '/network', label: 'Network', icon: 'hub' },
  { path: '/methods', label: 'Methods', icon: 'menu_book' },
  { path: '/cycles', label: 'Cycles', icon: 'event_repeat', roles: ['facility_manager'] },
  { path: '/review/manage', label: 'Review', icon: 'groups', roles: ['facility_manager'] },
  { path: '/awards', label: 'Awards', icon: 'workspace_premium', roles: ['facility_manager'] },
  { path: '/night-plans', label: 'Night plans', icon: 'bedtime', roles: ['facility_manager'] },
  { path: '/fees/manage', label: 'Fees', icon: 'payments', roles: ['facility_manager'] },
  { path: '/admin/accounts', label: 'Accounts', icon: 'manage_accounts', roles: ['administrator'] },
  { path: '/admin/outgoing-mail', label: 'Outgoing mail', icon: 'outgoing_mail', roles: ['administrator'] },
];

/** The links a person with these roles may follow. */
export function visibleNavLinks(user: { roles: readonly Role[] } | null): NavLink[] {
  if (!user) return [];
  return NAV_LINKS.filter((link) => !link.roles || hasAnyRole(user, ...link.roles));
}
