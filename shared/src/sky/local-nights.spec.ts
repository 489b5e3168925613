import { formatDayNumber, nightWindow, nightWindows, parseNightDate, timeZoneOffsetMs, toIsoUtc, zonedNoonUtcMs } from './local-nights';
import { SkyInputError } from './sky-input-error';

describe('local nights', () => {
  it('parseNightDate reads calendar dates and refuses impossible ones naming the field', () => {
    expect(formatDayNumber(parseNightDate('2024-02-29', 'campaign.firstNight'))).toBe('2024-02-29');
    expect(() => parseNightDate('2025-02-29', 'campaign.firstNight')).toThrow(SkyInputError);
    expect(() => parseNightDate('2025-13-01', 'x')).toThrow(/x: is not a calendar date/);
    expect(() => parseNightDate('25-01-01', 'x')).toThrow(/YYYY-MM-DD/);
    expect(() => parseNightDate(20250101, 'x')).toThrow(/YYYY-MM-DD/);
  });

  it('zonedNoonUtcMs finds 12:00 wall-clock time in zones with and without DST', () => {
    const day = (d: string) => parseNightDate(d, 'd');
    expect(toIsoUtc(zonedNoonUtcMs(day('2025-01-15'), 'Europe/Berlin'))).toBe('2025-01-15T11:00:00Z');
    expect(toIsoUtc(zonedNoonUtcMs(day('2025-07-15'), 'Europe/Berlin'))).toBe('2025-07-15T10:00:00Z');
    expect(toIsoUtc(zonedNoonUtcMs(day('2025-07-15'), 'America/Santiago'))).toBe('2025-07-15T16:00:00Z');
    expect(toIsoUtc(zonedNoonUtcMs(day('2025-07-15'), 'Pacific/Kiritimati'))).toBe('2025-07-14T22:00:00Z');
    expect(timeZoneOffsetMs('Asia/Kolkata', Date.UTC(2025, 0, 1))).toBe(5.5 * 3_600_000);
  });

  it('nightWindow runs from local mean noon to the next one, named by the zone date', () => {
    // 12:00 UTC − (−70.8° × 4 min) = 16:43:12 UTC.
    const w = nightWindow(parseNightDate('2025-07-15', 'd'), -70.8, 'America/Santiago');
    expect(toIsoUtc(w.startUtcMs)).toBe('2025-07-15T16:43:12Z');
    expect(w.endUtcMs - w.startUtcMs).toBe(86_400_000);
    expect(w.nightDate).toBe('2025-07-15');
  });

  it('nightWindow follows the zone date where the zone is a day ahead of solar time (lon −157°, UTC+14)', () => {
    // Zone noon of 2025-07-15 is 2025-07-14T22:00Z; the nearest mean noon at −157.4° is 2025-07-14T22:29:36Z.
    const w = nightWindow(parseNightDate('2025-07-15', 'd'), -157.4, 'Pacific/Kiritimati');
    expect(toIsoUtc(w.startUtcMs)).toBe('2025-07-14T22:29:36Z');
  });

  it('nightWindow of consecutive dates tile time without gaps across a DST change', () => {
    for (let d = parseNightDate('2025-10-20', 'd'); d < parseNightDate('2025-11-05', 'd'); d++) {
      expect(nightWindow(d + 1, 10, 'Europe/Berlin').startUtcMs).toBe(nightWindow(d, 10, 'Europe/Berlin').endUtcMs);
    }
  });

  it('nightWindows (two zone lookups) gives the same windows as nightWindow night by night', () => {
    const first = parseNightDate('2024-01-01', 'd');
    const last = parseNightDate('2025-12-31', 'd');
    for (const [lon, tz] of [
      [-70.8, 'America/Santiago'],
      [150, 'Australia/Sydney'],
      [15.6, 'Arctic/Longyearbyen'],
      [-157.4, 'Pacific/Kiritimati'],
      [0, 'UTC'],
      [179.9, 'Pacific/Auckland'],
    ] as const) {
      const all = nightWindows(first, last, lon, tz);
      expect(all).toHaveLength(last - first + 1);
      for (let i = 0; i < all.length; i += 7) expect(all[i]).toEqual(nightWindow(first + i, lon, tz));
    }
  });
});
