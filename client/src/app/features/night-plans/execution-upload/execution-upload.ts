import { ChangeDetectionStrategy, Component, inject, input, output, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { EXECUTION_CSV_COLUMNS, EXECUTION_MATCH_MINUTES, type ExecutionUploadResult } from '@spincycle/shared/night-plans/night-plans';
import type { CsvRowError } from '@spincycle/shared/proposals/target-schemas';
import { readApiError } from '../../../core/http/api-error-message';
import { CsvRowErrors } from '../../../ui/csv-row-errors/csv-row-errors';
import { FilePicker } from '../../../ui/file-picker/file-picker';
import { UploadProgress } from '../../../ui/file-picker/upload-progress';
import { csvRowErrorsOf, UploadRefusal } from '../../../ui/file-picker/upload-refusal';
import { NightPlansApi } from '../night-plans-api';

type UploadOutcome = { kind: 'stored'; result: ExecutionUploadResult } | { kind: 'refused'; message: string; rows: CsvRowError[] };

/** Largest execution log the server takes (EXECUTION_CSV_MAX_BYTES in server/src/features/night-plans/execution-csv.ts). */
const MAX_EXECUTION_CSV_BYTES = 2 * 1024 * 1024;

/**
 * Uploads the nodes' execution log (a CSV): each row marks a planned visit done or missed.
 * A refused file lists every bad row at once, as the target-list upload does, and nothing is stored.
 */
@Component({
  selector: 'app-execution-upload',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [CsvRowErrors, FilePicker, MatButton, MatIcon, UploadProgress, UploadRefusal],
  template: `
    <p class="hint" id="execution-columns">
      A CSV file with the columns
      @for (c of columns; track c; let last = $last) {
        <code>{{ c }}</code>{{ last ? '' : ', ' }}
      }
      : the target's name, the node's code, the time of the visit in UTC (for example 2027-03-04T02:15:00Z) and done or missed. Each row
      marks the planned visit of that target on that node at that time (or starting within {{ matchMinutes }} minutes of it).
    </p>
    <div class="controls">
      <app-file-picker
        accept=".csv,text/csv"
        label="CSV file"
        [maxBytes]="maxBytes"
        describedBy="execution-columns"
        testId="execution"
        [file]="file()"
        (fileChange)="chooseFile($event)"
        [disabled]="uploading()"
      />
      <button matButton="filled" type="button" (click)="upload()" [disabled]="!file() || uploading()" data-testid="execution-upload">
        <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">upload</mat-icon>
        Upload
      </button>
    </div>
    <app-upload-progress [progress]="uploading() ? 'unknown' : null" label="Uploading the execution log" />
    <div class="results" aria-live="polite" aria-atomic="true" data-testid="execution-results">
      @if (outcome(); as o) {
        @if (o.kind === 'stored') {
          <p class="ok">
            <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">check_circle</mat-icon>
            {{ o.result.rows }} {{ o.result.rows === 1 ? 'row' : 'rows' }} read; {{ o.result.updated }}
            {{ o.result.updated === 1 ? 'visit' : 'visits' }} changed.
          </p>
        } @else {
          <app-upload-refusal [message]="o.message" [problems]="o.rows.length" />
        }
      }
    </div>
    @if (outcome(); as o) {
      @if (o.kind === 'refused' && o.rows.length) {
        <app-csv-row-errors [rows]="o.rows" testId="execution-row-errors" />
      }
    }
  `,
  styles: `
    :host {
      display: block;
    }
    .hint {
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-body-small);
      max-inline-size: 80ch;
    }
    .controls {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      gap: 8px 24px;
    }
    .ok {
      display: flex;
      align-items: center;
      gap: 8px;
      margin: 4px 0;
    }
  `,
})
export class ExecutionUpload {
  readonly cycleId = input.required<number>();
  /** Emitted after the log was stored. */
  readonly uploaded = output<ExecutionUploadResult>();
  private readonly api = inject(NightPlansApi);

  protected readonly columns = EXECUTION_CSV_COLUMNS;
  protected readonly matchMinutes = EXECUTION_MATCH_MINUTES;
  protected readonly maxBytes = MAX_EXECUTION_CSV_BYTES;
  protected readonly file = signal<File | null>(null);
  protected readonly uploading = signal(false);
  protected readonly outcome = signal<UploadOutcome | null>(null);

  protected chooseFile(file: File | null): void {
    this.file.set(file);
    this.outcome.set(null);
  }

  protected upload(): void {
    const file = this.file();
    if (!file || this.uploading()) return;
    this.uploading.set(true);
    this.outcome.set(null);
    this.api.uploadExecution(this.cycleId(), file).subscribe({
      next: (result) => {
        this.uploading.set(false);
        this.outcome.set({ kind: 'stored', result });
        this.uploaded.emit(result);
        // Stored: clear the chosen file so that it is not sent twice by mistake.
        this.file.set(null);
      },
      error: (error: unknown) => {
        this.uploading.set(false);
        this.outcome.set({ kind: 'refused', message: readApiError(error).message, rows: csvRowErrorsOf(error) });
      },
    });
  }
}
