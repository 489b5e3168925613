import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatIcon } from '@angular/material/icon';
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

/**
 * The problems of a refused CSV upload, one row per bad row and column (row 0 is the header), in
 * a scrolling region of its own with the usual hint; used by every CSV upload of the product.
 */
@Component({
  selector: 'app-csv-row-errors',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    MatCell,
    MatCellDef,
    MatColumnDef,
    MatHeaderCell,
    MatHeaderCellDef,
    MatHeaderRow,
    MatHeaderRowDef,
    MatIcon,
    MatRow,
    MatRowDef,
    MatTable,
  ],
  template: `
    <div class="table-scroll dense row-errors" tabindex="0" role="region" aria-label="Problems in the uploaded file">
      <p class="table-scroll-hint">
        <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">swipe</mat-icon>Scroll sideways for more columns
      </p>
      <table mat-table [dataSource]="rows()" aria-label="Problems in the uploaded file" [attr.data-testid]="testId()">
        <ng-container matColumnDef="row">
          <th mat-header-cell *matHeaderCellDef class="num">Row</th>
          <td mat-cell *matCellDef="let problem" class="num">{{ problem.row === 0 ? 'header' : problem.row }}</td>
        </ng-container>
        <ng-container matColumnDef="field">
          <th mat-header-cell *matHeaderCellDef>Column</th>
          <td mat-cell *matCellDef="let problem">
            <code>{{ problem.field }}</code>
          </td>
        </ng-container>
        <ng-container matColumnDef="message">
          <th mat-header-cell *matHeaderCellDef>Problem</th>
          <td mat-cell *matCellDef="let problem">{{ problem.message }}</td>
        </ng-container>
        <tr mat-header-row *matHeaderRowDef="columns; sticky: true"></tr>
        <tr mat-row *matRowDef="let problem; columns: columns"></tr>
      </table>
    </div>
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
    .hint {
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-body-small);
    }
  `,
})
export class CsvRowErrors {
  readonly rows = input.required<readonly CsvRowError[]>();
  /** `data-testid` of the table. */
  readonly testId = input('row-errors');
  protected readonly columns = ['row', 'field', 'message'];
}
