/** Nodes, a site and a cycle shared by the planner's specs (test data only). */
import type { CycleSummary, Site, TelescopeNode } from '@spincycle/shared/facility/facility-types';

export const TEST_SITE: Site = {
  id: 1,
  code: 'HLM',
  name: 'Hollin Moor',
  latitudeDeg: 28.76,
  longitudeDeg: -17.88,
  elevationM: 2326,
  timeZone: 'Atlantic/Canary',
  skyBrightnessMagPerArcsec2: 21.6,
};

export function testNode(id: number, code: string, overrides: Partial<TelescopeNode> = {}): TelescopeNode {
  return {
    id,
    code,
    name: `Node ${code}`,
    siteId: TEST_SITE.id,
    site: TEST_SITE,
    active: true,
    apertureM: 0.4,
    obstructionFraction: 0.35,
    throughput: 0.6,
    band: 'V',
    readNoiseE: 9,
    darkCurrentEPerS: 0.02,
    gainEPerAdu: 1.3,
    saturationE: 60000,
    pixelScaleArcsec: 1.2,
    seeingFwhmArcsec: 1.6,
    systematicFloorMmag: 1.5,
    scintillationModel: 'young1967',
    overheadSeconds: 60,
    minExposureSeconds: 2,
    maxExposureSeconds: 300,
    altitudeLimitDeg: 30,
    sunAltitudeLimitDeg: -12,
    weatherLossFraction: 0.25,
    rateMinorPerHour: 4850,
    currency: 'eur',
    ...overrides,
  };
}

export const TEST_CYCLE: CycleSummary = {
  id: 7,
  code: 'C7',
  title: 'Cycle of the Lantern cluster',
  callOpensAt: '2026-01-01T12:00:00Z',
  callClosesAt: '2026-12-01T12:00:00Z',
  campaignStart: '2027-01-01',
  campaignEnd: '2027-03-01',
  anonymousReview: false,
  categories: [],
  version: 1,
  status: 'open',
  nodes: [],
};
