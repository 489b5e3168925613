import { formatLatitude, formatLongitude, formatMinorCurrency, formatPercent } from './format-units';

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
