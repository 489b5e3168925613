import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { LIGHT_CURVE_LIMITS, type LightCurveErrorBody, type PhotometryRunStatus } from '@spincycle/shared/photometry/photometry';
import { testProgram, testRun } from '../testing/photometry-fixtures';
import { LightCurveUpload } from './light-curve-upload';

const URL = '/api/proposals/5/photometry/uploads';

describe('LightCurveUpload', () => {
  let fixture: ComponentFixture<LightCurveUpload>;
  let backend: HttpTestingController;
  let queued: PhotometryRunStatus[];
  const el = () => fixture.nativeElement as HTMLElement;
  const text = (sel: string) => el().querySelector(sel)?.textContent?.replace(/\s+/g, ' ').trim() ?? null;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [LightCurveUpload],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(LightCurveUpload);
    fixture.componentRef.setInput('proposalId', 5);
    fixture.componentRef.setInput('targets', testProgram().targets);
    queued = [];
    fixture.componentInstance.queued.subscribe((run) => queued.push(run));
    await fixture.whenStable();
  });
  afterEach(() => backend.verify());

  const csv = (name: string, size = 20) => new File(['x'.repeat(size)], name, { type: 'text/csv' });

  /** Chooses files through the hidden input, as the browser's chooser does. */
  async function choose(files: File[]) {
    const input = el().querySelector('[data-testid=light-curve-files-input]') as HTMLInputElement;
    Object.defineProperty(input, 'files', { value: files, configurable: true });
    input.dispatchEvent(new Event('change'));
    await fixture.whenStable();
  }
  const uploadButton = () => el().querySelector('[data-testid=light-curve-upload-button]') as HTMLButtonElement;

  it('explains the columns and the limits, and uploads only once files are chosen', () => {
    const help = text('[data-testid=light-curve-columns]')!;
    expect(help).toContain('mag / flux');
    expect(help).toContain('Optional code of the node that took it');
    expect(help).toContain(`Up to ${LIGHT_CURVE_LIMITS.maxFiles} files at once, each at most 32 MB`);
    expect(help).toContain('at most 200,000 points per target');
    expect(uploadButton().disabled).toBe(true);
    expect(text('[data-testid=light-curve-chosen]')).toBe('No file chosen');
  });

  it('sends the chosen files with the choices, then says the analysis started and hands its run to the page', async () => {
    await choose([csv('night-1.csv'), csv('night-2.csv')]);
    expect(text('[data-testid=light-curve-chosen]')).toBe('2 files chosen');
    expect(Array.from(el().querySelectorAll('[data-testid=light-curve-file-list] .name')).map((e) => e.textContent)).toEqual([
      'night-1.csv',
      'night-2.csv',
    ]);
    uploadButton().click();
    const req = backend.expectOne({ method: 'POST', url: URL });
    const body = req.request.body as FormData;
    expect((body.getAll('files') as File[]).map((f) => f.name)).toEqual(['night-1.csv', 'night-2.csv']);
    // Left to the files: no time system, value kind or target sent; the default detrending.
    expect(body.has('timeSystem')).toBe(false);
    expect(body.has('targetId')).toBe(false);
    expect([body.get('offsets'), body.get('clipSigma'), body.get('binMinutes')]).toEqual(['node', '5', '']);
    req.flush({ run: testRun({ state: 'queued', done: 0 }) }, { status: 202, statusText: 'Accepted' });
    await fixture.whenStable();
    expect(text('[data-testid=light-curve-upload-results]')).toBe('check_circle The 2 files were stored; the analysis has started.');
    expect(queued.map((r) => r.state)).toEqual(['queued']);
    expect(text('[data-testid=light-curve-chosen]')).toBe('No file chosen');
  });

  it('refused: lists every problem by file, row and column, with how many more there were, and keeps the files', async () => {
    await choose([csv('night-1.csv')]);
    uploadButton().click();
    const body: LightCurveErrorBody = {
      code: 'invalid_light_curve',
      message: 'night-1.csv: row 3, mag: "x" is not a number (and 241 more problems; nothing was saved)',
      rows: [
        { file: 'night-1.csv', row: 0, field: 'file', message: 'the file has no time column' },
        // The reader's messages name their row and column; the table's columns say it already.
        { file: 'night-1.csv', row: 3, field: 'mag', message: 'row 3, mag: "x" is not a number' },
      ],
      totalErrors: 242,
    };
    backend.expectOne(URL).flush(body, { status: 400, statusText: 'Bad Request' });
    await fixture.whenStable();
    expect(text('app-upload-refusal')).toContain('Nothing was stored: fix the 242 problems below');
    const rows = Array.from(el().querySelectorAll('[data-testid=light-curve-row-errors] tbody tr')).map((tr) =>
      Array.from(tr.querySelectorAll('td')).map((td) => td.textContent!.trim()),
    );
    expect(rows).toEqual([
      ['night-1.csv', 'whole file', '—', 'the file has no time column'],
      ['night-1.csv', '3', 'mag', '"x" is not a number'],
    ]);
    // 242 in all, 2 listed (worked by hand).
    expect(text('[data-testid=light-curve-more-errors]')).toBe('…and 240 more problems like these.');
    expect(queued).toEqual([]);
    expect(text('[data-testid=light-curve-chosen]')).toBe('1 file chosen');
  });

  it('refused with a message only (too large, too many): the message, no table', async () => {
    await choose([csv('big.csv')]);
    uploadButton().click();
    backend
      .expectOne(URL)
      .flush({ code: 'file_too_large', message: 'Each file may hold at most 32 MB' }, { status: 413, statusText: 'Too Large' });
    await fixture.whenStable();
    expect(text('app-upload-refusal')).toBe('error Each file may hold at most 32 MB');
    expect(el().querySelector('[data-testid=light-curve-row-errors]')).toBeNull();
  });

  it('more files than allowed, or a file too large: not taken, and says why before sending', async () => {
    await choose(Array.from({ length: LIGHT_CURVE_LIMITS.maxFiles + 1 }, (_, i) => csv(`n${i}.csv`)));
    expect(text('[data-testid=light-curve-file-problem]')).toBe('21 files were chosen; send at most 20 at once.');
    expect(uploadButton().disabled).toBe(true);
    const huge = csv('huge.csv');
    Object.defineProperty(huge, 'size', { value: LIGHT_CURVE_LIMITS.maxFileBytes + 5 * 1024 * 1024 });
    await choose([huge]);
    expect(text('[data-testid=light-curve-file-problem]')).toBe('huge.csv is 37 MB, more than the 32 MB allowed. Choose a smaller file.');
    expect(uploadButton().disabled).toBe(true);
  });

  it('sends the chosen target, time system and value kind, and the detrending as edited', async () => {
    await choose([csv('one-target.csv')]);
    const c = fixture.componentInstance as unknown as {
      targetId: { setValue(v: number): void };
      timeSystem: { setValue(v: string): void };
      valueKind: { setValue(v: string): void };
      detrendForm: { controls: { clip: { setValue(v: boolean): void }; offsets: { setValue(v: string): void } }; markAsDirty(): void };
    };
    c.targetId.setValue(22);
    c.timeSystem.setValue('jd_utc');
    c.valueKind.setValue('mag');
    c.detrendForm.controls.clip.setValue(false);
    c.detrendForm.controls.offsets.setValue('none');
    c.detrendForm.markAsDirty();
    await fixture.whenStable();
    uploadButton().click();
    const req = backend.expectOne(URL);
    const body = req.request.body as FormData;
    expect([body.get('targetId'), body.get('timeSystem'), body.get('valueKind')]).toEqual(['22', 'jd_utc', 'mag']);
    expect([body.get('offsets'), body.get('clipSigma')]).toEqual(['none', '']);
    req.flush({ run: testRun({ state: 'queued' }) }, { status: 202, statusText: 'Accepted' });
    await fixture.whenStable();
  });

  it('a bin width out of range: says so under the field and sends nothing', async () => {
    await choose([csv('a.csv')]);
    (el().querySelector('[data-testid=upload-detrend-bin] button') as HTMLButtonElement).click();
    await fixture.whenStable();
    const minutes = el().querySelector('[data-testid=upload-detrend-bin-minutes]') as HTMLInputElement;
    minutes.value = '5000';
    minutes.dispatchEvent(new Event('input'));
    await fixture.whenStable();
    uploadButton().click();
    await fixture.whenStable();
    backend.expectNone(URL);
    expect(text('mat-error')).toBe('Bin to one day (1440 minutes) or less');
  });
});
