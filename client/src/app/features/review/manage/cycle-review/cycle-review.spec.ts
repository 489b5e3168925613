import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { CycleReviewProposal, Panel, ReviewSettings, TeamReviewerRow } from '@spincycle/shared/review/panels';
import CycleReview from './cycle-review';

const SETTINGS: ReviewSettings = {
  cycleId: 7,
  cycleCode: '2027A',
  cycleTitle: 'Lantern season',
  callClosesAt: '2027-01-16T00:00:00Z',
  callClosed: true,
  anonymousReview: true,
  categories: ['Open clusters'],
  reviewMode: 'panel',
  reviewersPerProposal: 3,
  reviewDeadline: '2027-02-01T12:00:00Z',
  setAsideLateTeams: false,
  hasAssignments: false,
};
const REVIEWER = { id: 21, displayName: 'Orla Brightwater', email: 'orla@example.test', affiliation: 'Hill Station', expertise: [] };
const PANELS: Panel[] = [
  { id: 5, cycleId: 7, name: 'Cool dwarfs', chairId: 21, members: [REVIEWER], proposalCount: 1, standingLocked: false, version: 2 },
];
const PROPOSALS: CycleReviewProposal[] = [
  {
    id: 11,
    title: 'Lantern cluster rotation survey',
    category: 'Open clusters',
    state: 'in_review',
    piName: 'Mara Quillfeather',
    panelId: 5,
    graded: false,
  },
  {
    id: 12,
    title: 'Spot lifetimes in young K dwarfs',
    category: null,
    state: 'submitted',
    piName: 'Rhea Tallowmere',
    panelId: null,
    graded: false,
  },
];

describe('CycleReview', () => {
  let fixture: ComponentFixture<CycleReview>;
  let backend: HttpTestingController;

  async function render(settings: ReviewSettings = SETTINGS, teamRows?: TeamReviewerRow[]): Promise<void> {
    TestBed.configureTestingModule({
      imports: [CycleReview],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(CycleReview);
    fixture.componentRef.setInput('cycleId', '7');
    TestBed.tick();
    backend.expectOne('/api/review/cycles/7/settings').flush(settings);
    backend.expectOne('/api/review/cycles/7/panels').flush(PANELS);
    backend.expectOne('/api/review/cycles/7/proposals').flush(PROPOSALS);
    backend.expectOne('/api/review/reviewers').flush([REVIEWER]);
    if (teamRows) {
      // Read once the settings say the cycle is in distributed review.
      await new Promise((resolve) => setTimeout(resolve));
      TestBed.tick();
      backend.expectOne('/api/review/cycles/7/team-reviewers').flush(teamRows);
    }
    await fixture.whenStable();
  }
  afterEach(() => backend.verify());
  const el = () => fixture.nativeElement as HTMLElement;

  it('panel review: settings filled in, the panels with their chair, a link to each matrix, the proposals with their panel', async () => {
    await render();
    expect(el().querySelector('h1')?.textContent).toContain('Review of 2027A');
    const form = el().querySelector('[data-testid=settings-form]') as HTMLElement;
    expect((form.querySelector('input[type=number]') as HTMLInputElement).value).toBe('3');
    expect((form.querySelector('input[type=date]') as HTMLInputElement).value).toBe('2027-02-01');
    expect((form.querySelector('input[type=time]') as HTMLInputElement).value).toBe('12:00');
    const panel = el().querySelector('[data-testid=panel-list] li')!;
    expect(panel.textContent).toContain('Orla Brightwater (chair)');
    expect(panel.querySelector('a')?.getAttribute('href')).toBe('/review/manage/7/panels/5');
    const rows = [...el().querySelectorAll('[data-testid=proposal-panels] tbody tr')];
    expect(rows.map((r) => r.querySelector('td')?.textContent)).toEqual([
      'Lantern cluster rotation survey',
      'Spot lifetimes in young K dwarfs',
    ]);
    expect(rows[1].textContent).toContain('—');
    // The table scrolls in its own labelled, focusable box, which says so.
    const box = el().querySelector('[data-testid=proposal-panels]')!.parentElement!;
    expect(box.classList).toContain('table-scroll');
    expect(box.getAttribute('tabindex')).toBe('0');
    expect(box.getAttribute('role')).toBe('region');
    expect(box.getAttribute('aria-label')).toBe('Proposals and their panels table');
    expect(box.querySelector(':scope > .table-scroll-hint')?.textContent).toContain('Scroll sideways for more columns');
  });

  it('saving the settings sends the deadline as a UTC instant and shows a server field error beside the date', async () => {
    await render();
    (el().querySelector('[data-testid=settings-form] button[type=submit]') as HTMLButtonElement).click();
    const req = backend.expectOne('/api/review/cycles/7/settings');
    expect(req.request.method).toBe('PUT');
    expect(req.request.body).toEqual({
      reviewMode: 'panel',
      reviewersPerProposal: 3,
      reviewDeadline: '2027-02-01T12:00:00Z',
      setAsideLateTeams: false,
    });
    req.flush(
      {
        code: 'validation_failed',
        message: 'reviewDeadline: must be after the call closes',
        fieldErrors: { reviewDeadline: ['must be after the call closes'] },
      },
      { status: 400, statusText: 'Bad Request' },
    );
    await fixture.whenStable();
    expect(el().querySelector('mat-error')?.textContent).toContain('must be after the call closes');
  });

  it('distributed review: the team reviewers with the late flag instead of panels', async () => {
    await render({ ...SETTINGS, reviewMode: 'distributed' }, [
      {
        proposalId: 11,
        title: 'Lantern cluster rotation survey',
        state: 'in_review',
        piName: 'Mara Quillfeather',
        reviewer: null,
        assigned: 0,
        graded: 0,
        late: true,
        setAside: true,
      },
    ]);
    expect(el().querySelector('[data-testid=panel-list]')).toBeNull();
    const row = el().querySelector('[data-testid=team-reviewers] tbody tr')!;
    expect(row.textContent).toContain('None named');
    expect(row.textContent).toContain('Late');
    expect(row.textContent).toContain('set aside');
    const box = el().querySelector('[data-testid=team-reviewers]')!.parentElement!;
    expect(box.classList).toContain('table-scroll');
    expect(box.getAttribute('tabindex')).toBe('0');
    expect(box.getAttribute('role')).toBe('region');
    expect(box.getAttribute('aria-label')).toBe('Team reviewers table');
    expect(box.querySelector(':scope > .table-scroll-hint')).not.toBeNull();
  });

  it('error: the message when the settings cannot be read', async () => {
    TestBed.configureTestingModule({
      imports: [CycleReview],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(CycleReview);
    fixture.componentRef.setInput('cycleId', '7');
    TestBed.tick();
    backend
      .expectOne('/api/review/cycles/7/settings')
      .flush({ code: 'cycle_not_found', message: 'No cycle 7' }, { status: 404, statusText: 'Not Found' });
    backend.expectOne('/api/review/cycles/7/panels').flush([]);
    backend.expectOne('/api/review/cycles/7/proposals').flush([]);
    backend.expectOne('/api/review/reviewers').flush([]);
    await fixture.whenStable();
    expect(el().textContent).toContain('The review of this cycle could not be loaded. No cycle 7');
  });
});
