import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { AssignmentMatrix } from '@spincycle/shared/review/panels';
import PanelMatrix, { describeCell } from './panel-matrix';

const MATRIX: AssignmentMatrix = {
  panel: { id: 5, name: 'Cool dwarfs', cycleId: 7, cycleCode: '2027A', version: 3, standingLocked: false },
  reviewersPerProposal: 2,
  reviewDeadline: '2027-02-01T12:00:00Z',
  reviewers: [
    { id: 21, displayName: 'Orla Brightwater', affiliation: 'Hill Station', expertise: ['Open clusters'], chair: true, load: 1 },
    { id: 22, displayName: 'Tamsin Reedley', affiliation: 'Vale Station', expertise: [], chair: false, load: 0 },
  ],
  proposals: [
    {
      id: 11,
      title: 'Lantern cluster rotation survey',
      category: 'Open clusters',
      state: 'in_review',
      piName: 'Mara Quillfeather',
      count: 1,
      notDiscussed: false,
      cells: [
        { state: 'assigned', source: 'manual', graded: false, expertiseMatch: true },
        { state: 'ineligible', reason: 'same_affiliation', label: 'Same affiliation as a team member' },
      ],
    },
  ],
  loadRange: { lowest: 0, highest: 1 },
};

describe('PanelMatrix', () => {
  let fixture: ComponentFixture<PanelMatrix>;
  let backend: HttpTestingController;

  function render(): void {
    TestBed.configureTestingModule({
      imports: [PanelMatrix],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(PanelMatrix);
    fixture.componentRef.setInput('cycleId', '7');
    fixture.componentRef.setInput('panelId', '5');
    TestBed.tick();
  }
  afterEach(() => backend.verify());
  const el = () => fixture.nativeElement as HTMLElement;
  const checkboxes = () => [...el().querySelectorAll('[data-testid=matrix] input[type=checkbox]')] as HTMLInputElement[];

  it('the matrix: one checkbox per cell, ineligible disabled with the reason as its name, count vs k, loads in the footer', async () => {
    render();
    backend.expectOne('/api/review/panels/5/matrix').flush(MATRIX);
    await fixture.whenStable();
    expect(el().querySelector('h1')?.textContent).toContain('Reviewers of Cool dwarfs');
    const boxes = checkboxes();
    expect(boxes).toHaveLength(2);
    expect(boxes[0].checked).toBe(true);
    expect(boxes[0].disabled).toBe(false);
    expect(boxes[1].disabled).toBe(true);
    expect(boxes[1].getAttribute('aria-label')).toContain('Cannot review: Same affiliation as a team member');
    expect(el().querySelector('td.num.short')?.textContent?.trim()).toBe('1 / 2');
    expect(el().querySelector('[data-testid=load-21]')?.textContent?.trim()).toBe('1');
    expect(el().querySelector('[data-testid=load-22]')?.textContent?.trim()).toBe('0');
    // The matrix scrolls in its own labelled, focusable box, which says so.
    const box = el().querySelector('[data-testid=matrix]')!.parentElement!;
    expect(box.classList).toContain('table-scroll');
    expect(box.getAttribute('tabindex')).toBe('0');
    expect(box.getAttribute('role')).toBe('region');
    expect(box.getAttribute('aria-label')).toBe('Assignment matrix table');
    expect(box.querySelector(':scope > .table-scroll-hint')?.textContent).toContain('Scroll sideways for more reviewers');
  });

  it('unticking a cell sends the change and shows the matrix the server returns', async () => {
    render();
    backend.expectOne('/api/review/panels/5/matrix').flush(MATRIX);
    await fixture.whenStable();
    checkboxes()[0].click();
    const req = backend.expectOne('/api/review/panels/5/assignments');
    expect(req.request.method).toBe('PUT');
    expect(req.request.body).toEqual({ proposalId: 11, reviewerId: 21, assigned: false });
    const after = JSON.parse(JSON.stringify(MATRIX)) as AssignmentMatrix;
    after.proposals[0].cells[0] = { state: 'free', expertiseMatch: true };
    after.proposals[0].count = 0;
    after.reviewers[0].load = 0;
    req.flush(after);
    await fixture.whenStable();
    expect(checkboxes()[0].checked).toBe(false);
    expect(el().querySelector('[data-testid=load-21]')?.textContent?.trim()).toBe('0');
  });

  it('assign automatically: shows the result, or the server’s refusal naming the proposals', async () => {
    render();
    backend.expectOne('/api/review/panels/5/matrix').flush(MATRIX);
    await fixture.whenStable();
    (el().querySelector('[data-testid=assign-automatically]') as HTMLButtonElement).click();
    fixture.detectChanges();
    expect(el().querySelector('mat-progress-bar')).not.toBeNull();
    backend.expectOne('/api/review/panels/5/assign-automatically').flush({ added: 1, removed: 0, expertiseMatches: 1, matrix: MATRIX });
    await fixture.whenStable();
    expect(el().querySelector('[data-testid=result]')?.textContent).toContain('1 new assignment, 0 removed');

    (el().querySelector('[data-testid=assign-automatically]') as HTMLButtonElement).click();
    backend
      .expectOne('/api/review/panels/5/assign-automatically')
      .flush(
        { code: 'assignment_infeasible', message: 'No assignment meets the rules: “Lantern cluster rotation survey” (1 eligible)' },
        { status: 409, statusText: 'Conflict' },
      );
    await fixture.whenStable();
    expect(el().querySelector('[data-testid=problem]')?.textContent).toContain('Lantern cluster rotation survey');
  });

  it('empty: a panel without proposals says so', async () => {
    render();
    backend.expectOne('/api/review/panels/5/matrix').flush({ ...MATRIX, proposals: [] });
    await fixture.whenStable();
    expect(el().textContent).toContain('No proposal is in this panel yet.');
    expect(el().querySelector('[data-testid=matrix]')).toBeNull();
  });

  it('error: the message', async () => {
    render();
    backend
      .expectOne('/api/review/panels/5/matrix')
      .flush({ code: 'panel_not_found', message: 'No panel 5' }, { status: 404, statusText: 'Not Found' });
    await fixture.whenStable();
    expect(el().textContent).toContain('The assignment matrix could not be loaded. No panel 5');
  });

  it('describeCell: plain words for each state', () => {
    expect(describeCell({ state: 'assigned', source: 'automatic', graded: true, expertiseMatch: false })).toBe(
      'assigned automatically, graded (cannot be removed)',
    );
    expect(describeCell({ state: 'conflict', reason: 'Co-author' })).toBe('Conflict declared: Co-author');
  });
});
