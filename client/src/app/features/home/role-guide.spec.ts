import { ROLES } from '@spincycle/shared/accounts/roles';
import { routes } from '../../app.routes';
import { ROLE_GUIDE } from './role-guide';

/** The first path segment of every top-level route that leads to a page (not the catch-all). */
const TOP_LEVEL = new Set(routes.filter((r) => r.path !== undefined && r.path !== '**').map((r) => r.path!.split('/')[0]));

describe('ROLE_GUIDE', () => {
  it('every link of every role leads to a route of the app, never to the not-found page', () => {
    for (const role of ROLES) {
      for (const link of ROLE_GUIDE[role].links) {
        expect(link.path.startsWith('/')).toBe(true);
        expect(TOP_LEVEL.has(link.path.slice(1).split('/')[0])).toBe(true);
      }
    }
  });

  it('every role has its pages now: no "not yet" note on any card', () => {
    for (const role of ROLES) expect(ROLE_GUIDE[role].upcoming).toBeUndefined();
  });

  it("the billing contact's card leads to Fees first and says when invoices come, in terms of the cycle", () => {
    expect(ROLE_GUIDE.billing_contact.links[0]).toEqual({ label: 'Fees', path: '/fees' });
    expect(ROLE_GUIDE.billing_contact.summary).toContain('payment by card');
    expect(ROLE_GUIDE.billing_contact.summary).toContain("after a cycle's awards are released");
    // No calendar promises: the cycle's own steps say when.
    expect(ROLE_GUIDE.billing_contact.summary).not.toMatch(
      /\b(20\d\d|January|February|March|April|May|June|July|August|September|October|November|December|soon|next month|next year)\b/,
    );
  });

  it("the reviewer's card leads to My reviews", () => {
    expect(ROLE_GUIDE.reviewer.links[0]).toEqual({ label: 'My reviews', path: '/review/my' });
  });

  it("the facility manager's card leads to Cycles, Review, Awards, Night plans, then Fees", () => {
    expect(ROLE_GUIDE.facility_manager.links.slice(0, 5)).toEqual([
      { label: 'Cycles', path: '/cycles' },
      { label: 'Review', path: '/review/manage' },
      { label: 'Awards', path: '/awards' },
      { label: 'Night plans', path: '/night-plans' },
      { label: 'Fees', path: '/fees/manage' },
    ]);
  });
});
