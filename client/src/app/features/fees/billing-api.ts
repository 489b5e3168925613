import { HttpClient, httpResource } from '@angular/common/http';
import { inject, Injectable, InjectionToken } from '@angular/core';
import type {
  FeesCycleSummary,
  FeesSummary,
  InvoiceDetail,
  InvoiceSummary,
  PaymentOutcome,
  ProgramBilling,
  RateClass,
  VersionedReasonInput,
} from '@spincycle/shared/billing/billing';
import { Observable } from 'rxjs';

const BASE = '/api/billing';

/** How often the pay dialog reads the invoice while the card processor confirms a payment. */
export const PAYMENT_POLL_MS = new InjectionToken<number>('PAYMENT_POLL_MS', { factory: () => 1000 });
/** How many reads the pay dialog makes before it stops waiting and asks to reload later (about a minute). */
export const PAYMENT_POLL_LIMIT = new InjectionToken<number>('PAYMENT_POLL_LIMIT', { factory: () => 60 });

/**
 * The card fields of one payment, as the pay dialog sends them (payInvoiceSchema in shared).
 * They go to our server and on to the card processor only: never stored, never logged.
 */
export interface CardPayment {
  version: number;
  cardNumber: string;
  expMonth: number;
  expYear: number;
  cvc: string;
  nameOnCard?: string;
}

/** What preparing the drafts of a cycle did. */
export interface PreparedDrafts {
  created: number;
  updated: number;
}

/** What accepting a billing-contact invitation gives: the program now billed to the viewer. */
export interface AcceptedBillingInvitation {
  proposalId: number;
  programTitle: string;
}

/** The two files of an invoice (plain links: the browser downloads them with the session cookie). */
export const invoicePdfUrl = (id: number) => `${BASE}/invoices/${id}/invoice.pdf`;
export const receiptPdfUrl = (id: number) => `${BASE}/invoices/${id}/receipt.pdf`;

/**
 * All HTTP of the fees: the payer's invoices, one invoice and its card payment; the facility
 * managers' cycles, fees summary, drafts, issue, discard, void, refund and a program's rate; a
 * program's billing contacts and the acceptance of an invitation. Resources must be created in
 * an injection context; a getter returning null reads nothing.
 */
@Injectable({ providedIn: 'root' })
export class BillingApi {
  private readonly http = inject(HttpClient);

  // ---- payers ----------------------------------------------------------------------------------

  /** GET /api/billing/invoices: the viewer's invoices (billing contact or PI of the program), newest first. */
  myInvoicesResource() {
    return httpResource<InvoiceSummary[]>(() => `${BASE}/invoices`);
  }

  /** GET /api/billing/invoices/:id (404 to anyone who may not see it). */
  invoiceResource(invoiceId: () => number | null) {
    return httpResource<InvoiceDetail>(() => {
      const id = invoiceId();
      return id === null ? undefined : `${BASE}/invoices/${id}`;
    });
  }

  /** GET /api/billing/invoices/:id once (the pay dialog's reads while a payment is confirmed). */
  invoice(invoiceId: number): Observable<InvoiceDetail> {
    return this.http.get<InvoiceDetail>(`${BASE}/invoices/${invoiceId}`);
  }

  /**
   * POST /api/billing/invoices/:id/payments → 202 with the payment's outcome (the invoice is paid
   * once the card processor confirms it). 402 `card_declined` (the processor's message) or
   * `card_needs_authentication`, 503 `payment_provider_unavailable`, 409 `stale_version`,
   * `invoice_not_payable` or `payment_in_progress`, 400 naming the card field.
   */
  pay(invoiceId: number, payment: CardPayment): Observable<PaymentOutcome> {
    return this.http.post<PaymentOutcome>(`${BASE}/invoices/${invoiceId}/payments`, payment);
  }

  // ---- facility managers -----------------------------------------------------------------------

  /** GET /api/billing/cycles: cycles whose awards are released, newest first. */
  cyclesResource() {
    return httpResource<FeesCycleSummary[]>(() => `${BASE}/cycles`);
  }

  /** GET /api/billing/cycles/:cycleId: totals per currency, the invoices, the programs still to invoice, the rate card. */
  summaryResource(cycleId: () => number | null) {
    return httpResource<FeesSummary>(() => {
      const id = cycleId();
      return id === null ? undefined : `${BASE}/cycles/${id}`;
    });
  }

  /** POST /api/billing/cycles/:cycleId/invoices: a draft for each awarded program and currency without one; drafts brought up to date. */
  prepareDrafts(cycleId: number): Observable<PreparedDrafts> {
    return this.http.post<PreparedDrafts>(`${BASE}/cycles/${cycleId}/invoices`, {});
  }

  /** POST /api/billing/invoices/:id/issue: numbers the draft and mails it. */
  issue(invoiceId: number, version: number): Observable<InvoiceDetail> {
    return this.http.post<InvoiceDetail>(`${BASE}/invoices/${invoiceId}/issue`, { version });
  }

  /** DELETE /api/billing/invoices/:id?version= (a draft only). */
  discard(invoiceId: number, version: number): Observable<void> {
    return this.http.delete<void>(`${BASE}/invoices/${invoiceId}`, { params: { version } });
  }

  /** POST /api/billing/invoices/:id/void: an issued, unpaid invoice, with the reason. */
  void(invoiceId: number, input: VersionedReasonInput): Observable<InvoiceDetail> {
    return this.http.post<InvoiceDetail>(`${BASE}/invoices/${invoiceId}/void`, input);
  }

  /** POST /api/billing/invoices/:id/refund: asks the card processor to refund a paid invoice (503 when it cannot be reached). */
  refund(invoiceId: number, input: VersionedReasonInput): Observable<InvoiceDetail> {
    return this.http.post<InvoiceDetail>(`${BASE}/invoices/${invoiceId}/refund`, input);
  }

  /** PUT /api/billing/programs/:proposalId/rate-class: the rate the program's next drafts use. */
  setRateClass(proposalId: number, rateClass: RateClass): Observable<{ rateClass: RateClass }> {
    return this.http.put<{ rateClass: RateClass }>(`${BASE}/programs/${proposalId}/rate-class`, { rateClass });
  }

  // ---- billing contacts ------------------------------------------------------------------------

  /** GET /api/billing/programs/:proposalId: the program's billing contacts (404 when there is no program). */
  programResource(proposalId: () => number | null) {
    return httpResource<ProgramBilling>(() => {
      const id = proposalId();
      return id === null ? undefined : `${BASE}/programs/${id}`;
    });
  }

  /** POST /api/billing/programs/:proposalId/contacts: invites a billing contact by e-mail. */
  inviteContact(proposalId: number, email: string): Observable<ProgramBilling> {
    return this.http.post<ProgramBilling>(`${BASE}/programs/${proposalId}/contacts`, { email });
  }

  /** DELETE /api/billing/programs/:proposalId/contacts/:contactId. */
  removeContact(proposalId: number, contactId: number): Observable<ProgramBilling> {
    return this.http.delete<ProgramBilling>(`${BASE}/programs/${proposalId}/contacts/${contactId}`);
  }

  /** POST /api/billing/contact-invitations/:token: 404 when the link is used, replaced or too old; 403 for another address. */
  acceptInvitation(token: string): Observable<AcceptedBillingInvitation> {
    return this.http.post<AcceptedBillingInvitation>(`${BASE}/contact-invitations/${encodeURIComponent(token)}`, {});
  }
}
