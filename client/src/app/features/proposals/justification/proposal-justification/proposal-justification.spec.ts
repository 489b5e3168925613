import { HttpEventType, provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import type { JustificationFile } from '@spincycle/shared/proposals/proposal-schemas';
import { ProposalStore } from '../../proposal-store';
import { testProposal } from '../../testing/fixtures';
import ProposalJustification, { checkJustificationFile } from './proposal-justification';

const STORED: JustificationFile = {
  filename: 'lantern-case.pdf',
  sizeBytes: 482_304,
  sha256: '9f2c4e0d7b1a3c5e8f6d4b2a0c9e7f5d3b1a9c8e7f6d5c4b3a2918f7e6d5c4b3',
  uploadedAt: '2027-01-05T10:30:00Z',
  uploadedBy: 'Orla Venn',
};

function pdf(name = 'case.pdf', size = 1000, type = 'application/pdf'): File {
  const file = new File(['%PDF-1.7'], name, { type });
  Object.defineProperty(file, 'size', { value: size });
  return file;
}

describe('ProposalJustification', () => {
  let fixture: ComponentFixture<ProposalJustification>;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [ProposalJustification],
      providers: [ProposalStore, provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    TestBed.inject(ProposalStore).id.set(5);
    fixture = TestBed.createComponent(ProposalJustification);
    TestBed.tick();
    backend.expectOne('/api/proposals/5').flush(testProposal());
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  const el = () => fixture.nativeElement as HTMLElement;

  function choose(file: File): void {
    const input = el().querySelector('[data-testid=pdf-input]') as HTMLInputElement;
    Object.defineProperty(input, 'files', { value: [file], configurable: true });
    input.dispatchEvent(new Event('change'));
  }

  it("checkJustificationFile: only non-empty PDFs (a file with no type counts by its .pdf name); the size is the picker's", () => {
    expect(checkJustificationFile(pdf())).toBeNull();
    expect(checkJustificationFile(pdf('case.pdf', 1000, ''))).toBeNull();
    expect(checkJustificationFile(pdf('case.docx', 1000, 'application/msword'))).toContain('is not a PDF');
    expect(checkJustificationFile(pdf('case.pdf', 0))).toBe('case.pdf is empty.');
  });

  // The file button itself (hidden input, keyboard, chosen name) is tested in ui/file-picker/file-picker.spec.ts.
  it('file picker: offers PDFs behind "Choose a PDF", described by the chosen name (the ids the browser tests read)', async () => {
    const native = el().querySelector('[data-testid=pdf-input]') as HTMLInputElement;
    expect(native.accept).toBe('application/pdf,.pdf');
    const button = el().querySelector('[data-testid=choose-pdf]') as HTMLButtonElement;
    expect(button.textContent?.trim()).toContain('Choose a PDF');
    expect(button.getAttribute('aria-describedby')).toBe('pdf-file-name');
    choose(pdf('lantern-case.pdf'));
    await fixture.whenStable();
    expect(el().querySelector('#pdf-file-name')?.textContent?.trim()).toBe('lantern-case.pdf');
    expect(button.textContent?.trim()).toContain('Choose another PDF');
  });

  it('a file over 10 MB is refused before upload, in plain words', async () => {
    choose(pdf('big.pdf', 12 * 1024 * 1024));
    await fixture.whenStable();
    expect(el().querySelector('[data-testid=pdf-problem]')?.textContent?.trim()).toBe(
      'big.pdf is 12 MB, more than the 10 MB allowed. Choose a smaller file.',
    );
    expect(el().querySelector('#pdf-file-name')?.textContent?.trim()).toBe('No file chosen');
    const upload = Array.from(el().querySelectorAll('button')).find((b) => b.textContent?.includes('Upload')) as HTMLButtonElement;
    expect(upload.disabled).toBe(true);
  });

  it('a file that is not a PDF is refused before upload', async () => {
    choose(pdf('case.docx', 1000, 'application/msword'));
    await fixture.whenStable();
    expect(el().querySelector('[data-testid=pdf-problem]')?.textContent).toContain('case.docx is not a PDF.');
  });

  it('uploads with progress, then shows the stored file with its hash, uploader and download link', async () => {
    expect(el().querySelector('[data-testid=no-justification]')).not.toBeNull();
    choose(pdf('lantern-case.pdf', 482_304));
    await fixture.whenStable();
    (Array.from(el().querySelectorAll('button')).find((b) => b.textContent?.includes('Upload')) as HTMLButtonElement).click();
    const put = backend.expectOne('/api/proposals/5/justification');
    expect(put.request.method).toBe('PUT');
    expect((put.request.body as FormData).get('file')).toBeInstanceOf(File);
    put.event({ type: HttpEventType.UploadProgress, loaded: 241_152, total: 482_304 });
    await fixture.whenStable();
    expect(el().textContent).toContain('50 % sent');
    put.flush(STORED);
    await fixture.whenStable();
    const stored = el().querySelector('[data-testid=justification-file]') as HTMLElement;
    expect(stored.textContent).toContain('lantern-case.pdf');
    expect(stored.textContent).toContain('471 kB');
    expect(stored.textContent).toContain(STORED.sha256);
    expect(stored.textContent).toContain('Orla Venn');
    expect(stored.querySelector('a')?.getAttribute('href')).toBe('/api/proposals/5/justification');
    expect(el().querySelector('[data-testid=pdf-result]')?.textContent).toContain('lantern-case.pdf uploaded.');
  });

  it('server refusal (415 not_a_pdf) is shown', async () => {
    choose(pdf('renamed.pdf'));
    await fixture.whenStable();
    (Array.from(el().querySelectorAll('button')).find((b) => b.textContent?.includes('Upload')) as HTMLButtonElement).click();
    backend
      .expectOne('/api/proposals/5/justification')
      .flush({ code: 'not_a_pdf', message: 'renamed.pdf is not a PDF file' }, { status: 415, statusText: 'Unsupported Media Type' });
    await fixture.whenStable();
    expect(el().querySelector('[data-testid=pdf-result]')?.textContent).toContain('renamed.pdf is not a PDF file');
  });
});
