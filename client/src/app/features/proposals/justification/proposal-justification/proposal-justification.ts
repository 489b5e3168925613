import { HttpEventType } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, LOCALE_ID, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { readApiError } from '../../../../core/http/api-error-message';
import { MAX_JUSTIFICATION_BYTES, ProposalApi } from '../../proposal-api';
import { ProposalStore } from '../../proposal-store';
import { FilePicker } from '../../../../ui/file-picker/file-picker';
import { formatFileSize } from '../../../../ui/file-picker/file-size';
import { UploadProgress } from '../../../../ui/file-picker/upload-progress';
import { UtcInstantPipe } from '../../../../ui/time/date-pipes';

/**
 * Why a chosen file is not a justification, checked before uploading (the file picker checks
 * its size first; the server checks both again).
 */
export function checkJustificationFile(file: File): string | null {
  const isPdf = file.type === 'application/pdf' || (file.type === '' && /\.pdf$/i.test(file.name));
  if (!isPdf) return `${file.name} is not a PDF. The justification must be a PDF file.`;
  if (file.size === 0) return `${file.name} is empty.`;
  return null;
}

/** The justification tab: the scientific case as one PDF, replaced by each upload. */
@Component({
  selector: 'app-proposal-justification',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [FilePicker, MatButton, MatIcon, UploadProgress, UtcInstantPipe],
  templateUrl: './proposal-justification.html',
  styleUrl: './proposal-justification.scss',
})
export default class ProposalJustification {
  private readonly api = inject(ProposalApi);
  protected readonly store = inject(ProposalStore);

  protected readonly file = computed(() => this.store.proposal()?.justification ?? null);
  protected readonly downloadUrl = computed(() => {
    const id = this.store.id();
    return id === null ? null : this.api.justificationUrl(id);
  });
  protected readonly maxMb = MAX_JUSTIFICATION_BYTES / 1024 / 1024;
  protected readonly maxBytes = MAX_JUSTIFICATION_BYTES;
  protected readonly checkFile = checkJustificationFile;

  protected readonly chosen = signal<File | null>(null);
  protected readonly progress = signal<number | null>(null);
  protected readonly error = signal<string | null>(null);
  protected readonly announcement = signal('');
  private readonly locale = inject(LOCALE_ID);

  protected size(bytes: number): string {
    return formatFileSize(bytes, this.locale);
  }

  /** A choice of the picker: null when it refused the file (it says why itself). */
  protected choose(file: File | null): void {
    this.announcement.set('');
    this.error.set(null);
    this.chosen.set(file);
  }

  protected upload(): void {
    const file = this.chosen();
    const id = this.store.id();
    if (!file || id === null || this.progress() !== null) return;
    this.progress.set(0);
    this.error.set(null);
    this.api.uploadJustification(id, file).subscribe({
      next: (event) => {
        if (event.type === HttpEventType.UploadProgress) {
          this.progress.set(event.total ? Math.round((100 * event.loaded) / event.total) : 0);
        } else if (event.type === HttpEventType.Response && event.body) {
          const stored = event.body;
          this.progress.set(null);
          this.chosen.set(null);
          const proposal = this.store.proposal();
          if (proposal) this.store.replace({ ...proposal, justification: stored });
          this.announcement.set(`${stored.filename} uploaded.`);
        }
      },
      error: (error: unknown) => {
        this.progress.set(null);
        this.error.set(readApiError(error).message);
      },
    });
  }
}
