import { parseRateText, rateToText } from './rate-text';

// Decimals per currency from ISO 4217 (EUR 2, JPY 0, KWD 3): common practice, no source.
describe('rateToText', () => {
  it('writes minor units in the currency’s units, with its own number of decimals and no grouping', () => {
    expect(rateToText(7760, 'eur')).toBe('77.60');
    expect(rateToText(5, 'eur')).toBe('0.05');
    expect(rateToText(0, 'eur')).toBe('0.00');
    expect(rateToText(1234567, 'eur')).toBe('12345.67');
    expect(rateToText(720000, 'jpy')).toBe('720000');
    expect(rateToText(1500, 'kwd')).toBe('1.500');
  });
});

describe('parseRateText', () => {
  it('reads an amount exactly into minor units (worked by hand in this test: 0.29 is not 28.999… cents)', () => {
    expect(parseRateText('77.60', 'eur')).toEqual({ ok: true, minor: 7760 });
    expect(parseRateText(' 77.6 ', 'eur')).toEqual({ ok: true, minor: 7760 });
    expect(parseRateText('77', 'eur')).toEqual({ ok: true, minor: 7700 });
    expect(parseRateText('77.', 'eur')).toEqual({ ok: true, minor: 7700 });
    expect(parseRateText('.5', 'eur')).toEqual({ ok: true, minor: 50 });
    expect(parseRateText('0.29', 'eur')).toEqual({ ok: true, minor: 29 });
    expect(parseRateText('1.005', 'kwd')).toEqual({ ok: true, minor: 1005 });
    expect(parseRateText('77.600', 'eur')).toEqual({ ok: true, minor: 7760 });
    expect(parseRateText('0', 'eur')).toEqual({ ok: true, minor: 0 });
    expect(parseRateText('007200', 'jpy')).toEqual({ ok: true, minor: 7200 });
    expect(parseRateText('7200.00', 'jpy')).toEqual({ ok: true, minor: 7200 });
  });

  it('an empty field is no rate (null), not 0', () => {
    expect(parseRateText('', 'eur')).toEqual({ ok: true, minor: null });
    expect(parseRateText('   ', 'eur')).toEqual({ ok: true, minor: null });
  });

  it('round-trips what rateToText writes', () => {
    for (const minor of [0, 1, 99, 100, 7760, 2_147_483_647])
      expect(parseRateText(rateToText(minor, 'eur'), 'eur')).toEqual({ ok: true, minor });
  });

  it('refuses what is not a plain amount, saying how to write one', () => {
    for (const text of ['abc', '.', '-5', '+5', '1e3', '77,60', '1,200.00', '7 760', '77.6.0']) {
      expect(parseRateText(text, 'eur')).toEqual({ ok: false, message: 'Give an amount in digits, e.g. 77.60' });
    }
  });

  it('refuses more decimals than the currency has', () => {
    expect(parseRateText('77.605', 'eur')).toEqual({ ok: false, message: 'Give at most 2 digits after the decimal point, e.g. 77.60' });
    expect(parseRateText('7200.5', 'jpy')).toEqual({ ok: false, message: 'JPY has no smaller unit: give a whole amount, e.g. 7200' });
  });

  it('refuses a rate beyond what the node’s rate column holds', () => {
    expect(parseRateText('21474836.47', 'eur')).toEqual({ ok: true, minor: 2_147_483_647 });
    expect(parseRateText('21474836.48', 'eur')).toEqual({ ok: false, message: 'That rate is too large: at most 21474836.47' });
    expect(parseRateText('99999999999999999999', 'eur')).toMatchObject({ ok: false });
  });
});
