import { currencyDigits, formatMinorUnits } from '../proposals/money';
import { formatHundredths, hoursToHundredths, lineAmountMinor, luhnValid, payInvoiceSchema, sumMinor } from './billing';

describe('invoice arithmetic (integer minor units)', () => {
  it('a hand-worked invoice (worked by hand in this test)', () => {
    // Line 1: 12.50 h × 45.00 per hour = 562.50 → 56 250 minor units.
    // Line 2:  7.25 h × 33.33 per hour = 241.6425 → 241.64 (24 164.25 rounds down).
    // Line 3:  0.05 h ×  0.10 per hour = 0.005 → 0.01 (exactly half a minor unit rounds up).
    // Total: 56 250 + 24 164 + 1 = 80 415 minor units, 804.15.
    const lines = [
      lineAmountMinor(hoursToHundredths(12.5), 4500),
      lineAmountMinor(hoursToHundredths(7.25), 3333),
      lineAmountMinor(hoursToHundredths(0.05), 10),
    ];
    expect(lines).toEqual([56_250, 24_164, 1]);
    expect(sumMinor(lines)).toBe(80_415);
    expect(formatMinorUnits(80_415, 'EUR')).toBe('EUR 804.15');
  });

  it('never goes through floating point: hundredths that are not exact in binary stay exact', () => {
    // 0.29 × 100 = 28.999999999999996 in floating point; the stored hundredths are 29.
    expect(hoursToHundredths(0.29)).toBe(29);
    expect(hoursToHundredths(1234.35)).toBe(123_435);
    // 9 007 199 254 740 991 (2^53 − 1) hundredths of an hour at 1 per hour cannot be summed past the safe range.
    expect(() => sumMinor([Number.MAX_SAFE_INTEGER, 1])).toThrow(RangeError);
    expect(() => lineAmountMinor(1.5, 100)).toThrow(RangeError);
    expect(formatHundredths(1250)).toBe('12.50');
    expect(formatHundredths(5)).toBe('0.05');
  });

  it('formats each currency with its own minor digits (ISO 4217 via Intl: common practice, no source)', () => {
    expect(currencyDigits('EUR')).toBe(2);
    expect(currencyDigits('JPY')).toBe(0);
    expect(formatMinorUnits(1234, 'JPY')).toBe('JPY 1,234');
    expect(formatMinorUnits(123_456, 'CHF')).toBe('CHF 1,234.56');
  });
});

describe('card fields', () => {
  it('the Luhn check (ISO/IEC 7812-1): test numbers pass, a changed digit fails (common practice, no source)', () => {
    expect(luhnValid('4242424242424242')).toBe(true);
    expect(luhnValid('4000000000000002')).toBe(true);
    expect(luhnValid('4242424242424241')).toBe(false);
    expect(luhnValid('42424242a4242424')).toBe(false);
  });

  it('a bad card field is named', () => {
    const base = { version: 1, cardNumber: '4242 4242 4242 4242', expMonth: 12, expYear: 2030, cvc: '123' };
    expect(payInvoiceSchema.parse(base).cardNumber).toBe('4242424242424242');
    const bad = payInvoiceSchema.safeParse({ ...base, cardNumber: '4242 4242 4242 4241', expMonth: 13, cvc: '12' });
    expect(bad.success).toBe(false);
    const fields = bad.error!.issues.map((i) => i.path.join('.'));
    expect(fields).toEqual(expect.arrayContaining(['cardNumber', 'expMonth', 'cvc']));
  });
});
