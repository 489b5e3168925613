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

  it('billing contact: the card links to Fees (its invoices) with no "not yet" note; the reviewer links to My reviews', async () => {
    const host = await render(['reviewer', 'billing_contact']);
    const billing = host.querySelector('[data-role=billing_contact]')!;
    expect(billing.querySelector('[data-testid=upcoming]')).toBeNull();
    expect(billing.textContent).toContain('payment by card');
    expect(billing.textContent).not.toContain('Not in Spincycle yet');
    const fees = Array.from(billing.querySelectorAll('a')).find((a) => a.textContent?.trim() === 'Fees');
    expect(fees?.getAttribute('href')).toBe('/fees');
    const hrefs = Array.from(host.querySelectorAll('a')).map((a) => a.getAttribute('href'));
    expect(hrefs.sort()).toEqual(['/fees', '/network', '/network', '/planner', '/review/my']);
  });

  it('no role shows a "not yet" note any more', async () => {
    const host = await render(['proposer', 'reviewer', 'facility_manager', 'billing_contact', 'administrator']);
    expect(host.querySelectorAll('mat-card')).toHaveLength(5);
    expect(host.querySelectorAll('[data-testid=upcoming]')).toHaveLength(0);
  });
});
