import {
  explainFee,
  formatHours,
  formatHoursTimesRate,
  formatLatitude,
  formatLongitude,
  formatMinorCurrency,
  formatPercent,
} from './format-units';

describe('format-units', () => {
  it('formatLatitude: hemisphere letter from the sign, magnitude with 3 decimals', () => {
    expect(formatLatitude(28.7606, 'en-US')).toBe('28.761° N');
    expect(formatLatitude(-31.27331, 'en-US')).toBe('31.273° S');
    expect(formatLatitude(0, 'en-US')).toBe('0.000° N');
  });

  it('formatLongitude: east-positive, so negative is W', () => {
    expect(formatLongitude(-17.8816, 'en-US')).toBe('17.882° W');
    expect(formatLongitude(149.0612, 'en-US', 1)).toBe('149.1° E');
  });

  it('formatMinorCurrency: divides by the currency’s own minor unit', () => {
    expect(formatMinorCurrency(4850, 'eur', 'en-US')).toBe('€48.50');
    expect(formatMinorCurrency(720000, 'jpy', 'en-US')).toBe('¥720,000');
    // Intl separates the code with a no-break space.
    expect(formatMinorCurrency(12345, 'kwd', 'en-US')).toBe('KWD\u00a012.345');
  });

  it('formatMinorCurrency: EUR and USD with two decimals, JPY with none, grouped, from the data’s code in any case', () => {
    expect(formatMinorCurrency(4500, 'EUR', 'en-US')).toBe('€45.00');
    expect(formatMinorCurrency(123456789, 'usd', 'en-US')).toBe('$1,234,567.89');
    expect(formatMinorCurrency(4500, 'jpy', 'en-US')).toBe('¥4,500');
    expect(formatMinorCurrency(4850, 'eur', 'de-DE')).toBe('48,50\u00a0€');
  });

  it('formatMinorCurrency: zero, negative (a credit), no negative zero, and an em dash without amount or currency', () => {
    expect(formatMinorCurrency(0, 'eur', 'en-US')).toBe('€0.00');
    expect(formatMinorCurrency(0, 'jpy', 'en-US')).toBe('¥0');
    expect(formatMinorCurrency(-1234, 'eur', 'en-US')).toBe('-€12.34');
    expect(formatMinorCurrency(-0.4, 'eur', 'en-US')).toBe('€0.00');
    expect(formatMinorCurrency(null, 'eur', 'en-US')).toBe('—');
    expect(formatMinorCurrency(100, '', 'en-US')).toBe('—');
    expect(formatMinorCurrency(100, 'not a code', 'en-US')).toBe('—');
  });

  it('formatHoursTimesRate: hours × rate per hour in money, with the fee when given', () => {
    expect(formatHours(1.8333, 'en-US')).toBe('1.83 h');
    expect(formatHoursTimesRate(1.83, 4500, 'eur', 'en-US')).toBe('1.83 h × €45.00 per hour');
    expect(formatHoursTimesRate(42.5, 4850, 'eur', 'en-US', 206125)).toBe('42.5 h × €48.50 per hour = €2,061.25');
    expect(formatHoursTimesRate(2, 720000, 'jpy', 'en-US', 1440000)).toBe('2 h × ¥720,000 per hour = ¥1,440,000');
  });

  it('explainFee: the science core’s line in minor units becomes money; other lines stay as they are', () => {
    expect(explainFee('1.83 h × 4500 per hour, rounded to the unit', 'eur', 'en-US')).toBe(
      '1.83 h × €45.00 per hour, rounded to the smallest unit of the currency',
    );
    expect(explainFee('12.4 h × 720000 per hour', 'jpy', 'en-US')).toBe('12.4 h × ¥720,000 per hour');
    expect(explainFee('Node-hours times the rate.', 'eur', 'en-US')).toBe('Node-hours times the rate.');
    expect(explainFee(undefined, 'eur', 'en-US')).toBe('');
  });

  it('formatPercent: whole percent with a space, never a certain 100 % below 1, em dash when not finite', () => {
    expect(formatPercent(0.9, 'en-US')).toBe('90 %');
    expect(formatPercent(0.904, 'en-US')).toBe('90 %');
    expect(formatPercent(0.9996, 'en-US')).toBe('99.9 %');
    expect(formatPercent(0.0092, 'en-US')).toBe('0.92 %');
    expect(formatPercent(1, 'en-US')).toBe('100 %');
    expect(formatPercent(Number.NaN, 'en-US')).toBe('—');
    expect(formatPercent(null, 'en-US')).toBe('—');
  });
});
