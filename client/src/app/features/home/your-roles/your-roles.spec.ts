import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { YourRoles } from './your-roles';

describe('YourRoles', () => {
  beforeEach(() => TestBed.configureTestingModule({ imports: [YourRoles], providers: [provideRouter([])] }));

  async function render(roles: string[]) {
    const fixture = TestBed.createComponent(YourRoles);
    fixture.componentRef.setInput('roles', roles);
    await fixture.whenStable();
    return fixture.nativeElement as HTMLElement;
  }

  it('one card per held role, in the fixed role order, each linking to the network', async () => {
    const host = await render(['administrator', 'proposer']);
    const cards = Array.from(host.querySelectorAll('mat-card'));
    expect(cards.map((card) => card.getAttribute('data-role'))).toEqual(['proposer', 'administrator']);
    for (const card of cards) {
      expect(Array.from(card.querySelectorAll('a')).map((a) => a.getAttribute('href'))).toContain('/network');
    }
  });

  it('accounts link only on the administrator card', async () => {
    const host = await render(['reviewer', 'administrator']);
    const hrefs = (role: string) => Array.from(host.querySelectorAll(`[data-role=${role}] a`)).map((a) => a.getAttribute('href'));
    expect(hrefs('administrator')).toContain('/admin/accounts');
    expect(hrefs('reviewer')).not.toContain('/admin/accounts');
  });

  it('no roles: says so instead of showing cards', async () => {
    const host = await render([]);
    expect(host.querySelectorAll('mat-card')).toHaveLength(0);
    expect(host.textContent).toContain('Your account holds no role yet.');
  });

  it('billing contact: says what is not there yet and when in the cycle it comes, with no link to it; the reviewer links to My reviews', async () => {
    const host = await render(['reviewer', 'billing_contact']);
    expect(host.querySelector('[data-role=reviewer] [data-testid=upcoming]')).toBeNull();
    const billing = host.querySelector('[data-role=billing_contact] [data-testid=upcoming]')!;
    expect(billing.getAttribute('role')).toBe('note');
    expect(billing.textContent).toContain('Not in Spincycle yet');
    expect(billing.textContent).toContain('Invoices for the node-hours awarded');
    expect(billing.textContent).toContain('payment by card');
    expect(billing.textContent).toContain("When: After a cycle's awards are decided.");
    // Nothing in the note is a link or a button; the cards link only to existing pages.
    expect(host.querySelectorAll('[data-testid=upcoming] a, [data-testid=upcoming] button')).toHaveLength(0);
    const hrefs = Array.from(host.querySelectorAll('a')).map((a) => a.getAttribute('href'));
    expect(hrefs.sort()).toEqual(['/network', '/network', '/planner', '/review/my']);
  });

  it('roles with their pages (proposer, administrator): no "not yet" note', async () => {
    const host = await render(['proposer', 'administrator']);
    expect(host.querySelectorAll('[data-testid=upcoming]')).toHaveLength(0);
  });
});
