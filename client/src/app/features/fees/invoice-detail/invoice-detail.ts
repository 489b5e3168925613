import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIcon } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import { RATE_CLASS_LABELS, type InvoiceDetail } from '@spincycle/shared/billing/billing';
import { loadErrorText } from '../../../core/http/api-error-message';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { DayPipe, UtcInstantPipe } from '../../../ui/time/date-pipes';
import { BillingApi, invoicePdfUrl, receiptPdfUrl } from '../billing-api';
import { cardText, HundredthsPipe, invoiceName, MinorUnitsPipe, PAYMENT_STATE_LABELS } from '../fees-format';
import { InvoiceStateChip } from '../invoice-state-chip/invoice-state-chip';
import { PayDialog, type PayDialogData } from '../pay-dialog/pay-dialog';

/**
 * /fees/invoices/:invoiceId: one invoice for its payers (and the facility managers): number and
 * state, whom it bills, its lines (node-hours × rate per node), the due date, the caution that
 * the consortium's terms govern, the payments tried so far, the invoice and receipt PDFs, and
 * for a billing contact of an issued invoice the card payment.
 */
@Component({
  selector: 'app-invoice-detail',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DayPipe, HundredthsPipe, InvoiceStateChip, LoadStatus, MatButton, MatIcon, MinorUnitsPipe, RouterLink, UtcInstantPipe],
  templateUrl: './invoice-detail.html',
  styleUrl: './invoice-detail.scss',
})
export default class InvoiceDetailPage {
  /** Route parameter. */
  readonly invoiceId = input.required<string>();
  private readonly dialog = inject(MatDialog);

  protected readonly id = computed(() => {
    const id = Number(this.invoiceId());
    return Number.isInteger(id) && id > 0 ? id : null;
  });
  protected readonly invoice = inject(BillingApi).invoiceResource(this.id);
  protected readonly data = computed<InvoiceDetail | null>(() => (this.invoice.hasValue() ? (this.invoice.value() ?? null) : null));
  protected readonly error = computed(() => {
    if (this.id() === null) return 'There is no invoice at this address.';
    return loadErrorText(this.invoice.error(), 'The invoice could not be loaded.');
  });

  protected readonly name = invoiceName;
  protected readonly rateLabels = RATE_CLASS_LABELS;
  protected readonly paymentLabels = PAYMENT_STATE_LABELS;
  protected readonly card = cardText;
  protected readonly invoiceUrl = invoicePdfUrl;
  protected readonly receiptUrl = receiptPdfUrl;

  protected readonly hasReceipt = computed(() => {
    const state = this.data()?.state;
    return state === 'paid' || state === 'refunded';
  });
  /** Newest first, as people read a history. */
  protected readonly payments = computed(() => [...(this.data()?.payments ?? [])].sort((a, b) => b.id - a.id));
  /** An issued invoice the viewer sees but does not pay (the PI, when it is not a billing contact). */
  protected readonly paidByOthers = computed(() => {
    const i = this.data();
    return !!i && i.state === 'issued' && !i.canPay && !i.canManage;
  });

  protected openPay(): void {
    const invoice = this.data();
    if (!invoice?.canPay) return;
    this.dialog
      .open<PayDialog, PayDialogData, InvoiceDetail | null>(PayDialog, {
        data: { invoice },
        width: '560px',
        maxWidth: '96vw',
        autoFocus: 'first-tabbable',
      })
      .afterClosed()
      .subscribe((latest) => {
        // The dialog's newest read of the invoice; closed with Escape, read it again.
        if (latest) this.invoice.set(latest);
        else if (latest === undefined) this.invoice.reload();
      });
  }
}
