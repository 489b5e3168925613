/**
 * API latency under load: GET /api/proposals and the plans list of a 60-target proposal on
 * 3 nodes (180 plans; `?pageSize=200` so that the whole list comes back, as before the list
 * was paged, and the default first page), plus the run status the plans tab polls. Each at a
 * fixed 200 requests per second for 30 s (BENCH_API_SECONDS to change it) from autocannon over
 * loopback, against a server of its own on the test database. Prints p50/p95/p99 and errors;
 * target: p95 ≤ 50 ms with 0 errors. Creates throw-away rows and deletes them at the end.
 */
import { execFileSync } from 'node:child_process';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import autocannon from 'autocannon';
import { setUpDatabase } from '../../database/setup';
import { createApp } from '../../server/src/app';
import { insertAccount } from '../../server/src/features/accounts/account-repository';
import { hashPassword } from '../../server/src/features/auth/password-hash';
import { computeAndStoreProposalPlans } from '../../server/src/features/proposals/plan-service';
import { createProposal } from '../../server/src/features/proposals/proposal-service';
import { uploadTargets } from '../../server/src/features/proposals/target-service';
import { seededRandom } from '../../shared/src/science/seeded-random';

const TARGETS = 60;
const RATE = 200;
const SECONDS = Number(process.env.BENCH_API_SECONDS ?? 30);
const PASSWORD = 'a bench password 123';

function generateCsv(count: number): string {
  const r = seededRandom(60);
  const lines = ['name,ra,dec,magnitude,band,colour,colour_system,ebv,age_myr,age_err_myr,period_precision_d,notes'];
  for (let i = 0; i < count; i++) {
    const age = r.uniform(300, 6000);
    lines.push(
      [`Star A-${i + 1}`, r.uniform(0, 360).toFixed(5), r.uniform(-60, 70).toFixed(5), r.uniform(9, 15).toFixed(2), 'V', r.uniform(0.7, 2.4).toFixed(3), 'BPRP', '', age.toFixed(0), (age * 0.2).toFixed(0), '', 'generated'].join(','),
    );
  }
  return lines.join('\n') + '\n';
}

/** The value of one cookie in a list of Set-Cookie headers. */
function cookieValue(setCookies: string[], name: string): string | undefined {
  for (const c of setCookies) {
    const [pair] = c.split(';');
    const eq = pair.indexOf('=');
    if (pair.slice(0, eq).trim() === name) return pair.slice(eq + 1);
  }
  return undefined;
}

/** Signs in over HTTP as the browser does; returns the Cookie header of the session. */
async function signIn(base: string, email: string): Promise<string> {
  const first = await fetch(`${base}/api/auth/session`);
  const jar = new Map<string, string>();
  const keep = (res: Response) => {
    for (const c of res.headers.getSetCookie()) {
      const [pair] = c.split(';');
      const eq = pair.indexOf('=');
      jar.set(pair.slice(0, eq).trim(), pair.slice(eq + 1));
    }
  };
  keep(first);
  const xsrf = cookieValue(first.headers.getSetCookie(), 'XSRF-TOKEN') ?? jar.get('XSRF-TOKEN') ?? '';
  const cookie = () => [...jar].map(([k, v]) => `${k}=${v}`).join('; ');
  const res = await fetch(`${base}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-xsrf-token': decodeURIComponent(xsrf), cookie: cookie() },
    body: JSON.stringify({ email, password: PASSWORD }),
  });
  if (res.status !== 200) throw new Error(`sign-in failed: ${res.status} ${await res.text()}`);
  keep(res);
  return cookie();
}

const percentile = (sorted: number[], p: number) => (sorted.length ? sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)] : NaN);

/** One endpoint at a fixed rate: latency percentiles of every answer, non-2xx and socket errors. */
async function load(base: string, label: string, urlPath: string, cookie: string): Promise<void> {
  const latencies: number[] = [];
  let bytes = 0;
  const result = await new Promise<autocannon.Result>((resolve, reject) => {
    const instance = autocannon(
      { url: `${base}${urlPath}`, connections: 20, overallRate: RATE, duration: SECONDS, headers: { cookie, accept: 'application/json' } },
      (err, res) => (err ? reject(err) : resolve(res)),
    );
    instance.on('response', (_client, _status, resBytes, responseTime) => {
      latencies.push(responseTime);
      bytes += resBytes;
    });
  });
  latencies.sort((a, b) => a - b);
  const errors = result.errors + result.timeouts + result.non2xx;
  const f = (v: number) => `${v.toFixed(1).padStart(7)} ms`;
  console.log(
    `${label.padEnd(34)} ${String(latencies.length).padStart(6)} req  p50 ${f(percentile(latencies, 50))}  p95 ${f(percentile(latencies, 95))}  p99 ${f(percentile(latencies, 99))}  ` +
      `errors ${errors} (non-2xx ${result.non2xx}, socket ${result.errors}, timeouts ${result.timeouts})  ${(bytes / Math.max(1, latencies.length) / 1024).toFixed(1)} kB/answer`,
  );
}

export default async function (): Promise<void> {
  const database = process.env.SPINCYCLE_TEST_DB ?? 'spincycle_test';
  const root = path.resolve(__dirname, '../..');
  execFileSync(
    process.execPath,
    ['--input-type=module', '-e', `const c = await import('./database/cluster.mjs'); const h = c.bringUpCluster({ log: () => {} }); h.ensureDatabase(${JSON.stringify(database)});`],
    { cwd: root, stdio: 'inherit' },
  );
  await setUpDatabase(database, 'never');

  const created = createApp({
    config: { PGDATABASE: database, LOG_LEVEL: 'silent', NODE_ENV: 'test', SMTP_PORT: 1, PUBLIC_URL: 'http://127.0.0.1' },
    // Plans are computed in-process below; nothing is queued.
    ctx: { planQueue: { enqueue: async () => undefined, close: async () => undefined } },
  });
  const { ctx } = created;
  const db = ctx.db;
  const server = created.app.listen(0, '127.0.0.1');
  await new Promise<void>((resolve) => server.once('listening', () => resolve()));
  const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;

  const tag = `APIB${Date.now().toString(36).toUpperCase()}`;
  const made = { account: 0, sites: [] as number[], nodes: [] as number[], cycle: 0, proposal: 0 };
  try {
    const email = `${tag.toLowerCase()}@bench.example`;
    made.account = await insertAccount(db, { email, displayName: 'Bench Proposer', affiliation: '', passwordHash: await hashPassword(PASSWORD), roles: ['proposer'] });
    const viewer = { id: made.account, email, displayName: 'Bench Proposer', affiliation: '', roles: ['proposer' as const] };
    made.sites = (
      await db('sites')
        .insert([
          { code: `${tag}N`, name: 'Bench North', latitude_deg: 34.9, longitude_deg: -108.4, elevation_m: 2210, time_zone: 'America/Denver', sky_brightness_mag_per_arcsec2: 21.6 },
          { code: `${tag}S`, name: 'Bench South', latitude_deg: -27.45, longitude_deg: -69.95, elevation_m: 2380, time_zone: 'America/Santiago', sky_brightness_mag_per_arcsec2: 21.8 },
        ])
        .returning('id')
    ).map((r: { id: number }) => r.id);
    const common = {
      obstruction_fraction: 0.4, throughput: 0.55, read_noise_e: 9, dark_current_e_per_s: 0.02, gain_e_per_adu: 1.3, saturation_e: 80000, pixel_scale_arcsec: 0.8,
      seeing_fwhm_arcsec: 1.6, systematic_floor_mmag: 1, scintillation_model: 'young1967', overhead_seconds: 45, min_exposure_seconds: 2, max_exposure_seconds: 300,
      altitude_limit_deg: 30, sun_altitude_limit_deg: -18, weather_loss_fraction: 0.3, currency: 'eur',
    };
    made.nodes = (
      await db('nodes')
        .insert([0, 1, 2].map((i) => ({ ...common, code: `${tag}-${i}`, name: `Bench ${i}`, site_id: made.sites[i === 2 ? 1 : 0], aperture_m: [0.5, 0.4, 1.0][i], band: ['V', 'R', 'R'][i], rate_minor_per_hour: [4500, 3000, 12000][i] })))
        .returning('id')
    ).map((r: { id: number }) => r.id);
    const now = Date.now();
    [{ id: made.cycle }] = await db('cycles')
      .insert({
        code: `${tag}C`, title: 'Bench cycle', call_opens_at: new Date(now - 86400_000), call_closes_at: new Date(now + 86400_000),
        campaign_start: new Date(now + 30 * 86400_000).toISOString().slice(0, 10), campaign_end: new Date(now + 209 * 86400_000).toISOString().slice(0, 10),
        categories: ['Bench'],
      })
      .returning('id');
    await db('cycle_nodes').insert(made.nodes.map((node_id) => ({ cycle_id: made.cycle, node_id, node_hours_available: 1000 })));
    const proposal = await createProposal(ctx, viewer, { cycleId: made.cycle, title: 'Bench proposal' });
    made.proposal = proposal.id;
    await db('proposal_nodes').insert(made.nodes.map((node_id) => ({ proposal_id: proposal.id, node_id })));
    const csv = Buffer.from(generateCsv(TARGETS));
    await uploadTargets(ctx, viewer, proposal.id, { buffer: csv, originalname: 'bench.csv' } as Express.Multer.File, () => 'replace');
    const plans = await computeAndStoreProposalPlans(db, proposal.id);
    const cookie = await signIn(base, email);

    console.log(`${TARGETS} targets on 3 nodes (${plans?.plans} plans, ${plans?.errors} errors); ${RATE} req/s for ${SECONDS} s per endpoint, autocannon over loopback`);
    await load(base, 'GET /api/proposals', '/api/proposals', cookie);
    await load(base, 'GET …/plans?pageSize=200 (all 180)', `/api/proposals/${proposal.id}/plans?pageSize=200`, cookie);
    await load(base, 'GET …/plans (first page)', `/api/proposals/${proposal.id}/plans`, cookie);
    await load(base, 'GET …/plans/status', `/api/proposals/${proposal.id}/plans/status`, cookie);
    console.log('target: p95 ≤ 50 ms with 0 errors for GET /api/proposals and the plans list');
  } finally {
    server.close();
    if (made.proposal) await db('proposals').where({ id: made.proposal }).del();
    if (made.cycle) await db('cycles').where({ id: made.cycle }).del();
    if (made.nodes.length) await db('nodes').whereIn('id', made.nodes).del();
    if (made.sites.length) await db('sites').whereIn('id', made.sites).del();
    if (made.account) await db('accounts').where({ id: made.account }).del();
    await created.close();
  }
}
