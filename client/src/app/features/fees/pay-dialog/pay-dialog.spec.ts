import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ChangeDetectionStrategy, Component } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatDialog, MatDialogRef } from '@angular/material/dialog';
import type { InvoiceDetail } from '@spincycle/shared/billing/billing';
import { PAYMENT_POLL_LIMIT, PAYMENT_POLL_MS } from '../billing-api';
import { testAttempt, testInvoice } from '../testing/fee-fixtures';
import { PayDialog, type PayDialogData } from './pay-dialog';

@Component({ changeDetection: ChangeDetectionStrategy.OnPush, template: '' })
class Opener {}

const PAY_URL = '/api/billing/invoices/22/payments';
const INVOICE_URL = '/api/billing/invoices/22';

describe('PayDialog', () => {
  let fixture: ComponentFixture<Opener>;
  let backend: HttpTestingController;
  let ref: MatDialogRef<PayDialog, InvoiceDetail | null>;
  let closedWith: InvoiceDetail | null | undefined | 'open';
  const logs: jest.SpyInstance[] = [];

  const host = () => document.getElementById(ref.id) as HTMLElement;
  const q = (id: string) => host().querySelector(`[data-testid=${id}]`) as HTMLElement | null;
  const text = (id: string) => q(id)?.textContent?.replace(/\s+/g, ' ').trim() ?? '';
  /** One turn of the event loop: a poll's timer (0 ms in these tests) fires. */
  const turn = () => new Promise((resolve) => setTimeout(resolve));
  const stable = async () => {
    await turn();
    await fixture.whenStable();
  };

  async function open(invoice = testInvoice(22)): Promise<void> {
    TestBed.configureTestingModule({
      imports: [Opener],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: PAYMENT_POLL_MS, useValue: 0 },
        { provide: PAYMENT_POLL_LIMIT, useValue: 3 },
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(Opener);
    ref = TestBed.inject(MatDialog).open<PayDialog, PayDialogData, InvoiceDetail | null>(PayDialog, { data: { invoice } });
    closedWith = 'open';
    ref.afterClosed().subscribe((result) => (closedWith = result));
    await fixture.whenStable();
  }

  async function type(id: string, value: string): Promise<void> {
    const input = q(id) as HTMLInputElement;
    input.value = value;
    input.dispatchEvent(new Event('input'));
    input.dispatchEvent(new Event('blur'));
    await fixture.whenStable();
  }

  async function fillCard(card = '4242 4242 4242 4242'): Promise<void> {
    await type('card-number', card);
    await type('exp-month', '07');
    await type('exp-year', '2031');
    await type('cvc', '314');
    await type('name-on-card', 'Bram Ledgerwood');
  }

  async function submit(): Promise<void> {
    (q('pay-submit') as HTMLButtonElement).click();
    await fixture.whenStable();
  }

  const cardInputs = () => ['card-number', 'exp-month', 'exp-year', 'cvc', 'name-on-card'].map((id) => (q(id) as HTMLInputElement)?.value);

  beforeEach(() => {
    // The card fields must never reach a log.
    for (const method of ['log', 'info', 'warn', 'error', 'debug'] as const) logs.push(jest.spyOn(console, method));
  });

  afterEach(() => {
    TestBed.inject(MatDialog).closeAll();
    backend.verify();
    for (const spy of logs) {
      for (const call of spy.mock.calls) expect(JSON.stringify(call)).not.toMatch(/4242|4000000000000002|314/);
      spy.mockRestore();
    }
    logs.length = 0;
  });

  it('the form: card fields with their autocomplete names, the card processor line and the amount on the button', async () => {
    await open();
    const auto = (id: string) => q(id)?.getAttribute('autocomplete');
    expect([auto('card-number'), auto('exp-month'), auto('exp-year'), auto('cvc'), auto('name-on-card')]).toEqual([
      'cc-number',
      'cc-exp-month',
      'cc-exp-year',
      'cc-csc',
      'cc-name',
    ]);
    expect(q('card-number')?.getAttribute('inputmode')).toBe('numeric');
    expect(text('pay-privacy')).toContain('go to the card processor');
    expect(text('pay-privacy')).toContain('Spincycle does not store them');
    // 80 415 minor units (the hand-worked invoice of the fixtures).
    expect(text('pay-submit')).toBe('Pay EUR 804.15');
    expect(host().querySelector('h2')?.textContent).toContain('Pay invoice SC-2027-0022');
  });

  it('bad fields are named beside each field and nothing is sent', async () => {
    await open();
    await type('card-number', '4242 4242 4242 4241');
    await type('exp-month', '13');
    await type('exp-year', '1999');
    await type('cvc', '12');
    await submit();
    backend.expectNone(PAY_URL);
    expect(text('card-number-error')).toBe('is not a valid card number (check the digits)');
    expect(text('exp-month-error')).toBe('must be a month from 1 to 12');
    expect(text('exp-year-error')).toBe('must be a year such as 2029');
    expect(text('cvc-error')).toBe('must be 3 or 4 digits');
  });

  it('202, then polling every turn until the invoice is paid: waiting bar, then paid with the receipt link', async () => {
    await open();
    await fillCard();
    await submit();
    const req = backend.expectOne(PAY_URL);
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({
      version: 3,
      cardNumber: '4242424242424242',
      expMonth: 7,
      expYear: 2031,
      cvc: '314',
      nameOnCard: 'Bram Ledgerwood',
    });
    expect((q('pay-submit') as HTMLButtonElement).disabled).toBe(true);
    const processing = testInvoice(22, { payments: [testAttempt(9, { state: 'processing', message: null, cardLast4: '4242' })] });
    req.flush(
      { state: 'processing', message: 'The card processor accepted the payment.', invoice: processing },
      { status: 202, statusText: 'Accepted' },
    );
    await fixture.whenStable();

    expect(text('pay-waiting')).toContain("Payment accepted, waiting for the card processor's confirmation");
    expect(q('pay-waiting')?.getAttribute('role')).toBe('status');
    expect(host().querySelector('mat-progress-bar')?.getAttribute('mode')).toBe('indeterminate');
    // The card fields are gone once the processor has the payment.
    expect(q('card-number')).toBeNull();

    await stable();
    backend.expectOne(INVOICE_URL).flush(processing);
    await stable();
    const paid = testInvoice(22, {
      state: 'paid',
      paidAt: '2027-03-05T10:16:00.000Z',
      canPay: false,
      version: 4,
      payments: [testAttempt(9, { state: 'succeeded', message: null, cardLast4: '4242' })],
    });
    backend.expectOne(INVOICE_URL).flush(paid);
    await stable();
    expect(text('pay-paid')).toContain('Paid.');
    expect(q('pay-receipt')?.getAttribute('href')).toBe('/api/billing/invoices/22/receipt.pdf');
    expect(q('pay-receipt')?.hasAttribute('download')).toBe(true);
    // No more reads once paid.
    await stable();
    backend.expectNone(INVOICE_URL);
    (q('pay-close') as HTMLButtonElement).click();
    await fixture.whenStable();
    expect(closedWith).toEqual(paid);
  });

  it('no confirmation within the wait: a plain message to reload later, and the reads stop', async () => {
    await open();
    await fillCard();
    await submit();
    const processing = testInvoice(22, { payments: [testAttempt(9, { state: 'processing', message: null })] });
    backend
      .expectOne(PAY_URL)
      .flush({ state: 'processing', message: 'Accepted.', invoice: processing }, { status: 202, statusText: 'Accepted' });
    for (let i = 0; i < 3; i++) {
      await stable();
      backend.expectOne(INVOICE_URL).flush(processing);
    }
    await stable();
    backend.expectNone(INVOICE_URL);
    expect(text('pay-timeout')).toContain('has not confirmed the payment yet');
    expect(text('pay-timeout')).toContain('reload the invoice in a few minutes');
  });

  it('402: the processor’s message as an alert, the dialog stays open for another card with the version read again', async () => {
    await open();
    await fillCard('4000 0000 0000 0002');
    await submit();
    backend
      .expectOne(PAY_URL)
      .flush({ code: 'card_declined', message: 'Your card was declined.' }, { status: 402, statusText: 'Payment Required' });
    await fixture.whenStable();
    expect(q('pay-refusal')?.getAttribute('role')).toBe('alert');
    expect(text('pay-refusal')).toBe('Your card was declined.');
    // The security code is asked again; the form stays.
    expect(cardInputs()).toEqual(['4000 0000 0000 0002', '07', '2031', '', 'Bram Ledgerwood']);
    backend.expectOne(INVOICE_URL).flush(testInvoice(22, { version: 4, payments: [testAttempt(8)] }));
    await fixture.whenStable();
    expect(closedWith).toBe('open');

    await type('card-number', '4242 4242 4242 4242');
    await type('cvc', '314');
    await submit();
    const again = backend.expectOne(PAY_URL);
    expect(again.request.body.version).toBe(4);
    again.flush(
      { state: 'processing', message: 'Accepted.', invoice: testInvoice(22, { state: 'paid', version: 5 }) },
      { status: 202, statusText: 'Accepted' },
    );
    await fixture.whenStable();
    expect(text('pay-paid')).toContain('Paid.');
  });

  it('a decline the processor reports while we wait goes back to the form with its message', async () => {
    await open();
    await fillCard();
    await submit();
    const processing = testInvoice(22, { payments: [testAttempt(9, { state: 'processing', message: null })] });
    backend
      .expectOne(PAY_URL)
      .flush({ state: 'processing', message: 'Accepted.', invoice: processing }, { status: 202, statusText: 'Accepted' });
    await stable();
    backend
      .expectOne(INVOICE_URL)
      .flush(
        testInvoice(22, { version: 4, payments: [testAttempt(9, { state: 'declined', message: 'Insufficient funds on the card.' })] }),
      );
    await stable();
    expect(text('pay-refusal')).toBe('Insufficient funds on the card.');
    // The fields start empty: the earlier card is not kept.
    expect(cardInputs()).toEqual(['', '', '', '', '']);
    backend.expectNone(INVOICE_URL);
  });

  it('503: the server’s message, the form kept for a retry with the same version', async () => {
    await open();
    await fillCard();
    await submit();
    backend.expectOne(PAY_URL).flush(
      {
        code: 'payment_provider_unavailable',
        message: 'The card processor cannot be reached just now, so nothing was done. Try again in a few minutes.',
      },
      { status: 503, statusText: 'Service Unavailable' },
    );
    await fixture.whenStable();
    expect(text('pay-refusal')).toContain('cannot be reached just now');
    backend.expectNone(INVOICE_URL);
    await submit();
    expect(backend.expectOne(PAY_URL).request.body.version).toBe(3);
  });

  it('409: the message, and the invoice read again (a voided invoice ends the dialog)', async () => {
    await open();
    await fillCard();
    await submit();
    backend
      .expectOne(PAY_URL)
      .flush({ code: 'invoice_not_payable', message: 'Invoice SC-2027-0022 is void.' }, { status: 409, statusText: 'Conflict' });
    await fixture.whenStable();
    expect(text('pay-refusal')).toBe('Invoice SC-2027-0022 is void.');
    backend.expectOne(INVOICE_URL).flush(testInvoice(22, { state: 'void', canPay: false, version: 4 }));
    await fixture.whenStable();
    expect(text('pay-ended')).toBe('This invoice is now voided: there is nothing to pay.');
  });

  it('400 with field errors puts each message under its field', async () => {
    await open();
    await fillCard();
    await submit();
    backend
      .expectOne(PAY_URL)
      .flush(
        { code: 'validation_failed', message: 'Check the card fields.', fieldErrors: { cvc: ['must be 3 or 4 digits'] } },
        { status: 400, statusText: 'Bad Request' },
      );
    await fixture.whenStable();
    expect(text('cvc-error')).toBe('must be 3 or 4 digits');
  });

  it('Cancel closes with nothing changed, and a new dialog starts with empty fields', async () => {
    await open();
    await fillCard();
    (Array.from(host().querySelectorAll('button')).find((b) => b.textContent?.trim() === 'Cancel') as HTMLButtonElement).click();
    await fixture.whenStable();
    expect(closedWith).toBeNull();
    ref = TestBed.inject(MatDialog).open<PayDialog, PayDialogData, InvoiceDetail | null>(PayDialog, { data: { invoice: testInvoice(22) } });
    await fixture.whenStable();
    expect(cardInputs()).toEqual(['', '', '', '', '']);
  });
});
