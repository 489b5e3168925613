/**
 * Proposal target list: upload of a generated 500-target CSV (parse + validate + insert) and
 * the plan job on 3 nodes (sky windows + 1500 target plans + one write transaction), timed on
 * the server side against the test database. Target: ≤ 2 s in all. Creates throw-away rows
 * (account, sites, nodes, cycle, proposal) and deletes them at the end.
 */
import { execFileSync } from 'node:child_process';
import path from 'node:path';
import pino from 'pino';
import { setUpDatabase } from '../../database/setup';
import type { AppContext } from '../../server/src/app-context';
import { loadConfig } from '../../server/src/config';
import { createDb } from '../../server/src/db/knex';
import { insertAccount } from '../../server/src/features/accounts/account-repository';
import { computeAndStoreProposalPlans } from '../../server/src/features/proposals/plan-service';
import { createProposal } from '../../server/src/features/proposals/proposal-service';
import { decodeCsvText, readTargetCsv } from '../../server/src/features/proposals/target-csv';
import { uploadTargets } from '../../server/src/features/proposals/target-service';
import { seededRandom } from '../../shared/src/science/seeded-random';
import { formatDecDms, formatRaHms } from '../../shared/src/proposals/sexagesimal';

const TARGETS = 500;
const RUNS = 3;
const ms = (t: number) => `${t.toFixed(0).padStart(5)} ms`;

function generateCsv(count: number): string {
  const r = seededRandom(500);
  const lines = ['name,ra,dec,magnitude,band,colour,colour_system,ebv,age_myr,age_err_myr,period_precision_d,notes'];
  for (let i = 0; i < count; i++) {
    const ra = r.uniform(0, 360);
    const dec = r.uniform(-60, 70);
    const bprp = r.next() < 0.5;
    const colour = bprp ? r.uniform(0.7, 2.4) : r.uniform(0.5, 1.4);
    const age = r.uniform(300, 6000);
    // Half the positions sexagesimal (the parser's slower path), half decimal degrees.
    const [raText, decText] = i % 2 ? [formatRaHms(ra), formatDecDms(dec).replace('−', '-')] : [ra.toFixed(5), dec.toFixed(5)];
    lines.push(
      [`Star B-${i + 1}`, raText, decText, r.uniform(9, 15).toFixed(2), r.next() < 0.5 ? 'V' : 'G', colour.toFixed(3), bprp ? 'BPRP' : 'BV', '', age.toFixed(0), (age * 0.2).toFixed(0), r.next() < 0.3 ? '0.2' : '', 'generated'].join(','),
    );
  }
  return lines.join('\n') + '\n';
}

export default async function (): Promise<void> {
  const database = process.env.SPINCYCLE_TEST_DB ?? 'spincycle_test';
  const root = path.resolve(__dirname, '../..');
  // The private cluster and the test database, as the server tests bring them up.
  execFileSync(
    process.execPath,
    ['--input-type=module', '-e', `const c = await import('./database/cluster.mjs'); const h = c.bringUpCluster({ log: () => {} }); h.ensureDatabase(${JSON.stringify(database)});`],
    { cwd: root, stdio: 'inherit' },
  );
  await setUpDatabase(database, 'never');

  const config = loadConfig({ ...process.env, PGDATABASE: database, LOG_LEVEL: 'silent', NODE_ENV: 'test' });
  const logger = pino({ level: 'silent' });
  const db = createDb(config, logger);
  const ctx: AppContext = {
    config,
    db,
    logger,
    mailer: { send: async () => undefined, close: () => undefined },
    // The benchmark runs the plan job itself, in-process (no queue).
    planQueue: { enqueue: async () => undefined, close: async () => undefined },
    now: () => new Date(),
  };
  const tag = `BENCH${Date.now().toString(36).toUpperCase()}`;
  const created = { account: 0, sites: [] as number[], nodes: [] as number[], cycle: 0, proposal: 0 };
  try {
    created.account = await insertAccount(db, { email: `${tag.toLowerCase()}@bench.example`, displayName: 'Bench Proposer', affiliation: '', passwordHash: 'x', roles: ['proposer'] });
    const viewer = { id: created.account, email: `${tag.toLowerCase()}@bench.example`, displayName: 'Bench Proposer', affiliation: '', roles: ['proposer' as const] };
    created.sites = (
      await db('sites')
        .insert([
          { code: `${tag}N`, name: 'Bench North', latitude_deg: 34.9, longitude_deg: -108.4, elevation_m: 2210, time_zone: 'America/Denver', sky_brightness_mag_per_arcsec2: 21.6 },
          { code: `${tag}E`, name: 'Bench East', latitude_deg: 42.06, longitude_deg: 20.5, elevation_m: 1650, time_zone: 'Europe/Belgrade', sky_brightness_mag_per_arcsec2: 21.2 },
          { code: `${tag}S`, name: 'Bench South', latitude_deg: -27.45, longitude_deg: -69.95, elevation_m: 2380, time_zone: 'America/Santiago', sky_brightness_mag_per_arcsec2: 21.8 },
        ])
        .returning('id')
    ).map((r: { id: number }) => r.id);
    const common = {
      obstruction_fraction: 0.4, throughput: 0.55, read_noise_e: 9, dark_current_e_per_s: 0.02, gain_e_per_adu: 1.3, saturation_e: 80000, pixel_scale_arcsec: 0.8,
      seeing_fwhm_arcsec: 1.6, systematic_floor_mmag: 1, scintillation_model: 'young1967', overhead_seconds: 45, min_exposure_seconds: 2, max_exposure_seconds: 300,
      altitude_limit_deg: 30, sun_altitude_limit_deg: -18, weather_loss_fraction: 0.3, currency: 'eur',
    };
    created.nodes = (
      await db('nodes')
        .insert(created.sites.map((siteId, i) => ({ ...common, code: `${tag}-${i}`, name: `Bench ${i}`, site_id: siteId, aperture_m: [0.5, 0.4, 1.0][i], band: ['V', 'R', 'R'][i], rate_minor_per_hour: [4500, 3000, 12000][i] })))
        .returning('id')
    ).map((r: { id: number }) => r.id);
    const now = Date.now();
    [{ id: created.cycle }] = await db('cycles')
      .insert({
        code: `${tag}C`, title: 'Bench cycle', call_opens_at: new Date(now - 86400_000), call_closes_at: new Date(now + 86400_000),
        campaign_start: new Date(now + 30 * 86400_000).toISOString().slice(0, 10), campaign_end: new Date(now + 209 * 86400_000).toISOString().slice(0, 10),
        categories: ['Bench'],
      })
      .returning('id');
    await db('cycle_nodes').insert(created.nodes.map((node_id) => ({ cycle_id: created.cycle, node_id, node_hours_available: 1000 })));
    const proposal = await createProposal(ctx, viewer, { cycleId: created.cycle, title: 'Bench proposal' });
    created.proposal = proposal.id;
    await db('proposal_nodes').insert(created.nodes.map((node_id) => ({ proposal_id: proposal.id, node_id })));

    const csv = Buffer.from(generateCsv(TARGETS));
    console.log(`${TARGETS} targets (${(csv.length / 1024).toFixed(0)} kB CSV, half sexagesimal) on 3 nodes, 180-night campaign; ${RUNS} runs`);
    console.log('run  parse+validate  upload (parse+validate+insert)  plan compute  plan write   total   plans');
    for (let run = 1; run <= RUNS; run++) {
      const t0 = performance.now();
      const list = readTargetCsv(decodeCsvText(csv, 'bench.csv'));
      const parseMs = performance.now() - t0;
      if (list.errors.length) throw new Error(`generated CSV has problems: ${JSON.stringify(list.errors.slice(0, 3))}`);
      const t1 = performance.now();
      const uploaded = await uploadTargets(ctx, viewer, proposal.id, { buffer: csv, originalname: 'bench.csv' } as Express.Multer.File, () => 'replace');
      const uploadMs = performance.now() - t1;
      const t2 = performance.now();
      const result = await computeAndStoreProposalPlans(db, proposal.id);
      const planMs = performance.now() - t2;
      if (!result || uploaded.added !== TARGETS) throw new Error('the benchmark proposal vanished');
      console.log(
        `${String(run).padStart(3)}  ${ms(parseMs).padStart(14)}  ${ms(uploadMs).padStart(29)}  ${ms(result.computeMs).padStart(12)}  ${ms(result.writeMs).padStart(10)}  ${ms(uploadMs + planMs)}  ${result.plans} (${result.errors} errors)`,
      );
    }
    console.log('target: upload + plan job ≤ 2000 ms');
  } finally {
    if (created.proposal) await db('proposals').where({ id: created.proposal }).del();
    if (created.cycle) await db('cycles').where({ id: created.cycle }).del();
    if (created.nodes.length) await db('nodes').whereIn('id', created.nodes).del();
    if (created.sites.length) await db('sites').whereIn('id', created.sites).del();
    if (created.account) await db('accounts').where({ id: created.account }).del();
    await db.destroy();
  }
}
