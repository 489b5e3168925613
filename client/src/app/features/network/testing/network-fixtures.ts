/** Invented sites and nodes for the network feature's specs (test data only). */
import type { Site, TelescopeNode } from '@spincycle/shared/facility/facility-types';

export const NORTH: Site = {
  id: 1,
  code: 'HLM',
  name: 'Hollin Moor',
  latitudeDeg: 28.7606,
  longitudeDeg: -17.8816,
  elevationM: 2326,
  timeZone: 'Atlantic/Canary',
  skyBrightnessMagPerArcsec2: 21.6,
};

export const SOUTH: Site = {
  id: 2,
  code: 'SRK',
  name: 'Saltrake Ridge',
  latitudeDeg: -31.2733,
  longitudeDeg: 149.0612,
  elevationM: 1165,
  timeZone: 'Australia/Sydney',
  skyBrightnessMagPerArcsec2: 21.2,
};

/** A node as GET /api/nodes answers it: academic rate €48.50, no external rate. */
export function testNode(id: number, code: string, site: Site = NORTH, overrides: Partial<TelescopeNode> = {}): TelescopeNode {
  return {
    id,
    code,
    name: `Node ${code}`,
    siteId: site.id,
    site,
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
    weatherLossFraction: 0.275,
    rateMinorPerHour: 4850,
    externalRateMinorPerHour: null,
    currency: 'eur',
    ...overrides,
  };
}
