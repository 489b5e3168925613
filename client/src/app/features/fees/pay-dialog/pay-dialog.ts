import { HttpErrorResponse } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, DestroyRef, inject, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogActions, MatDialogContent, MatDialogRef, MatDialogTitle } from '@angular/material/dialog';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { INVOICE_STATE_LABELS, type InvoiceDetail, type PaymentAttemptView } from '@spincycle/shared/billing/billing';
import { readApiError } from '../../../core/http/api-error-message';
import { applyServerFieldErrors, controlErrorMessage } from '../../../ui/forms/server-errors';
import { BillingApi, PAYMENT_POLL_LIMIT, PAYMENT_POLL_MS, receiptPdfUrl } from '../billing-api';
import { invoiceName, MinorUnitsPipe } from '../fees-format';
import { cardNumberCheck, cardPayment, cvcCheck, expMonthCheck, expYearCheck, nameOnCardCheck } from './card-fields';

export interface PayDialogData {
  invoice: InvoiceDetail;
}

/** Where the dialog stands: the card form, waiting for the processor's confirmation, paid, or no confirmation within the wait. */
export type PayPhase = 'form' | 'waiting' | 'paid' | 'timeout' | 'ended';

const ATTEMPT_ENDED: ReadonlySet<PaymentAttemptView['state']> = new Set(['declined', 'needs_authentication', 'failed']);

/** The newest attempt of an invoice (highest id). */
const newestAttempt = (i: InvoiceDetail): PaymentAttemptView | null =>
  i.payments.reduce<PaymentAttemptView | null>((a, p) => (!a || p.id > a.id ? p : a), null);

/**
 * Pays an issued invoice by card. The card fields are checked here as the server checks them
 * (payInvoiceSchema), sent once with the invoice's version, and dropped as soon as the card
 * processor has taken the payment or the dialog closes: they are never stored or logged.
 *
 * A 202 means the processor accepted the payment; the invoice becomes paid only when the
 * processor confirms it to the server, so the dialog reads the invoice every second (about a
 * minute at most) until it is paid. A declined card (402) shows the processor's message and
 * leaves the form open for another card, with the invoice's new version read again. Closes
 * with the latest invoice read, if any.
 */
@Component({
  selector: 'app-pay-dialog',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    MatButton,
    MatDialogActions,
    MatDialogContent,
    MatDialogTitle,
    MatError,
    MatFormField,
    MatHint,
    MatIcon,
    MatInput,
    MatLabel,
    MatProgressBar,
    MinorUnitsPipe,
    ReactiveFormsModule,
  ],
  templateUrl: './pay-dialog.html',
  styleUrl: './pay-dialog.scss',
})
export class PayDialog {
  private readonly data = inject<PayDialogData>(MAT_DIALOG_DATA);
  private readonly ref = inject(MatDialogRef<PayDialog, InvoiceDetail | null>);
  private readonly api = inject(BillingApi);
  private readonly pollMs = inject(PAYMENT_POLL_MS);
  private readonly pollLimit = inject(PAYMENT_POLL_LIMIT);

  /** The invoice as last read (its version is the one the next payment sends). */
  protected readonly invoice = signal<InvoiceDetail>(this.data.invoice);
  protected readonly phase = signal<PayPhase>('form');
  protected readonly sending = signal(false);
  /** Why the last payment did not go through (the processor's or the server's words). */
  protected readonly refusal = signal<string | null>(null);
  /** The sentence of a dialog that stopped for another reason (the invoice was voided meanwhile). */
  protected readonly ended = signal<string | null>(null);
  protected readonly errorOf = controlErrorMessage;
  protected readonly name = invoiceName;
  protected readonly receiptUrl = receiptPdfUrl;

  protected readonly form = new FormGroup({
    cardNumber: new FormControl('', { nonNullable: true, validators: [Validators.required, cardNumberCheck] }),
    expMonth: new FormControl('', { nonNullable: true, validators: [Validators.required, expMonthCheck] }),
    expYear: new FormControl('', { nonNullable: true, validators: [Validators.required, expYearCheck] }),
    cvc: new FormControl('', { nonNullable: true, validators: [Validators.required, cvcCheck] }),
    nameOnCard: new FormControl('', { nonNullable: true, validators: [nameOnCardCheck] }),
  });

  /** Whether the dialog has read a newer invoice than it was given (the page then shows it). */
  private changed = false;
  private timer: ReturnType<typeof setTimeout> | null = null;
  private polls = 0;
  /** The attempt the processor is confirming, when the answer named it. */
  private attemptId: number | null = null;

  constructor() {
    // The card fields live only as long as the dialog.
    this.ref.beforeClosed().subscribe(() => this.forgetCard());
    inject(DestroyRef).onDestroy(() => {
      this.stopPolling();
      this.forgetCard();
    });
  }

  protected pay(): void {
    if (this.sending() || this.phase() !== 'form') return;
    this.refusal.set(null);
    this.form.markAllAsTouched();
    if (this.form.invalid) return;
    const invoiceId = this.invoice().id;
    const payment = cardPayment(this.invoice().version, this.form.getRawValue());
    this.sending.set(true);
    this.ref.disableClose = true;
    this.api.pay(invoiceId, payment).subscribe({
      next: (outcome) => {
        this.sending.set(false);
        this.ref.disableClose = false;
        // The processor has the payment: the card fields are not needed any more.
        this.forgetCard();
        this.take(outcome.invoice);
        const attempt = newestAttempt(outcome.invoice);
        this.attemptId = attempt?.state === 'processing' ? attempt.id : null;
        if (!this.settle(outcome.invoice)) {
          this.phase.set('waiting');
          this.polls = 0;
          this.schedulePoll();
        }
      },
      error: (err: unknown) => {
        this.sending.set(false);
        this.ref.disableClose = false;
        this.refused(err);
      },
    });
  }

  /** A refused payment: the reason in words, the fields it names marked, and the invoice read again when its version moved. */
  private refused(err: unknown): void {
    const body = readApiError(err);
    const status = err instanceof HttpErrorResponse ? err.status : 0;
    if (body.fieldErrors) {
      const unmatched = applyServerFieldErrors(this.form, body.fieldErrors);
      this.refusal.set(unmatched.length ? `${body.message} ${unmatched.join(' ')}` : body.message);
      return;
    }
    this.refusal.set(body.message);
    if (status === 402) {
      // Another card (or the same one again) starts from an empty security code.
      this.form.controls.cvc.reset();
    }
    // A decline moves the invoice to a new version; a conflict says it changed: read it again.
    if (status === 402 || status === 409) this.reread();
  }

  private reread(): void {
    this.api.invoice(this.invoice().id).subscribe({
      next: (invoice) => {
        this.take(invoice);
        this.settle(invoice);
      },
      // The message already shown says what to do; a later payment meets the version check.
      error: () => undefined,
    });
  }

  private take(invoice: InvoiceDetail): void {
    this.invoice.set(invoice);
    this.changed = true;
  }

  /** Ends the dialog's work when the invoice is no longer one to pay; true when it did. */
  private settle(invoice: InvoiceDetail): boolean {
    if (invoice.state === 'paid' || invoice.state === 'refunded') {
      this.stopPolling();
      this.phase.set('paid');
      return true;
    }
    if (invoice.state !== 'issued') {
      this.stopPolling();
      this.ended.set(`This invoice is now ${INVOICE_STATE_LABELS[invoice.state].toLowerCase()}: there is nothing to pay.`);
      this.phase.set('ended');
      return true;
    }
    return false;
  }

  private schedulePoll(): void {
    if (this.timer !== null) return;
    this.timer = setTimeout(() => {
      this.timer = null;
      this.poll();
    }, this.pollMs);
  }

  private stopPolling(): void {
    if (this.timer !== null) clearTimeout(this.timer);
    this.timer = null;
  }

  private poll(): void {
    if (this.phase() !== 'waiting') return;
    this.polls += 1;
    this.api.invoice(this.invoice().id).subscribe({
      next: (invoice) => {
        if (this.phase() !== 'waiting') return;
        this.take(invoice);
        if (this.settle(invoice)) return;
        const attempt = this.attemptId === null ? undefined : invoice.payments.find((p) => p.id === this.attemptId);
        if (attempt && ATTEMPT_ENDED.has(attempt.state)) {
          // The processor declined after all: back to the form, with its words.
          this.refusal.set(attempt.message ?? 'The card processor did not accept the payment.');
          this.phase.set('form');
          return;
        }
        this.next();
      },
      error: () => this.next(),
    });
  }

  private next(): void {
    if (this.phase() !== 'waiting') return;
    if (this.polls >= this.pollLimit) {
      this.phase.set('timeout');
      return;
    }
    this.schedulePoll();
  }

  private forgetCard(): void {
    this.form.reset();
  }

  protected close(): void {
    this.stopPolling();
    this.ref.close(this.changed ? this.invoice() : null);
  }
}
