import { SkyInputError } from '../sky/sky-input-error';
import { computeSkyWindows } from '../sky/sky-windows';
import type { SkySite, TargetWindows } from '../sky/sky-types';
import { syntheticWindows } from '../sky/testing/synthetic-windows';
import { DEFAULT_MAX_GAP_NIGHTS, assessSeason, observingSeasons } from './observing-season';

/** Synthetic windows with only the usable hours per night set (nights from 2025-01-01). */
const windowsOfHours = (hours: number[]): TargetWindows => syntheticWindows({ usableHours: hours });

const run = (length: number, h = 4) => Array.from({ length }, () => h);

// Invented sites: a northern site at 34.9° N and a mid-latitude site at 50° N.
const NORTH_SITE: SkySite = { latitudeDeg: 34.9, longitudeDeg: -108.4, elevationM: 2100, timeZone: 'America/Denver' };
const MID_SITE: SkySite = { latitudeDeg: 50, longitudeDeg: 10, elevationM: 300, timeZone: 'Europe/Berlin' };

describe('observingSeasons', () => {
  it('bridges a gap of maxGapNights nights (default 14, Spincycle’s choice) and splits at one more', () => {
    // Usable nights 0–9 and 23–32: consecutive usable nights 9 and 23 are 14 apart.
    const bridged = observingSeasons(windowsOfHours([...run(10), ...run(13, 0), ...run(10), 0]));
    expect(DEFAULT_MAX_GAP_NIGHTS).toBe(14);
    expect(bridged.seasons).toHaveLength(1);
    expect(bridged.seasons[0]).toMatchObject({ firstNightIndex: 0, lastNightIndex: 32, lengthDays: 32, usableNights: 20 });
    // 9 and 24 are 15 apart.
    const split = observingSeasons(windowsOfHours([...run(10), ...run(14, 0), ...run(10), 0]));
    expect(split.seasons.map((s) => [s.firstNightIndex, s.lastNightIndex])).toEqual([
      [0, 9],
      [24, 33],
    ]);
    expect(split.longestSeason?.firstNightIndex).toBe(0);
  });

  it('names the dates and flags a season that the campaign may cut, and not one inside it', () => {
    const { seasons } = observingSeasons(windowsOfHours([0, ...run(5), ...run(20, 0), ...run(3)]), { maxGapNights: 7 });
    expect(seasons[0]).toMatchObject({ firstNight: '2025-01-02', lastNight: '2025-01-06', cutByCampaign: false });
    expect(seasons[1]).toMatchObject({ firstNight: '2025-01-27', lastNight: '2025-01-29', cutByCampaign: true });
  });

  it('ignores nights shorter than minUsableHours, and counts them without it', () => {
    const w = windowsOfHours([...run(10, 0.2), ...run(10, 3)]);
    expect(observingSeasons(w, { minUsableHours: 0.5 }).longestSeason).toMatchObject({ firstNightIndex: 10, lengthDays: 9 });
    expect(observingSeasons(w).longestSeason).toMatchObject({ firstNightIndex: 0, lengthDays: 19 });
  });

  it('returns no season for a target that is never usable', () => {
    expect(observingSeasons(windowsOfHours(run(30, 0)))).toEqual({ seasons: [], longestSeason: null });
  });

  it('refuses a gap under one night', () => {
    expect(() => observingSeasons(windowsOfHours(run(3)), { maxGapNights: 0 })).toThrow(SkyInputError);
  });
});

describe('assessSeason', () => {
  it('fits a baseline as long as the season, and proposes ceil(baseline / season) seasons for a longer one', () => {
    const w = windowsOfHours([0, ...run(101), 0]); // a 100-d season
    expect(assessSeason(w, 100)).toMatchObject({ fitsOneSeason: true, multiSeason: null, reason: null, longestSeasonDays: 100 });
    const a = assessSeason(w, 250);
    expect(a.fitsOneSeason).toBe(false);
    expect(a.multiSeason).toEqual({ seasons: 3, perSeasonBaselineDays: expect.closeTo(250 / 3, 9) });
    expect(a.reason).toContain('a baseline of 250 days does not fit in one observing season');
    expect(a.reason).toContain('3 seasons of about 83 days each');
    expect(a.reason).toContain('spans several allocation cycles');
  });

  it('says so when the target has no season at the site', () => {
    const a = assessSeason(windowsOfHours(run(30, 0)), 10);
    expect(a).toMatchObject({ fitsOneSeason: false, longestSeasonDays: 0, seasonsInCampaign: 0, multiSeason: null });
    expect(a.reason).toContain('no usable night');
  });

  describe('real windows over a year', () => {
    // computeSkyWindows over 365 nights takes a few hundred ms: once per site.
    let north: TargetWindows[];
    let midFromJuly: TargetWindows;
    let midFromJanuary: TargetWindows;
    beforeAll(() => {
      north = computeSkyWindows({
        site: NORTH_SITE,
        limits: { altitudeLimitDeg: 30 },
        campaign: { firstNight: '2025-07-01', lastNight: '2026-06-30' },
        targets: [
          { name: 'equatorial 12h', raDeg: 180, decDeg: 0 },
          { name: 'winter star', raDeg: 60, decDeg: 20 },
        ],
      }).targets;
      const circumpolar = [{ name: 'polar star', raDeg: 90, decDeg: 80 }];
      midFromJuly = computeSkyWindows({
        site: MID_SITE,
        limits: { altitudeLimitDeg: 30 },
        campaign: { firstNight: '2025-07-01', lastNight: '2026-06-30' },
        targets: circumpolar,
      }).targets[0];
      midFromJanuary = computeSkyWindows({
        site: MID_SITE,
        limits: { altitudeLimitDeg: 30 },
        campaign: { firstNight: '2026-01-01', lastNight: '2026-12-31' },
        targets: circumpolar,
      }).targets[0];
    });

    it('gives an equatorial target (RA 12h) one season of 6–8 months from 34.9° N, too short for 300 d', () => {
      // The target is behind the Sun around the September equinox (the Sun is at RA 12h then).
      const { seasons, longestSeason } = observingSeasons(north[0]);
      expect(seasons).toHaveLength(1);
      expect(longestSeason!.lengthDays).toBeGreaterThanOrEqual(180);
      expect(longestSeason!.lengthDays).toBeLessThanOrEqual(245);
      const a = assessSeason(north[0], 300);
      expect(a.fitsOneSeason).toBe(false);
      expect(a.multiSeason).toEqual({ seasons: 2, perSeasonBaselineDays: 150 });
      expect(a.reason).toMatch(
        /^a baseline of 300 days does not fit in one observing season: the target's longest season from this site is \d+ days \(2025-1\d-\d\d to 2026-0\d-\d\d\)/,
      );
    });

    it('fits a 40-d baseline for a target in season', () => {
      expect(assessSeason(north[1], 40)).toMatchObject({ fitsOneSeason: true, reason: null, multiSeason: null });
    });

    it('keeps a circumpolar target (Dec +80 from 50° N) observable except in the short summer nights without astronomical darkness', () => {
      // At 50° N the Sun stays above −18° around the June solstice (lowest −16.6° on 21 June,
      // 90° − 50° − 23.4°, common practice, no source): the windows have no usable time then.
      const june21 = midFromJuly.nightDates.indexOf('2026-06-21');
      expect(midFromJuly.usableHoursByNight[june21]).toBe(0);
      const dec21 = midFromJuly.nightDates.indexOf('2025-12-21');
      expect(midFromJuly.usableHoursByNight[dec21]).toBeGreaterThan(10);
      // July–June: the summer gap falls at the campaign's ends, one season of ~ 10.5 months holds 250 d.
      const july = observingSeasons(midFromJuly);
      expect(july.seasons).toHaveLength(1);
      expect(july.longestSeason!.lengthDays).toBeGreaterThan(300);
      expect(assessSeason(midFromJuly, 250).fitsOneSeason).toBe(true);
      // January–December: the summer gap splits the year into two seasons, neither holds 250 d.
      const january = observingSeasons(midFromJanuary);
      expect(january.seasons).toHaveLength(2);
      const a = assessSeason(midFromJanuary, 250);
      expect(a.fitsOneSeason).toBe(false);
      expect(a.seasonsInCampaign).toBe(2);
      expect(a.reason).toContain('cut by the campaign');
    });
  });
});
