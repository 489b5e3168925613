import { assessCadence, nightVisitCapacity, type CadenceRequirement } from './cadence-assessment';
import { SkyInputError } from './sky-input-error';
import { computeSkyWindows } from './sky-windows';
import type { TargetWindows } from './sky-types';
import { syntheticWindows } from './testing/synthetic-windows';

const HOUR = 3_600_000;

/**
 * Synthetic windows: night n has one interval of `hours[n]` (or several, given as arrays), from
 * n × 24 h after the Unix epoch, 2 h apart.
 */
function windowsOf(hours: Array<number | number[]>): TargetWindows {
  const lists = hours.map((h) => (Array.isArray(h) ? h : h > 0 ? [h] : []));
  const intervals = lists.map((list, n) => {
    let t = n * 24 * HOUR;
    return list.map((len): [number, number] => {
      const interval: [number, number] = [t, t + len * HOUR];
      t += len * HOUR + 2 * HOUR;
      return interval;
    });
  });
  return syntheticWindows({
    usableHours: lists.map((list) => list.reduce((sum, len) => sum + len, 0)),
    intervalsUtcMs: intervals,
    summarize: true,
  });
}

const every = (n: number, h: number) => Array.from({ length: n }, () => h);
const req = (r: Partial<CadenceRequirement>): CadenceRequirement => ({
  visitsPerNight: 1,
  visitHours: 0.25,
  cadenceDays: 1,
  baselineDays: 30,
  totalVisits: 20,
  ...r,
});

describe('assessCadence', () => {
  it('fits a modest requirement on 180 clear-able nights and says so in one line', () => {
    const a = assessCadence(windowsOf(every(180, 4)), req({ cadenceDays: 2, baselineDays: 90, totalVisits: 46 }), 0.3);
    expect(a.fits).toBe(true);
    expect(a.reasons).toEqual([]);
    expect(a.verdict).toBe('180 of 180 nights can hold the visit; no gap; cadence fits');
    expect(a.expectedClearNights).toBeCloseTo(126, 9);
    expect(a.cadenceNightsNeeded).toBe(46);
  });

  it('refuses when the qualifying nights after weather loss are fewer than the cadence needs', () => {
    // 41 observable nights, cadence 1 night over 59 days → 60 nights needed.
    const hours = [...every(41, 3), ...every(139, 0)];
    const a = assessCadence(windowsOf(hours), req({ cadenceDays: 1, baselineDays: 59, totalVisits: 60 }), 0);
    expect(a.fits).toBe(false);
    expect(a.reasons).toContain('only 41 nights can hold the visit, but 60 visits at 1 a night need 60 nights');
    expect(a.reasons).toContain('the nights that can hold the visit span only 40 days, less than the baseline of 59 days');
  });

  it('names the weather loss when it is what breaks the count', () => {
    const a = assessCadence(windowsOf(every(60, 3)), req({ cadenceDays: 1, baselineDays: 59, totalVisits: 60 }), 0.25);
    expect(a.fits).toBe(false);
    expect(a.reasons[0]).toBe(
      'only 60 nights can hold the visit (45 expected clear after 25 % weather loss), but 60 visits at 1 a night need 60 nights',
    );
    expect(a.reasons[1]).toBe(
      'only 60 nights can hold the visit (45 expected clear after 25 % weather loss), but the cadence needs 60 nights',
    );
  });

  it('stretches the baseline to absorb the weather when the campaign has the nights', () => {
    // 120 observable nights; nightly cadence over 59 days asks for 60 clear nights; with 25 %
    // weather loss that takes 80 qualifying nights, i.e. a stretch of 79 nights.
    const a = assessCadence(windowsOf(every(120, 3)), req({ cadenceDays: 1, baselineDays: 59, totalVisits: 60 }), 0.25);
    expect(a.fits).toBe(true);
    expect(a.stretchDays).toBe(79);
    expect(a.baselineWindow).toEqual({ firstNight: '2025-01-01', lastNight: '2025-03-21', qualifyingNights: 80, longestGapNights: 0 });
    expect(a.verdict).toBe('120 of 120 nights can hold the visit; no gap; cadence fits over 79 days to absorb the weather');
  });

  it('reports a gap longer than the cadence', () => {
    const hours = [...every(30, 3), ...every(33, 0), ...every(30, 3)];
    const a = assessCadence(windowsOf(hours), req({ cadenceDays: 2, baselineDays: 80, totalVisits: 30 }), 0);
    expect(a.fits).toBe(false);
    // 34 nights from one qualifying night to the next: 33 nights without the target.
    expect(a.longestGapNights).toBe(33);
    expect(a.reasons).toEqual([
      'a gap of 33 nights without the target is longer than the cadence allows (a visit night at least every 2 nights)',
    ]);
    expect(a.verdict).toBe(
      '60 of 93 nights can hold the visit; longest gap 33 nights; cadence does not fit: a gap of 33 nights without the target is longer than the cadence allows (a visit night at least every 2 nights)',
    );
  });

  it('chooses the stretch of the campaign without the gap when the baseline is short enough', () => {
    const hours = [...every(30, 3), ...every(33, 0), ...every(30, 3)];
    const a = assessCadence(windowsOf(hours), req({ cadenceDays: 2, baselineDays: 20, totalVisits: 11 }), 0);
    expect(a.fits).toBe(true);
    expect(a.baselineWindow).toEqual({ firstNight: '2025-01-01', lastNight: '2025-01-21', qualifyingNights: 21, longestGapNights: 0 });
  });

  it('explains a nightly window too short for the visits', () => {
    const a = assessCadence(windowsOf(every(30, 0.4)), req({ visitsPerNight: 3, visitHours: 0.25, totalVisits: 30 }), 0);
    expect(a.fits).toBe(false);
    expect(a.reasons).toEqual(['nightly window 0.4 h at most cannot hold 3 visits of 0.25 h spaced over the night']);
  });

  it('counts visits per interval: two intervals of 0.5 h hold 2 visits of 0.4 h, not 2 of 0.6 h', () => {
    const w = windowsOf([[0.5, 0.5]]);
    expect(nightVisitCapacity(w, 0, 0.4)).toBe(2);
    expect(nightVisitCapacity(w, 0, 0.5)).toBe(2);
    expect(nightVisitCapacity(w, 0, 0.6)).toBe(0);
  });

  it('says when the target is never observable', () => {
    const a = assessCadence(windowsOf(every(10, 0)), req({}), 0);
    expect(a.reasons).toEqual(['the target is never observable from this site during the campaign']);
    expect(a.verdict).toMatch(/^no night of 10 can hold the visit; cadence does not fit/);
  });

  it('refuses a bad requirement with a SkyInputError naming the field', () => {
    const w = windowsOf(every(5, 2));
    expect(() => assessCadence(w, req({ visitsPerNight: 1.5 }), 0)).toThrow(SkyInputError);
    expect(() => assessCadence(w, req({ visitHours: Number.NaN }), 0)).toThrow('requirement.visitHours');
    expect(() => assessCadence(w, req({}), 1)).toThrow('weatherLossFraction');
  });

  it('works on computed windows: a winter target from a northern site over half a year', () => {
    const result = computeSkyWindows({
      site: { latitudeDeg: 28.76, longitudeDeg: -17.88, elevationM: 2300, timeZone: 'Atlantic/Canary' },
      limits: { altitudeLimitDeg: 30 },
      campaign: { firstNight: '2025-01-01', lastNight: '2025-06-29' },
      targets: [{ raDeg: 90, decDeg: 20 }],
    });
    const a = assessCadence(result.targets[0], req({ cadenceDays: 3, baselineDays: 60, totalVisits: 21 }), 0.2);
    expect(a.fits).toBe(true);
    expect(a.qualifyingNights).toBeGreaterThan(80);
    expect(a.qualifyingNights).toBeLessThan(180);
    expect(a.verdict).toMatch(/^\d+ of 180 nights can hold the visit; no gap; cadence fits$/);
  });
});
