import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIcon } from '@angular/material/icon';
import type { LightCurveRowError } from '@spincycle/shared/photometry/photometry';

/**
 * The problems of a refused light-curve upload, one line per file, row and column (row 0 is the
 * file as a whole), in a scrolling region of its own, with how many more there were when the
 * server listed only the first ones.
 */
@Component({
  selector: 'app-light-curve-errors',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DecimalPipe, MatIcon],
  template: `
    <div class="table-scroll dense row-errors" tabindex="0" role="region" aria-label="Problems in the uploaded files">
      <p class="table-scroll-hint">
        <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">swipe</mat-icon>Scroll sideways for more columns
      </p>
      <table aria-label="Problems in the uploaded files" data-testid="light-curve-row-errors">
        <thead>
          <tr>
            <th scope="col">File</th>
            <th scope="col" class="num">Row</th>
            <th scope="col">Column</th>
            <th scope="col">Problem</th>
          </tr>
        </thead>
        <tbody>
          @for (problem of rows(); track $index) {
            <tr>
              <td class="file">{{ problem.file }}</td>
              <td class="num">{{ problem.row === 0 ? 'whole file' : (problem.row | number) }}</td>
              <td>
                @if (problem.field && problem.field !== 'file') {
                  <code>{{ problem.field }}</code>
                } @else {
                  —
                }
              </td>
              <td>{{ withoutPlace(problem.message) }}</td>
            </tr>
          }
        </tbody>
      </table>
    </div>
    @if (more(); as more) {
      <p class="more" data-testid="light-curve-more-errors">
        …and {{ more | number }} more {{ more === 1 ? 'problem' : 'problems' }} like these.
      </p>
    }
    <p class="hint">Row 1 is the first row after the header.</p>
  `,
  styles: `
    :host {
      display: block;
    }
    .row-errors {
      margin-block-start: 8px;
      max-block-size: 360px;
      overflow-y: auto;
    }
    table {
      border-collapse: collapse;
      inline-size: 100%;
      font-variant-numeric: tabular-nums;
    }
    th,
    td {
      padding: 4px 12px;
      text-align: start;
      vertical-align: top;
      border-block-end: 1px solid var(--mat-sys-outline-variant);
    }
    th {
      font-weight: 600;
      white-space: nowrap;
      position: sticky;
      inset-block-start: 0;
      background: var(--mat-sys-surface);
    }
    .num {
      text-align: end;
      white-space: nowrap;
    }
    .file {
      overflow-wrap: anywhere;
      min-inline-size: 12ch;
    }
    .more {
      margin: 8px 0 0;
      font-weight: 500;
    }
    .hint {
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-body-small);
    }
  `,
})
export class LightCurveErrors {
  readonly rows = input.required<readonly LightCurveRowError[]>();
  /** Problems in all (the server lists the first ones only). */
  readonly total = input(0);
  protected readonly more = computed(() => Math.max(0, this.total() - this.rows().length));
  /** The message without its "row 12, mag: " lead: the table's own columns say where. */
  protected readonly withoutPlace = (message: string) => message.replace(/^(?:row \d+(?:, [^:]+)?|header): /, '');
}
