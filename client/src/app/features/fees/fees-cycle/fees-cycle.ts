import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
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
import {
  INVOICE_PAYMENT_DAYS,
  RATE_CLASS_LABELS,
  type FeesSummary,
  type InvoiceState,
  type InvoiceSummary,
  type RateClass,
} from '@spincycle/shared/billing/billing';
import { loadErrorText, readApiError } from '../../../core/http/api-error-message';
import { confirmAction } from '../../../ui/confirm-dialog/confirm-dialog';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { sortRows, type SortValue } from '../../../ui/table/sort-rows';
import { DayPipe, UtcInstantPipe } from '../../../ui/time/date-pipes';
import { BillingApi, type PreparedDrafts } from '../billing-api';
import { FeeTotalsChart } from '../fee-totals-chart/fee-totals-chart';
import { count, invoiceName, MinorUnitsPipe } from '../fees-format';
import { InvoiceStateChip } from '../invoice-state-chip/invoice-state-chip';
import { ReasonDialog, type ReasonDialogData, type ReasonDialogResult } from '../reason-dialog/reason-dialog';

const COLUMNS = ['number', 'program', 'rate', 'amount', 'due', 'state', 'actions'] as const;

export const STALE_MESSAGE =
  'Someone else changed this invoice meanwhile. The table now shows it as stored; try again if it still applies.';

const STATE_ORDER: Record<InvoiceState, number> = { draft: 1, issued: 2, paid: 3, refunded: 4, void: 5 };

function rowValue(row: InvoiceSummary, column: string): SortValue {
  switch (column) {
    case 'number':
      return row.number;
    case 'program':
      return row.programTitle;
    case 'rate':
      return row.rateClass;
    case 'amount':
      return `${row.currency} ${String(row.totalMinor).padStart(16, '0')}`;
    case 'due':
      return row.dueDate;
    case 'state':
      return row.overdue ? 0 : STATE_ORDER[row.state];
    default:
      return null;
  }
}

/** "2 drafts created and 1 brought up to date." */
export function preparedSummary(r: PreparedDrafts): string {
  if (!r.created && !r.updated) return 'Nothing to prepare: every awarded program already has its invoice.';
  const parts = [];
  if (r.created) parts.push(`${count(r.created, 'draft', 'drafts')} created`);
  if (r.updated) parts.push(`${r.created ? r.updated : count(r.updated, 'draft', 'drafts')} brought up to date`);
  return `${parts.join(' and ')}.`;
}

const otherRate = (r: RateClass): RateClass => (r === 'academic' ? 'external' : 'academic');

/**
 * /fees/manage/:cycleId, for facility managers: the fees of one cycle. Totals per currency as a
 * chart and a table; "Prepare drafts" from the awards and the rate card; the invoices with what
 * each allows (issue or discard a draft, void an issued invoice, refund a paid one) and the rate
 * each program pays; the rate card. An action on an invoice someone else changed meanwhile
 * reloads the table and says so.
 */
@Component({
  selector: 'app-fees-cycle',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    DayPipe,
    FeeTotalsChart,
    InvoiceStateChip,
    LoadStatus,
    MatButton,
    MatCell,
    MatCellDef,
    MatColumnDef,
    MatHeaderCell,
    MatHeaderCellDef,
    MatHeaderRow,
    MatHeaderRowDef,
    MatIcon,
    MatProgressBar,
    MatRow,
    MatRowDef,
    MatSort,
    MatSortHeader,
    MatTable,
    MinorUnitsPipe,
    RouterLink,
    UtcInstantPipe,
  ],
  templateUrl: './fees-cycle.html',
  styleUrl: './fees-cycle.scss',
})
export default class FeesCycle {
  /** Route parameter. */
  readonly cycleId = input.required<string>();
  private readonly api = inject(BillingApi);
  private readonly dialog = inject(MatDialog);

  protected readonly id = computed(() => {
    const id = Number(this.cycleId());
    return Number.isInteger(id) && id > 0 ? id : null;
  });
  protected readonly summary = this.api.summaryResource(this.id);
  protected readonly data = computed<FeesSummary | null>(() => (this.summary.hasValue() ? (this.summary.value() ?? null) : null));
  protected readonly error = computed(() => {
    if (this.id() === null) return 'There is no cycle at this address.';
    return loadErrorText(this.summary.error(), 'The fees of this cycle could not be loaded.');
  });

  protected readonly columns = COLUMNS;
  protected readonly name = invoiceName;
  /** Widened for the table's untyped row context. */
  protected readonly rateLabels: Readonly<Record<string, string>> = RATE_CLASS_LABELS;
  protected readonly sort = signal<Sort>({ active: '', direction: '' });
  protected readonly rows = computed(() => sortRows(this.data()?.invoices ?? [], this.sort(), rowValue));

  /** What a program pays as set on this page (the summary carries each invoice's rate only). */
  private readonly programRates = signal<ReadonlyMap<number, RateClass>>(new Map());
  /** The action under way: an invoice id, or 'prepare'. */
  protected readonly working = signal<number | 'prepare' | null>(null);
  protected readonly notice = signal<string | null>(null);
  protected readonly failure = signal<string | null>(null);

  /** The rate the program pays for its next drafts, as far as this page knows. */
  protected rateOf(row: InvoiceSummary): RateClass {
    return this.programRates().get(row.proposalId) ?? row.rateClass;
  }

  protected otherRateLabel(row: InvoiceSummary): string {
    return RATE_CLASS_LABELS[otherRate(this.rateOf(row))].toLowerCase();
  }

  private begin(what: number | 'prepare'): void {
    this.working.set(what);
    this.notice.set(null);
    this.failure.set(null);
  }

  private done(notice: string): void {
    this.working.set(null);
    this.notice.set(notice);
    this.summary.reload();
  }

  private failed(err: unknown, lead: string): void {
    this.working.set(null);
    const body = readApiError(err);
    if (body.code === 'stale_version') {
      this.failure.set(STALE_MESSAGE);
      this.summary.reload();
      return;
    }
    this.failure.set(`${lead} ${body.message}`);
  }

  protected prepare(): void {
    const id = this.id();
    if (id === null || this.working() !== null) return;
    this.begin('prepare');
    this.api.prepareDrafts(id).subscribe({
      next: (r) => this.done(preparedSummary(r)),
      error: (err: unknown) => this.failed(err, 'The drafts were not prepared.'),
    });
  }

  protected issue(row: InvoiceSummary): void {
    confirmAction(this.dialog, {
      title: `Issue the invoice for “${row.programTitle}”?`,
      message: `It gets the next invoice number of the year and a due date ${INVOICE_PAYMENT_DAYS} days from today, and is mailed with its PDF to the program's billing contacts (or to its PI when it has none). An issued invoice cannot be changed: it can only be voided.`,
      confirmLabel: 'Issue and mail',
    }).subscribe((yes) => {
      if (!yes) return;
      this.begin(row.id);
      this.api.issue(row.id, row.version).subscribe({
        next: (invoice) => this.done(`Invoice ${invoice.number ?? ''} issued and mailed for “${row.programTitle}”.`),
        error: (err: unknown) => this.failed(err, 'The invoice was not issued.'),
      });
    });
  }

  protected discard(row: InvoiceSummary): void {
    confirmAction(this.dialog, {
      title: 'Discard this draft?',
      message: `The draft for “${row.programTitle}” is deleted. “Prepare drafts” makes it again from the awards.`,
      confirmLabel: 'Discard draft',
      destructive: true,
    }).subscribe((yes) => {
      if (!yes) return;
      this.begin(row.id);
      this.api.discard(row.id, row.version).subscribe({
        next: () => this.done(`The draft for “${row.programTitle}” was discarded.`),
        error: (err: unknown) => this.failed(err, 'The draft was not discarded.'),
      });
    });
  }

  protected voidInvoice(row: InvoiceSummary): void {
    this.askReason(
      row,
      {
        heading: `Void invoice ${invoiceName(row)}`,
        message:
          'A voided invoice keeps its number and can no longer be paid; the program’s billing contacts are told by mail. “Prepare drafts” then makes a new draft for the program.',
        confirmLabel: 'Void invoice',
        version: row.version,
        send: (input) => this.api.void(row.id, input),
      },
      (number) => `Invoice ${number} voided; the billing contacts are told by mail.`,
    );
  }

  protected refund(row: InvoiceSummary): void {
    this.askReason(
      row,
      {
        heading: `Refund invoice ${invoiceName(row)}`,
        message:
          'The card processor is asked to refund the full amount. The invoice shows as refunded once the processor confirms it, and the billing contacts are then told by mail.',
        caution:
          'The money goes back to the card the invoice was paid with. The consortium’s own rules on refunds apply; Spincycle does not check them.',
        confirmLabel: 'Refund',
        version: row.version,
        send: (input) => this.api.refund(row.id, input),
      },
      (number) => `Refund of invoice ${number} asked for: it shows as refunded when the card processor confirms it.`,
    );
  }

  private askReason(row: InvoiceSummary, data: ReasonDialogData, notice: (number: string) => string): void {
    this.notice.set(null);
    this.failure.set(null);
    this.dialog
      .open<ReasonDialog, ReasonDialogData, ReasonDialogResult>(ReasonDialog, { data, width: '520px', autoFocus: 'first-tabbable' })
      .afterClosed()
      .subscribe((result) => {
        if (result === 'stale') {
          this.failure.set(STALE_MESSAGE);
          this.summary.reload();
        } else if (result) {
          this.done(notice(invoiceName(row)));
        }
      });
  }

  protected switchRate(row: InvoiceSummary): void {
    if (this.working() !== null) return;
    const next = otherRate(this.rateOf(row));
    this.begin(row.id);
    this.api.setRateClass(row.proposalId, next).subscribe({
      next: (r) => {
        this.programRates.update((m) => new Map(m).set(row.proposalId, r.rateClass));
        this.working.set(null);
        this.notice.set(
          `“${row.programTitle}” now pays the ${RATE_CLASS_LABELS[r.rateClass].toLowerCase()}. Prepare drafts to bring its draft up to date; issued invoices keep their rate.`,
        );
      },
      error: (err: unknown) => this.failed(err, 'The rate was not changed.'),
    });
  }
}
