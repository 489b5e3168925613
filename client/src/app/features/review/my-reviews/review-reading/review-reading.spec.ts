import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { provideRouter } from '@angular/router';
import { reviewProposal, reviewRow } from '../testing/review-fixtures';
import ReviewReading from './review-reading';

describe('ReviewReading', () => {
  let fixture: ComponentFixture<ReviewReading>;
  let backend: HttpTestingController;

  async function render(body = reviewProposal()): Promise<void> {
    TestBed.configureTestingModule({
      imports: [ReviewReading],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ReviewReading);
    fixture.componentRef.setInput('proposalId', '41');
    TestBed.tick();
    backend.expectOne('/api/review/my/41').flush(body);
    await fixture.whenStable();
  }

  afterEach(() => backend.verify());
  const el = () => fixture.nativeElement as HTMLElement;
  const text = (selector: string) => (el().querySelector(selector)?.textContent ?? '').replace(/\s+/g, ' ').trim();

  it('shows abstract, nodes, the PDF in a frame, targets with plans, and the assessment with its explanations; no team in an anonymous cycle', async () => {
    await render();
    expect(text('h1')).toBe('Spin-down in an invented cluster');
    expect(text('.abstract')).toBe('We measure rotation periods of invented stars.');
    expect(text('.nodes')).toContain('N1');
    expect(el().querySelector('iframe')?.getAttribute('src')).toBe('/api/review/my/41/justification');
    expect(el().querySelector('iframe')?.getAttribute('title')).toBe('Scientific justification (PDF)');
    // Worked example of the fixture: Star A feasible on N1 (12.5 h), Star B without a plan.
    const assessment = text('[data-testid=assessment]');
    expect(assessment).toContain('1 of 2 (50%)');
    expect(assessment).toContain('12.5');
    expect(assessment).toContain('Star B');
    expect(assessment).toContain('No plan could be computed: no plan could be computed from its input on any requested node');
    const cells = [...el().querySelectorAll('table.plans tbody tr')].map((tr) =>
      [...tr.querySelectorAll('th, td')].map((c) => (c.textContent ?? '').trim()),
    );
    expect(cells).toEqual([
      ['Star A', 'N1', 'Yes', '80', '1', '40', '12.5', '90%', 'nights_stay'],
      ['Star B', 'No plan on the requested nodes.', 'nights_stay'],
    ]);
    // The plans scroll in their own labelled, focusable box, which says so.
    const box = el().querySelector('table.plans')!.parentElement!;
    expect(box.classList).toContain('table-scroll');
    expect(box.getAttribute('tabindex')).toBe('0');
    expect(box.getAttribute('role')).toBe('region');
    expect(box.getAttribute('aria-label')).toBe('Targets and their plans table');
    expect(box.querySelector(':scope > .table-scroll-hint')?.textContent).toContain('Scroll sideways for more columns');
    expect(el().querySelector('[data-testid=team]')).toBeNull();
  });

  it('targets of one age show the period–colour chart; the sky window comes through the reviewer’s route', async () => {
    await render();
    expect(el().querySelector('[data-testid=cluster-chart]')).not.toBeNull();
    expect(text('#cluster-chart-heading')).toBe('Period against colour at 650 Myr');
    const sky = el().querySelector<HTMLButtonElement>('button[aria-label="Sky window of Star A from N1"]')!;
    sky.click();
    TestBed.tick();
    const req = backend.expectOne((r) => r.url === '/api/review/my/41/targets/1/sky');
    expect(req.request.params.get('nodeId')).toBe('5');
    req.flush({}, { status: 500, statusText: 'Server Error' });
  });

  it('shows the PI and affiliations when the cycle is not anonymous', async () => {
    await render(reviewProposal({ team: { piName: 'Ilsabet Morrow-Fane', affiliations: ['Hollowcrest Observatory'] } }));
    expect(text('[data-testid=team]')).toBe('PI: Ilsabet Morrow-Fane · Hollowcrest Observatory');
  });

  it('a grade with two decimals is refused on the spot; comments save on blur with the version read', async () => {
    await render();
    const grade = el().querySelector<HTMLInputElement>('[data-testid=reading-grade]')!;
    grade.value = '7.25';
    grade.dispatchEvent(new Event('input'));
    grade.dispatchEvent(new Event('blur'));
    await fixture.whenStable();
    expect(el().textContent).toContain('Use at most one decimal');
    backend.expectNone('/api/review/my/41/review');

    grade.value = '7.5';
    grade.dispatchEvent(new Event('input'));
    const strengths = el().querySelectorAll('textarea')[0];
    strengths.value = 'A clear cadence argument.';
    strengths.dispatchEvent(new Event('input'));
    strengths.dispatchEvent(new Event('blur'));
    const req = backend.expectOne('/api/review/my/41/review');
    expect(req.request.body).toEqual({ version: 1, grade: 7.5, strengths: 'A clear cadence argument.', weaknesses: '', committeeNote: '' });
    req.flush(reviewRow({ grade: 7.5, strengths: 'A clear cadence argument.', version: 2, savedAt: '2027-01-21T10:00:00Z' }));
    await fixture.whenStable();
    expect(text('[data-testid=reading-state]')).toBe('Saved');
  });

  it('a locked review is read-only and says why', async () => {
    await render(reviewProposal({ review: reviewRow({ grade: 8, locked: true, lockedBecause: 'deadline' }) }));
    expect(el().querySelector<HTMLInputElement>('[data-testid=reading-grade]')!.readOnly).toBe(true);
    expect(text('[data-testid=reading-state]')).toContain('The review deadline has passed');
    expect([...el().querySelectorAll('button')].some((b) => b.textContent?.includes('Declare a conflict'))).toBe(false);
  });

  it('error: a proposal that is not assigned shows the server’s message', async () => {
    TestBed.configureTestingModule({
      imports: [ReviewReading],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ReviewReading);
    fixture.componentRef.setInput('proposalId', '41');
    TestBed.tick();
    backend
      .expectOne('/api/review/my/41')
      .flush({ code: 'proposal_not_found', message: 'No proposal 41 is assigned to you' }, { status: 404, statusText: 'Not Found' });
    await fixture.whenStable();
    expect(text('[role=alert]')).toContain('No proposal 41 is assigned to you');
  });
});
