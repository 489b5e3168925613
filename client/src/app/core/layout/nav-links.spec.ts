import { visibleNavLinks } from './nav-links';

describe('visibleNavLinks', () => {
  const labels = (roles: Parameters<typeof visibleNavLinks>[0]) => visibleNavLinks(roles).map((link) => link.label);

  it('signed out: nothing', () => {
    expect(labels(null)).toEqual([]);
  });

  it('any signed-in person: Home and Network', () => {
    expect(labels({ roles: ['reviewer'] })).toEqual(['Home', 'Network']);
    expect(labels({ roles: [] })).toEqual(['Home', 'Network']);
  });

  it('administrator: also Accounts', () => {
    expect(labels({ roles: ['proposer', 'administrator'] })).toEqual(['Home', 'Network', 'Accounts']);
  });
});
