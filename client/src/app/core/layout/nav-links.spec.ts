import { visibleNavLinks } from './nav-links';

describe('visibleNavLinks', () => {
  const labels = (roles: Parameters<typeof visibleNavLinks>[0]) => visibleNavLinks(roles).map((link) => link.label);

  it('signed out: nothing', () => {
    expect(labels(null)).toEqual([]);
  });

  it('any signed-in person: Home, Target planner and Network', () => {
    expect(labels({ roles: ['reviewer'] })).toEqual(['Home', 'Target planner', 'Network']);
    expect(labels({ roles: [] })).toEqual(['Home', 'Target planner', 'Network']);
  });

  it('administrator: also Accounts', () => {
    expect(labels({ roles: ['proposer', 'administrator'] })).toEqual(['Home', 'Proposals', 'Target planner', 'Network', 'Accounts']);
  });

  it('proposer: Proposals; facility manager: Cycles', () => {
    expect(labels({ roles: ['proposer'] })).toEqual(['Home', 'Proposals', 'Target planner', 'Network']);
    expect(labels({ roles: ['facility_manager'] })).toEqual(['Home', 'Target planner', 'Network', 'Cycles']);
  });
});
