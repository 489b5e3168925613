import { HttpEventType, provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatRadioGroupHarness } from '@angular/material/radio/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import { provideRouter } from '@angular/router';
import type { CsvRowError } from '@spincycle/shared/proposals/target-schemas';
import { ProposalStore } from '../../proposal-store';
import { testProposal, testTarget } from '../../testing/fixtures';
import TargetList from './target-list';

describe('TargetList', () => {
  let fixture: ComponentFixture<TargetList>;
  let loader: HarnessLoader;
  let root: HarnessLoader;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [TargetList],
      providers: [
        ProposalStore,
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    TestBed.inject(ProposalStore).id.set(5);
    fixture = TestBed.createComponent(TargetList);
    loader = TestbedHarnessEnvironment.loader(fixture);
    root = TestbedHarnessEnvironment.documentRootLoader(fixture);
    TestBed.tick();
    backend.expectOne('/api/proposals/5').flush(testProposal());
    backend
      .expectOne('/api/proposals/5/targets')
      .flush([
        testTarget(1),
        testTarget(2, { name: 'Lantern 2', raDeg: 187.5, decDeg: -5.341667, periodDays: 0.62, periodUncertaintyDays: 0.05 }),
      ]);
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  function chooseFile(name = 'lantern.csv'): void {
    const input = fixture.nativeElement.querySelector('[data-testid=csv-input]') as HTMLInputElement;
    const file = new File(['name,ra,dec\n'], name, { type: 'text/csv' });
    Object.defineProperty(input, 'files', { value: [file] });
    input.dispatchEvent(new Event('change'));
  }

  it('fits 1440 px: a "scroll sideways" caption in the box, names and notes cut to one line with a tooltip', () => {
    const box = (fixture.nativeElement as HTMLElement).querySelector('[data-testid=targets-table]')!.parentElement!;
    expect(box.classList).toContain('table-scroll');
    expect(box.classList).toContain('table-fit');
    expect(box.querySelector(':scope > .table-scroll-hint')?.textContent).toContain('Scroll sideways for more columns');
    for (const column of ['name', 'notes']) {
      const cell = (fixture.nativeElement as HTMLElement).querySelector(
        `[data-testid=targets-table] td.mat-column-${column} .cell-truncate`,
      );
      expect(cell?.classList).toContain('mat-mdc-tooltip-trigger');
    }
  });

  it('lists the targets with sexagesimal positions, export and example links', async () => {
    const columns = await (await loader.getHarness(MatTableHarness)).getCellTextByColumnName();
    expect(columns['name'].text).toEqual(['Lantern 1', 'Lantern 2']);
    expect(columns['ra'].text).toEqual(['03:47:00.0', '12:30:00.0']);
    expect(columns['dec'].text).toEqual(['+24:07:00', '−05:20:30']);
    expect(columns['period'].text).toEqual(['—', '0.62']);
    expect(columns['periodErr'].text).toEqual(['—', '0.05']);
    const headers = await (await (await loader.getHarness(MatTableHarness)).getHeaderRows())[0].getCellTextByColumnName();
    expect(headers['period']).toBe('Period (d)');
    expect(headers['periodErr']).toBe('± period uncertainty (d)');
    expect(fixture.nativeElement.textContent).toContain('period_error');
    const hrefs = Array.from(fixture.nativeElement.querySelectorAll('a[download]')).map((a) =>
      (a as HTMLAnchorElement).getAttribute('href'),
    );
    expect(hrefs).toEqual(['/api/proposals/5/targets.csv', '/api/target-lists/example.csv']);
    expect(fixture.nativeElement.textContent).toContain('colour_system');
  });

  it('upload refused: shows the progress, then lists every row error the server returned', async () => {
    chooseFile();
    await fixture.whenStable();
    await (await loader.getHarness(MatButtonHarness.with({ text: /Upload/ }))).click();

    const req = backend.expectOne((r) => r.url === '/api/proposals/5/targets/upload');
    expect(req.request.method).toBe('POST');
    expect(req.request.params.get('mode')).toBe('append');
    expect((req.request.body as FormData).get('file')).toBeInstanceOf(File);
    expect(req.request.reportProgress).toBe(true);

    req.event({ type: HttpEventType.UploadProgress, loaded: 30, total: 120 });
    await fixture.whenStable();
    expect(fixture.nativeElement.querySelector('[data-testid=upload-progress]')).not.toBeNull();
    expect(fixture.nativeElement.textContent).toContain('25 % sent');

    const rows: CsvRowError[] = [
      { row: 2, field: 'dec', message: 'declination must be between −90° and 90°, got 95' },
      { row: 7, field: 'band', message: 'band must be one of B, V, R, I, G' },
      { row: 7, field: 'age_myr', message: 'age must be positive' },
      { row: 31, field: 'name', message: 'the name Lantern 4 is used twice (rows 4 and 31)' },
    ];
    req.flush(
      { code: 'invalid_target_list', message: 'The list has 4 problems.', fieldErrors: {}, rows },
      { status: 400, statusText: 'Bad Request' },
    );
    await fixture.whenStable();

    expect(fixture.nativeElement.querySelector('[data-testid=upload-progress]')).toBeNull();
    const results = fixture.nativeElement.querySelector('[data-testid=upload-results]') as HTMLElement;
    expect(results.getAttribute('aria-live')).toBe('polite');
    expect(results.textContent).toContain('The list has 4 problems.');
    const table = await loader.getHarness(MatTableHarness.with({ selector: '[data-testid=row-errors]' }));
    const columns = await table.getCellTextByColumnName();
    expect(columns['row'].text).toEqual(['2', '7', '7', '31']);
    expect(columns['field'].text).toEqual(['dec', 'band', 'age_myr', 'name']);
    expect(columns['message'].text).toEqual(rows.map((r) => r.message));
  });

  it('upload accepted in replace mode: asks first, reports the count and reloads the list', async () => {
    await (await loader.getHarness(MatRadioGroupHarness)).checkRadioButton({ label: 'Replace the list' });
    chooseFile();
    await fixture.whenStable();
    await (await loader.getHarness(MatButtonHarness.with({ text: /Upload/ }))).click();
    backend.expectNone((r) => r.url === '/api/proposals/5/targets/upload');
    await (await root.getHarness(MatButtonHarness.with({ text: 'Replace', selector: 'mat-dialog-actions button' }))).click();

    const req = backend.expectOne((r) => r.url === '/api/proposals/5/targets/upload');
    expect(req.request.params.get('mode')).toBe('replace');
    req.flush({ mode: 'replace', added: 3, removed: 2, targets: [] });
    TestBed.tick();
    backend.expectOne('/api/proposals/5/targets').flush([testTarget(1), testTarget(2), testTarget(3)]);
    backend.expectOne('/api/proposals/5').flush(testProposal({ targetCount: 3 }));
    await fixture.whenStable();
    expect(fixture.nativeElement.querySelector('[data-testid=upload-results]').textContent).toContain(
      '3 targets now make up the list (2 removed)',
    );
  });

  it('upload accepted with notes: the rows stored with a colour warning are listed with row, column and warning', async () => {
    chooseFile();
    await fixture.whenStable();
    await (await loader.getHarness(MatButtonHarness.with({ text: /Upload/ }))).click();
    const note = {
      row: 2,
      field: 'colour',
      message:
        'A B−V of 2.5 mag is outside the F5V–M5V dwarfs (between 0.44 and 1.83 mag), but a plausible BP−RP: check the colour system.',
    };
    backend
      .expectOne((r) => r.url === '/api/proposals/5/targets/upload')
      .flush({ mode: 'append', added: 2, removed: 0, notes: [note], targets: [] });
    TestBed.tick();
    backend.expectOne('/api/proposals/5/targets').flush([testTarget(1), testTarget(2)]);
    backend.expectOne('/api/proposals/5').flush(testProposal());
    await fixture.whenStable();
    expect(fixture.nativeElement.querySelector('[data-testid=upload-results]').textContent).toContain('One row was stored with a warning');
    const table = await loader.getHarness(MatTableHarness.with({ selector: '[data-testid=row-notes]' }));
    const columns = await table.getCellTextByColumnName();
    expect(columns['row'].text).toEqual(['2']);
    expect(columns['field'].text).toEqual(['colour']);
    expect(columns['message'].text).toEqual([note.message]);
  });

  it('add a target: RA/Dec typed as text are parsed into degrees before the row is posted', async () => {
    await (await loader.getHarness(MatButtonHarness.with({ text: /Add a target/ }))).click();
    const set = async (name: string, value: string) =>
      (await root.getHarness(MatInputHarness.with({ selector: `[formControlName=${name}]` }))).setValue(value);
    await set('name', 'Lantern 9');
    await set('ra', '12:30:00');
    await set('dec', '-05:20:30');
    await set('magnitude', '13.1');
    await set('colour', '1.02');
    await set('ageMyr', '650');
    expect(document.querySelector('[data-testid=ra-reading]')?.textContent).toContain('187.50000° = 12:30:00.0');
    await (await root.getHarness(MatButtonHarness.with({ text: 'Add target' }))).click();

    const post = backend.expectOne((r) => r.method === 'POST' && r.url === '/api/proposals/5/targets');
    expect(post.request.body).toEqual({
      name: 'Lantern 9',
      raDeg: 187.5,
      decDeg: expect.closeTo(-5.341667, 5),
      magnitude: 13.1,
      magnitudeBand: 'V',
      colour: 1.02,
      colourSystem: 'BPRP',
      reddeningEbv: null,
      ageMyr: 650,
      ageUncertaintyMyr: null,
      periodPrecisionDays: null,
      periodDays: null,
      periodUncertaintyDays: null,
      notes: '',
    });
    post.flush(testTarget(9, { name: 'Lantern 9' }), { status: 201, statusText: 'Created' });
    // Not whenStable(): the quiet refresh of the proposal is pending until answered.
    await new Promise((resolve) => setTimeout(resolve));
    TestBed.tick();
    backend.expectOne('/api/proposals/5').flush(testProposal({ targetCount: 3 }));
    await fixture.whenStable();
    const columns = await (await loader.getHarness(MatTableHarness)).getCellTextByColumnName();
    expect(columns['name'].text).toEqual(['Lantern 1', 'Lantern 2', 'Lantern 9']);
  });

  it('add a target with an expected period: the dialog shows the hint and posts the period and its uncertainty', async () => {
    await (await loader.getHarness(MatButtonHarness.with({ text: /Add a target/ }))).click();
    const set = async (name: string, value: string) =>
      (await root.getHarness(MatInputHarness.with({ selector: `[formControlName=${name}]` }))).setValue(value);
    const period = await root.getHarness(MatFormFieldHarness.with({ floatingLabelText: 'Period (d)' }));
    expect(await period.getTextHints()).toEqual([
      'Only for stars without an expected period from their colour and age (fast rotators, M dwarfs beyond the relations)',
    ]);
    await root.getHarness(MatFormFieldHarness.with({ floatingLabelText: '± (d)' }));
    await set('name', 'Lantern M');
    await set('ra', '163.2');
    await set('dec', '31.6');
    await set('magnitude', '16.2');
    await set('colour', '3.05');
    await set('ageMyr', '650');
    await set('periodDays', '0.62');
    await set('periodUncertaintyDays', '0.05');
    await (await root.getHarness(MatButtonHarness.with({ text: 'Add target' }))).click();
    const post = backend.expectOne((r) => r.method === 'POST' && r.url === '/api/proposals/5/targets');
    expect(post.request.body).toMatchObject({ name: 'Lantern M', colour: 3.05, periodDays: 0.62, periodUncertaintyDays: 0.05 });
    post.flush(testTarget(10, { name: 'Lantern M', periodDays: 0.62, periodUncertaintyDays: 0.05 }), {
      status: 201,
      statusText: 'Created',
    });
    await new Promise((resolve) => setTimeout(resolve));
    TestBed.tick();
    backend.expectOne('/api/proposals/5').flush(testProposal({ targetCount: 3 }));
    await fixture.whenStable();
  });

  it('edit a target: the dialog is filled with its expected period and uncertainty', async () => {
    await (await loader.getHarness(MatButtonHarness.with({ selector: '[aria-label="Edit Lantern 2"]' }))).click();
    const value = async (name: string) =>
      (await root.getHarness(MatInputHarness.with({ selector: `[formControlName=${name}]` }))).getValue();
    expect(await value('periodDays')).toBe('0.62');
    expect(await value('periodUncertaintyDays')).toBe('0.05');
    await (await root.getHarness(MatButtonHarness.with({ text: 'Cancel' }))).click();
  });

  it('add a target: a period out of range or an uncertainty without a period is refused on its field, nothing sent', async () => {
    await (await loader.getHarness(MatButtonHarness.with({ text: /Add a target/ }))).click();
    const set = async (name: string, value: string) =>
      (await root.getHarness(MatInputHarness.with({ selector: `[formControlName=${name}]` }))).setValue(value);
    await set('name', 'Lantern X');
    await set('ra', '163.2');
    await set('dec', '31.6');
    await set('magnitude', '12');
    await set('colour', '1');
    await set('ageMyr', '650');
    await set('periodUncertaintyDays', '0.1');
    await (await root.getHarness(MatButtonHarness.with({ text: 'Add target' }))).click();
    backend.expectNone((r) => r.method === 'POST');
    const uncertainty = await root.getHarness(MatFormFieldHarness.with({ floatingLabelText: '± (d)' }));
    expect(await uncertainty.getTextErrors()).toEqual(['Enter the period as well, or clear its uncertainty.']);

    await set('periodDays', '1500');
    await (await root.getHarness(MatButtonHarness.with({ text: 'Add target' }))).click();
    backend.expectNone((r) => r.method === 'POST');
    const period = await root.getHarness(MatFormFieldHarness.with({ floatingLabelText: 'Period (d)' }));
    expect(await period.getTextErrors()).toEqual(['Enter a period between 0.05 and 1000 d, or leave it empty (you typed 1500).']);
  });

  it('add a target: a declination out of range is refused with the text as typed, nothing sent', async () => {
    await (await loader.getHarness(MatButtonHarness.with({ text: /Add a target/ }))).click();
    await (await root.getHarness(MatInputHarness.with({ selector: '[formControlName=dec]' }))).setValue('95:00:00');
    await (await root.getHarness(MatButtonHarness.with({ text: 'Add target' }))).click();
    backend.expectNone((r) => r.method === 'POST');
    const dec = await root.getHarness(MatFormFieldHarness.with({ floatingLabelText: 'Dec (J2000)' }));
    expect((await dec.getTextErrors())[0]).toBe('Enter a declination between −90° and 90° (you typed 95:00:00).');
  });
});
