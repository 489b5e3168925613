import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { provideRouter } from '@angular/router';
import { MY_REVIEWS, reviewRow } from '../testing/review-fixtures';
import { SAVE_DEBOUNCE_MS } from '../review-saver';
import ReviewTable from './review-table';

describe('ReviewTable', () => {
  let fixture: ComponentFixture<ReviewTable>;
  let backend: HttpTestingController;

  async function render(body = MY_REVIEWS, panels: unknown[] = []): Promise<void> {
    TestBed.configureTestingModule({
      imports: [ReviewTable],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ReviewTable);
    TestBed.tick();
    backend.expectOne('/api/review/my').flush(body);
    flushCards(panels);
    await fixture.whenStable();
  }

  /** The cards above the table: "Your panels" (none unless a test gives some) and "Your expertise" (none listed). */
  function flushCards(panels: unknown[] = []): void {
    for (const req of backend.match('/api/review/me/panels')) req.flush(panels);
    for (const req of backend.match('/api/review/me/expertise')) req.flush({ expertise: [], suggestions: [] });
  }

  afterEach(() => {
    flushCards();
    backend.verify();
    jest.useRealTimers();
  });

  const el = () => fixture.nativeElement as HTMLElement;
  const gradeInputs = () => [...el().querySelectorAll<HTMLInputElement>('input.grade')];
  const stateOf = (id: number) => (el().querySelector(`[data-testid=state-${id}]`)?.textContent ?? '').trim();

  function type(input: HTMLInputElement, value: string): void {
    input.value = value;
    input.dispatchEvent(new Event('input'));
  }

  it('loading, then the rows with their assessment, grade and team only where the cycle shows it', async () => {
    TestBed.configureTestingModule({
      imports: [ReviewTable],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ReviewTable);
    TestBed.tick();
    fixture.detectChanges();
    expect(el().querySelector('mat-progress-bar')).not.toBeNull();
    backend.expectOne('/api/review/my').flush(MY_REVIEWS);
    flushCards();
    await fixture.whenStable();
    expect(el().querySelector('mat-progress-bar')).toBeNull();
    const rows = el().querySelectorAll('tr.mat-mdc-row');
    expect(rows).toHaveLength(3);
    expect(rows[0].textContent).toContain('Spin-down in an invented cluster');
    expect(rows[0].textContent).toContain('75%');
    expect(rows[0].textContent).toContain('1 at risk');
    expect(gradeInputs().map((i) => i.value)).toEqual(['', '6.5', '8.0']);
    expect(rows[2].textContent).toContain('Ilsabet Morrow-Fane, Hollowcrest Observatory');
    expect(rows[0].textContent).not.toContain('Ilsabet');
    expect(el().querySelector('[data-testid=cycle-2027A]')?.textContent).toContain('1 of 2 graded');
    // On a narrow screen the table scrolls in its own labelled, focusable box, which says so.
    const box = el().querySelector<HTMLElement>('.table-scroll')!;
    expect(box.getAttribute('tabindex')).toBe('0');
    expect(box.getAttribute('role')).toBe('region');
    expect(box.getAttribute('aria-label')).toBe('Assigned proposals table');
    expect(box.querySelector(':scope > .table-scroll-hint')?.textContent).toContain('Scroll sideways for more columns');
    expect(box.querySelector(':scope > table.reviews')).not.toBeNull();
  });

  it("lists the reviewer's panels above the table, with the way to a panel's grades for its chair at the panel stage only", async () => {
    await render({ cycles: [], reviews: [] }, [
      {
        panelId: 3,
        panelName: 'Lower Meadow',
        cycleId: 1,
        cycleCode: 'R1',
        cycleTitle: 'Round 1',
        isChair: true,
        reviewDeadline: '2026-11-01T00:00:00Z',
        panelStage: true,
        standingLockedAt: null,
        proposals: 8,
      },
      {
        panelId: 4,
        panelName: 'Upper Meadow',
        cycleId: 2,
        cycleCode: 'R2',
        cycleTitle: 'Round 2',
        isChair: false,
        reviewDeadline: '2027-01-01T00:00:00Z',
        panelStage: false,
        standingLockedAt: null,
        proposals: 6,
      },
    ]);
    fixture.detectChanges();
    const lower = el().querySelector('[data-testid=my-panel-3]')!;
    expect(lower.textContent).toContain('you chair it');
    expect(lower.querySelector('a')?.getAttribute('href')).toBe('/review/panels/3');
    // The link's icon is drawn from the icon font, not spelled out as a word beside the label.
    const icon = lower.querySelector('a mat-icon')!;
    expect(icon.classList).toContain('material-symbols-outlined');
    expect(icon.getAttribute('aria-hidden')).toBe('true');
    expect(lower.querySelector('a')?.getAttribute('href')).toBe('/review/panels/3');
    const upper = el().querySelector('[data-testid=my-panel-4]')!;
    expect(upper.textContent).toContain('Grades due');
    expect(upper.querySelector('a')).toBeNull();
  });

  it('empty and error states', async () => {
    await render({ cycles: [], reviews: [] });
    expect(el().textContent).toContain('No proposals assigned to you yet.');
    expect(el().querySelector('table')).toBeNull();
  });

  it('error: the message with a retry', async () => {
    TestBed.configureTestingModule({
      imports: [ReviewTable],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ReviewTable);
    TestBed.tick();
    backend.expectOne('/api/review/my').flush({ code: 'x', message: 'Database down.' }, { status: 503, statusText: 'Unavailable' });
    flushCards();
    await fixture.whenStable();
    expect(el().querySelector('[role=alert]')?.textContent).toContain('Your assigned proposals could not be loaded.');
  });

  it('a typed grade saves on blur with the row’s version and shows “Saved”; a refused value shows why and sends nothing', async () => {
    await render();
    const [first] = gradeInputs();
    type(first, '7.25');
    first.dispatchEvent(new Event('blur'));
    await fixture.whenStable();
    expect(stateOf(41)).toBe('Check the grade');
    expect(el().textContent).toContain('Use at most one decimal');
    backend.expectNone('/api/review/my/41/review');

    type(first, '7.2');
    first.dispatchEvent(new Event('blur'));
    const req = backend.expectOne('/api/review/my/41/review');
    expect(req.request.method).toBe('PUT');
    expect(req.request.body).toEqual({ version: 1, grade: 7.2, strengths: '', weaknesses: '', committeeNote: '' });
    await fixture.whenStable();
    expect(stateOf(41)).toBe('Saving…');
    req.flush(reviewRow({ grade: 7.2, version: 2, savedAt: '2027-01-21T10:00:00Z' }));
    await fixture.whenStable();
    expect(stateOf(41)).toBe('Saved');
    // The saved row keeps its field (not rebuilt under the person typing): same element, same text.
    expect(gradeInputs()[0]).toBe(first);
    expect(first.value).toBe('7.2');
  });

  it('saves on its own after a quiet moment while typing', async () => {
    await render();
    type(gradeInputs()[1], '9');
    backend.expectNone('/api/review/my/42/review');
    await new Promise((resolve) => setTimeout(resolve, SAVE_DEBOUNCE_MS + 50));
    backend.expectOne('/api/review/my/42/review').flush(reviewRow({ proposalId: 42, grade: 9, version: 4 }));
    await fixture.whenStable();
    expect(stateOf(42)).toBe('Saved');
  });

  it('Enter and Tab move to the next row’s grade (saving the row left)', async () => {
    await render();
    const inputs = gradeInputs();
    inputs[0].focus();
    type(inputs[0], '5');
    const enter = new KeyboardEvent('keydown', { key: 'Enter', cancelable: true });
    inputs[0].dispatchEvent(enter);
    expect(enter.defaultPrevented).toBe(true);
    expect(document.activeElement).toBe(inputs[1]);
    backend.expectOne('/api/review/my/41/review').flush(reviewRow({ grade: 5, version: 2 }));
    const tab = new KeyboardEvent('keydown', { key: 'Tab', cancelable: true });
    inputs[1].dispatchEvent(tab);
    expect(document.activeElement).toBe(inputs[2]);
  });

  it('a failed save stays visible with “Retry now”, which sends again', async () => {
    await render();
    const [first] = gradeInputs();
    type(first, '4');
    first.dispatchEvent(new Event('blur'));
    backend
      .expectOne('/api/review/my/41/review')
      .flush({ code: 'internal_error', message: 'Something went wrong.' }, { status: 500, statusText: 'Error' });
    await fixture.whenStable();
    expect(stateOf(41)).toBe('Save failed');
    const retry = [...el().querySelectorAll('button')].find((b) => b.textContent?.includes('Retry now'))!;
    retry.click();
    backend.expectOne('/api/review/my/41/review').flush(reviewRow({ grade: 4, version: 2 }));
    await fixture.whenStable();
    expect(stateOf(41)).toBe('Saved');
  });

  it('a locked row is read-only and offers no conflict declaration', async () => {
    await render();
    const inputs = gradeInputs();
    expect(inputs[2].readOnly).toBe(true);
    expect(stateOf(17)).toBe('Submitted');
    const rows = el().querySelectorAll('tr.mat-mdc-row');
    expect(rows[0].querySelector('button[aria-label^="Declare a conflict"]')).not.toBeNull();
    expect(rows[2].querySelector('button[aria-label^="Declare a conflict"]')).toBeNull();
  });

  it('filters by text and by “without a grade”', async () => {
    await render();
    const filter = el().querySelector<HTMLInputElement>('.filter input')!;
    type(filter, 'flares');
    await fixture.whenStable();
    expect(el().querySelectorAll('tr.mat-mdc-row')).toHaveLength(1);
    type(filter, '');
    (el().querySelector('mat-checkbox input') as HTMLInputElement).click();
    await fixture.whenStable();
    expect([...el().querySelectorAll('tr.mat-mdc-row')].map((r) => r.querySelector('a')?.textContent)).toEqual([
      'Spin-down in an invented cluster',
    ]);
  });

  it('declaring a conflict before opening the proposal: the reason dialog posts it and the list reloads', async () => {
    await render();
    (el().querySelector('button[aria-label="Declare a conflict with Spin-down in an invented cluster"]') as HTMLButtonElement).click();
    await TestbedHarnessEnvironment.documentRootLoader(fixture).getHarness(MatDialogHarness);
    const host = document.querySelector('app-conflict-dialog')!;
    const reason = host.querySelector('textarea')!;
    reason.value = 'I supervised the PI until last year.';
    reason.dispatchEvent(new Event('input'));
    (host.querySelector('button[type=submit]') as HTMLButtonElement).click();
    const req = backend.expectOne('/api/review/my/41/conflict');
    expect(req.request.body).toEqual({ reason: 'I supervised the PI until last year.' });
    req.flush({ proposalId: 41, declaredAt: '2027-01-21T10:00:00Z' });
    // Not whenStable: the reload it starts keeps the application busy until it is answered.
    await new Promise((resolve) => setTimeout(resolve, 50));
    TestBed.tick();
    backend.expectOne('/api/review/my').flush({ ...MY_REVIEWS, reviews: MY_REVIEWS.reviews.slice(1) });
    flushCards();
    await fixture.whenStable();
    expect(el().querySelector('[data-testid=notice]')?.textContent).toContain('Conflict declared');
    expect(el().querySelectorAll('tr.mat-mdc-row')).toHaveLength(2);
    expect(await TestbedHarnessEnvironment.documentRootLoader(fixture).getAllHarnesses(MatDialogHarness)).toHaveLength(0);
  });

  it('“Submit all” asks first, then posts the cycle and shows a refusal naming the proposals without a grade', async () => {
    await render();
    const submit = [...el().querySelectorAll('button')].find((b) => b.textContent?.includes('Submit all for 2027A'))!;
    submit.click();
    const dialog = await TestbedHarnessEnvironment.documentRootLoader(fixture).getHarness(MatDialogHarness);
    expect(await dialog.getText()).toContain('1 of your 2 proposals in 2027A have no grade yet');
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Submit all' }))).click();
    await fixture.whenStable();
    const req = backend.expectOne('/api/review/my/submit');
    expect(req.request.body).toEqual({ cycleId: 3 });
    req.flush(
      {
        code: 'grades_missing',
        message: 'Give a grade to every proposal before submitting; without a grade: #41 “Spin-down in an invented cluster”',
      },
      { status: 400, statusText: 'Bad Request' },
    );
    await fixture.whenStable();
    expect(el().querySelector('[data-testid=notice]')?.textContent).toContain('#41');
    // The locked cycle offers no submit button.
    expect([...el().querySelectorAll('button')].some((b) => b.textContent?.includes('Submit all for 2026B'))).toBe(false);
  });
});
