import type { NodeSpec, SiteSpec } from '../facility/facility-types';
import { computeTargetPlan } from '../science/target-plan';
import { assessCadence, type CadenceAssessment } from '../sky/cadence-assessment';
import { SkyInputError } from '../sky/sky-input-error';
import { computeSkyWindows } from '../sky/sky-windows';
import { skyLimitsForNode, toSkyWindowsReport } from '../sky/sky-windows-report';
import { combinePlanWithSky, computeNodeTargetPlan, requirementFromPlan } from './node-target-plan';
import { targetWindowsFromReport } from './sky-report-adapter';

// An invented southern node (behaviour checks, not reference numbers).
const site: SiteSpec = {
  latitudeDeg: -29,
  longitudeDeg: -70.7,
  elevationM: 2400,
  timeZone: 'America/Santiago',
  skyBrightnessMagPerArcsec2: 21.6,
};
const node: NodeSpec = {
  apertureM: 0.4,
  obstructionFraction: 0.35,
  throughput: 0.55,
  band: 'V',
  readNoiseE: 9,
  darkCurrentEPerS: 0.02,
  gainEPerAdu: 1.3,
  saturationE: 60000,
  pixelScaleArcsec: 1.1,
  seeingFwhmArcsec: 1.7,
  systematicFloorMmag: 1.2,
  scintillationModel: 'young1967',
  overheadSeconds: 60,
  minExposureSeconds: 2,
  maxExposureSeconds: 300,
  altitudeLimitDeg: 30,
  sunAltitudeLimitDeg: -12,
  weatherLossFraction: 0.25,
  rateMinorPerHour: 5000,
  currency: 'eur',
};
const target = {
  colour: { value: 1.1, system: 'BPRP' as const },
  ageMyr: 700,
  ageUncertaintyMyr: 80,
  magnitude: { value: 12, band: 'G' as const },
};
// An older, slower star: its cadence asks for a visit every few nights, so some windows carry it.
const olderTarget = { ...target, colour: { value: 1.4, system: 'BPRP' as const }, ageMyr: 2500, ageUncertaintyMyr: 300 };

/** Equal assessments, up to the report's 0.001-h rounding of the longest nightly window. */
function expectSameAssessment(actual: CadenceAssessment, expected: CadenceAssessment | undefined): void {
  expect(expected).toBeDefined();
  expect(actual).toEqual({ ...expected, maxNightlyUsableHours: expect.closeTo(expected!.maxNightlyUsableHours, 3) });
}

function computed(raDeg: number, decDeg: number, moonSeparationMinDeg?: number) {
  return computeSkyWindows({
    site,
    limits: skyLimitsForNode(node, moonSeparationMinDeg === undefined ? {} : { moonSeparationMinDeg }),
    campaign: { firstNight: '2026-03-01', lastNight: '2026-08-27' },
    targets: [
      { name: 'Star L-3', raDeg, decDeg },
      { name: 'Star L-4', raDeg: (raDeg + 120) % 360, decDeg: -60 },
    ],
  });
}

describe('targetWindowsFromReport', () => {
  it('rebuilds the typed arrays of each target from the JSON report', () => {
    const result = computed(200, -35, 30);
    const report = toSkyWindowsReport(result);
    for (const [i, original] of result.targets.entries()) {
      const back = targetWindowsFromReport(JSON.parse(JSON.stringify(report.targets[i])), i);
      expect(back.targetIndex).toBe(i);
      expect(back.name).toBe(original.name);
      expect(back.nightDates).toEqual(original.nightDates);
      expect(back.usableHoursByNight.length).toBe(original.usableHoursByNight.length);
      for (let n = 0; n < original.nightDates.length; n++) {
        expect(back.usableHoursByNight[n]).toBeCloseTo(original.usableHoursByNight[n], 3);
        expect(back.intervalCountByNight[n]).toBe(original.intervalCountByNight[n]);
        expect(back.moonExcludedByNight[n]).toBe(original.moonExcludedByNight[n]);
        expect(back.moonIlluminationByNight[n]).toBeCloseTo(original.moonIlluminationByNight[n], 3);
        expect(Math.abs(back.moonAltitudeDegByNight[n] - original.moonAltitudeDegByNight[n])).toBeLessThanOrEqual(0.005);
      }
      // Interval edges survive to the second.
      for (let k = 0; k < original.intervalsUtcMs.length; k++) {
        expect(Math.abs(back.intervalsUtcMs[k] - original.intervalsUtcMs[k])).toBeLessThanOrEqual(500);
      }
      expect(back.summary).toEqual(report.targets[i].summary);
    }
  });

  it('gives the same cadence verdict as the typed windows, for the plan of the moment', () => {
    const verdicts: boolean[] = [];
    // A southern-sky field, and a field at Dec +50° that never climbs above 30° from −29°.
    for (const result of [computed(200, -35), computed(20, 50)]) {
      const report = toSkyWindowsReport(result);
      for (const star of [target, olderTarget]) {
        const plan = computeTargetPlan(star, node, site);
        const requirement = requirementFromPlan(plan);
        for (const [i, original] of result.targets.entries()) {
          const back = targetWindowsFromReport(report.targets[i], i);
          const direct = assessCadence(original, requirement, node.weatherLossFraction);
          expectSameAssessment(assessCadence(back, requirement, node.weatherLossFraction), direct);
          const combined = combinePlanWithSky(plan, back, node);
          expect(combined.feasible).toBe(combinePlanWithSky(plan, original, node).feasible);
          verdicts.push(direct.fits);
        }
      }
    }
    // The scenarios cover both answers.
    expect(verdicts).toContain(true);
    expect(verdicts).toContain(false);
  });

  it('matches the server-side assessment a report carries when it was given the same requirement', () => {
    const result = computed(200, -35);
    const requirement = requirementFromPlan(computeTargetPlan(target, node, site));
    const report = toSkyWindowsReport(result, { requirement, weatherLossFraction: node.weatherLossFraction });
    const back = targetWindowsFromReport(report.targets[0]);
    expectSameAssessment(assessCadence(back, requirement, node.weatherLossFraction), report.targets[0].assessment);
  });

  it('carries the Moon’s altitude per night, rounded to 0.01°, so the plan gets the same moonlit sky as from the typed windows', () => {
    const result = computed(200, -35);
    const report = JSON.parse(JSON.stringify(toSkyWindowsReport(result)));
    const night = report.targets[0].nights[5];
    expect(night.moonAltitudeDeg).toBe(Number(result.targets[0].moonAltitudeDegByNight[5].toFixed(2)));
    const back = targetWindowsFromReport(report.targets[0]);
    const direct = computeNodeTargetPlan(target, node, site, result.targets[0]).plan.quantities;
    const fromReport = computeNodeTargetPlan(target, node, site, back).plan.quantities;
    // The moonlit model, not the site's dark sky.
    expect(fromReport.skyBrightnessMagPerArcsec2.why).toMatch(/^median sky with the Moon over the \d+ nights/);
    expect(fromReport.skyBrightnessMagPerArcsec2.value).toBeLessThan(site.skyBrightnessMagPerArcsec2);
    // The report's rounding moves the median sky by less than 0.005 mag (the page shows 0.1 mag).
    // One night near full Moon moves more: the illumination's 0.001 step is a phase angle of up
    // to ~2.6° there (α = acos(2f − 1) is steep at f = 1), a few hundredths of a magnitude.
    expect(fromReport.skyBrightnessMagPerArcsec2.value).toBeCloseTo(direct.skyBrightnessMagPerArcsec2.value, 2);
    expect(fromReport.worstSkyBrightnessMagPerArcsec2.value).toBeCloseTo(direct.worstSkyBrightnessMagPerArcsec2.value, 1);
    expect(fromReport.visits.value).toBe(direct.visits.value);
    expect(fromReport.baselineDays.value).toBe(direct.baselineDays.value);
  });

  it('an older report without the Moon’s altitude: NaN in the windows, and the plan takes the site’s dark sky and says the Moon could not be counted', () => {
    const report = toSkyWindowsReport(computed(200, -35));
    const old = { ...report.targets[0], nights: report.targets[0].nights!.map(({ moonAltitudeDeg: _dropped, ...night }) => night) };
    expect(old.nights.some((night) => 'moonAltitudeDeg' in night)).toBe(false);
    const back = targetWindowsFromReport(old);
    expect(Array.from(back.moonAltitudeDegByNight).every(Number.isNaN)).toBe(true);
    const combined = computeNodeTargetPlan(target, node, site, back);
    const sky = combined.plan.quantities.skyBrightnessMagPerArcsec2;
    expect(sky.value).toBe(site.skyBrightnessMagPerArcsec2);
    expect(sky.why).toMatch(/the Moon could not be counted/);
    expect(combined.plan.quantities.worstSkyBrightnessMagPerArcsec2.why).toMatch(/the Moon could not be counted/);
    // The rest of the plan is the dark-sky plan checked against the same windows.
    const dark = computeTargetPlan(target, node, site);
    expect(combined.plan.quantities.exposureSeconds.value).toBe(dark.quantities.exposureSeconds.value);
    expect(combined.sky).toEqual(combinePlanWithSky(dark, back, node).sky);
  });

  it('refuses a report without its per-night list, naming the field', () => {
    const report = toSkyWindowsReport(computed(200, -35), { includeNights: false });
    expect(() => targetWindowsFromReport(report.targets[0])).toThrow(SkyInputError);
    expect(() => targetWindowsFromReport(report.targets[0])).toThrow(/^nights: /);
  });

  it('refuses an unreadable interval edge, naming the night and interval', () => {
    const report = toSkyWindowsReport(computed(200, -35));
    const t = report.targets[0];
    const n = t.nights!.findIndex((night) => night.intervals.length > 0);
    t.nights![n].intervals[0] = { startUtc: 'dusk', endUtc: t.nights![n].intervals[0].endUtc };
    expect(() => targetWindowsFromReport(t)).toThrow(new RegExp(`^nights\\[${n}\\]\\.intervals\\[0\\]`));
  });
});
