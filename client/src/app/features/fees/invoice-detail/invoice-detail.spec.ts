import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatDialog } from '@angular/material/dialog';
import { provideRouter } from '@angular/router';
import { BILLING_CAUTION, type InvoiceDetail } from '@spincycle/shared/billing/billing';
import { PAYMENT_POLL_LIMIT, PAYMENT_POLL_MS } from '../billing-api';
import { testAttempt, testInvoice } from '../testing/fee-fixtures';
import InvoiceDetailPage from './invoice-detail';

const URL = '/api/billing/invoices/22';

describe('InvoiceDetailPage', () => {
  let fixture: ComponentFixture<InvoiceDetailPage>;
  let backend: HttpTestingController;

  const el = () => fixture.nativeElement as HTMLElement;
  const q = (id: string) => el().querySelector(`[data-testid=${id}]`) as HTMLElement | null;
  const text = (id: string) => q(id)?.textContent?.replace(/\s+/g, ' ').trim() ?? '';
  const dialogQ = (id: string) => document.querySelector(`mat-dialog-container [data-testid=${id}]`) as HTMLElement | null;
  const turn = () => new Promise((resolve) => setTimeout(resolve));

  async function render(answer: InvoiceDetail | { status: number; body: object }, id = '22'): Promise<void> {
    TestBed.configureTestingModule({
      imports: [InvoiceDetailPage],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: PAYMENT_POLL_MS, useValue: 0 },
        { provide: PAYMENT_POLL_LIMIT, useValue: 5 },
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(InvoiceDetailPage);
    fixture.componentRef.setInput('invoiceId', id);
    // Not whenStable yet: the invoice's read holds it off until answered.
    TestBed.tick();
    fixture.detectChanges();
    if (id !== '22') return;
    expect(el().querySelector('mat-progress-bar')?.getAttribute('aria-label')).toBe('Loading the invoice');
    const req = backend.expectOne(URL);
    if ('status' in answer) req.flush(answer.body, { status: answer.status, statusText: 'Error' });
    else req.flush(answer);
    await fixture.whenStable();
  }

  afterEach(() => {
    TestBed.inject(MatDialog).closeAll();
    backend.verify();
  });

  it('shows number and state, bill-to, the lines with two-decimal hours and a total row, the due date and the caution', async () => {
    await render(testInvoice(22));
    expect(el().querySelector('h1')?.textContent).toBe('Invoice SC-2027-0022');
    expect(text('invoice-state')).toBe('Awaiting payment');
    expect(text('bill-to')).toContain('PI: Tamsin Orrel, Greyhollow Array');
    expect(el().textContent).toContain('Bram Ledgerwood (ledger@greyhollow.example)');
    const rows = [...el().querySelectorAll('[data-testid=invoice-lines] tbody tr')].map((r) =>
      [...r.children].map((c) => c.textContent?.trim()),
    );
    // The hand-worked lines of shared/src/billing/billing.spec.ts.
    expect(rows).toEqual([
      ['Node KRG-50 (Kestrel Ridge 50 cm), cycle 2027A', '12.50', 'EUR 45.00', 'EUR 562.50'],
      ['Node VHM-40 (Vale Hollow 40 cm), cycle 2027A', '7.25', 'EUR 33.33', 'EUR 241.64'],
      ['Node QSP-30 (Quill Spur 30 cm), cycle 2027A', '0.05', 'EUR 0.10', 'EUR 0.01'],
    ]);
    expect([...q('invoice-total')!.children].map((c) => c.textContent?.trim())).toEqual(['Total', 'EUR 804.15']);
    expect(text('invoice-due')).toBe('1 Apr 2027');
    expect(q('invoice-caution')?.querySelector('span')?.textContent).toBe(BILLING_CAUTION);
    expect(q('invoice-caution')?.getAttribute('role')).toBe('note');
    expect(text('no-payments')).toBe('No payment yet.');
    expect(q('invoice-pdf')?.getAttribute('href')).toBe('/api/billing/invoices/22/invoice.pdf');
    expect(q('invoice-pdf')?.hasAttribute('download')).toBe(true);
    // Not paid: no receipt.
    expect(q('receipt-pdf')).toBeNull();
    expect(text('pay-button')).toContain('Pay by card');
  });

  it('overdue is said in words; the payments list each attempt with its outcome, card and the processor’s message', async () => {
    await render(
      testInvoice(22, {
        overdue: true,
        payments: [
          testAttempt(8, { createdAt: '2027-03-05T10:15:00.000Z' }),
          testAttempt(9, { state: 'failed', message: 'The card processor could not be reached.', cardLast4: '4242' }),
        ],
      }),
    );
    expect(text('invoice-overdue')).toContain('Overdue');
    expect(text('invoice-due')).toContain('overdue: past its due date');
    const rows = [...el().querySelectorAll('[data-testid=invoice-payments] tbody tr')].map((r) =>
      [...r.children].map((c) => c.textContent?.trim()),
    );
    expect(rows).toEqual([
      ['5 Mar 2027, 10:15', 'Visa ending 4242', 'EUR 804.15', 'Card processor not reached', 'The card processor could not be reached.'],
      ['5 Mar 2027, 10:15', 'Visa ending 0002', 'EUR 804.15', 'Declined', 'Your card was declined.'],
    ]);
  });

  it('paid: the receipt link, no pay button', async () => {
    await render(testInvoice(22, { state: 'paid', paidAt: '2027-03-05T10:16:00.000Z', canPay: false }));
    expect(text('invoice-state')).toBe('Paid');
    expect(q('receipt-pdf')?.getAttribute('href')).toBe('/api/billing/invoices/22/receipt.pdf');
    expect(q('receipt-pdf')?.hasAttribute('download')).toBe(true);
    expect(q('pay-button')).toBeNull();
  });

  it('refunded: receipt link and the reason; a refund still pending says so', async () => {
    await render(
      testInvoice(22, {
        state: 'refunded',
        canPay: false,
        refundReason: 'Campaign cancelled by the facility.',
        refundedAt: '2027-03-20T09:00:00.000Z',
      }),
    );
    expect(text('invoice-state')).toBe('Refunded');
    expect(q('receipt-pdf')).not.toBeNull();
    expect(el().textContent).toContain('Campaign cancelled by the facility.');
    TestBed.resetTestingModule();
    await render(testInvoice(22, { state: 'paid', canPay: false, refundPending: true }));
    expect(text('invoice-refund-pending')).toContain('Refund pending');
    expect(text('invoice-facts')).toContain('Asked for; it shows as refunded when the card processor confirms it');
  });

  it('the PI who is not a billing contact sees who pays, and no pay button', async () => {
    await render(testInvoice(22, { canPay: false, canManage: false }));
    expect(q('pay-button')).toBeNull();
    expect(text('paid-by-contacts')).toContain("The program's billing contacts pay its invoices by card.");
  });

  it('pay flow: the dialog pays, waits for the confirmation, and the page then shows the invoice as paid', async () => {
    await render(testInvoice(22));
    (q('pay-button') as HTMLButtonElement).click();
    await fixture.whenStable();
    const type = (id: string, value: string) => {
      const input = dialogQ(id) as HTMLInputElement;
      input.value = value;
      input.dispatchEvent(new Event('input'));
    };
    type('card-number', '4242424242424242');
    type('exp-month', '12');
    type('exp-year', '2030');
    type('cvc', '123');
    await fixture.whenStable();
    (dialogQ('pay-submit') as HTMLButtonElement).click();
    const processing = testInvoice(22, { payments: [testAttempt(9, { state: 'processing', message: null })] });
    backend
      .expectOne(`${URL}/payments`)
      .flush({ state: 'processing', message: 'Accepted.', invoice: processing }, { status: 202, statusText: 'Accepted' });
    await fixture.whenStable();
    expect(dialogQ('pay-waiting')?.textContent).toContain("Payment accepted, waiting for the card processor's confirmation");
    await turn();
    const paid = testInvoice(22, { state: 'paid', paidAt: '2027-03-05T10:16:00.000Z', canPay: false, version: 4 });
    backend.expectOne(URL).flush(paid);
    await turn();
    await fixture.whenStable();
    expect(dialogQ('pay-receipt')?.getAttribute('href')).toBe('/api/billing/invoices/22/receipt.pdf');
    (dialogQ('pay-close') as HTMLButtonElement).click();
    await turn();
    await fixture.whenStable();
    expect(text('invoice-state')).toBe('Paid');
    expect(q('receipt-pdf')).not.toBeNull();
    expect(q('pay-button')).toBeNull();
  });

  it('an invoice the viewer may not see (404): the server’s sentence and a way to try again', async () => {
    await render({ status: 404, body: { code: 'invoice_not_found', message: 'No invoice 22' } });
    const alert = el().querySelector('[role=alert]');
    expect(alert?.textContent).toContain('The invoice could not be loaded. No invoice 22');
    expect(el().querySelector('h1')?.textContent).toBe('Invoice');
  });

  it('a malformed address reads nothing and says so', async () => {
    await render(testInvoice(22), 'abc');
    await fixture.whenStable();
    backend.expectNone(() => true);
    expect(el().querySelector('[role=alert]')?.textContent).toContain('There is no invoice at this address.');
  });
});
