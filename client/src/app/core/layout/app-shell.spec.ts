import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatMenuHarness } from '@angular/material/menu/testing';
import { provideRouter, Router } from '@angular/router';
import { seedSession, testUser } from '../../../testing/session';
import { AppShell } from './app-shell';

describe('AppShell', () => {
  let fixture: ComponentFixture<AppShell>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [AppShell],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
  });

  afterEach(() => backend.verify());

  async function render(): Promise<HTMLElement> {
    fixture = TestBed.createComponent(AppShell);
    loader = TestbedHarnessEnvironment.loader(fixture);
    await fixture.whenStable();
    return fixture.nativeElement as HTMLElement;
  }

  const navLabels = (host: HTMLElement) =>
    Array.from(host.querySelectorAll('nav a .mat-mdc-list-item-title')).map((title) => title.textContent?.trim());

  it('has a skip link to <main id="main"> and the product name', async () => {
    await seedSession(null);
    const host = await render();
    expect(host.querySelector('a.skip-link')?.getAttribute('href')).toBe('#main');
    expect(host.querySelector('main#main')).not.toBeNull();
    expect(host.querySelector('.brand')?.textContent).toContain('Spincycle');
  });

  it('signed out: no navigation, a Sign in link', async () => {
    await seedSession(null);
    const host = await render();
    expect(navLabels(host)).toEqual([]);
    expect(Array.from(host.querySelectorAll('a')).some((a) => a.textContent?.trim() === 'Sign in')).toBe(true);
  });

  it('reviewer: Home, My reviews, Target planner, Network and Methods only', async () => {
    await seedSession(testUser(['reviewer']));
    expect(navLabels(await render())).toEqual(['Home', 'My reviews', 'Target planner', 'Network', 'Methods']);
  });

  it('administrator: Accounts and Outgoing mail appear', async () => {
    await seedSession(testUser(['administrator']));
    expect(navLabels(await render())).toEqual(['Home', 'Target planner', 'Network', 'Methods', 'Accounts', 'Outgoing mail']);
  });

  it('facility manager: Cycles, Review, Awards, Night plans and Fees, each a link to its page', async () => {
    await seedSession(testUser(['facility_manager']));
    const host = await render();
    expect(navLabels(host)).toEqual(['Home', 'Target planner', 'Network', 'Methods', 'Cycles', 'Review', 'Awards', 'Night plans', 'Fees']);
    const fees = Array.from(host.querySelectorAll('nav a')).find((a) => a.textContent?.includes('Fees'));
    expect(fees?.getAttribute('href')).toBe('/fees/manage');
    const awards = Array.from(host.querySelectorAll('nav a')).find((a) => a.textContent?.includes('Awards'));
    expect(awards?.getAttribute('href')).toBe('/awards');
    const nightPlans = Array.from(host.querySelectorAll('nav a')).find((a) => a.textContent?.includes('Night plans'));
    expect(nightPlans?.getAttribute('href')).toBe('/night-plans');
  });

  it('the menu names the person and their roles, and Sign out posts and goes to sign-in', async () => {
    await seedSession(testUser(['proposer', 'billing_contact']));
    const navigateByUrl = jest.spyOn(TestBed.inject(Router), 'navigateByUrl').mockResolvedValue(true);
    await render();
    const menu = await loader.getHarness(MatMenuHarness);
    await menu.open();
    const panel = document.querySelector('.mat-mdc-menu-panel') as HTMLElement;
    expect(panel.textContent).toContain('Orla Venn');
    expect(panel.textContent).toContain('Proposer · Billing contact');
    await menu.clickItem({ text: /Sign out/ });
    const req = backend.expectOne('/api/auth/sign-out');
    expect(req.request.method).toBe('POST');
    req.flush(null, { status: 204, statusText: 'No Content' });
    await fixture.whenStable();
    expect(navigateByUrl).toHaveBeenCalledWith('/sign-in');
    expect(navLabels(fixture.nativeElement)).toEqual([]);
  });

  it('the theme button switches to dark and says what it will do next', async () => {
    localStorage.clear();
    await seedSession(null);
    await render();
    const button = await loader.getHarness(MatButtonHarness.with({ selector: '[aria-label="Use the dark theme"]' }));
    await button.click();
    expect(document.documentElement.classList.contains('scheme-dark')).toBe(true);
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ selector: '[aria-label="Use the light theme"]' }))).toHaveLength(1);
    localStorage.clear();
    document.documentElement.classList.remove('scheme-dark');
  });
});
