/**
 * Pressure of a cycle (pure, no I/O): requested node-hours against what the cycle offers, per
 * node and per right-ascension bin (GET /api/review/cycles/:cycleId/pressure).
 *
 * Requested hours: the node-hours of the stored, feasible target plans of the cycle's
 * proposals in review or ranked, on the nodes each proposal requests (the server selects them).
 *
 * Per node: requested node-hours over the cycle's node-hours available on that node.
 *
 * Per right-ascension bin of 2 h (0–2 h, 2–4 h, …, 22–24 h; bin of a target = ⌊RA / 2 h⌋, its
 * J2000 RA from the targets table): the requested node-hours of the targets in the bin (all
 * nodes together) against the dark hours the bin offers over the campaign, defined as
 *
 *   darkHours(bin) = Σ over the cycle's nodes Σ over the campaign's nights of the usable hours of
 *                    a probe star at the bin's central RA (1 h, 3 h, …, 23 h) and at the
 *                    declination equal to the node site's latitude,
 *
 * where "usable hours" are what the sky windows (shared/src/sky `computeSkyWindows`) compute: the
 * time of the night with the Sun's centre at or below −18° (astronomical darkness, whatever the
 * node's own Sun limit) during which the probe stands at or above the node's altitude limit
 * (apparent altitude, normal refraction), with no Moon exclusion. A star at the site's latitude
 * passes through the zenith, so it has the widest range of hour angles any target there can be
 * observed at: the bin's dark hours are the most that range of RA can get from that node. Each
 * node counts separately (two nodes at one site offer the bin twice the time, as they offer
 * twice the node-hours). The bin's centre stands for the whole 2-h range (a 1-h shift of RA
 * moves the observable hours by about an hour within a night, which the bin edges share).
 */
import { computeSkyWindows } from '../sky/sky-windows';
import type { SkyCampaign, SkySite } from '../sky/sky-types';

/** Width of one right-ascension bin, hours. */
export const RA_BIN_HOURS = 2;
/** Number of bins over 24 h. */
export const RA_BIN_COUNT = 24 / RA_BIN_HOURS;
/** Astronomical darkness: the Sun's centre at or below −18°. */
export const ASTRONOMICAL_DARK_SUN_ALTITUDE_DEG = -18;

/** Bin index (0–11) of a right ascension in degrees (15° per hour). */
export function raBinOf(raDeg: number): number {
  const hours = (((raDeg % 360) + 360) % 360) / 15;
  return Math.min(RA_BIN_COUNT - 1, Math.floor(hours / RA_BIN_HOURS));
}

/** The central right ascension of a bin, degrees. */
export function raBinCentreDeg(bin: number): number {
  return (bin * RA_BIN_HOURS + RA_BIN_HOURS / 2) * 15;
}

/**
 * Dark hours per RA bin offered by one node over the campaign (see the file's comment): twelve
 * numbers, from `computeSkyWindows` with one probe star per bin.
 */
export function darkHoursByRaBin(site: SkySite, altitudeLimitDeg: number, campaign: SkyCampaign): number[] {
  const targets = Array.from({ length: RA_BIN_COUNT }, (_, bin) => ({ raDeg: raBinCentreDeg(bin), decDeg: site.latitudeDeg }));
  const result = computeSkyWindows({
    site,
    limits: { altitudeLimitDeg, sunAltitudeLimitDeg: ASTRONOMICAL_DARK_SUN_ALTITUDE_DEG },
    campaign,
    targets,
  });
  return result.targets.map((t) => t.usableHoursByNight.reduce((s, h) => s + h, 0));
}

/** One node of the cycle with its capacity. */
export interface PressureNode {
  nodeId: number;
  nodeCode: string;
  nodeHoursAvailable: number;
}

/** One stored feasible plan: a target on a node, its requested node-hours. */
export interface PressureRequest {
  nodeId: number;
  raDeg: number;
  nodeHours: number;
}

export interface NodePressure {
  nodeId: number;
  nodeCode: string;
  requestedNodeHours: number;
  availableNodeHours: number;
  /** requested / available; null when nothing is available. */
  pressure: number | null;
}

export interface RaBinPressure {
  bin: number;
  /** Bin edges, hours of right ascension. */
  startHours: number;
  endHours: number;
  requestedNodeHours: number;
  darkHours: number;
  /** requested / dark hours; null when the bin offers no dark hours. */
  pressure: number | null;
}

export interface PressureTotals {
  nodes: NodePressure[];
  raBins: RaBinPressure[];
}

const ratio = (requested: number, available: number) => (available > 0 ? requested / available : null);

/**
 * Pressure per node and per RA bin. Requests on nodes that are not in `nodes` are left out of
 * both; `darkHoursByNode` holds `darkHoursByRaBin` of each node (missing nodes offer nothing).
 */
export function computePressure(
  nodes: readonly PressureNode[],
  requests: readonly PressureRequest[],
  darkHoursByNode: ReadonlyMap<number, readonly number[]>,
): PressureTotals {
  const requestedByNode = new Map<number, number>();
  const requestedByBin = new Array<number>(RA_BIN_COUNT).fill(0);
  const inCycle = new Set(nodes.map((n) => n.nodeId));
  for (const r of requests) {
    if (!inCycle.has(r.nodeId)) continue;
    requestedByNode.set(r.nodeId, (requestedByNode.get(r.nodeId) ?? 0) + r.nodeHours);
    requestedByBin[raBinOf(r.raDeg)] += r.nodeHours;
  }
  const darkByBin = new Array<number>(RA_BIN_COUNT).fill(0);
  for (const n of nodes) (darkHoursByNode.get(n.nodeId) ?? []).forEach((h, bin) => (darkByBin[bin] += h));
  return {
    nodes: nodes.map((n) => {
      const requested = requestedByNode.get(n.nodeId) ?? 0;
      return {
        nodeId: n.nodeId,
        nodeCode: n.nodeCode,
        requestedNodeHours: requested,
        availableNodeHours: n.nodeHoursAvailable,
        pressure: ratio(requested, n.nodeHoursAvailable),
      };
    }),
    raBins: requestedByBin.map((requested, bin) => ({
      bin,
      startHours: bin * RA_BIN_HOURS,
      endHours: (bin + 1) * RA_BIN_HOURS,
      requestedNodeHours: requested,
      darkHours: darkByBin[bin],
      pressure: ratio(requested, darkByBin[bin]),
    })),
  };
}

/** GET /api/review/cycles/:cycleId/pressure. */
export interface CyclePressureReport extends PressureTotals {
  cycleId: number;
  cycleCode: string;
  campaignStart: string;
  campaignEnd: string;
  /** Proposals whose plans were counted (in review or ranked). */
  proposalCount: number;
}
