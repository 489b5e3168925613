/** The roles a person may hold; one person may hold several. Chairing is per panel, not a role. */
export const ROLES = ['proposer', 'reviewer', 'facility_manager', 'billing_contact', 'administrator'] as const;
export type Role = (typeof ROLES)[number];

/** Labels shown in the interface. */
export const ROLE_LABELS: Record<Role, string> = {
  proposer: 'Proposer',
  reviewer: 'Reviewer',
  facility_manager: 'Facility manager',
  billing_contact: 'Billing contact',
  administrator: 'Administrator',
};

/** True when the user holds at least one of the roles. */
export function hasAnyRole(user: { roles: readonly Role[] } | null | undefined, ...roles: Role[]): boolean {
  return !!user && roles.some((r) => user.roles.includes(r));
}
