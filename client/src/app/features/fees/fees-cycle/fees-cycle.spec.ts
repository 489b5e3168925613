import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting, TestRequest } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatDialog } from '@angular/material/dialog';
import { provideRouter } from '@angular/router';
import type { FeesSummary } from '@spincycle/shared/billing/billing';
import { testFeesSummary, testInvoice, testInvoiceSummary } from '../testing/fee-fixtures';
import FeesCycle, { preparedSummary, STALE_MESSAGE } from './fees-cycle';

const URL = '/api/billing/cycles/7';

describe('preparedSummary', () => {
  it('says what preparing did, in words', () => {
    expect(preparedSummary({ created: 2, updated: 1 })).toBe('2 drafts created and 1 brought up to date.');
    expect(preparedSummary({ created: 1, updated: 0 })).toBe('1 draft created.');
    expect(preparedSummary({ created: 0, updated: 3 })).toBe('3 drafts brought up to date.');
    expect(preparedSummary({ created: 0, updated: 0 })).toBe('Nothing to prepare: every awarded program already has its invoice.');
  });
});

describe('FeesCycle', () => {
  let fixture: ComponentFixture<FeesCycle>;
  let backend: HttpTestingController;

  const el = () => fixture.nativeElement as HTMLElement;
  const q = (id: string) => el().querySelector(`[data-testid=${id}]`) as HTMLElement | null;
  const text = (id: string) => q(id)?.textContent?.replace(/\s+/g, ' ').trim() ?? '';
  const dialog = () => document.querySelector('mat-dialog-container') as HTMLElement | null;
  const dialogButton = (label: string) =>
    [...(dialog()?.querySelectorAll('button') ?? [])].find((b) => b.textContent?.trim() === label) as HTMLButtonElement;
  const settle = async () => {
    await new Promise((resolve) => setTimeout(resolve));
    await fixture.whenStable();
  };

  async function render(summary: FeesSummary = testFeesSummary()): Promise<void> {
    TestBed.configureTestingModule({
      imports: [FeesCycle],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(FeesCycle);
    fixture.componentRef.setInput('cycleId', '7');
    TestBed.tick();
    fixture.detectChanges();
    expect(el().querySelector('mat-progress-bar')?.getAttribute('aria-label')).toBe('Loading the fees of the cycle');
    backend.expectOne(URL).flush(summary);
    await fixture.whenStable();
  }

  /** The summary is read again after an action. */
  async function reread(summary: FeesSummary = testFeesSummary()): Promise<void> {
    TestBed.tick();
    backend.expectOne(URL).flush(summary);
    await fixture.whenStable();
  }

  afterEach(() => {
    TestBed.inject(MatDialog).closeAll();
    backend.verify();
  });

  it('the cycle, totals as a chart and a table, programs still to invoice, the invoices with their actions, and the rate card', async () => {
    await render();
    expect(el().querySelector('h1')?.textContent).toBe('Fees of 2027A');
    expect(q('fee-chart-EUR')).not.toBeNull();
    expect(q('fee-totals-EUR')).not.toBeNull();
    expect(text('programs-to-invoice')).toContain('2 awarded programs have no invoice yet.');
    const row = (id: number) => q(`cycle-invoice-${id}`)!;
    expect(row(21).querySelector('a')?.textContent).toBe('Draft');
    expect(row(21).querySelector('a')?.getAttribute('href')).toBe('/fees/invoices/21');
    // What each state allows: a draft is issued or discarded; an issued invoice voided; a paid one refunded.
    const actions = (id: number) => [...row(id).querySelectorAll('.row-actions button')].map((b) => b.getAttribute('data-testid'));
    expect(actions(21)).toEqual(['issue-21', 'discard-21']);
    expect(actions(22)).toEqual(['void-22']);
    expect(actions(23)).toEqual(['refund-23']);
    // Each button's name begins with its visible word and names the invoice or the program.
    expect(q('issue-21')?.textContent?.replace(/\s+/g, ' ').trim()).toBe('Issue the draft for “Dwarfs of the far field”');
    expect(q('void-22')?.textContent?.replace(/\s+/g, ' ').trim()).toBe('Void invoice SC-2027-0022');
    const rates = [...el().querySelectorAll('[data-testid=rate-card] tbody tr')].map((r) =>
      [...r.children].map((c) => c.textContent?.replace(/\s+/g, ' ').trim()),
    );
    expect(rates).toEqual([
      ['KRG-50 · Kestrel Ridge 50 cm', 'EUR', 'EUR 45.00', 'EUR 90.00'],
      ['VHM-40 · Vale Hollow 40 cm', 'EUR', 'EUR 33.33', 'EUR 33.33'],
    ]);
  });

  it('a paid invoice with a refund pending offers no second refund', async () => {
    const summary = testFeesSummary();
    summary.invoices = [testInvoiceSummary(23, { state: 'paid', refundPending: true })];
    await render(summary);
    expect(q('refund-23')).toBeNull();
    expect(q('cycle-invoice-23')?.textContent).toContain('Refund pending');
  });

  it('Prepare drafts: posts, says how many were made, and reads the fees again', async () => {
    await render();
    (q('prepare-drafts') as HTMLButtonElement).click();
    await fixture.whenStable();
    const req = backend.expectOne('/api/billing/cycles/7/invoices');
    expect(req.request.method).toBe('POST');
    expect(el().querySelector('mat-progress-bar[aria-label="Preparing the drafts"]')).not.toBeNull();
    expect((q('prepare-drafts') as HTMLButtonElement).disabled).toBe(true);
    req.flush({ created: 2, updated: 1 });
    await reread(testFeesSummary({ programsToInvoice: 0 }));
    expect(text('fees-notice')).toBe('2 drafts created and 1 brought up to date.');
    expect(text('programs-to-invoice')).toContain('Every awarded program has its invoice.');
  });

  it('Issue: a confirmation saying it will be numbered and mailed, then the POST with the version', async () => {
    await render();
    (q('issue-21') as HTMLButtonElement).click();
    await settle();
    expect(dialog()?.textContent).toContain('gets the next invoice number of the year');
    expect(dialog()?.textContent).toContain('is mailed with its PDF to the program');
    dialogButton('Issue and mail').click();
    await settle();
    const req = backend.expectOne('/api/billing/invoices/21/issue');
    expect(req.request.body).toEqual({ version: 1 });
    req.flush(testInvoice(21, { number: 'SC-2027-0031' }));
    await reread();
    expect(text('fees-notice')).toBe('Invoice SC-2027-0031 issued and mailed for “Dwarfs of the far field”.');
  });

  it('Issue cancelled: nothing is sent', async () => {
    await render();
    (q('issue-21') as HTMLButtonElement).click();
    await settle();
    dialogButton('Cancel').click();
    await settle();
    backend.expectNone('/api/billing/invoices/21/issue');
  });

  it('409 stale_version: the table is read again and the page says so', async () => {
    await render();
    (q('discard-21') as HTMLButtonElement).click();
    await settle();
    dialogButton('Discard draft').click();
    await settle();
    const req = backend.expectOne((r) => r.url === '/api/billing/invoices/21');
    expect(req.request.method).toBe('DELETE');
    expect(req.request.params.get('version')).toBe('1');
    req.flush({ code: 'stale_version', message: 'The invoice changed since you opened it.' }, { status: 409, statusText: 'Conflict' });
    await reread();
    expect(text('fees-failure')).toBe(STALE_MESSAGE);
    expect(q('fees-failure')?.getAttribute('role')).toBe('alert');
  });

  it('Void: a reason is required; with one, it posts version and reason and says the contacts are told', async () => {
    await render();
    (q('void-22') as HTMLButtonElement).click();
    await settle();
    expect(dialog()?.querySelector('h2')?.textContent).toContain('Void invoice SC-2027-0022');
    (dialog()!.querySelector('[data-testid=reason-confirm]') as HTMLButtonElement).click();
    await settle();
    backend.expectNone('/api/billing/invoices/22/void');
    expect(dialog()?.querySelector('[data-testid=reason-error]')?.textContent?.trim()).toBe(
      'Give a reason: it is kept with the invoice’s history.',
    );
    const reason = dialog()!.querySelector('textarea') as HTMLTextAreaElement;
    reason.value = '  Billed to the wrong program.  ';
    reason.dispatchEvent(new Event('input'));
    await fixture.whenStable();
    (dialog()!.querySelector('[data-testid=reason-confirm]') as HTMLButtonElement).click();
    await settle();
    const req = backend.expectOne('/api/billing/invoices/22/void');
    expect(req.request.body).toEqual({ version: 3, reason: 'Billed to the wrong program.' });
    req.flush(testInvoice(22, { state: 'void', voidReason: 'Billed to the wrong program.' }));
    await new Promise((resolve) => setTimeout(resolve));
    await reread();
    expect(dialog()).toBeNull();
    expect(text('fees-notice')).toBe('Invoice SC-2027-0022 voided; the billing contacts are told by mail.');
  });

  it('Refund: the caution about the card and the consortium’s rules; a 503 stays in the dialog with the server’s words', async () => {
    await render();
    (q('refund-23') as HTMLButtonElement).click();
    await settle();
    const caution = dialog()!.querySelector('[data-testid=reason-caution]')!;
    expect(caution.textContent).toContain('The money goes back to the card the invoice was paid with.');
    expect(caution.textContent).toContain('The consortium’s own rules on refunds apply');
    const reason = dialog()!.querySelector('textarea') as HTMLTextAreaElement;
    reason.value = 'Campaign cancelled by the facility.';
    reason.dispatchEvent(new Event('input'));
    await fixture.whenStable();
    (dialog()!.querySelector('[data-testid=reason-confirm]') as HTMLButtonElement).click();
    await settle();
    backend
      .expectOne('/api/billing/invoices/23/refund')
      .flush(
        { code: 'payment_provider_unavailable', message: 'The card processor cannot be reached just now, so nothing was done.' },
        { status: 503, statusText: 'Service Unavailable' },
      );
    await settle();
    expect(dialog()?.querySelector('[data-testid=dialog-error]')?.textContent).toContain('cannot be reached just now');
    // Try again from the same dialog: the reason is still there.
    (dialog()!.querySelector('[data-testid=reason-confirm]') as HTMLButtonElement).click();
    await settle();
    const again: TestRequest = backend.expectOne('/api/billing/invoices/23/refund');
    expect(again.request.body).toEqual({ version: 3, reason: 'Campaign cancelled by the facility.' });
    again.flush(testInvoice(23, { state: 'paid', refundPending: true }));
    await new Promise((resolve) => setTimeout(resolve));
    await reread();
    expect(text('fees-notice')).toContain('it shows as refunded when the card processor confirms it');
  });

  it('a stale refund closes the dialog, reloads and says so', async () => {
    await render();
    (q('refund-23') as HTMLButtonElement).click();
    await settle();
    const reason = dialog()!.querySelector('textarea') as HTMLTextAreaElement;
    reason.value = 'Paid twice.';
    reason.dispatchEvent(new Event('input'));
    await fixture.whenStable();
    (dialog()!.querySelector('[data-testid=reason-confirm]') as HTMLButtonElement).click();
    await settle();
    backend
      .expectOne('/api/billing/invoices/23/refund')
      .flush({ code: 'stale_version', message: 'Changed.' }, { status: 409, statusText: 'Conflict' });
    await new Promise((resolve) => setTimeout(resolve));
    await reread();
    expect(dialog()).toBeNull();
    expect(text('fees-failure')).toBe(STALE_MESSAGE);
  });

  it('rate class: switches the program to the other rate and says what it changes', async () => {
    await render();
    expect(q('rate-22')?.textContent).toContain('to the external rate');
    (q('rate-22') as HTMLButtonElement).click();
    await fixture.whenStable();
    const req = backend.expectOne('/api/billing/programs/72/rate-class');
    expect(req.request.method).toBe('PUT');
    expect(req.request.body).toEqual({ rateClass: 'external' });
    req.flush({ rateClass: 'external' });
    await fixture.whenStable();
    expect(text('fees-notice')).toContain('now pays the external rate. Prepare drafts to bring its draft up to date');
    expect(text('next-rate-22')).toBe('Next drafts: External rate');
    expect(q('rate-22')?.textContent).toContain('to the academic rate');
  });

  it('no invoice yet, and an error with Try again', async () => {
    await render(testFeesSummary({ totals: [], invoices: [] }));
    expect(text('no-totals')).toContain('No invoice yet in this cycle');
    expect(text('no-invoices')).toContain('“Prepare drafts” makes one for each awarded program.');
    TestBed.resetTestingModule();
    TestBed.configureTestingModule({
      imports: [FeesCycle],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(FeesCycle);
    fixture.componentRef.setInput('cycleId', '7');
    TestBed.tick();
    backend
      .expectOne(URL)
      .flush(
        { code: 'awards_not_released', message: 'The awards of cycle 2027A are not released yet.' },
        { status: 409, statusText: 'Conflict' },
      );
    await fixture.whenStable();
    expect(el().querySelector('[role=alert]')?.textContent).toContain(
      'The fees of this cycle could not be loaded. The awards of cycle 2027A are not released yet.',
    );
  });
});
