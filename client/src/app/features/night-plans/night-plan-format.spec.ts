import {
  buildPercent,
  buildWords,
  cadenceAchieved,
  cadenceAsked,
  cadenceLate,
  campaignMonths,
  isBuildActive,
  siteClock,
  siteNoon,
  utcClock,
  zoneOffsetMinutes,
} from './night-plan-format';
import { testBuild, testTarget } from './testing/night-plan-fixtures';

describe('night-plan-format', () => {
  it('buildPercent: floored share of the work, 0 before it is counted, 100 when done (worked by hand in this test)', () => {
    expect(buildPercent({ state: 'running', done: 1, total: 3 })).toBe(33);
    expect(buildPercent({ state: 'running', done: 299, total: 300 })).toBe(99);
    expect(buildPercent({ state: 'queued', done: 0, total: 0 })).toBe(0);
    expect(buildPercent({ state: 'done', done: 0, total: 0 })).toBe(100);
  });

  it('buildWords: queued, counting, running and a re-plan', () => {
    expect(buildWords(testBuild({ state: 'queued', done: 0, total: 0 }), 'en')).toBe('Building the night plans: waiting to start.');
    expect(buildWords(testBuild({ state: 'running', done: 0, total: 0 }), 'en')).toBe('Building the night plans: counting the work.');
    expect(buildWords(testBuild({ state: 'running', done: 1200, total: 3000 }), 'en')).toBe(
      'Building the night plans: 1,200 of 3,000 steps done (40 %).',
    );
    expect(buildWords(testBuild({ kind: 'replan', fromNight: '2027-03-02', state: 'queued' }), 'en')).toBe(
      'Re-planning from the night of 2027-03-02: waiting to start.',
    );
    expect(isBuildActive(testBuild({ state: 'running' }))).toBe(true);
    expect(isBuildActive(testBuild({ state: 'failed' }))).toBe(false);
    expect(isBuildActive(null)).toBe(false);
  });

  it('site times: fixed UTC−3 and a zone with summer time (common practice, no source: IANA zone rules)', () => {
    expect(zoneOffsetMinutes(new Date('2027-03-02T02:00:00Z'), 'Etc/GMT+3')).toBe(-180);
    expect(siteClock('2027-03-02T02:00:00Z', 'Etc/GMT+3')).toBe('23:00');
    expect(utcClock('2027-03-02T02:05:00.000Z')).toBe('02:05');
    // Central European summer time (UTC+2) in July, winter time (UTC+1) in January.
    expect(zoneOffsetMinutes(new Date('2027-07-01T12:00:00Z'), 'Europe/Berlin')).toBe(120);
    expect(zoneOffsetMinutes(new Date('2027-01-01T12:00:00Z'), 'Europe/Berlin')).toBe(60);
    // Local noon of 1 March at UTC−3 is 15:00 UTC.
    expect(new Date(siteNoon('2027-03-01', 'Etc/GMT+3')).toISOString()).toBe('2027-03-01T15:00:00.000Z');
  });

  it('campaignMonths: partial first and last months, across a year end', () => {
    expect(campaignMonths('2027-11-20', '2028-01-10', 'en')).toEqual([
      { from: '2027-11-20', to: '2027-11-30', label: 'November 2027' },
      { from: '2027-12-01', to: '2027-12-31', label: 'December 2027' },
      { from: '2028-01-01', to: '2028-01-10', label: 'January 2028' },
    ]);
    expect(campaignMonths('2027-03-01T00:00:00Z', '2027-03-05T00:00:00Z', 'en')).toEqual([
      { from: '2027-03-01', to: '2027-03-05', label: 'March 2027' },
    ]);
  });

  it('cadence in words, and a gap past the step and its tolerance', () => {
    expect(cadenceAsked(testTarget({ stepNights: 6, toleranceNights: 2 }))).toBe('every 6 nights (4 to 8)');
    expect(cadenceAsked(testTarget({ stepNights: 1, toleranceNights: 0 }))).toBe('every night');
    expect(cadenceAchieved(testTarget({ medianGapNights: 1, largestGapNights: 3 }))).toBe('median 1 night, largest gap 3 nights');
    expect(cadenceAchieved(testTarget({ medianGapNights: null, largestGapNights: null }))).toBe('fewer than two visit nights planned');
    expect(cadenceLate(testTarget({ stepNights: 6, toleranceNights: 2, largestGapNights: 8 }))).toBe(false);
    expect(cadenceLate(testTarget({ stepNights: 6, toleranceNights: 2, largestGapNights: 9 }))).toBe(true);
  });
});
