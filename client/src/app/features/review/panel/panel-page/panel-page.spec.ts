import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import { provideRouter } from '@angular/router';
import { PRESSURE, STANDING, STATISTICS } from '../testing/panel-fixtures';
import PanelPage from './panel-page';

describe('PanelPage', () => {
  let fixture: ComponentFixture<PanelPage>;
  let backend: HttpTestingController;

  async function render(id = '5'): Promise<HTMLElement> {
    TestBed.configureTestingModule({
      imports: [PanelPage],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        provideRouter([]),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(PanelPage);
    fixture.componentRef.setInput('panelId', id);
    fixture.detectChanges();
    return fixture.nativeElement as HTMLElement;
  }

  afterEach(() => backend.verify());

  /** Opens a tab by its label. Not the tab harness: it waits for stability, which a pending request holds off. */
  async function openTab(el: HTMLElement, label: string): Promise<void> {
    const tab = Array.from(el.querySelectorAll<HTMLElement>('[role="tab"]')).find((t) => t.textContent?.includes(label))!;
    tab.click();
    fixture.detectChanges();
    // The tab group announces the change in a microtask.
    await Promise.resolve();
    fixture.detectChanges();
    TestBed.tick();
  }

  it('loads the statistics: grades table with raw and normalised side by side, not-discussed rows greyed, CSV links', async () => {
    const el = await render();
    backend.expectOne('/api/review/panels/5/statistics').flush(STATISTICS);
    await fixture.whenStable();
    expect(el.querySelector('h1')?.textContent).toContain('Panel Lantern');
    expect(el.textContent).toContain('reviewed anonymously');
    const first = el.querySelector('[data-testid="grades-row-11"]')!;
    expect(first.textContent).toContain('8.0');
    expect(first.textContent).toContain('1.22');
    const second = el.querySelector('[data-testid="grades-row-12"]')!;
    expect(second.classList).toContain('not-discussed');
    expect(second.textContent).toContain('Discuss: grades differ');
    expect(el.querySelector('[data-testid="normalisation-explained"]')?.textContent).toContain('gets 0');
    expect(el.querySelector('[data-testid="matrix-csv"]')?.getAttribute('href')).toBe('/api/review/panels/5/matrix.csv');
    // The chair does not get the triage control.
    expect(el.textContent).not.toContain('Not discussed: lowest share');
  });

  it('grades table: scrolls in its own labelled, focusable box with a hint; the figures come before the reviewers', async () => {
    const el = await render();
    backend.expectOne('/api/review/panels/5/statistics').flush(STATISTICS);
    await fixture.whenStable();
    const box = el.querySelector<HTMLElement>('app-grades-table .table-scroll')!;
    expect(box.getAttribute('tabindex')).toBe('0');
    expect(box.getAttribute('role')).toBe('region');
    expect(box.getAttribute('aria-label')).toBe('Grades of the panel');
    expect(box.querySelector(':scope > .table-scroll-hint')?.textContent).toContain('Scroll sideways for more columns');
    expect(box.querySelector(':scope > table[data-testid="grades-table"]')).not.toBeNull();
    // First header row: the proposal, its figures and notes, then one group per reviewer.
    const headers = Array.from(box.querySelectorAll('thead tr:first-child th')).map((th) => th.textContent?.trim());
    expect(headers).toEqual([
      'Proposal',
      'Mean grade',
      'Median grade',
      'Normalised mean',
      'Spread (grade points)',
      'Notes',
      'Reviewer Ash',
      'Reviewer Birch',
    ]);
  });

  it('shows the error state when the panel is refused', async () => {
    const el = await render();
    backend
      .expectOne('/api/review/panels/5/statistics')
      .flush({ code: 'not_panel_stage', message: 'Not yet open.' }, { status: 403, statusText: 'Forbidden' });
    await fixture.whenStable();
    expect(el.querySelector('[role="alert"]')?.textContent).toContain('The panel could not be loaded. Not yet open.');
  });

  it('an address without a valid id says so without a request', async () => {
    const el = await render('abc');
    await fixture.whenStable();
    expect(el.textContent).toContain('There is no panel at this address.');
  });

  it('standing tab: loads on opening, moves with a required reason, posts the move', async () => {
    const el = await render();
    backend.expectOne('/api/review/panels/5/statistics').flush(STATISTICS);
    await fixture.whenStable();
    await openTab(el, 'Standing');
    backend.expectOne('/api/review/panels/5/standing').flush(STANDING);
    await fixture.whenStable();
    expect(el.querySelector('[data-testid="standing-moves"]')?.textContent).toContain('Weaker plan');

    const down = el.querySelector<HTMLButtonElement>('[aria-label="Move Spin-down of an invented cluster down from position 1"]')!;
    down.click();
    await fixture.whenStable();
    const overlay = document.querySelector('app-move-dialog')!;
    const submit = () => Array.from(overlay.querySelectorAll('button')).find((b) => b.textContent?.trim() === 'Move')!;
    expect(submit().disabled).toBe(true); // no reason yet
    const reason = overlay.querySelector('textarea')!;
    reason.value = 'Stronger plan after discussion';
    reason.dispatchEvent(new Event('input'));
    await fixture.whenStable();
    expect(submit().disabled).toBe(false);
    submit().click();
    await fixture.whenStable();
    const req = backend.expectOne('/api/review/panels/5/standing/moves');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({ proposalId: 11, toPosition: 2, reason: 'Stronger plan after discussion' });
    req.flush({ ...STANDING, entries: [...STANDING.entries].reverse().map((e, i) => ({ ...e, position: i + 1 })) });
    await fixture.whenStable();
    expect(el.textContent).toContain('moved from position 1 to 2');
    expect(document.querySelector('app-move-dialog')).toBeNull();
  });

  it('lock asks for confirmation and says it is final', async () => {
    const el = await render();
    backend.expectOne('/api/review/panels/5/statistics').flush(STATISTICS);
    await fixture.whenStable();
    await openTab(el, 'Standing');
    backend.expectOne('/api/review/panels/5/standing').flush(STANDING);
    await fixture.whenStable();
    const lockButton = Array.from(el.querySelectorAll('button')).find((b) => b.textContent?.includes('Lock standing'))!;
    lockButton.click();
    await fixture.whenStable();
    const dialog = await TestbedHarnessEnvironment.documentRootLoader(fixture).getHarness(MatDialogHarness);
    expect(await dialog.getContentText()).toContain('Locking is final');
    await dialog.close();
    await fixture.whenStable();
    backend.expectNone('/api/review/panels/5/standing/lock');
  });

  it('pressure tab: loads the cycle pressure and shows the numbers beside the charts', async () => {
    const el = await render();
    backend.expectOne('/api/review/panels/5/statistics').flush(STATISTICS);
    await fixture.whenStable();
    await openTab(el, 'Pressure');
    backend.expectOne('/api/review/cycles/7/pressure').flush(PRESSURE);
    await fixture.whenStable();
    expect(el.querySelector('[data-testid="node-pressure-table"]')?.textContent).toContain('80%');
    const ra = el.querySelector('[data-testid="ra-pressure-table"]')!;
    expect(ra.querySelectorAll('tbody tr')).toHaveLength(12);
    expect(ra.textContent).toContain('0–2 h');
    expect(ra.textContent).toContain('300%');
    expect(el.querySelectorAll('canvas')).toHaveLength(2);
    // Each table scrolls in its own labelled, focusable box if it is too wide.
    for (const testId of ['node-pressure-table', 'ra-pressure-table']) {
      const box = el.querySelector(`[data-testid="${testId}"]`)!.parentElement!;
      expect(box.classList).toContain('table-scroll');
      expect(box.getAttribute('tabindex')).toBe('0');
      expect(box.getAttribute('role')).toBe('region');
      expect(box.getAttribute('aria-label')).toMatch(/pressure table$/);
      expect(box.querySelector(':scope > .table-scroll-hint')).not.toBeNull();
    }
  });
});
