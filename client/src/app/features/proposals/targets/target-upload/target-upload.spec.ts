import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MAX_TARGET_CSV_BYTES, TargetUpload } from './target-upload';

// The file button itself (hidden input, keyboard, chosen name, size check) is tested in
// ui/file-picker/file-picker.spec.ts; the upload flows in target-list.spec.ts.
describe('TargetUpload file picker', () => {
  let fixture: ComponentFixture<TargetUpload>;
  let backend: HttpTestingController;
  const el = () => fixture.nativeElement as HTMLElement;
  const input = () => el().querySelector('[data-testid=csv-input]') as HTMLInputElement;
  const uploadButton = () =>
    Array.from(el().querySelectorAll('button')).find((b) => b.textContent?.trim().endsWith('Upload')) as HTMLButtonElement;

  beforeEach(async () => {
    TestBed.configureTestingModule({ imports: [TargetUpload], providers: [provideHttpClient(), provideHttpClientTesting()] });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(TargetUpload);
    fixture.componentRef.setInput('proposalId', 5);
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  async function choose(file: File): Promise<void> {
    Object.defineProperty(input(), 'files', { value: [file], configurable: true });
    input().dispatchEvent(new Event('change'));
    await fixture.whenStable();
  }

  it('offers CSV files behind "Choose a CSV file", described by the chosen name (the ids the browser tests read)', () => {
    expect(input().accept).toBe('.csv,text/csv');
    const button = el().querySelector('[data-testid=choose-csv]') as HTMLButtonElement;
    expect(button.textContent).toContain('Choose a CSV file');
    expect(button.getAttribute('aria-describedby')).toBe('csv-file-name');
    expect(el().querySelector('#csv-file-name')?.textContent?.trim()).toBe('No file chosen');
    expect(uploadButton().disabled).toBe(true);
  });

  it('shows the chosen file name and enables Upload', async () => {
    await choose(new File(['name,ra,dec\n'], 'lantern-cluster-members.csv', { type: 'text/csv' }));
    expect(el().querySelector('[data-testid=csv-file-name]')?.textContent?.trim()).toBe('lantern-cluster-members.csv');
    expect(el().querySelector('[data-testid=choose-csv]')?.textContent).toContain('Choose another CSV file');
    expect(uploadButton().disabled).toBe(false);
  });

  it('a CSV over the server limit (5 MB) is refused before upload and Upload stays off', async () => {
    const big = new File(['name,ra,dec\n'], 'whole-sky.csv', { type: 'text/csv' });
    Object.defineProperty(big, 'size', { value: MAX_TARGET_CSV_BYTES + 3 * 1024 * 1024 });
    await choose(big);
    expect(el().querySelector('[data-testid=csv-problem]')?.textContent).toContain('whole-sky.csv is 8 MB, more than the 5 MB allowed.');
    expect(uploadButton().disabled).toBe(true);
  });
});
