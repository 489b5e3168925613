/**
 * Throw-away rows for the benchmarks that work on a real proposal: a proposer account, sites,
 * three nodes, an open cycle and a draft proposal requesting the nodes; and their removal.
 * Shared by proposal-upload.bench.ts and api.bench.ts.
 */
import { execFileSync } from 'node:child_process';
import path from 'node:path';
import type { Knex } from 'knex';
import { setUpDatabase } from '../../../database/setup';
import type { AppContext } from '../../../server/src/app-context';
import { insertAccount } from '../../../server/src/features/accounts/account-repository';
import { createProposal } from '../../../server/src/features/proposals/proposal-service';

/** The private cluster and a migrated database, as the server tests bring them up. */
export async function bringUpBenchDatabase(database: string): Promise<void> {
  execFileSync(
    process.execPath,
    [
      '--input-type=module',
      '-e',
      `const c = await import('./database/cluster.mjs'); const h = c.bringUpCluster({ log: () => {} }); h.ensureDatabase(${JSON.stringify(database)});`,
    ],
    { cwd: path.resolve(__dirname, '../../..'), stdio: 'inherit' },
  );
  await setUpDatabase(database, 'never');
}

const SITES = {
  N: {
    name: 'Bench North',
    latitude_deg: 34.9,
    longitude_deg: -108.4,
    elevation_m: 2210,
    time_zone: 'America/Denver',
    sky_brightness_mag_per_arcsec2: 21.6,
  },
  E: {
    name: 'Bench East',
    latitude_deg: 42.06,
    longitude_deg: 20.5,
    elevation_m: 1650,
    time_zone: 'Europe/Belgrade',
    sky_brightness_mag_per_arcsec2: 21.2,
  },
  S: {
    name: 'Bench South',
    latitude_deg: -27.45,
    longitude_deg: -69.95,
    elevation_m: 2380,
    time_zone: 'America/Santiago',
    sky_brightness_mag_per_arcsec2: 21.8,
  },
} as const;

const NODE_COMMON = {
  obstruction_fraction: 0.4,
  throughput: 0.55,
  read_noise_e: 9,
  dark_current_e_per_s: 0.02,
  gain_e_per_adu: 1.3,
  saturation_e: 80000,
  pixel_scale_arcsec: 0.8,
  seeing_fwhm_arcsec: 1.6,
  systematic_floor_mmag: 1,
  scintillation_model: 'young1967',
  overhead_seconds: 45,
  min_exposure_seconds: 2,
  max_exposure_seconds: 300,
  altitude_limit_deg: 30,
  sun_altitude_limit_deg: -18,
  weather_loss_fraction: 0.3,
  currency: 'eur',
};

export interface BenchRows {
  account: number;
  sites: number[];
  nodes: number[];
  cycle: number;
  proposal: number;
}

export interface BenchNetworkOptions {
  tag: string;
  passwordHash: string;
  /** Sites to create, in order. */
  sites: readonly (keyof typeof SITES)[];
  /** Index into `sites` of each of the three nodes (0.5 m V, 0.4 m R, 1.0 m R). */
  siteOfNode: readonly [number, number, number];
}

/**
 * Creates the rows into `rows` as it goes (so that a failure half-way still lets
 * removeBenchRows clean up) and returns the proposer and the proposal id.
 */
export async function createBenchNetwork(ctx: AppContext, rows: BenchRows, o: BenchNetworkOptions) {
  const db = ctx.db;
  const email = `${o.tag.toLowerCase()}@bench.example`;
  rows.account = await insertAccount(db, {
    email,
    displayName: 'Bench Proposer',
    affiliation: '',
    passwordHash: o.passwordHash,
    roles: ['proposer'],
  });
  const viewer = { id: rows.account, email, displayName: 'Bench Proposer', affiliation: '', roles: ['proposer' as const] };
  rows.sites = (
    await db('sites')
      .insert(o.sites.map((s) => ({ code: `${o.tag}${s}`, ...SITES[s] })))
      .returning('id')
  ).map((r: { id: number }) => r.id);
  rows.nodes = (
    await db('nodes')
      .insert(
        o.siteOfNode.map((site, i) => ({
          ...NODE_COMMON,
          code: `${o.tag}-${i}`,
          name: `Bench ${i}`,
          site_id: rows.sites[site],
          aperture_m: [0.5, 0.4, 1.0][i],
          band: ['V', 'R', 'R'][i],
          rate_minor_per_hour: [4500, 3000, 12000][i],
        })),
      )
      .returning('id')
  ).map((r: { id: number }) => r.id);
  const now = Date.now();
  [{ id: rows.cycle }] = await db('cycles')
    .insert({
      code: `${o.tag}C`,
      title: 'Bench cycle',
      call_opens_at: new Date(now - 86400_000),
      call_closes_at: new Date(now + 86400_000),
      campaign_start: new Date(now + 30 * 86400_000).toISOString().slice(0, 10),
      campaign_end: new Date(now + 209 * 86400_000).toISOString().slice(0, 10),
      categories: ['Bench'],
    })
    .returning('id');
  await db('cycle_nodes').insert(rows.nodes.map((node_id) => ({ cycle_id: rows.cycle, node_id, node_hours_available: 1000 })));
  const proposal = await createProposal(ctx, viewer, { cycleId: rows.cycle, title: 'Bench proposal' });
  rows.proposal = proposal.id;
  await db('proposal_nodes').insert(rows.nodes.map((node_id) => ({ proposal_id: proposal.id, node_id })));
  return { viewer, email, proposalId: proposal.id };
}

/** Deletes what createBenchNetwork made (children first). */
export async function removeBenchRows(db: Knex, rows: BenchRows): Promise<void> {
  if (rows.proposal) await db('proposals').where({ id: rows.proposal }).del();
  if (rows.cycle) await db('cycles').where({ id: rows.cycle }).del();
  if (rows.nodes.length) await db('nodes').whereIn('id', rows.nodes).del();
  if (rows.sites.length) await db('sites').whereIn('id', rows.sites).del();
  if (rows.account) await db('accounts').where({ id: rows.account }).del();
}

export const emptyBenchRows = (): BenchRows => ({ account: 0, sites: [], nodes: [], cycle: 0, proposal: 0 });
