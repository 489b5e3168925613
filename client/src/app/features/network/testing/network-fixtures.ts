/** Invented sites and nodes for the network feature's specs (test data only). */
import type { Site, TelescopeNode } from '@spincycle/shared/facility/facility-types';
import { testNode as plannerTestNode } from '../../planner/planner-test-data';

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

/** A node as GET /api/nodes answers it: the planner's test node at `site`, 27.5 % of nights lost, academic rate €48.50, no external rate. */
export function testNode(id: number, code: string, site: Site = NORTH, overrides: Partial<TelescopeNode> = {}): TelescopeNode {
  return plannerTestNode(id, code, { siteId: site.id, site, weatherLossFraction: 0.275, externalRateMinorPerHour: null, ...overrides });
}
