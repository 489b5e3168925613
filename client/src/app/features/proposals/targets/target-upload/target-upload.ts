import { DecimalPipe } from '@angular/common';
import { HttpEventType } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIcon } from '@angular/material/icon';
import { MatRadioButton, MatRadioGroup } from '@angular/material/radio';
import {
  MatCell,
  MatCellDef,
  MatColumnDef,
  MatHeaderCell,
  MatHeaderCellDef,
  MatHeaderRow,
  MatHeaderRowDef,
  MatRow,
  MatRowDef,
  MatTable,
} from '@angular/material/table';
import type { CsvRowError } from '@spincycle/shared/proposals/target-schemas';
import { filter, of, switchMap } from 'rxjs';
import { readApiError } from '../../../../core/http/api-error-message';
import { confirmAction } from '../../../../ui/confirm-dialog/confirm-dialog';
import { CsvRowErrors } from '../../../../ui/csv-row-errors/csv-row-errors';
import { FilePicker } from '../../../../ui/file-picker/file-picker';
import { UploadProgress } from '../../../../ui/file-picker/upload-progress';
import { csvRowErrorsOf, UploadRefusal } from '../../../../ui/file-picker/upload-refusal';
import { TargetApi, TargetUploadMode, TargetUploadResult } from '../target-api';

/** What the results panel shows after an upload. */
export type UploadOutcome =
  | { kind: 'imported'; added: number; removed: number; mode: TargetUploadMode; notes: CsvRowError[] }
  | { kind: 'refused'; message: string; rows: CsvRowError[] };

/** Largest target-list CSV the server takes (TARGET_CSV_MAX_BYTES in server/src/http/upload-limits.ts). */
export const MAX_TARGET_CSV_BYTES = 5 * 1024 * 1024;

/**
 * Uploads a target-list CSV (replacing or appending), with a determinate progress bar, and
 * lists every row the server refused, so that the whole file can be fixed in one pass.
 */
@Component({
  selector: 'app-target-upload',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    CsvRowErrors,
    DecimalPipe,
    FilePicker,
    MatButton,
    MatCell,
    MatCellDef,
    MatColumnDef,
    MatHeaderCell,
    MatHeaderCellDef,
    MatHeaderRow,
    MatHeaderRowDef,
    MatIcon,
    MatRadioButton,
    MatRadioGroup,
    MatRow,
    MatRowDef,
    MatTable,
    ReactiveFormsModule,
    UploadProgress,
    UploadRefusal,
  ],
  templateUrl: './target-upload.html',
  styleUrl: './target-upload.scss',
})
export class TargetUpload {
  private readonly api = inject(TargetApi);
  private readonly dialog = inject(MatDialog);

  readonly proposalId = input.required<number>();
  /** Targets in the list now (replacing a non-empty list asks first). */
  readonly existingCount = input(0);
  /** Emitted after a list was stored. */
  readonly uploaded = output<TargetUploadResult>();

  protected readonly mode = new FormControl<TargetUploadMode>('append', { nonNullable: true });
  protected readonly file = signal<File | null>(null);
  /** Percent sent, while an upload is on its way. */
  protected readonly progress = signal<number | null>(null);
  protected readonly outcome = signal<UploadOutcome | null>(null);
  protected readonly uploading = computed(() => this.progress() !== null);
  protected readonly rowColumns = ['row', 'field', 'message'];
  protected readonly maxBytes = MAX_TARGET_CSV_BYTES;

  protected chooseFile(file: File | null): void {
    this.file.set(file);
    this.outcome.set(null);
  }

  protected upload(): void {
    const file = this.file();
    if (!file || this.uploading()) return;
    const mode = this.mode.value;
    const count = this.existingCount();
    const confirmed$ =
      mode === 'replace' && count > 0
        ? confirmAction(this.dialog, {
            title: 'Replace the target list?',
            message: `The ${count} targets now in the list, and their target plans, will be replaced by the rows of ${file.name}.`,
            confirmLabel: 'Replace',
            destructive: true,
          })
        : of(true);
    confirmed$
      .pipe(
        filter((yes) => yes),
        switchMap(() => {
          this.progress.set(0);
          this.outcome.set(null);
          return this.api.upload(this.proposalId(), file, mode);
        }),
      )
      .subscribe({
        next: (event) => {
          if (event.type === HttpEventType.UploadProgress) {
            this.progress.set(event.total ? Math.round((100 * event.loaded) / event.total) : 0);
          } else if (event.type === HttpEventType.Response && event.body) {
            this.progress.set(null);
            this.outcome.set({
              kind: 'imported',
              added: event.body.added,
              removed: event.body.removed,
              mode,
              notes: event.body.notes ?? [],
            });
            this.uploaded.emit(event.body);
            // Stored: clear the chosen file so that it is not sent twice by mistake.
            this.file.set(null);
          }
        },
        error: (error: unknown) => {
          this.progress.set(null);
          this.outcome.set({ kind: 'refused', message: readApiError(error).message, rows: csvRowErrorsOf(error) });
        },
      });
  }
}
