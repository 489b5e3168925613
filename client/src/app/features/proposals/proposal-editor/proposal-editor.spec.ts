import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { provideRouter, withComponentInputBinding } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { Clock } from '../../../core/time/clock';
import { formatLocalInstant } from '../../../ui/time/date-format';
import proposalsRoutes from '../proposals.routes';
import { testProgram as testPhotometry } from '../../photometry/testing/photometry-fixtures';
import { testProposal } from '../testing/fixtures';

const NOW = Date.parse('2027-01-10T12:00:00Z');

describe('ProposalEditor', () => {
  let harness: RouterTestingHarness;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      providers: [
        provideRouter([{ path: 'proposals', children: proposalsRoutes }], withComponentInputBinding()),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: Clock, useValue: { now: signal(NOW) } },
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    harness = await RouterTestingHarness.create();
  });

  afterEach(() => backend.verify());

  const el = () => harness.routeNativeElement as HTMLElement;
  const squash = (text: string | null | undefined) => (text ?? '').replace(/\s+/g, ' ').trim();

  it('opens on the overview tab, with a link per tab and the deadline in UTC, then local time when it differs', async () => {
    await harness.navigateByUrl('/proposals/5');
    TestBed.tick();
    backend.expectOne('/api/proposals/5').flush(testProposal());
    await harness.fixture.whenStable();
    const links = Array.from(el().querySelectorAll('nav a')) as HTMLAnchorElement[];
    expect(links.map((a) => a.textContent?.trim())).toEqual(['Overview', 'Team', 'Targets', 'Plans', 'Justification', 'Submit']);
    expect(links.map((a) => a.getAttribute('href'))).toEqual([
      '/proposals/5/overview',
      '/proposals/5/team',
      '/proposals/5/targets',
      '/proposals/5/plans',
      '/proposals/5/justification',
      '/proposals/5/submit',
    ]);
    expect(links[0].classList).toContain('mdc-tab--active');
    expect(el().querySelector('h1')?.textContent).toBe('Spin-down of the Lantern cluster');
    expect(el().textContent).toContain('Call closes in 5 days');
    expect(el().querySelector('[data-testid=closes-utc]')?.textContent).toBe('15 Jan 2027, 23:59 UTC');
    const local = formatLocalInstant('2027-01-15T23:59:00Z', 'en-US');
    expect(el().querySelector('[data-testid=closes-your-time]')?.textContent ?? '').toBe(local);
    expect(squash(el().querySelector('.deadline')?.textContent)).toBe(
      `Call closes in 5 days: 15 Jan 2027, 23:59 UTC${local && ` (your time: ${local})`}`,
    );
    expect(el().querySelector('app-proposal-overview textarea')).not.toBeNull();
    expect(el().querySelector('[data-testid=read-only-banner]')).toBeNull();
  });

  it('submitted: a banner says when, and that every tab is read-only', async () => {
    await harness.navigateByUrl('/proposals/5/overview');
    TestBed.tick();
    backend.expectOne('/api/proposals/5').flush(testProposal({ state: 'submitted', editable: false, submittedAt: '2027-01-09T16:45:00Z' }));
    await harness.fixture.whenStable();
    const banner = el().querySelector('[data-testid=read-only-banner]') as HTMLElement;
    expect(banner.textContent).toContain('Submitted on');
    expect(banner.textContent).toContain('9 Jan 2027, 16:45 UTC');
    // UTC written once, then the person's own time only when it reads differently.
    const local = formatLocalInstant('2027-01-09T16:45:00Z', 'en-US');
    expect(squash(banner.textContent)).toBe(`lock Submitted on 9 Jan 2027, 16:45 UTC${local && ` (your time: ${local})`} — read-only.`);
    expect(banner.textContent).toContain('— read-only.');
    expect((el().querySelector('app-proposal-overview textarea') as HTMLTextAreaElement).disabled).toBe(true);
  });

  it('awarded: a "Light curves" tab after the others leads to the program\'s returned photometry', async () => {
    await harness.navigateByUrl('/proposals/5/photometry');
    TestBed.tick();
    backend.expectOne('/api/proposals/5').flush(testProposal({ state: 'awarded', editable: false }));
    await new Promise((resolve) => setTimeout(resolve));
    TestBed.tick();
    backend.expectOne('/api/proposals/5/photometry').flush(testPhotometry());
    await harness.fixture.whenStable();
    const links = Array.from(el().querySelectorAll('nav a')) as HTMLAnchorElement[];
    expect(links.map((a) => a.textContent?.trim())).toEqual([
      'Overview',
      'Team',
      'Targets',
      'Plans',
      'Justification',
      'Submit',
      'Light curves',
    ]);
    expect(links[6].getAttribute('href')).toBe('/proposals/5/photometry');
    expect(links[6].classList).toContain('mdc-tab--active');
    expect(el().querySelector('[data-testid=photometry-table]')).not.toBeNull();
  });

  it('not awarded: no "Light curves" tab', async () => {
    await harness.navigateByUrl('/proposals/5/justification');
    TestBed.tick();
    backend.expectOne('/api/proposals/5').flush(testProposal({ state: 'in_review', editable: false }));
    await harness.fixture.whenStable();
    const labels = Array.from(el().querySelectorAll('nav a')).map((a) => a.textContent?.trim());
    expect(labels).not.toContain('Light curves');
  });

  it('not on the team (404): says so instead of the tabs', async () => {
    await harness.navigateByUrl('/proposals/99/overview');
    TestBed.tick();
    backend
      .expectOne('/api/proposals/99')
      .flush({ code: 'proposal_not_found', message: 'No proposal 99' }, { status: 404, statusText: 'Not Found' });
    await harness.fixture.whenStable();
    expect(el().textContent).toContain('This proposal does not exist, or you are not on its team.');
    expect(el().querySelector('nav')).toBeNull();
  });
});
