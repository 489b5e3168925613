import { SkyInputError } from '../sky/sky-input-error';
import { computeSkyWindows } from '../sky/sky-windows';
import type { SkySite, SkyWindowsResult } from '../sky/sky-types';
import {
  DEFAULT_PERIOD_SCAN_COUNT,
  SIDEREAL_PER_SOLAR_DAY,
  assessPhaseCoverage,
  commensurateHarmonic,
  phaseCoverage,
  scanPeriods,
} from './phase-coverage';
import { planVisitTimes, type VisitRequest } from './visit-times';

// Invented sites at the same latitude, 131.6° apart in longitude.
const NORTH_SITE: SkySite = { latitudeDeg: 34.9, longitudeDeg: -108.4, elevationM: 2100, timeZone: 'America/Denver' };
const EAST_SITE: SkySite = { latitudeDeg: 34.9, longitudeDeg: 120, elevationM: 1500, timeZone: 'Asia/Shanghai' };
const CAMPAIGN = { firstNight: '2025-10-01', lastNight: '2025-12-29' }; // 90 nights
const TARGETS = [
  { name: 'autumn star', raDeg: 45, decDeg: 20 },
  { name: 'southern star', raDeg: 45, decDeg: -80 },
];

let north: SkyWindowsResult;
let east: SkyWindowsResult;
beforeAll(() => {
  north = computeSkyWindows({ site: NORTH_SITE, limits: { altitudeLimitDeg: 30 }, campaign: CAMPAIGN, targets: TARGETS });
  east = computeSkyWindows({ site: EAST_SITE, limits: { altitudeLimitDeg: 30 }, campaign: CAMPAIGN, targets: TARGETS });
});

const req = (r: Partial<VisitRequest> = {}): VisitRequest => ({
  baselineDays: 60,
  visitsPerNight: 1,
  nightStepDays: 1,
  visitHours: 0.25,
  ...r,
});
const range = (low: number, high = low) => ({ low, high });

describe('phaseCoverage', () => {
  it('counts every bin for evenly spread times and one bin for times at the same phase (definition)', () => {
    const even = Array.from({ length: 10 }, (_, i) => i + 0.5);
    expect(phaseCoverage(even, 10)).toBe(1);
    expect(phaseCoverage([0.25, 3.25, 7.25, 100.25], 1)).toBeCloseTo(0.1, 12);
  });

  it('sees nightly visits at a fixed clock time at one phase for P = 1 d and two for P = 2 d (day aliasing)', () => {
    const nightly = Array.from({ length: 90 }, (_, i) => i + 0.25);
    expect(phaseCoverage(nightly, 1)).toBeCloseTo(0.1, 12);
    expect(phaseCoverage(nightly, 2)).toBeCloseTo(0.2, 12);
    expect(phaseCoverage(nightly, 7.3)).toBe(1);
  });

  it('returns 0 without times, honours the bin count and refuses a non-positive period', () => {
    expect(phaseCoverage([], 1)).toBe(0);
    expect(phaseCoverage([0.05, 0.3], 1, 4)).toBe(0.5);
    expect(() => phaseCoverage([1], 0)).toThrow(SkyInputError);
  });
});

describe('commensurateHarmonic', () => {
  // |1/P − n| < 1/T, beat 1/|1/P − n| (common practice, no source).
  it('finds periods near 1, ½ and ⅓ d with their beat periods', () => {
    expect(commensurateHarmonic(1, 90)).toEqual({ n: 1, beatPeriodDays: Infinity });
    // Beat 50 d: less than one cycle of drift over a 40-d baseline.
    expect(commensurateHarmonic(1 / 0.98, 40)).toEqual({ n: 1, beatPeriodDays: expect.closeTo(50, 9) });
    expect(commensurateHarmonic(0.5, 90)?.n).toBe(2);
    expect(commensurateHarmonic(1 / 3.005, 90)).toEqual({ n: 3, beatPeriodDays: expect.closeTo(200, 6) });
    // The sidereal day is commensurate for any baseline under a year.
    expect(commensurateHarmonic(1 / SIDEREAL_PER_SOLAR_DAY, 300)?.n).toBe(1);
  });

  it('does not flag periods whose phase drifts by more than a cycle over the baseline', () => {
    expect(commensurateHarmonic(1 / 0.98, 60)).toBeNull(); // beat 50 d: 1.2 cycles over 60 d
    expect(commensurateHarmonic(7.3, 90)).toBeNull();
    expect(commensurateHarmonic(0.7, 1000)).toBeNull();
    expect(commensurateHarmonic(1, 0)).toBeNull();
  });
});

describe('scanPeriods', () => {
  it('adds the solar and sidereal 1/n-day periods inside the range and none outside it', () => {
    const inside = scanPeriods(0.9, 1.1);
    expect(inside).toHaveLength(DEFAULT_PERIOD_SCAN_COUNT + 2);
    expect(inside).toContain(1);
    expect(inside).toContain(1 / SIDEREAL_PER_SOLAR_DAY);
    expect(scanPeriods(2, 20)).toHaveLength(DEFAULT_PERIOD_SCAN_COUNT);
  });
});

describe('assessPhaseCoverage', () => {
  it('flags P ≈ 1 d with one visit per night from one site: low coverage, n = 1, other longitudes needed', () => {
    const a = assessPhaseCoverage(north.targets[0], req(), range(0.98, 1.02));
    expect(a.minCoverage).toBeLessThan(0.5);
    expect(a.commensurate?.n).toBe(1);
    expect(a.action).toBe('otherLongitude');
    expect(a.requiredBaselineDays).toBeNull();
    expect(a.reason).toMatch(
      /^P = 0\.99\d* d is close to 1 d: .*beat period.* cover only \d+ % of its phase in the 60 d baseline.*other longitudes/,
    );
  });

  it('flags P ≈ ½ d the same way with n = 2', () => {
    const a = assessPhaseCoverage(north.targets[0], req(), range(0.49, 0.51));
    expect(a.minCoverage).toBeLessThan(0.5);
    expect(a.commensurate?.n).toBe(2);
    expect(a.action).toBe('otherLongitude');
    expect(a.reason).toContain('close to 1/2 d');
  });

  it('asks for a longer baseline when the beat period fits in the campaign (P = 1.05 d, beat 21 d, 10-d baseline)', () => {
    const a = assessPhaseCoverage(north.targets[0], req({ baselineDays: 10 }), range(1.05));
    expect(a.commensurate).toEqual({ n: 1, beatPeriodDays: expect.closeTo(21, 6) });
    expect(a.action).toBe('lengthenBaseline');
    expect(a.requiredBaselineDays).toBeGreaterThan(10);
    expect(a.requiredBaselineDays).toBeLessThanOrEqual(21);
    expect(a.reason).toContain('its phase drifts by one cycle only every 21 d');
    // The baseline it asks for does reach the threshold.
    const longer = assessPhaseCoverage(north.targets[0], req({ baselineDays: a.requiredBaselineDays! }), range(1.05));
    expect(longer.action).toBe('ok');
  });

  it('passes a P = 7.3 d target with nightly visits: full coverage, not commensurate', () => {
    const a = assessPhaseCoverage(north.targets[0], req(), range(7.3));
    expect(a).toMatchObject({ action: 'ok', commensurate: null, requiredBaselineDays: null, reason: null });
    expect(a.minCoverage).toBeGreaterThanOrEqual(0.8);
  });

  it('asks for a sampling change when visits every 7 nights lock onto P ≈ 7.3 d (not a day harmonic)', () => {
    // The phase moves by 7/7.3 − 1 = −0.04 cycle per visit: 13 visits in the campaign span half a cycle.
    const a = assessPhaseCoverage(north.targets[0], req({ nightStepDays: 7 }), range(7.2, 7.4));
    expect(a.action).toBe('changeSampling');
    expect(a.commensurate).toBeNull();
    expect(a.reason).toContain('another night step or more visits per night');
    // Nightly visits do not lock onto it.
    expect(assessPhaseCoverage(north.targets[0], req(), range(7.2, 7.4)).action).toBe('ok');
  });

  it('asks for a baseline beyond the campaign for periods longer than the campaign can cover', () => {
    const a = assessPhaseCoverage(north.targets[0], req(), range(150, 200));
    expect(a.action).toBe('lengthenBaseline');
    expect(a.requiredBaselineDays).toBe(160); // 0.8 × 200 d
    expect(a.reason).toContain('longer than the campaign');
  });

  it('sends a target the site never sees to another node', () => {
    const a = assessPhaseCoverage(north.targets[1], req(), range(0.5, 10));
    expect(a).toMatchObject({ action: 'otherLongitude', minCoverage: 0, visits: 0 });
  });

  it('covers P = 1 d when the visits of two sites ~130° apart in longitude are merged (why other longitudes help)', () => {
    const r = req({ visitsPerNight: 6 });
    const a = planVisitTimes(north.targets[0], r);
    const b = planVisitTimes(east.targets[0], r);
    expect(a.epochUtcMs).toBe(b.epochUtcMs); // same campaign → same epoch: the times can be merged
    const merged = Float64Array.from([...a.timesDays, ...b.timesDays]);
    expect(phaseCoverage(a.timesDays, 1)).toBeLessThanOrEqual(0.5);
    expect(phaseCoverage(b.timesDays, 1)).toBeLessThanOrEqual(0.5);
    expect(phaseCoverage(merged, 1)).toBeGreaterThanOrEqual(0.8);
  });

  it('refuses an inverted period range', () => {
    expect(() => assessPhaseCoverage(north.targets[0], req(), { low: 2, high: 1 })).toThrow(SkyInputError);
  });
});
