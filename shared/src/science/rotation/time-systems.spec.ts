import { MJD_OFFSET, parseIsoUtc, taiMinusUtcSeconds, tdbMinusTtSeconds, toBjdTdb } from './time-systems';

describe('time systems', () => {
  it('MJD = JD − 2400000.5 (definition of the MJD)', () => {
    expect(MJD_OFFSET).toBe(2400000.5);
    // 1858-11-17T00:00Z is MJD 0 (definition); 2000-01-01T12:00Z is JD 2451545.0 (J2000.0).
    expect(parseIsoUtc('1858-11-17T00:00:00Z')).toBe(MJD_OFFSET);
    expect(parseIsoUtc('2000-01-01T12:00:00Z')).toBe(2451545.0);
  });

  it('parses strict ISO 8601 instants with Z or an offset, seconds optional, a space for the T', () => {
    const jd = parseIsoUtc('2026-03-14T02:31:07Z') as number;
    expect(parseIsoUtc('2026-03-14 02:31:07Z')).toBe(jd);
    expect(parseIsoUtc('2026-03-14T04:31:07+02:00')).toBeCloseTo(jd, 10);
    expect(parseIsoUtc('2026-03-13T21:31:07-05:00')).toBeCloseTo(jd, 10);
    expect(parseIsoUtc('2026-03-14T02:31Z')).toBeCloseTo(jd - 7 / 86400, 10);
    // Microseconds survive (1 µs = 1.157e-11 d).
    expect(((parseIsoUtc('2026-03-14T02:31:07.000123Z') as number) - jd) * 86400e6).toBeCloseTo(123, -1);
    expect(parseIsoUtc('2024-02-29T00:00:00Z')).not.toBeNull();
  });

  it.each([
    '2024-13-01T00:00Z',
    '2023-02-29T00:00Z',
    '2024-02-30T00:00Z',
    '2024-04-31T00:00Z',
    '2024-01-01T24:00Z',
    '2024-01-01T23:60Z',
    '2024-01-01T23:59:60Z',
    '2024-01-01T00:00',
    '2024-01-01',
    '24-01-01T00:00Z',
    '2024-01-01T00:00+2',
    '60500.5',
    '',
  ])('rejects %j', (text) => {
    expect(parseIsoUtc(text)).toBeNull();
  });

  it('counts leap seconds from IERS Bulletin C: 36 s in late 2016, 37 s from 2017, 25 s in 1990', () => {
    expect(taiMinusUtcSeconds(parseIsoUtc('2016-12-31T23:59:00Z') as number)).toBe(36);
    expect(taiMinusUtcSeconds(parseIsoUtc('2017-01-01T00:00:00Z') as number)).toBe(37);
    expect(taiMinusUtcSeconds(parseIsoUtc('2026-06-01T00:00:00Z') as number)).toBe(37);
    expect(taiMinusUtcSeconds(parseIsoUtc('1990-06-01T00:00:00Z') as number)).toBe(25);
  });

  it('keeps TDB − TT within its ±1.7 ms periodic term (Kaplan 2005, eq. 2.6)', () => {
    for (let jd = 2451545; jd < 2451545 + 400; jd += 7) expect(Math.abs(tdbMinusTtSeconds(jd))).toBeLessThan(0.00168);
  });

  it('gives BJD − JD(UTC) = 69.184 s plus the Rømer delay, which stays within ±8.5 min and is near 0 at the ecliptic pole', () => {
    // Worked by hand: 37 + 32.184 = 69.184 s in 2026; 1 au of light time = 499.0 s, Earth's
    // distance from the barycentre ≤ 1.02 au; towards the ecliptic pole (RA 270°, Dec +66.56°)
    // the projection is the barycentre's small offset from the ecliptic plane (a few seconds at most).
    const jd = new Float64Array(Array.from({ length: 365 }, (_, i) => 2461000.5 + i));
    const pole = toBjdTdb(jd, 270, 66.56);
    for (let i = 0; i < jd.length; i++) expect(Math.abs((pole[i] - jd[i]) * 86400 - 69.184)).toBeLessThan(5);
    const plane = toBjdTdb(jd, 0, 0);
    let max = 0;
    for (let i = 0; i < jd.length; i++) max = Math.max(max, Math.abs((plane[i] - jd[i]) * 86400 - 69.184));
    expect(max).toBeGreaterThan(450);
    expect(max).toBeLessThan(510);
  });
});
