import type { Knex } from 'knex';
import type { CycleNodeCapacity, Cycle, NodeBand, ScintillationModel, Site, TelescopeNode } from '@spincycle/shared/facility/facility-types';

interface SiteRow {
  id: number;
  code: string;
  name: string;
  latitude_deg: number;
  longitude_deg: number;
  elevation_m: number;
  time_zone: string;
  sky_brightness_mag_per_arcsec2: number;
}

export function toSite(r: SiteRow): Site {
  return {
    id: r.id,
    code: r.code,
    name: r.name,
    latitudeDeg: r.latitude_deg,
    longitudeDeg: r.longitude_deg,
    elevationM: r.elevation_m,
    timeZone: r.time_zone,
    skyBrightnessMagPerArcsec2: r.sky_brightness_mag_per_arcsec2,
  };
}

type NodeRow = Record<string, unknown> & { site_id: number };

export function toNode(r: NodeRow, site: Site): TelescopeNode {
  return {
    id: r.id as number,
    code: r.code as string,
    name: r.name as string,
    siteId: r.site_id,
    site,
    active: r.active as boolean,
    apertureM: r.aperture_m as number,
    obstructionFraction: r.obstruction_fraction as number,
    throughput: r.throughput as number,
    band: r.band as NodeBand,
    readNoiseE: r.read_noise_e as number,
    darkCurrentEPerS: r.dark_current_e_per_s as number,
    gainEPerAdu: r.gain_e_per_adu as number,
    saturationE: r.saturation_e as number,
    pixelScaleArcsec: r.pixel_scale_arcsec as number,
    seeingFwhmArcsec: r.seeing_fwhm_arcsec as number,
    systematicFloorMmag: r.systematic_floor_mmag as number,
    scintillationModel: r.scintillation_model as ScintillationModel,
    overheadSeconds: r.overhead_seconds as number,
    minExposureSeconds: r.min_exposure_seconds as number,
    maxExposureSeconds: r.max_exposure_seconds as number,
    altitudeLimitDeg: r.altitude_limit_deg as number,
    sunAltitudeLimitDeg: r.sun_altitude_limit_deg as number,
    weatherLossFraction: r.weather_loss_fraction as number,
    rateMinorPerHour: r.rate_minor_per_hour as number,
    currency: r.currency as string,
  };
}

export async function listSites(db: Knex): Promise<Site[]> {
  return (await db<SiteRow>('sites').orderBy('code')).map(toSite);
}

/** Nodes with their sites; `ids` narrows the list. */
export async function listNodes(db: Knex, ids?: number[]): Promise<TelescopeNode[]> {
  const sites = new Map((await listSites(db)).map((s) => [s.id, s]));
  const q = db<NodeRow>('nodes').orderBy('code');
  if (ids) q.whereIn('id', ids);
  return (await q).map((r) => toNode(r, sites.get(r.site_id)!));
}

interface CycleRow {
  id: number;
  code: string;
  title: string;
  call_opens_at: Date;
  call_closes_at: Date;
  campaign_start: string;
  campaign_end: string;
  anonymous_review: boolean;
  categories: string[];
  version: number;
}

export function toCycle(r: CycleRow): Cycle {
  return {
    id: r.id,
    code: r.code,
    title: r.title,
    callOpensAt: r.call_opens_at.toISOString(),
    callClosesAt: r.call_closes_at.toISOString(),
    campaignStart: r.campaign_start,
    campaignEnd: r.campaign_end,
    anonymousReview: r.anonymous_review,
    categories: r.categories,
    version: r.version,
  };
}

export async function listCycles(db: Knex): Promise<(Cycle & { nodes: CycleNodeCapacity[] })[]> {
  const rows = await db<CycleRow>('cycles').orderBy('call_opens_at', 'desc');
  const capacity = await db('cycle_nodes as cn')
    .join('nodes as n', 'n.id', 'cn.node_id')
    .whereIn('cn.cycle_id', rows.map((r) => r.id))
    .orderBy('n.code')
    .select('cn.cycle_id', 'cn.node_id', 'n.code', 'cn.node_hours_available');
  return rows.map((r) => ({
    ...toCycle(r),
    nodes: capacity
      .filter((c) => c.cycle_id === r.id)
      .map((c) => ({ nodeId: c.node_id, nodeCode: c.code, nodeHoursAvailable: c.node_hours_available })),
  }));
}

export async function findCycleById(db: Knex, id: number): Promise<Cycle | undefined> {
  const row = await db<CycleRow>('cycles').where({ id }).first();
  return row ? toCycle(row) : undefined;
}
