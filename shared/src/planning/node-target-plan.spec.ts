import type { NodeSpec, SiteSpec } from '../facility/facility-types';
import { computeSkyWindows } from '../sky/sky-windows';
import { skyLimitsForNode } from '../sky/sky-windows-report';
import { computeNodeTargetPlan, requirementFromPlan } from './node-target-plan';

// An invented northern node (demo-like values; the checks below are about behaviour, not numbers).
const site: SiteSpec = { latitudeDeg: 35, longitudeDeg: -108, elevationM: 2200, timeZone: 'America/Denver', skyBrightnessMagPerArcsec2: 21.5 };
const node: NodeSpec = {
  apertureM: 0.5, obstructionFraction: 0.4, throughput: 0.55, band: 'V', readNoiseE: 9, darkCurrentEPerS: 0.02, gainEPerAdu: 1.3,
  saturationE: 80000, pixelScaleArcsec: 0.8, seeingFwhmArcsec: 1.6, systematicFloorMmag: 1, scintillationModel: 'young1967',
  overheadSeconds: 45, minExposureSeconds: 2, maxExposureSeconds: 300, altitudeLimitDeg: 25, sunAltitudeLimitDeg: -18,
  weatherLossFraction: 0.3, rateMinorPerHour: 4500, currency: 'eur',
};
const target = { colour: { value: 0.9, system: 'BV' as const }, ageMyr: 600, ageUncertaintyMyr: 60, magnitude: { value: 12, band: 'V' as const } };

function windowsFor(raDeg: number, decDeg: number) {
  const result = computeSkyWindows({
    site,
    limits: skyLimitsForNode(node),
    campaign: { firstNight: '2027-01-01', lastNight: '2027-06-29' },
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
    const bright = computeNodeTargetPlan({ ...target, ageMyr: 4000, ageUncertaintyMyr: 400, magnitude: { value: 10, band: 'V' } }, node, site, windowsFor(130, 20));
    expect(bright.plan.quantities.exposureSeconds.value).toBeCloseTo(bright.plan.quantities.saturationLimitSeconds.value, 0);
    expect(bright.suggestions.map((s) => s.kind)).not.toContain('longer_exposure');
    const short = computeNodeTargetPlan({ ...target, magnitude: { value: 14, band: 'V' } }, node, site, windowsFor(130, 20), { exposureSeconds: 5 });
    expect(short.plan.flags.map((f) => f.code)).toContain('precisionGoalNotReached');
    expect(short.suggestions.find((s) => s.kind === 'longer_exposure')?.message).toMatch(/up to \d+ s/);
  });
});
