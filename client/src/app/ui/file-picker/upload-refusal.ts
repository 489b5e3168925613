import { DecimalPipe } from '@angular/common';
import { HttpErrorResponse } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatIcon } from '@angular/material/icon';
import { isApiErrorBody } from '@spincycle/shared/http/api-error';
import type { CsvRowError } from '@spincycle/shared/proposals/target-schemas';

/** The `rows` of a refused CSV upload's 400 body (every bad row at once), or none. */
export function csvRowErrorsOf(error: unknown): CsvRowError[] {
  if (!(error instanceof HttpErrorResponse) || !isApiErrorBody(error.error)) return [];
  const rows = (error.error as { rows?: unknown }).rows;
  return Array.isArray(rows) ? (rows as CsvRowError[]) : [];
}

/**
 * The sentence of a refused upload: the server's message and, when it listed bad rows, that
 * nothing was stored and how many problems to fix (the rows themselves: CsvRowErrors, placed
 * outside the page's live region so that the table is not read out).
 */
@Component({
  selector: 'app-upload-refusal',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DecimalPipe, MatIcon],
  template: `
    <p role="alert">
      <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">error</mat-icon>
      <span>
        {{ message() }}
        @if (problems(); as count) {
          Nothing was stored: fix the {{ count | number }} {{ count === 1 ? 'problem' : 'problems' }} below and upload the file again.
        }
      </span>
    </p>
  `,
  styles: `
    :host {
      display: block;
      padding: 8px 12px;
      border-radius: var(--mat-sys-corner-medium);
      background: var(--mat-sys-error-container);
      color: var(--mat-sys-on-error-container);
    }
    p {
      display: flex;
      align-items: center;
      gap: 8px;
      margin: 4px 0;
    }
    mat-icon {
      flex: none;
    }
  `,
})
export class UploadRefusal {
  /** The server's message. */
  readonly message = input.required<string>();
  /** How many row problems it listed (0: none). */
  readonly problems = input(0);
}
