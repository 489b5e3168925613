import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { provideRouter } from '@angular/router';
import type { InvoiceSummary } from '@spincycle/shared/billing/billing';
import { testInvoiceSummary } from '../testing/fee-fixtures';
import MyInvoices from './my-invoices';

const URL = '/api/billing/invoices';

const INVOICES: InvoiceSummary[] = [
  testInvoiceSummary(3, {
    programTitle: 'Slow rotators, second season',
    state: 'paid',
    paidAt: '2027-03-04T11:00:00.000Z',
    dueDate: '2027-03-30',
  }),
  testInvoiceSummary(2, {
    programTitle: 'Dwarfs of the far field',
    overdue: true,
    dueDate: '2027-02-01',
    totalMinor: 1_234,
    currency: 'CHF',
  }),
  testInvoiceSummary(1, {
    programTitle: 'Spin-down of an invented cluster',
    state: 'refunded',
    refundPending: false,
    dueDate: '2027-01-15',
  }),
  testInvoiceSummary(4, { programTitle: 'Active dwarfs', state: 'paid', refundPending: true, dueDate: '2027-04-10' }),
];

describe('MyInvoices', () => {
  let fixture: ComponentFixture<MyInvoices>;
  let backend: HttpTestingController;
  const el = () => fixture.nativeElement as HTMLElement;
  const rows = () => [...el().querySelectorAll('[data-testid=invoices-table] tbody tr')] as HTMLElement[];
  const cells = (row: HTMLElement) => [...row.querySelectorAll('td')].map((c) => c.textContent?.replace(/\s+/g, ' ').trim());

  async function render(respond: (req: ReturnType<HttpTestingController['expectOne']>) => void): Promise<void> {
    TestBed.configureTestingModule({
      imports: [MyInvoices],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(MyInvoices);
    TestBed.tick();
    fixture.detectChanges();
    expect(el().querySelector('mat-progress-bar')?.getAttribute('aria-label')).toBe('Loading your invoices');
    expect(el().textContent).not.toContain('You have no invoice yet');
    respond(backend.expectOne(URL));
    await fixture.whenStable();
  }

  afterEach(() => backend.verify());

  it('lists the invoices in the server’s order: number linking to the invoice, program, cycle, amount, due date and state in words', async () => {
    await render((req) => req.flush(INVOICES));
    expect(el().querySelector('mat-progress-bar')).toBeNull();
    expect(rows().map((r) => r.getAttribute('data-testid'))).toEqual(['invoice-row-3', 'invoice-row-2', 'invoice-row-1', 'invoice-row-4']);
    expect(cells(rows()[0])).toEqual([
      'SC-2027-0003',
      'Slow rotators, second season PI: Tamsin Orrel',
      '2027A',
      'EUR 804.15',
      '30 Mar 2027',
      'Paid',
    ]);
    expect(rows()[0].querySelector('a')?.getAttribute('href')).toBe('/fees/invoices/3');
    // CHF 12.34: 1 234 minor units in a currency of two minor digits.
    expect(cells(rows()[1])[3]).toBe('CHF 12.34');
    expect(cells(rows()[2])[5]).toBe('Refunded');
  });

  it('overdue and refund pending are written out, not shown by colour alone; a note counts the overdue invoices', async () => {
    await render((req) => req.flush(INVOICES));
    expect(rows()[1].querySelector('[data-testid=invoice-overdue]')?.textContent).toContain('Overdue');
    expect(rows()[1].querySelector('[data-testid=invoice-state]')?.textContent).toBe('Awaiting payment');
    expect(rows()[3].querySelector('[data-testid=invoice-refund-pending]')?.textContent).toContain('Refund pending');
    expect(rows()[0].querySelector('[data-testid=invoice-overdue]')).toBeNull();
    expect(el().querySelector('[data-testid=overdue-note]')?.textContent).toContain('One invoice is past the due date.');
  });

  it('sorts by a header: state puts the overdue first; due date ascending', async () => {
    await render((req) => req.flush(INVOICES));
    const header = (name: string) =>
      [...el().querySelectorAll('th')]
        .find((th) => th.textContent?.trim() === name)!
        .querySelector('.mat-sort-header-container') as HTMLElement;
    header('State').click();
    await fixture.whenStable();
    expect(rows().map((r) => r.getAttribute('data-testid'))).toEqual(['invoice-row-2', 'invoice-row-3', 'invoice-row-4', 'invoice-row-1']);
    header('Due').click();
    await fixture.whenStable();
    expect(rows().map((r) => r.getAttribute('data-testid'))).toEqual(['invoice-row-1', 'invoice-row-2', 'invoice-row-3', 'invoice-row-4']);
  });

  it('empty: explains when invoices come', async () => {
    await render((req) => req.flush([]));
    expect(rows()).toHaveLength(0);
    expect(el().textContent).toContain("Invoices come after a cycle's awards are released");
    expect(el().textContent).toContain('the facility managers then issue one for each awarded program');
    expect(el().querySelector('[data-testid=overdue-note]')).toBeNull();
  });

  it('error: the sentence as an alert with Try again, which reads the list again', async () => {
    await render((req) => req.flush({ code: 'x', message: 'Database asleep.' }, { status: 500, statusText: 'Server Error' }));
    const alert = el().querySelector('[role=alert]') as HTMLElement;
    expect(alert.textContent).toContain('Your invoices could not be loaded.');
    (alert.querySelector('button') as HTMLButtonElement).click();
    TestBed.tick();
    backend.expectOne(URL).flush(INVOICES);
    await fixture.whenStable();
    expect(rows()).toHaveLength(4);
  });
});
