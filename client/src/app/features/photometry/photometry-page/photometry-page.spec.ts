import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { provideRouter } from '@angular/router';
import type { ProgramPhotometry } from '@spincycle/shared/photometry/photometry';
import { ProposalStore } from '../../proposals/proposal-store';
import { PHOTOMETRY_POLL_MS } from '../photometry-api';
import { testEmptyRow, testProgram, testRow, testRun } from '../testing/photometry-fixtures';
import PhotometryPage, { photometrySortValue } from './photometry-page';

const URL = '/api/proposals/5/photometry';

describe('PhotometryPage', () => {
  let fixture: ComponentFixture<PhotometryPage>;
  let backend: HttpTestingController;
  const el = () => fixture.nativeElement as HTMLElement;
  const text = (sel: string) => el().querySelector(sel)?.textContent?.replace(/\s+/g, ' ').trim() ?? null;
  const all = (sel: string) => Array.from(el().querySelectorAll(sel)).map((e) => e.textContent?.replace(/\s+/g, ' ').trim());
  const pause = () => new Promise((resolve) => setTimeout(resolve, 5));

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [PhotometryPage],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        provideRouter([]),
        { provide: ProposalStore, useValue: { id: signal(5) } },
        { provide: PHOTOMETRY_POLL_MS, useValue: 1 },
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(PhotometryPage);
    TestBed.tick();
  });
  afterEach(() => backend.verify());

  async function show(program: ProgramPhotometry = testProgram()) {
    backend.expectOne(URL).flush(program);
    await fixture.whenStable();
  }

  it('shows the progress, the upload card and one row per target with its numbers in plain notation', async () => {
    await show();
    expect(text('[data-testid=photometry-visits]')).toBe('36 of 40');
    expect(text('[data-testid=photometry-with-light-curves]')).toBe('3 of 4');
    expect(text('[data-testid=photometry-analysed]')).toBe('3 of 4');
    expect(text('[data-testid=photometry-measured]')).toBe('1 of 4');
    expect(el().querySelector('app-light-curve-upload')).not.toBeNull();
    expect(el().querySelector('[data-testid=light-curve-upload-button]')).not.toBeNull();

    const rows = el().querySelectorAll('[data-testid=photometry-table] tbody tr');
    expect(rows).toHaveLength(3);
    expect(all('[data-testid=photometry-table] tbody tr td:first-child')).toEqual(['Lantern-14', 'Lantern-22', 'Lantern-31']);
    // Measured: 8.214 ± 0.034 d, FAP 3×10⁻⁵, 4.2 mmag, 612 Myr (480–750) (fixtures).
    const measured = el().querySelector('[data-testid=photometry-row-14]')!;
    expect(measured.querySelector('[data-testid=photometry-period]')!.textContent!.trim()).toBe('8.214 ± 0.034');
    expect(measured.querySelector('[data-testid=photometry-fap]')!.textContent!.trim()).toBe('3×10⁻⁵');
    expect(measured.querySelector('[data-testid=photometry-amplitude]')!.textContent!.trim()).toBe('4.2');
    expect(measured.querySelector('[data-testid=verdict-chip]')!.textContent!.trim()).toContain('Measured');
    expect(measured.querySelector('[data-testid=photometry-age]')!.textContent!.trim()).toBe('612 Myr (480–750)');
    expect(measured.querySelector('[data-testid=photometry-alias]')!.textContent!.trim()).toBe('No');
    // Not detected: the period without an uncertainty, no age.
    const notDetected = el().querySelector('[data-testid=photometry-row-22]')!;
    expect(notDetected.querySelector('[data-testid=verdict-chip]')!.textContent).toContain('Not detected');
    expect(notDetected.querySelector('[data-testid=photometry-fap]')!.textContent!.trim()).toBe('0.41');
    expect(notDetected.querySelector('[data-testid=photometry-age]')!.textContent!.trim()).toBe('—');
    // Alias-flagged: the flag in words, FAP below the smallest shown, the cautions as hidden text.
    const alias = el().querySelector('[data-testid=photometry-row-31]')!;
    expect(alias.querySelector('[data-testid=photometry-alias]')!.textContent).toContain('Possible');
    expect(alias.querySelector('[data-testid=photometry-fap]')!.textContent!.trim()).toBe('< 10⁻¹⁰');
    expect(alias.querySelector('[data-testid=photometry-cautions] .visually-hidden')!.textContent).toBe(
      'The period may be an alias of the one-day sampling. Fast rotator: the age is a lower limit.',
    );
    expect(alias.querySelector('[data-testid=verdict-chip]')!.textContent).toContain('Tentative');
  });

  it('links each target to its page and the export to the CSV download', async () => {
    await show();
    expect(el().querySelector('[data-testid=photometry-row-link-14]')!.getAttribute('href')).toBe('/14');
    const exportLink = el().querySelector('[data-testid=photometry-export]') as HTMLAnchorElement;
    expect(exportLink.getAttribute('href')).toBe('/api/proposals/5/photometry/export.csv');
    expect(exportLink.hasAttribute('download')).toBe(true);
    expect(exportLink.textContent).toContain('Export table (CSV)');
  });

  it('amplitudes switch to ppm, and the header says the unit', async () => {
    await show();
    expect(text('th.mat-column-amplitude')).toContain('Semi-amplitude (mmag)');
    (el().querySelectorAll('[data-testid=photometry-amplitude-unit] button')[1] as HTMLButtonElement).click();
    await fixture.whenStable();
    expect(text('th.mat-column-amplitude')).toContain('Semi-amplitude (ppm)');
    expect(text('[data-testid=photometry-row-14] [data-testid=photometry-amplitude]')).toBe('3,870');
  });

  it('sorts by a column: periods as numbers, verdicts best first, missing values last', async () => {
    const rows = [testRow(14), testRow(22, { periodDays: 12.5, verdict: 'not_detected' }), testEmptyRow()];
    expect(rows.map((r) => photometrySortValue(r, 'period'))).toEqual([8.214, 12.5, null]);
    expect(rows.map((r) => photometrySortValue(r, 'verdict'))).toEqual([0, 2, null]);
    await show(testProgram({ targets: rows }));
    (el().querySelector('th.mat-column-period .mat-sort-header-container') as HTMLElement).click();
    await fixture.whenStable();
    (el().querySelector('th.mat-column-period .mat-sort-header-container') as HTMLElement).click();
    await fixture.whenStable();
    // Descending: 12.5 then 8.214, the target without a period last.
    expect(all('[data-testid=photometry-table] tbody tr td:first-child')).toEqual(['Lantern-22', 'Lantern-14', 'Lantern-40']);
  });

  it('no light curve yet: says so, and still lists the targets awaiting one', async () => {
    await show(testProgram({ targets: [testEmptyRow()], run: null }));
    expect(text('[data-testid=photometry-empty]')).toContain('No light curve yet.');
    expect(text('[data-testid=photometry-row-40] [data-testid=verdict-chip]')).toContain('Not analysed');
    expect(el().querySelector('[data-testid=photometry-reanalyse-toggle]')).toBeNull();
  });

  it('409 no_program: an empty state saying when light curves can be uploaded, no error', async () => {
    backend.expectOne(URL).flush({ code: 'no_program', message: 'No program yet.' }, { status: 409, statusText: 'Conflict' });
    await fixture.whenStable();
    expect(el().textContent).toContain('Light curves can be uploaded once the proposal is awarded and its program starts.');
    expect(el().querySelector('[role=alert]')).toBeNull();
    expect(el().querySelector('[data-testid=photometry-table]')).toBeNull();
  });

  it('404: says the proposal is not there or not the viewer’s', async () => {
    backend.expectOne(URL).flush({ code: 'proposal_not_found', message: 'No proposal 5' }, { status: 404, statusText: 'Not Found' });
    await fixture.whenStable();
    expect(text('[role=alert]')).toContain('This proposal does not exist, or you are not on its team.');
  });

  it('a viewer who may not upload: no upload card and no "Analyse again", the table still shows', async () => {
    await show(testProgram({ canUpload: false }));
    expect(el().querySelector('app-light-curve-upload')).toBeNull();
    expect(el().querySelector('[data-testid=photometry-reanalyse-toggle]')).toBeNull();
    expect(text('[data-testid=photometry-read-only]')).toBe("The program's team uploads the light curves; you can read the results here.");
    expect(el().querySelector('[data-testid=photometry-table]')).not.toBeNull();
  });

  it('while the analysis runs: a determinate bar with the state in words, polled until done, then the table is fetched again', async () => {
    await show(testProgram({ run: testRun({ state: 'running', done: 1, total: 3, finishedAt: null }) }));
    const bar = el().querySelector('[data-testid=photometry-run-progress]')!;
    expect(bar.getAttribute('mode')).toBe('determinate');
    expect(bar.getAttribute('aria-valuenow')).toBe('33');
    expect(bar.getAttribute('aria-label')).toBe('Targets analysed: 1 of 3');
    expect(text('[data-testid=photometry-run-state]')).toBe('Measuring rotation periods: 1 of 3 targets analysed.');

    await pause();
    backend.expectOne(`${URL}/run`).flush(testRun({ state: 'running', done: 2, total: 3, finishedAt: null }));
    await fixture.whenStable();
    expect(el().querySelector('[data-testid=photometry-run-progress]')!.getAttribute('aria-valuenow')).toBe('67');

    await pause();
    backend.expectOne(`${URL}/run`).flush(testRun());
    TestBed.tick();
    backend.expectOne(URL).flush(testProgram());
    await fixture.whenStable();
    expect(el().querySelector('[data-testid=photometry-run-progress]')).toBeNull();
    expect(text('[data-testid=photometry-run-state]')).toContain('Last analysed');
  });

  it('a failed analysis: says so with the reason', async () => {
    await show(testProgram({ run: testRun({ state: 'failed', done: 1, error: 'the worker stopped' }) }));
    expect(text('[data-testid=photometry-run-failed]')).toContain('The analysis stopped after 1 of 3 targets: the worker stopped');
  });

  it('"Analyse again" posts the detrending choices and follows the analysis it queued', async () => {
    await show();
    (el().querySelector('[data-testid=photometry-reanalyse-toggle]') as HTMLButtonElement).click();
    await fixture.whenStable();
    expect(el().querySelector('[data-testid=photometry-reanalyse-panel]')).not.toBeNull();
    (el().querySelector('[data-testid=reanalyse-detrend-bin] button') as HTMLButtonElement).click();
    await fixture.whenStable();
    (el().querySelector('[data-testid=photometry-reanalyse]') as HTMLButtonElement).click();
    const req = backend.expectOne({ method: 'POST', url: `${URL}/analyses` });
    // The program's choices (node zero points, 5σ) with binning switched on at its default 10 minutes.
    expect(req.request.body).toEqual({ detrend: { offsets: 'node', clipSigma: 5, binMinutes: 10 } });
    req.flush({ run: testRun({ state: 'queued', done: 0, finishedAt: null }) }, { status: 202, statusText: 'Accepted' });
    await fixture.whenStable().catch(() => undefined);
    expect(text('[data-testid=photometry-run-state]')).toBe('Waiting to start the analysis of 3 targets…');
    expect(el().querySelector('[data-testid=photometry-reanalyse-panel]')).toBeNull();
    await pause();
    backend.expectOne(`${URL}/run`).flush(testRun());
    TestBed.tick();
    backend.expectOne(URL).flush(testProgram());
    await fixture.whenStable();
  });

  it('a cluster program: shows the cluster card', async () => {
    await show(testProgram({ cluster: { ageMyr: 600, colourSystem: 'BV', fit: null } }));
    expect(el().querySelector('[data-testid=cluster-age-card]')).not.toBeNull();
    expect(el().querySelector('[data-testid=cluster-age-chart]')).not.toBeNull();
  });
});
