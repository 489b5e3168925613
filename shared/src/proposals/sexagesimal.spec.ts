import fc from 'fast-check';
import { parseDec, parseRa } from '../sky/ra-dec-parser';
import { formatDecDms, formatRaHms } from './sexagesimal';

describe('sexagesimal display', () => {
  it('formats Vega (SCIENCE.md §8 #11, J2000 279.23473479°, +38.78368896°) as 18:36:56.3, +38:47:01', () => {
    // 279.23473479° / 15 = 18.6156490 h = 18h 36m 56.34s; 38.78368896° = 38° 47′ 01.28″ (hand arithmetic).
    expect(formatRaHms(279.23473479)).toBe('18:36:56.3');
    expect(formatDecDms(38.78368896)).toBe('+38:47:01');
  });

  it('wraps RA into 0–24 h, rounding 23:59:59.96 up to 00:00:00.0, and writes a negative Dec with a minus sign', () => {
    expect(formatRaHms(359.99999)).toBe('00:00:00.0');
    expect(formatRaHms(-15)).toBe('23:00:00.0');
    expect(formatDecDms(-5.341666667)).toBe('−05:20:30');
    expect(formatDecDms(-90)).toBe('−90:00:00');
  });

  it('reads back through the sky parser within its rounding (0.05 s of time, 0.5″) (property, seeded)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 359.9999, noNaN: true }), fc.double({ min: -90, max: 90, noNaN: true }), (raDeg, decDeg) => {
        const ra = parseRa(formatRaHms(raDeg));
        const wrapped = Math.abs(ra - raDeg) > 180 ? ra + 360 : ra;
        expect(Math.abs(wrapped - raDeg)).toBeLessThanOrEqual((0.05 * 15) / 3600 + 1e-9);
        expect(Math.abs(parseDec(formatDecDms(decDeg)) - decDeg)).toBeLessThanOrEqual(0.5 / 3600 + 1e-9);
      }),
      { seed: 1162, numRuns: 500 },
    );
  });
});
