import { HttpEventType } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, ElementRef, inject, LOCALE_ID, signal, viewChild } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { readApiError } from '../../../../core/http/api-error-message';
import { MAX_JUSTIFICATION_BYTES, ProposalApi } from '../../proposal-api';
import { ProposalStore } from '../../proposal-store';
import { UtcInstantPipe } from '../../../../ui/time/date-pipes';

/** Why a file cannot be sent, checked before uploading (the server checks again). */
export function checkJustificationFile(file: File): string | null {
  const isPdf = file.type === 'application/pdf' || (file.type === '' && /\.pdf$/i.test(file.name));
  if (!isPdf) return `${file.name} is not a PDF. The justification must be a PDF file.`;
  if (file.size > MAX_JUSTIFICATION_BYTES) {
    return `${file.name} is ${(file.size / 1024 / 1024).toFixed(1)} MB; the justification may be at most 10 MB.`;
  }
  if (file.size === 0) return `${file.name} is empty.`;
  return null;
}

/** `482304` → `471 kB`; bytes below 1 kB, MB from 1 MB (binary multiples, as file managers show). */
export function formatFileSize(bytes: number, locale: string): string {
  const number = (value: number, digits: number) => new Intl.NumberFormat(locale, { maximumFractionDigits: digits }).format(value);
  if (bytes < 1024) return `${number(bytes, 0)} bytes`;
  if (bytes < 1024 * 1024) return `${number(bytes / 1024, bytes < 10 * 1024 ? 1 : 0)} kB`;
  return `${number(bytes / 1024 / 1024, 1)} MB`;
}

/** The justification tab: the scientific case as one PDF, replaced by each upload. */
@Component({
  selector: 'app-proposal-justification',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [UtcInstantPipe, MatButton, MatIcon, MatProgressBar],
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

  protected readonly chosen = signal<File | null>(null);
  protected readonly progress = signal<number | null>(null);
  protected readonly error = signal<string | null>(null);
  protected readonly announcement = signal('');
  private readonly fileInput = viewChild<ElementRef<HTMLInputElement>>('fileInput');
  private readonly locale = inject(LOCALE_ID);

  protected size(bytes: number): string {
    return formatFileSize(bytes, this.locale);
  }

  protected choose(event: Event): void {
    const input = event.target as HTMLInputElement;
    const file = input.files && input.files.length ? input.files[0] : null;
    this.announcement.set('');
    this.error.set(null);
    this.chosen.set(null);
    if (!file) return;
    const problem = checkJustificationFile(file);
    if (problem) {
      this.error.set(problem);
      input.value = '';
      return;
    }
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
          const input = this.fileInput()?.nativeElement;
          if (input) input.value = '';
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
