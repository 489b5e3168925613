import type { Knex } from 'knex';
import type { NodeUpdateInput } from '@spincycle/shared/facility/node-schemas';
import type { NodeBand, ScintillationModel, Site, TelescopeNode } from '@spincycle/shared/facility/facility-types';

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

/** A `sites` row as the API shape. */
function toSite(r: SiteRow): Site {
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

/** A `nodes` row with its site as the API shape. */
function toNode(r: NodeRow, site: Site): TelescopeNode {
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
    externalRateMinorPerHour: (r.external_rate_minor_per_hour as number | null) ?? null,
    currency: r.currency as string,
  };
}

/** Every site, by code. */
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

/** Writes the given fields of a node (absent ones stay as they are); false when there is no such node. */
export async function updateNodeRow(db: Knex, id: number, patch: NodeUpdateInput): Promise<boolean> {
  const row: Record<string, unknown> = {};
  if (patch.externalRateMinorPerHour !== undefined) row['external_rate_minor_per_hour'] = patch.externalRateMinorPerHour;
  if (!Object.keys(row).length) return (await db('nodes').where({ id }).first('id')) !== undefined;
  return (await db('nodes').where({ id }).update(row)) > 0;
}
