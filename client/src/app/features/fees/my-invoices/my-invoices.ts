import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatIcon } from '@angular/material/icon';
import { MatSort, MatSortHeader, Sort } from '@angular/material/sort';
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
import { RouterLink } from '@angular/router';
import type { InvoiceState, InvoiceSummary } from '@spincycle/shared/billing/billing';
import { loadErrorText } from '../../../core/http/api-error-message';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { sortRows, type SortValue } from '../../../ui/table/sort-rows';
import { DayPipe } from '../../../ui/time/date-pipes';
import { BillingApi } from '../billing-api';
import { invoiceName, MinorUnitsPipe } from '../fees-format';
import { InvoiceStateChip } from '../invoice-state-chip/invoice-state-chip';

const COLUMNS = ['number', 'program', 'cycle', 'amount', 'due', 'state'] as const;

/** Sorting by state: overdue first, then awaiting payment, paid, refunded and voided. */
const STATE_ORDER: Record<InvoiceState, number> = { issued: 1, draft: 2, paid: 3, refunded: 4, void: 5 };

function stateRank(row: InvoiceSummary): number {
  return row.overdue ? 0 : STATE_ORDER[row.state];
}

function invoiceValue(row: InvoiceSummary, column: string): SortValue {
  switch (column) {
    case 'number':
      return row.number;
    case 'program':
      return row.programTitle;
    case 'cycle':
      return row.cycleCode;
    case 'amount':
      // Amounts of different currencies sort by currency first, never as one number.
      return `${row.currency} ${String(row.totalMinor).padStart(16, '0')}`;
    case 'due':
      return row.dueDate;
    case 'state':
      return stateRank(row);
    default:
      return null;
  }
}

/**
 * /fees, for billing contacts and PIs: the invoices of their programs (number, program, cycle,
 * amount, due date and state, overdue and pending refunds in words), sortable, each opening its
 * invoice. Drafts never appear: managers issue an invoice before its payers see it.
 */
@Component({
  selector: 'app-my-invoices',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    DayPipe,
    InvoiceStateChip,
    LoadStatus,
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
    MatSort,
    MatSortHeader,
    MatTable,
    MinorUnitsPipe,
    RouterLink,
  ],
  templateUrl: './my-invoices.html',
  styleUrl: './my-invoices.scss',
})
export default class MyInvoices {
  protected readonly invoices = inject(BillingApi).myInvoicesResource();
  protected readonly columns = COLUMNS;
  protected readonly name = invoiceName;
  /** The server's order (newest first) until a header is chosen. */
  protected readonly sort = signal<Sort>({ active: '', direction: '' });

  private readonly list = computed(() => (this.invoices.hasValue() ? (this.invoices.value() ?? []) : []));
  protected readonly rows = computed(() => sortRows(this.list(), this.sort(), invoiceValue));
  protected readonly overdue = computed(() => this.list().filter((i) => i.overdue).length);
  protected readonly error = computed(() => loadErrorText(this.invoices.error(), 'Your invoices could not be loaded.'));
  protected readonly empty = computed(() => this.invoices.hasValue() && this.list().length === 0);
}
