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
    const hrefs = (role: string) =>
      Array.from(host.querySelectorAll(`[data-role=${role}] a`)).map((a) => a.getAttribute('href'));
    expect(hrefs('administrator')).toContain('/admin/accounts');
    expect(hrefs('reviewer')).not.toContain('/admin/accounts');
  });

  it('no roles: says so instead of showing cards', async () => {
    const host = await render([]);
    expect(host.querySelectorAll('mat-card')).toHaveLength(0);
    expect(host.textContent).toContain('Your account holds no role yet.');
  });
});
