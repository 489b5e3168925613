import { ComponentFixture, TestBed } from '@angular/core/testing';
import type { FeeTotals } from '@spincycle/shared/billing/billing';
import { OKABE_ITO } from '../../../ui/charts/chart-palette';
import { amountTicks, FeeTotalsChart, feeSegments } from './fee-totals-chart';

/**
 * Worked by hand in this test: EUR paid 1000.00, outstanding 804.15 of which 300.00 overdue,
 * drafts 500.00, refunded 800.00 → segments 1000.00, 504.15, 300.00, 500.00, 800.00; all
 * invoices 3104.15. Ticks of 3104.15 in steps of 1000 (rough 776, rounded up to 1 × 10³): 0 … 4000.
 */
const EUR: FeeTotals = {
  currency: 'EUR',
  draftMinor: 50_000,
  issuedMinor: 260_415,
  paidMinor: 100_000,
  outstandingMinor: 80_415,
  overdueMinor: 30_000,
  refundedMinor: 80_000,
  invoices: 5,
};
const JPY: FeeTotals = {
  ...EUR,
  currency: 'JPY',
  draftMinor: 0,
  paidMinor: 0,
  outstandingMinor: 0,
  overdueMinor: 0,
  refundedMinor: 0,
  issuedMinor: 0,
};

describe('feeSegments and amountTicks', () => {
  it('splits the outstanding amount into not yet due and overdue, in the stacking order', () => {
    expect(feeSegments(EUR).map((s) => [s.key, s.minor])).toEqual([
      ['paid', 100_000],
      ['due', 50_415],
      ['overdue', 30_000],
      ['draft', 50_000],
      ['refunded', 80_000],
    ]);
  });

  it('ticks at 1, 2 or 5 × 10ⁿ from 0 up to at least the total', () => {
    expect(amountTicks(3104.15)).toEqual([0, 1000, 2000, 3000, 4000]);
    expect(amountTicks(8)).toEqual([0, 2, 4, 6, 8]);
    expect(amountTicks(0.37)).toEqual([0, 0.1, 0.2, 0.3, 0.4]);
    expect(amountTicks(0)).toEqual([0]);
  });
});

describe('FeeTotalsChart', () => {
  let fixture: ComponentFixture<FeeTotalsChart>;
  const el = () => fixture.nativeElement as HTMLElement;

  async function render(totals: FeeTotals[]): Promise<void> {
    TestBed.configureTestingModule({ imports: [FeeTotalsChart] });
    fixture = TestBed.createComponent(FeeTotalsChart);
    fixture.componentRef.setInput('totals', totals);
    fixture.componentRef.setInput('cycleCode', '2027A');
    await fixture.whenStable();
  }

  it('one bar per currency in Okabe–Ito colours, widths in proportion on an axis titled with the currency', async () => {
    await render([EUR]);
    const svg = el().querySelector('[data-testid=fee-chart-EUR] svg')!;
    expect(svg.getAttribute('role')).toBe('img');
    const name = svg.querySelector(`title#${svg.getAttribute('aria-labelledby')}`)?.textContent;
    expect(name).toContain(
      'Fees of cycle 2027A in EUR: Paid: EUR 1,000.00; Outstanding, not yet due: EUR 504.15; Outstanding and overdue: EUR 300.00',
    );
    const rects = [...svg.querySelectorAll('rect')];
    expect(rects.map((r) => r.getAttribute('fill'))).toEqual([
      OKABE_ITO.bluishGreen,
      OKABE_ITO.blue,
      OKABE_ITO.vermillion,
      OKABE_ITO.orange,
      OKABE_ITO.reddishPurple,
    ]);
    // On a 0–4000 axis of 600 units: paid 1000 → 150 wide, overdue 300 → 45 wide.
    expect(Number(rects[0].getAttribute('width'))).toBeCloseTo(150, 6);
    expect(Number(rects[2].getAttribute('width'))).toBeCloseTo(45, 6);
    expect([...svg.querySelectorAll('.tick-label')].map((t) => t.textContent)).toEqual(['0', '1,000', '2,000', '3,000', '4,000']);
    expect(svg.querySelector('.axis-title')?.textContent).toBe('Amount (EUR)');
    expect([...el().querySelectorAll('.legend li')].map((li) => li.textContent?.trim())).toEqual([
      'Paid',
      'Outstanding, not yet due',
      'Outstanding and overdue',
      'Drafts (not issued)',
      'Refunded',
    ]);
  });

  it('the same figures in a table, currencies never added together; a currency with nothing says so', async () => {
    await render([EUR, JPY]);
    const row = (c: string) => [...el().querySelectorAll(`[data-testid=fee-totals-${c}] > *`)].map((x) => x.textContent?.trim());
    expect(row('EUR')).toEqual(['EUR', 'EUR 1,000.00', 'EUR 804.15', 'EUR 300.00', 'EUR 500.00', 'EUR 800.00', '5']);
    expect(row('JPY')).toEqual(['JPY', 'JPY 0', 'JPY 0', 'JPY 0', 'JPY 0', 'JPY 0', '5']);
    expect(el().querySelector('[data-testid=fee-chart-JPY] svg')).toBeNull();
    expect(el().querySelector('[data-testid=fee-chart-JPY]')?.textContent).toContain('Nothing invoiced in JPY yet.');
    expect(el().querySelector('caption')?.textContent?.trim()).toBe('Totals per currency of cycle 2027A');
  });
});
