import type { TelescopeNode } from '@spincycle/shared/facility/facility-types';
import { computePlanRows } from './plan-computation';
import type { PlanInputs } from './plan-inputs';
import type { StoredTarget } from '../targets/target-repository';

// Two invented nodes, one in each hemisphere, with the same instrument.
const instrument = {
  apertureM: 0.6,
  obstructionFraction: 0.4,
  throughput: 0.5,
  band: 'V' as const,
  readNoiseE: 8,
  darkCurrentEPerS: 0.02,
  gainEPerAdu: 1.2,
  saturationE: 70000,
  pixelScaleArcsec: 0.9,
  seeingFwhmArcsec: 1.6,
  systematicFloorMmag: 1,
  scintillationModel: 'young1967' as const,
  overheadSeconds: 45,
  minExposureSeconds: 1,
  maxExposureSeconds: 300,
  altitudeLimitDeg: 30,
  sunAltitudeLimitDeg: -18,
  weatherLossFraction: 0.2,
  rateMinorPerHour: 5000,
  currency: 'eur',
  active: true,
};
const north: TelescopeNode = {
  ...instrument,
  id: 1,
  code: 'N-60',
  name: 'North 60',
  siteId: 1,
  site: {
    id: 1,
    code: 'N',
    name: 'North Hill',
    latitudeDeg: 35,
    longitudeDeg: -108,
    elevationM: 2200,
    timeZone: 'America/Denver',
    skyBrightnessMagPerArcsec2: 21.5,
  },
};
const south: TelescopeNode = {
  ...instrument,
  id: 2,
  code: 'S-60',
  name: 'South 60',
  siteId: 2,
  site: {
    id: 2,
    code: 'S',
    name: 'South Hill',
    latitudeDeg: -29,
    longitudeDeg: -70.7,
    elevationM: 2400,
    timeZone: 'America/Santiago',
    skyBrightnessMagPerArcsec2: 21.7,
  },
};
const target = (id: number, name: string, decDeg: number): StoredTarget => ({
  id,
  position: id,
  version: 1,
  name,
  raDeg: 90,
  decDeg,
  magnitude: 12,
  magnitudeBand: 'V',
  colour: 1.0,
  colourSystem: 'BPRP',
  reddeningEbv: null,
  ageMyr: 500,
  ageUncertaintyMyr: 50,
  periodPrecisionDays: null,
  periodDays: null,
  periodUncertaintyDays: null,
  notes: '',
  updatedAt: '2030-01-01T00:00:00Z',
});
const campaign = { firstNight: '2030-11-01', lastNight: '2031-02-28' };

describe('computePlanRows', () => {
  it('names the requested node where an infeasible target works, and says so when none does', async () => {
    const inputs: PlanInputs = {
      campaign,
      nodes: [north, south],
      targets: [target(1, 'Star S-75', -75), target(2, 'Star N+85', 85), { ...target(3, 'Star B-1', 0), magnitude: 2.5 }],
      completeness: 0.9,
    };
    const progress: number[] = [];
    const rows = await computePlanRows(inputs, (done) => void progress.push(done));
    expect(progress).toEqual([1, 2, 3]);
    const row = (t: number, n: number) => rows.find((r) => r.targetId === t && r.nodeId === n)!.result!;
    // Dec −75° never reaches 30° from 35° N but is circumpolar from −29°.
    expect(row(1, 1).feasible).toBe(false);
    expect(row(1, 2).feasible).toBe(true);
    expect(row(1, 1).suggestions.find((s) => s.kind === 'other_node')?.message).toMatch(/^Feasible on S-60 \(/);
    // Dec +85° from −29° never rises; from 35° N it stays at 40° altitude or more.
    expect(row(2, 2).feasible).toBe(false);
    expect(row(2, 2).suggestions.find((s) => s.kind === 'other_node')?.message).toMatch(/^Feasible on N-60/);
    // A naked-eye star saturates every requested node.
    for (const n of [1, 2]) {
      expect(row(3, n).feasible).toBe(false);
      expect(row(3, n).suggestions.find((s) => s.kind === 'other_node')?.message).toMatch(/^None of the requested nodes/);
      // Said once however many checks thought of another node; each reason once too.
      const messages = row(3, n).suggestions.map((s) => s.message);
      expect(new Set(messages).size).toBe(messages.length);
      expect(new Set(row(3, n).reasons).size).toBe(row(3, n).reasons.length);
    }
  });

  it('passes the proposer’s expected period to the plan, where it replaces the relation’s', async () => {
    const mDwarf = { ...target(4, 'Star M-9', 20), colour: 3.0, magnitude: 13 };
    const withPeriod = { ...mDwarf, id: 5, name: 'Star M-10', periodDays: 0.8, periodUncertaintyDays: 0.05 };
    const rows = await computePlanRows({ campaign, nodes: [north], targets: [mDwarf, withPeriod], completeness: 0.9 });
    const fromRelation = rows.find((r) => r.targetId === 4)!.result!;
    const given = rows.find((r) => r.targetId === 5)!.result!;
    expect(fromRelation.periodDays).not.toBeCloseTo(0.8, 2);
    expect(given.periodDays).toBeCloseTo(0.8, 6);
    // The plausible range around the given period comes from its uncertainty, not the relation's.
    expect(given.shortestPeriodDays).toBeLessThan(0.8);
    expect(given.longestPeriodDays).toBeGreaterThan(0.8);
    expect(given.longestPeriodDays).toBeLessThan(1);
  });

  it('passes the proposal’s completeness to every plan: a higher completeness needs at least as many visits', async () => {
    const targets = [target(7, 'Star C-1', 20), { ...target(8, 'Star C-2', 20), colour: 2.0, magnitude: 14 }];
    const visits = async (completeness: number) =>
      (await computePlanRows({ campaign, nodes: [north], targets, completeness })).map((r) => r.result!.visits);
    const low = await visits(0.6);
    const high = await visits(0.99);
    for (let i = 0; i < targets.length; i++) expect(high[i]).toBeGreaterThanOrEqual(low[i]);
    expect(high.some((v, i) => v > low[i])).toBe(true);
  });
});
