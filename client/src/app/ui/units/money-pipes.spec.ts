import { LOCALE_ID } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { FeeWhyPipe } from './fee-why-pipe';
import { HoursTimesRatePipe } from './hours-times-rate-pipe';
import { MinorCurrencyPipe } from './minor-currency-pipe';

describe('money pipes', () => {
  it('minorCurrency, hoursTimesRate and feeWhy show amounts with their currency, never minor units', () => {
    TestBed.configureTestingModule({ providers: [{ provide: LOCALE_ID, useValue: 'en-US' }] });
    const [money, times, why] = TestBed.runInInjectionContext(
      () => [new MinorCurrencyPipe(), new HoursTimesRatePipe(), new FeeWhyPipe()] as const,
    );
    expect(money.transform(4500, 'eur')).toBe('€45.00');
    expect(money.transform(undefined, 'eur')).toBe('—');
    expect(times.transform(1.83, 4500, 'eur')).toBe('1.83 h × €45.00 per hour');
    expect(times.transform(1.83, 4500, 'eur', 8235)).toBe('1.83 h × €45.00 per hour = €82.35');
    expect(why.transform('1.83 h × 4500 per hour, rounded to the unit', 'usd')).toBe(
      '1.83 h × $45.00 per hour, rounded to the smallest unit of the currency',
    );
  });
});
