import { HttpErrorResponse } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, ElementRef, inject, input, output, signal, viewChild } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { CsvRowErrors } from '../../../ui/csv-row-errors/csv-row-errors';
import { MatProgressBar } from '@angular/material/progress-bar';
import { isApiErrorBody } from '@spincycle/shared/http/api-error';
import { EXECUTION_CSV_COLUMNS, EXECUTION_MATCH_MINUTES, type ExecutionUploadResult } from '@spincycle/shared/night-plans/night-plans';
import type { CsvRowError } from '@spincycle/shared/proposals/target-schemas';
import { readApiError } from '../../../core/http/api-error-message';
import { NightPlansApi } from '../night-plans-api';

type UploadOutcome = { kind: 'stored'; result: ExecutionUploadResult } | { kind: 'refused'; message: string; rows: CsvRowError[] };

/** The `rows` of a 400 body, tolerating their absence. */
function rowErrorsOf(error: unknown): CsvRowError[] {
  if (!(error instanceof HttpErrorResponse) || !isApiErrorBody(error.error)) return [];
  const rows = (error.error as { rows?: unknown }).rows;
  return Array.isArray(rows) ? (rows as CsvRowError[]) : [];
}

/**
 * Uploads the nodes' execution log (a CSV): each row marks a planned visit done or missed.
 * A refused file lists every bad row at once, as the target-list upload does, and nothing is stored.
 */
@Component({
  selector: 'app-execution-upload',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [CsvRowErrors, MatButton, MatIcon, MatProgressBar],
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
      <div class="file-picker">
        <input
          #fileInput
          type="file"
          hidden
          accept=".csv,text/csv"
          (change)="chooseFile($event)"
          [disabled]="uploading()"
          aria-label="Execution CSV file"
          data-testid="execution-input"
        />
        <button
          matButton="outlined"
          type="button"
          (click)="fileInput.click()"
          [disabled]="uploading()"
          aria-describedby="execution-file-name execution-columns"
          data-testid="choose-execution"
        >
          <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">attach_file</mat-icon>
          {{ file() ? 'Choose another CSV file' : 'Choose a CSV file' }}
        </button>
        <span id="execution-file-name" class="file-name" [class.none]="!file()" data-testid="execution-file-name">
          {{ file() ? file()!.name : 'No file chosen' }}
        </span>
      </div>
      <button matButton="filled" type="button" (click)="upload()" [disabled]="!file() || uploading()" data-testid="execution-upload">
        <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">upload</mat-icon>
        Upload
      </button>
    </div>
    <div class="bar-slot">
      @if (uploading()) {
        <mat-progress-bar mode="indeterminate" aria-label="Uploading the execution log" />
      }
    </div>
    <div class="results" aria-live="polite" aria-atomic="true" data-testid="execution-results">
      @if (outcome(); as o) {
        @if (o.kind === 'stored') {
          <p class="ok">
            <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">check_circle</mat-icon>
            {{ o.result.rows }} {{ o.result.rows === 1 ? 'row' : 'rows' }} read; {{ o.result.updated }}
            {{ o.result.updated === 1 ? 'visit' : 'visits' }} changed.
          </p>
        } @else {
          <div class="refused" role="alert">
            <p>
              <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">error</mat-icon>
              {{ o.message }}
              @if (o.rows.length) {
                Nothing was stored: fix the {{ o.rows.length }} {{ o.rows.length === 1 ? 'problem' : 'problems' }} below and upload the file
                again.
              }
            </p>
          </div>
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
    .file-picker {
      display: flex;
      align-items: center;
      gap: 12px;
      min-inline-size: 0;
      max-inline-size: 100%;
    }
    .file-name {
      min-inline-size: 0;
      max-inline-size: 32ch;
      overflow: hidden;
      text-overflow: ellipsis;
      white-space: nowrap;
    }
    .file-name.none {
      color: var(--mat-sys-on-surface-variant);
    }
    .bar-slot {
      min-block-size: 4px;
      margin-block: 8px;
    }
    .ok,
    .refused p {
      display: flex;
      align-items: center;
      gap: 8px;
      margin: 4px 0;
    }
    .refused {
      padding: 8px 12px;
      border-radius: var(--mat-sys-corner-medium);
      background: var(--mat-sys-error-container);
      color: var(--mat-sys-on-error-container);
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
  protected readonly file = signal<File | null>(null);
  protected readonly uploading = signal(false);
  protected readonly outcome = signal<UploadOutcome | null>(null);
  private readonly fileInput = viewChild<ElementRef<HTMLInputElement>>('fileInput');

  protected chooseFile(event: Event): void {
    const files = (event.target as HTMLInputElement).files;
    this.file.set(files && files.length ? files[0] : null);
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
        const el = this.fileInput()?.nativeElement;
        if (el) el.value = '';
      },
      error: (error: unknown) => {
        this.uploading.set(false);
        this.outcome.set({ kind: 'refused', message: readApiError(error).message, rows: rowErrorsOf(error) });
      },
    });
  }
}
