import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { ExecutionUpload } from './execution-upload';

describe('ExecutionUpload', () => {
  let fixture: ComponentFixture<ExecutionUpload>;
  let backend: HttpTestingController;
  const el = () => fixture.nativeElement as HTMLElement;

  beforeEach(async () => {
    TestBed.configureTestingModule({ imports: [ExecutionUpload], providers: [provideHttpClient(), provideHttpClientTesting()] });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ExecutionUpload);
    fixture.componentRef.setInput('cycleId', 7);
    await fixture.whenStable();
  });
  afterEach(() => backend.verify());

  async function chooseAndUpload(): Promise<File> {
    const file = new File(['target,node,utc_time,status\n'], 'kestrel-log.csv', { type: 'text/csv' });
    const input = el().querySelector('[data-testid=execution-input]') as HTMLInputElement;
    Object.defineProperty(input, 'files', { value: [file] });
    input.dispatchEvent(new Event('change'));
    await fixture.whenStable();
    expect(el().querySelector('[data-testid=execution-file-name]')?.textContent?.trim()).toBe('kestrel-log.csv');
    (el().querySelector('[data-testid=execution-upload]') as HTMLButtonElement).click();
    return file;
  }

  it('names the columns the file needs', () => {
    const hint = el().querySelector('#execution-columns')!.textContent!.replace(/\s+/g, ' ');
    expect(hint).toContain('target, node, utc_time, status');
    expect(hint).toContain('within 30 minutes');
    // The hint describes the file button, after the chosen file's name.
    const choose = el().querySelector('[data-testid=choose-execution]') as HTMLButtonElement;
    expect(choose.textContent).toContain('Choose a CSV file');
    expect(choose.getAttribute('aria-describedby')).toBe('execution-file-name execution-columns');
  });

  it('a log over the server limit (2 MB) is refused before upload and Upload stays off', async () => {
    const big = new File(['target,node,utc_time,status\n'], 'whole-season.csv', { type: 'text/csv' });
    Object.defineProperty(big, 'size', { value: 3 * 1024 * 1024 });
    const input = el().querySelector('[data-testid=execution-input]') as HTMLInputElement;
    Object.defineProperty(input, 'files', { value: [big] });
    input.dispatchEvent(new Event('change'));
    await fixture.whenStable();
    expect(el().querySelector('[data-testid=execution-problem]')?.textContent).toContain(
      'whole-season.csv is 3 MB, more than the 2 MB allowed.',
    );
    expect((el().querySelector('[data-testid=execution-upload]') as HTMLButtonElement).disabled).toBe(true);
  });

  it('sends the file as multipart `file` and says how many visits changed', async () => {
    const file = await chooseAndUpload();
    const req = backend.expectOne('/api/night-plans/cycles/7/execution');
    expect(req.request.method).toBe('POST');
    expect((req.request.body as FormData).get('file')).toEqual(file);
    const emitted: unknown[] = [];
    fixture.componentInstance.uploaded.subscribe((r) => emitted.push(r));
    req.flush({ updated: 11, rows: 12 });
    await fixture.whenStable();
    expect(el().querySelector('[data-testid=execution-results]')!.textContent!.replace(/\s+/g, ' ')).toContain(
      '12 rows read; 11 visits changed.',
    );
    expect(emitted).toEqual([{ updated: 11, rows: 12 }]);
    // Stored: the file is cleared so that it is not sent twice.
    expect(el().querySelector('[data-testid=execution-file-name]')?.textContent?.trim()).toBe('No file chosen');
    expect((el().querySelector('[data-testid=execution-upload]') as HTMLButtonElement).disabled).toBe(true);
  });

  it('a 400 lists every bad row with its column and message, and says nothing was stored', async () => {
    await chooseAndUpload();
    backend.expectOne('/api/night-plans/cycles/7/execution').flush(
      {
        code: 'invalid_execution_log',
        message: 'The execution log has problems.',
        rows: [
          { row: 2, field: 'utc_time', message: 'use an ISO 8601 time, e.g. 2027-03-04T02:15:00Z' },
          { row: 5, field: 'target', message: 'no planned visit of Quill-9 on KRG-50 near that time' },
        ],
      },
      { status: 400, statusText: 'Bad Request' },
    );
    await fixture.whenStable();
    expect(el().querySelector('[role=alert]')!.textContent).toContain('Nothing was stored: fix the 2 problems below');
    const rows = [...el().querySelectorAll('[data-testid=execution-row-errors] tr.mat-mdc-row')].map((r) =>
      [...r.querySelectorAll('td')].map((td) => td.textContent!.trim()),
    );
    expect(rows).toEqual([
      ['2', 'utc_time', 'use an ISO 8601 time, e.g. 2027-03-04T02:15:00Z'],
      ['5', 'target', 'no planned visit of Quill-9 on KRG-50 near that time'],
    ]);
    const region = el().querySelector('.row-errors') as HTMLElement;
    expect(region.getAttribute('tabindex')).toBe('0');
    expect(region.getAttribute('aria-label')).toBe('Problems in the uploaded file');
  });
});
