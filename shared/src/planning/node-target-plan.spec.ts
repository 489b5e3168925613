import type { NodeSpec, SiteSpec } from '../facility/facility-types';
import { computeSkyWindows } from '../sky/sky-windows';
import { skyLimitsForNode } from '../sky/sky-windows-report';
import { computeNodeTargetPlan, requirementFromPlan } from './node-target-plan';

// An invented northern node (demo-like values; the checks below are about behaviour, not numbers).
const site: SiteSpec = {
  latitudeDeg: 35,
  longitudeDeg: -108,
  elevationM: 2200,
  timeZone: 'America/Denver',
  skyBrightnessMagPerArcsec2: 21.5,
};
const node: NodeSpec = {
  apertureM: 0.5,
  obstructionFraction: 0.4,
  throughput: 0.55,
  band: 'V',
  readNoiseE: 9,
  darkCurrentEPerS: 0.02,
  gainEPerAdu: 1.3,
  saturationE: 80000,
  pixelScaleArcsec: 0.8,
  seeingFwhmArcsec: 1.6,
  systematicFloorMmag: 1,
  scintillationModel: 'young1967',
  overheadSeconds: 45,
  minExposureSeconds: 2,
  maxExposureSeconds: 300,
  altitudeLimitDeg: 25,
  sunAltitudeLimitDeg: -18,
  weatherLossFraction: 0.3,
  rateMinorPerHour: 4500,
  currency: 'eur',
};
const target = {
  colour: { value: 0.9, system: 'BV' as const },
  ageMyr: 600,
  ageUncertaintyMyr: 60,
  magnitude: { value: 12, band: 'V' as const },
};

function windowsFor(raDeg: number, decDeg: number, campaign = { firstNight: '2027-01-01', lastNight: '2027-06-29' }) {
  const result = computeSkyWindows({
    site,
    limits: skyLimitsForNode(node),
    campaign,
    targets: [{ name: 'Star T-1', raDeg, decDeg }],
  });
  return result.targets[0];
}

describe('computeNodeTargetPlan', () => {
  it('a K dwarf of a 600 Myr cluster high in the spring sky: feasible, verdict says the cadence fits', () => {
    const r = computeNodeTargetPlan(target, node, site, windowsFor(130, 20));
    expect(r.feasible).toBe(true);
    expect(r.reasons).toEqual([]);
    expect(r.sky.verdict).toMatch(/cadence fits/);
    const req = requirementFromPlan(r.plan);
    expect(req.totalVisits).toBe(r.plan.quantities.visits.value);
    expect(req.visitHours).toBeCloseTo(r.plan.quantities.visitSeconds.value / 3600, 9);
  });

  it('the same star at Dec −75° never rises at 35°N: infeasible with a reason and an other-node suggestion', () => {
    const r = computeNodeTargetPlan(target, node, site, windowsFor(130, -75));
    expect(r.feasible).toBe(false);
    expect(r.reasons.length).toBeGreaterThan(0);
    expect(r.suggestions.map((s) => s.kind)).toContain('other_node');
  });

  it('a star too bright for the node is infeasible from the science alone, whatever the sky', () => {
    const r = computeNodeTargetPlan({ ...target, magnitude: { value: 4, band: 'V' } }, node, site, windowsFor(130, 20));
    expect(r.plan.feasible).toBe(false);
    expect(r.feasible).toBe(false);
    expect(r.reasons.join(' ')).toMatch(/saturat/);
  });

  it('suggests a longer exposure only where one is possible: not for a star already at its saturation limit', () => {
    const bright = computeNodeTargetPlan(
      { ...target, ageMyr: 4000, ageUncertaintyMyr: 400, magnitude: { value: 10, band: 'V' } },
      node,
      site,
      windowsFor(130, 20),
    );
    expect(bright.plan.quantities.exposureSeconds.value).toBeCloseTo(bright.plan.quantities.saturationLimitSeconds.value, 0);
    expect(bright.suggestions.map((s) => s.kind)).not.toContain('longer_exposure');
    const short = computeNodeTargetPlan({ ...target, magnitude: { value: 14, band: 'V' } }, node, site, windowsFor(130, 20), {
      exposureSeconds: 5,
    });
    expect(short.plan.flags.map((f) => f.code)).toContain('precisionGoalNotReached');
    expect(short.suggestions.find((s) => s.kind === 'longer_exposure')?.message).toMatch(/up to \d+ s/);
  });
});

describe('computeNodeTargetPlan: season, phase coverage and moonlight from the sky windows', () => {
  it('season: a baseline longer than the observing season is not feasible in one season, and a multi-season plan is offered', () => {
    // A slow rotator with a long requested precision → a baseline of many months; the target
    // (RA 8.7 h) is observable from January to early June only.
    const slow = { ...target, periodDays: 60, periodUncertaintyDays: 6 };
    const r = computeNodeTargetPlan(slow, node, site, windowsFor(130, 20), { baselineCycles: 4, maxBaselineDays: 400 });
    expect(r.plan.quantities.baselineDays.value).toBeGreaterThan(r.season.longestSeasonDays);
    expect(r.season.fitsOneSeason).toBe(false);
    expect(r.feasible).toBe(false);
    expect(r.reasons.join(' ')).toMatch(/season/);
    expect(r.suggestions.map((x) => x.kind)).toContain('multi_season');
  });

  it('season: an ordinary baseline inside the season fits (must not trigger)', () => {
    const r = computeNodeTargetPlan(target, node, site, windowsFor(130, 20));
    expect(r.season.fitsOneSeason).toBe(true);
    expect(r.suggestions.map((x) => x.kind)).not.toContain('multi_season');
  });

  it('phase coverage: a period of 1.00 d seen from one site keeps its phase every night → not feasible from here, other longitudes asked for', () => {
    const dayLocked = { ...target, periodDays: 1.0, periodUncertaintyDays: 0.002 };
    const r = computeNodeTargetPlan(dayLocked, node, site, windowsFor(130, 20));
    expect(r.phase.commensurate?.n).toBe(1);
    expect(r.feasible).toBe(false);
    expect(r.reasons.join(' ')).toMatch(/1(\.0+)? ?d|beat/);
    expect(r.suggestions.map((x) => x.kind)).toContain('other_longitude');
  });

  it('phase coverage: a 1.06 d period (beat period ≈ 18 d) needs more nights than 3 cycles to drift through its phases: the baseline is lengthened', () => {
    const nearDay = { ...target, periodDays: 1.06, periodUncertaintyDays: 0.005 };
    const short = computeNodeTargetPlan(nearDay, node, site, windowsFor(130, 20), {
      sky: { medianMagPerArcsec2: 21.5, worstMagPerArcsec2: 21.5, usableNights: 1, source: 'test' },
      baselineCycles: 3,
    });
    expect(short.plan.flags.map((f) => f.code)).toContain('baselineForPhaseCoverage');
    expect(short.plan.quantities.baselineDays.value).toBeGreaterThan(Math.ceil(3 * short.plan.quantities.longestPeriodDays.value));
    expect(short.phase.action).toBe('ok');
  });

  it('phase coverage: a 6.5 d period is not day-locked (must not trigger)', () => {
    const r = computeNodeTargetPlan({ ...target, periodDays: 6.5, periodUncertaintyDays: 0.5 }, node, site, windowsFor(130, 20));
    expect(r.phase.commensurate).toBeNull();
    expect(r.suggestions.map((x) => x.kind)).not.toContain('other_longitude');
  });

  it('moonlight: a target near the ecliptic through full-moon weeks gets a brighter median sky than the dark site value, and a noisier visit', () => {
    const moonlit = computeNodeTargetPlan(target, node, site, windowsFor(130, 20));
    const q = moonlit.plan.quantities;
    expect(q.skyBrightnessMagPerArcsec2.value).toBeLessThan(site.skyBrightnessMagPerArcsec2);
    expect(q.worstSkyBrightnessMagPerArcsec2.value).toBeLessThan(q.skyBrightnessMagPerArcsec2.value);
    const dark = computeNodeTargetPlan(target, node, site, windowsFor(130, 20), {
      sky: {
        medianMagPerArcsec2: site.skyBrightnessMagPerArcsec2,
        worstMagPerArcsec2: site.skyBrightnessMagPerArcsec2,
        usableNights: 100,
        source: 'test',
      },
    });
    expect(dark.plan.precision.components.skyPpm).toBeLessThan(moonlit.plan.precision.components.skyPpm);
  });

  it('moonlight: with no usable night the site dark sky is assumed and said so (must not invent a Moon)', () => {
    const r = computeNodeTargetPlan(target, node, site, windowsFor(130, -75));
    expect(r.plan.quantities.skyBrightnessMagPerArcsec2.value).toBe(site.skyBrightnessMagPerArcsec2);
    expect(r.plan.quantities.skyBrightnessMagPerArcsec2.why).toMatch(/dark sky/);
  });
});
