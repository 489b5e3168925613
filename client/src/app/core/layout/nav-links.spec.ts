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

  it('administrator: also Accounts', () => {
    expect(labels({ roles: ['proposer', 'administrator'] })).toEqual([
      'Home',
      'Proposals',
      'Target planner',
      'Network',
      'Methods',
      'Accounts',
    ]);
  });

  it('proposer: Proposals; facility manager: Cycles, Review, Awards and Night plans', () => {
    expect(labels({ roles: ['proposer'] })).toEqual(['Home', 'Proposals', 'Target planner', 'Network', 'Methods']);
    expect(labels({ roles: ['facility_manager'] })).toEqual([
      'Home',
      'Target planner',
      'Network',
      'Methods',
      'Cycles',
      'Review',
      'Awards',
      'Night plans',
    ]);
  });
});
