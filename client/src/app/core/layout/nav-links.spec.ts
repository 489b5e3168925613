import { visibleNavLinks } from './nav-links';

describe('visibleNavLinks', () => {
  const labels = (roles: Parameters<typeof visibleNavLinks>[0]) => visibleNavLinks(roles).map((link) => link.label);

  it('signed out: nothing', () => {
    expect(labels(null)).toEqual([]);
  });

  it('any signed-in person: Home, Target planner, Network and Methods; a reviewer also My reviews', () => {
    expect(labels({ roles: ['reviewer'] })).toEqual(['Home', 'My reviews', 'Target planner', 'Network', 'Methods']);
    expect(labels({ roles: [] })).toEqual(['Home', 'Target planner', 'Network', 'Methods']);
  });

  it('administrator: also Accounts and Outgoing mail', () => {
    expect(labels({ roles: ['proposer', 'administrator'] })).toEqual([
      'Home',
      'Proposals',
      'Fees',
      'Target planner',
      'Network',
      'Methods',
      'Accounts',
      'Outgoing mail',
    ]);
  });

  it('proposer: Proposals and Fees; facility manager: Cycles, Review, Awards, Night plans and Fees', () => {
    expect(labels({ roles: ['proposer'] })).toEqual(['Home', 'Proposals', 'Fees', 'Target planner', 'Network', 'Methods']);
    expect(labels({ roles: ['facility_manager'] })).toEqual([
      'Home',
      'Target planner',
      'Network',
      'Methods',
      'Cycles',
      'Review',
      'Awards',
      'Night plans',
      'Fees',
    ]);
  });

  it('billing contact: Fees leads to their invoices; the facility manager’s Fees to the invoicing of a cycle', () => {
    const paths = (roles: Parameters<typeof visibleNavLinks>[0]) =>
      visibleNavLinks(roles)
        .filter((link) => link.label === 'Fees')
        .map((link) => link.path);
    expect(labels({ roles: ['billing_contact'] })).toEqual(['Home', 'Fees', 'Target planner', 'Network', 'Methods']);
    expect(paths({ roles: ['billing_contact'] })).toEqual(['/fees']);
    expect(paths({ roles: ['facility_manager'] })).toEqual(['/fees/manage']);
  });
});
