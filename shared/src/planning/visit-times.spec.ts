import { SkyInputError } from '../sky/sky-input-error';
import { MS_PER_DAY, MS_PER_HOUR } from '../sky/local-nights';
import { computeSkyWindows } from '../sky/sky-windows';
import { MAX_INTERVALS_PER_NIGHT, type SkySite, type TargetWindows } from '../sky/sky-types';
import { SYNTHETIC_FIRST_NIGHT_UTC_MS, syntheticWindows } from '../sky/testing/synthetic-windows';
import { defaultVisitEpochUtcMs, planVisitTimes, type VisitRequest } from './visit-times';

const EPOCH = SYNTHETIC_FIRST_NIGHT_UTC_MS;

/**
 * Synthetic windows: night n has the given intervals, in hours after 0h UTC of night n's date
 * (2025-01-01 + n), e.g. [[20, 28]] for 20h–04h UTC.
 */
function windowsOf(nights: Array<Array<[number, number]>>, moonExcluded: number[] = []): TargetWindows {
  const at = (n: number, hours: number) => EPOCH + n * MS_PER_DAY + hours * MS_PER_HOUR;
  return syntheticWindows({
    usableHours: nights.map((list) => list.reduce((sum, [from, to]) => sum + (to - from), 0)),
    intervalsUtcMs: nights.map((list, n) => list.map(([from, to]): [number, number] => [at(n, from), at(n, to)])),
    moonExcludedNights: moonExcluded,
    summarize: true,
  });
}

const nightly = (count: number, interval: [number, number] = [20, 28]) => Array.from({ length: count }, () => [interval]);
const req = (r: Partial<VisitRequest>): VisitRequest => ({ baselineDays: 30, visitsPerNight: 1, nightStepDays: 1, visitHours: 0.25, ...r });
const nightsOf = (plan: { nightIndexByVisit: Int32Array }) => [...new Set(plan.nightIndexByVisit)];

describe('planVisitTimes', () => {
  it('places one visit per night at the middle of the usable interval, in days since 0h UTC of the first night', () => {
    // 20h–04h UTC: the middle is 0h UTC of the next date, i.e. n + 1 days after the epoch.
    const plan = planVisitTimes(windowsOf(nightly(5)), req({ baselineDays: 10 }));
    expect(plan.epochUtcMs).toBe(EPOCH);
    expect(plan.firstVisitNightIndex).toBe(0);
    expect(Array.from(plan.timesDays)).toEqual([1, 2, 3, 4, 5].map((d) => expect.closeTo(d, 12)));
    expect(plan.visitNights).toBe(5);
  });

  it('spreads several visits at equal fractions (k + ½)/n of the usable time (Spincycle’s choice)', () => {
    // 8 h, 4 visits of 0.5 h: 6 h free in 4 gaps of 1.5 h → middles at 21h, 23h, 01h, 03h.
    const plan = planVisitTimes(windowsOf(nightly(1)), req({ visitsPerNight: 4, visitHours: 0.5, baselineDays: 0 }));
    const hours = Array.from(plan.timesDays, (t) => t * 24);
    expect(hours).toEqual([21, 23, 25, 27].map((h) => expect.closeTo(h, 9)));
  });

  it('shares the visits between two intervals in proportion to their length and keeps every visit inside one', () => {
    // 3 h + 1 h with a 2-h gap: 4 visits → 3 in the first interval, 1 in the second.
    const w = windowsOf([
      [
        [20, 23],
        [25, 26],
      ],
    ]);
    const plan = planVisitTimes(w, req({ visitsPerNight: 4, visitHours: 0.25, baselineDays: 0 }));
    const hours = Array.from(plan.timesDays, (t) => t * 24);
    expect(hours.filter((h) => h > 20 + 0.125 - 1e-9 && h < 23 - 0.125 + 1e-9)).toHaveLength(3);
    expect(hours.filter((h) => h > 25 + 0.125 - 1e-9 && h < 26 - 0.125 + 1e-9)).toHaveLength(1);
    // None in the gap between the intervals.
    expect(hours.filter((h) => h > 23 && h < 25)).toHaveLength(0);
  });

  it('places only what a short night holds back to back, and all the visits when they fit', () => {
    // 1 h holds two 0.5-h visits, not four.
    expect(
      planVisitTimes(windowsOf(nightly(1, [0, 1])), req({ visitsPerNight: 4, visitHours: 0.5, baselineDays: 0 })).timesDays,
    ).toHaveLength(2);
    expect(
      planVisitTimes(windowsOf(nightly(1, [0, 2])), req({ visitsPerNight: 4, visitHours: 0.5, baselineDays: 0 })).timesDays,
    ).toHaveLength(4);
  });

  it('skips nights without room for a visit, Moon-excluded nights and cloudy nights, and no others', () => {
    const nights = nightly(8);
    nights[1] = [];
    nights[2] = [[0, 0.1]]; // shorter than one 0.25-h visit
    const w = windowsOf(nights, [3]);
    expect(nightsOf(planVisitTimes(w, req({ baselineDays: 7 }), { clearNight: (n) => n !== 5 }))).toEqual([0, 4, 6, 7]);
    expect(nightsOf(planVisitTimes(windowsOf(nightly(8)), req({ baselineDays: 7 })))).toEqual([0, 1, 2, 3, 4, 5, 6, 7]);
  });

  it('visits every nightStepDays nights on a fixed grid and stops after the baseline', () => {
    const w = windowsOf(nightly(40));
    expect(nightsOf(planVisitTimes(w, req({ nightStepDays: 3, baselineDays: 10 })))).toEqual([0, 3, 6, 9]);
    // A fractional step alternates 1- and 2-night gaps (round(j·1.5)), mean 1.5.
    expect(nightsOf(planVisitTimes(w, req({ nightStepDays: 1.5, baselineDays: 9 })))).toEqual([0, 2, 3, 5, 6, 8, 9]);
    // A cloudy grid night is skipped, not made up on the next night.
    expect(nightsOf(planVisitTimes(w, req({ nightStepDays: 3, baselineDays: 10 }), { clearNight: (n) => n !== 3 }))).toEqual([0, 6, 9]);
  });

  it('starts at the first usable night at or after startNightIndex and counts the baseline from it', () => {
    const nights = nightly(30);
    for (let n = 0; n < 12; n++) nights[n] = [];
    const plan = planVisitTimes(windowsOf(nights), req({ startNightIndex: 5, baselineDays: 4 }));
    expect(plan.firstVisitNightIndex).toBe(12);
    expect(nightsOf(plan)).toEqual([12, 13, 14, 15, 16]);
  });

  it('returns no visits and a null first night when no night can take one', () => {
    const plan = planVisitTimes(windowsOf([[], [], [[0, 0.1]]]), req({}));
    expect(plan.timesDays).toHaveLength(0);
    expect(plan.firstVisitNightIndex).toBeNull();
  });

  it('measures times from a given epoch when asked', () => {
    const w = windowsOf(nightly(2));
    const plan = planVisitTimes(w, req({ baselineDays: 1 }), { epochUtcMs: EPOCH + MS_PER_DAY });
    expect(Array.from(plan.timesDays)).toEqual([expect.closeTo(0, 12), expect.closeTo(1, 12)]);
    expect(defaultVisitEpochUtcMs(w)).toBe(EPOCH);
  });

  it('refuses a fractional number of visits per night', () => {
    expect(() => planVisitTimes(windowsOf(nightly(2)), req({ visitsPerNight: 1.5 }))).toThrow(SkyInputError);
  });

  it('keeps every visit of a real campaign inside a usable interval of its night (North site, invented)', () => {
    const site: SkySite = { latitudeDeg: 34.9, longitudeDeg: -108.4, elevationM: 2100, timeZone: 'America/Denver' };
    const result = computeSkyWindows({
      site,
      limits: { altitudeLimitDeg: 30 },
      campaign: { firstNight: '2025-10-01', lastNight: '2025-11-29' },
      targets: [{ raDeg: 45, decDeg: 20 }],
    });
    const w = result.targets[0];
    const plan = planVisitTimes(w, req({ visitsPerNight: 5, visitHours: 0.3, baselineDays: 59 }));
    expect(plan.timesDays.length).toBeGreaterThan(200);
    plan.timesDays.forEach((t, i) => {
      const n = plan.nightIndexByVisit[i];
      const ms = plan.epochUtcMs + t * MS_PER_DAY;
      const base = n * MAX_INTERVALS_PER_NIGHT * 2;
      let inside = false;
      for (let k = 0; k < w.intervalCountByNight[n]; k++) {
        const from = w.intervalsUtcMs[base + 2 * k] + 0.15 * MS_PER_HOUR;
        const to = w.intervalsUtcMs[base + 2 * k + 1] - 0.15 * MS_PER_HOUR;
        if (ms >= from - 1 && ms <= to + 1) inside = true;
      }
      expect(inside).toBe(true);
    });
  });
});
