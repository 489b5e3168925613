import type { CapacityOverrunRule } from '../cycles/cycle-schemas';

/**
 * Sites, nodes and cycles as the API returns them. The science core takes the plain
 * `SiteSpec` / `NodeSpec` parts, so a plan can be computed from these objects directly.
 */

/** Where a node stands. Longitude is east-positive. */
export interface SiteSpec {
  latitudeDeg: number;
  longitudeDeg: number;
  elevationM: number;
  /** IANA time zone used to name local nights (the night of 2025-03-04 starts that evening). */
  timeZone: string;
  /** Typical dark-sky background in the node's band, mag/arcsec². */
  skyBrightnessMagPerArcsec2: number;
}

export interface Site extends SiteSpec {
  id: number;
  code: string;
  name: string;
}

/** Photometric band of a node's standard filter. */
export const NODE_BANDS = ['B', 'V', 'R', 'I', 'G'] as const;
export type NodeBand = (typeof NODE_BANDS)[number];

/** Scintillation model chosen per node (Young 1967, or Osborn et al. 2015). */
export const SCINTILLATION_MODELS = ['young1967', 'osborn2015'] as const;
export type ScintillationModel = (typeof SCINTILLATION_MODELS)[number];

/** The instrument and operating rules of one node: everything a target plan needs. */
export interface NodeSpec {
  /** Clear aperture diameter of the primary, metres. */
  apertureM: number;
  /** Central obstruction as a fraction of the aperture diameter (0–0.6). */
  obstructionFraction: number;
  /** End-to-end efficiency (optics × filter × detector QE), 0–1. */
  throughput: number;
  band: NodeBand;
  readNoiseE: number;
  darkCurrentEPerS: number;
  gainEPerAdu: number;
  /** Pixel value (electrons) above which the detector is no longer linear. */
  saturationE: number;
  pixelScaleArcsec: number;
  /** Typical seeing at the site, full width at half maximum, arcsec. */
  seeingFwhmArcsec: number;
  /** Systematic floor of differential photometry on this node, mmag. */
  systematicFloorMmag: number;
  scintillationModel: ScintillationModel;
  /** Per-visit overhead: slew, acquisition, readout, seconds. */
  overheadSeconds: number;
  minExposureSeconds: number;
  maxExposureSeconds: number;
  /** Lowest altitude the node may point to (its own safety configuration), degrees. */
  altitudeLimitDeg: number;
  /** Sun altitude at or below which the node observes, degrees (−18 astronomical, −12 nautical). */
  sunAltitudeLimitDeg: number;
  /** Fraction of night time lost to weather over a year, 0–1. */
  weatherLossFraction: number;
  /** Fee per node-hour in the smallest unit of `currency` (e.g. cents): the academic rate. */
  rateMinorPerHour: number;
  /** ISO 4217 code, lowercase as the payment provider expects (e.g. `eur`). */
  currency: string;
}

export interface TelescopeNode extends NodeSpec {
  id: number;
  code: string;
  name: string;
  siteId: number;
  site: Site;
  active: boolean;
  /**
   * External rate per node-hour in the smallest unit of `currency`, paid by programs of rate
   * class `external` (docs/billing.md); `null`: they pay the academic rate, `rateMinorPerHour`.
   * It sits here rather than beside `rateMinorPerHour` in NodeSpec because target plans never
   * use it (they show the academic fee). The server always sends it; absent reads as `null`.
   */
  externalRateMinorPerHour?: number | null;
}

/** An allocation round. All instants are ISO 8601 UTC strings. */
export interface Cycle {
  id: number;
  code: string;
  title: string;
  callOpensAt: string;
  callClosesAt: string;
  /** First and last night of the campaign, local dates `YYYY-MM-DD`. */
  campaignStart: string;
  campaignEnd: string;
  anonymousReview: boolean;
  /**
   * A proposal asking a node for more node-hours than the cycle offers there: `warn` (the
   * default) or `block` its submission. The server always sends it; absent reads as `warn`.
   */
  capacityOverrun?: CapacityOverrunRule;
  categories: string[];
  /** Optimistic-concurrency version: an update must name the version it read. */
  version: number;
}

/** Node-hours a node offers in a cycle. */
export interface CycleNodeCapacity {
  nodeId: number;
  nodeCode: string;
  nodeHoursAvailable: number;
}

/** Where a cycle's call stands at the moment of the request. */
export type CallStatus = 'upcoming' | 'open' | 'closed';

/** GET /api/cycles items. */
export interface CycleSummary extends Cycle {
  status: CallStatus;
  nodes: CycleNodeCapacity[];
}

/** The call status of a cycle at an instant (the closing instant itself is already closed). */
export function callStatusAt(cycle: Pick<Cycle, 'callOpensAt' | 'callClosesAt'>, now: Date): CallStatus {
  const t = now.getTime();
  if (t < Date.parse(cycle.callOpensAt)) return 'upcoming';
  if (t < Date.parse(cycle.callClosesAt)) return 'open';
  return 'closed';
}
