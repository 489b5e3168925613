import { FormControl } from '@angular/forms';
import { cardNumberCheck, cardPayment, cvcCheck, expMonthCheck, expYearCheck, nameOnCardCheck, parseExpYear } from './card-fields';

const check = (validator: typeof cardNumberCheck, value: string) => validator(new FormControl(value));

describe('card fields (mirroring payInvoiceSchema)', () => {
  it('card number: test numbers with spaces or dashes pass; a changed digit or too few digits are named', () => {
    // 4242 4242 4242 4242 passes the Luhn check; ending 1 does not (common practice, no source).
    expect(check(cardNumberCheck, '4242 4242 4242 4242')).toBeNull();
    expect(check(cardNumberCheck, '4000-0000-0000-0002')).toBeNull();
    expect(check(cardNumberCheck, '4242 4242 4242 4241')).toEqual({ schema: 'is not a valid card number (check the digits)' });
    expect(check(cardNumberCheck, '4242 4242')).toEqual({ schema: 'must be 12 to 19 digits' });
    expect(check(cardNumberCheck, '')).toBeNull();
  });

  it('expiry: a month from 1 to 12; a year of two or four digits within 2000–2100', () => {
    expect(check(expMonthCheck, '7')).toBeNull();
    expect(check(expMonthCheck, '12')).toBeNull();
    expect(check(expMonthCheck, '13')).toEqual({ schema: 'must be a month from 1 to 12' });
    expect(check(expMonthCheck, '0')).toEqual({ schema: 'must be a month from 1 to 12' });
    expect(check(expMonthCheck, 'ab')).toEqual({ schema: 'must be a month from 1 to 12' });
    expect(parseExpYear('29')).toBe(2029);
    expect(parseExpYear('2031')).toBe(2031);
    expect(check(expYearCheck, '29')).toBeNull();
    expect(check(expYearCheck, '1999')).toEqual({ schema: 'must be a year such as 2029' });
    expect(check(expYearCheck, '202')).toEqual({ schema: 'must be a year such as 2029' });
  });

  it('security code: 3 or 4 digits; the name on the card is optional', () => {
    expect(check(cvcCheck, '123')).toBeNull();
    expect(check(cvcCheck, '1234')).toBeNull();
    expect(check(cvcCheck, '12')).toEqual({ schema: 'must be 3 or 4 digits' });
    expect(check(nameOnCardCheck, '')).toBeNull();
    expect(check(nameOnCardCheck, 'Bram Ledgerwood')).toBeNull();
    expect(check(nameOnCardCheck, 'x'.repeat(201))).not.toBeNull();
  });

  it('the request body: digits only, numbers for the expiry, the name only when given', () => {
    const typed = { cardNumber: '4242 4242 4242 4242', expMonth: '07', expYear: '29', cvc: ' 123 ', nameOnCard: '  ' };
    expect(cardPayment(4, typed)).toEqual({ version: 4, cardNumber: '4242424242424242', expMonth: 7, expYear: 2029, cvc: '123' });
    expect(cardPayment(4, { ...typed, nameOnCard: ' Bram Ledgerwood ' }).nameOnCard).toBe('Bram Ledgerwood');
  });
});
