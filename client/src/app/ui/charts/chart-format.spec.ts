import { formatNightDate } from './chart-format';

describe('formatNightDate', () => {
  it('a night in an en-US browser: day before month, as every other date of the product', () => {
    expect(formatNightDate('2027-03-02', 'en-US')).toBe('2 Mar');
    expect(formatNightDate('2027-03-02', 'en-US', true)).toBe('2 Mar 2027');
  });

  it('a night in a British browser: the same text', () => {
    expect(formatNightDate('2027-08-28', 'en-GB', true)).toBe('28 Aug 2027');
  });

  it('an unreadable date: shown as given', () => {
    expect(formatNightDate('not a date', 'en-US', true)).toBe('not a date');
  });
});
