/**
 * API latency under load: GET /api/proposals and the plans list of a 60-target proposal on
 * 3 nodes (180 plans; `?pageSize=200` so that the whole list comes back, as before the list
 * was paged, and the default first page), plus the run status the plans tab polls. Each at a
 * fixed 200 requests per second for 30 s (BENCH_API_SECONDS to change it) from autocannon over
 * loopback (after 3 s of the same load, not counted), against a web server of its own on the test database. The server runs as
 * `npm start` runs it — its own process (server/src/server.ts), logging at info — so that the
 * load generator's own work does not share its event loop. Prints p50/p95/p99 and errors;
 * target: p95 ≤ 50 ms with 0 errors. Creates throw-away rows and deletes them at the end.
 */
import { randomUUID } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { createServer } from 'node:net';
import path from 'node:path';
import autocannon from 'autocannon';
import { spawn } from 'node:child_process';
import { stopChild, waitForOwnServer } from '../../server/scripts/processes.cjs';
import { createApp } from '../../server/src/app';
import { hashPassword } from '../../server/src/features/auth/password-hash';
import { computeAndStoreProposalPlans } from '../../server/src/features/proposals/plans/plan-service';
import { uploadTargets } from '../../server/src/features/proposals/targets/target-service';
import { seededRandom } from '../../shared/src/science/seeded-random';
import { bringUpBenchDatabase, createBenchNetwork, emptyBenchRows, removeBenchRows } from './support/bench-network';

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
      [
        `Star A-${i + 1}`,
        r.uniform(0, 360).toFixed(5),
        r.uniform(-60, 70).toFixed(5),
        r.uniform(9, 15).toFixed(2),
        'V',
        r.uniform(0.7, 2.4).toFixed(3),
        'BPRP',
        '',
        age.toFixed(0),
        (age * 0.2).toFixed(0),
        '',
        'generated',
      ].join(','),
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

/** A port nothing listens on now (the OS picks it). */
function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer();
    probe.once('error', reject);
    probe.listen(0, '127.0.0.1', () => {
      const { port } = probe.address() as { port: number };
      probe.close(() => resolve(port));
    });
  });
}

const percentile = (sorted: number[], p: number) =>
  sorted.length ? sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)] : NaN;

/** One endpoint at a fixed rate: latency percentiles of every answer, non-2xx and socket errors. */
/** Seconds of the same load before each measurement, not counted (JIT, connection pools, caches). */
const WARM_UP_SECONDS = 3;

/** CPU seconds (user + system) a process has used so far, from /proc (Linux). */
function cpuSecondsOf(pid: number): number {
  const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1].split(' ');
  // Fields 14 and 15 of stat (utime, stime) in clock ticks; after "pid (comm) " they are 12 and 13.
  return (Number(fields[11]) + Number(fields[12])) / CLOCK_TICKS;
}
const CLOCK_TICKS = 100;

/** BENCH_API_ONLY: measure only the endpoints whose label contains this text (e.g. `first page`). */
const ONLY = process.env.BENCH_API_ONLY;

async function load(base: string, label: string, urlPath: string, cookie: string, serverPid: number): Promise<void> {
  if (ONLY && !label.includes(ONLY)) return;
  await new Promise<void>((resolve, reject) => {
    autocannon(
      {
        url: `${base}${urlPath}`,
        connections: 20,
        overallRate: RATE,
        duration: WARM_UP_SECONDS,
        headers: { cookie, accept: 'application/json' },
      },
      (err) => (err ? reject(err) : resolve()),
    );
  });
  const latencies: number[] = [];
  let bytes = 0;
  const cpuBefore = cpuSecondsOf(serverPid);
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
  const cpuMsPerRequest = ((cpuSecondsOf(serverPid) - cpuBefore) * 1000) / Math.max(1, latencies.length);
  latencies.sort((a, b) => a - b);
  const errors = result.errors + result.timeouts + result.non2xx;
  const f = (v: number) => `${v.toFixed(1).padStart(7)} ms`;
  console.log(
    `${label.padEnd(34)} ${String(latencies.length).padStart(6)} req  p50 ${f(percentile(latencies, 50))}  p95 ${f(percentile(latencies, 95))}  p99 ${f(percentile(latencies, 99))}  ` +
      `errors ${errors} (non-2xx ${result.non2xx}, socket ${result.errors}, timeouts ${result.timeouts})  ${(bytes / Math.max(1, latencies.length) / 1024).toFixed(1)} kB/answer  server CPU ${cpuMsPerRequest.toFixed(2)} ms/request`,
  );
}

export default async function (): Promise<void> {
  const database = process.env.SPINCYCLE_TEST_DB ?? 'spincycle_test';
  await bringUpBenchDatabase(database);

  // The bench's own app: only its context (database, queue stub) to create and remove the rows.
  const created = createApp({
    config: { PGDATABASE: database, LOG_LEVEL: 'silent', NODE_ENV: 'test', SMTP_PORT: 1, PUBLIC_URL: 'http://127.0.0.1' },
    // Plans are computed in-process below; nothing is queued.
    ctx: { planQueue: { enqueue: async () => undefined, close: async () => undefined } },
  });
  const { ctx } = created;
  const db = ctx.db;
  const port = await freePort();
  const base = `http://127.0.0.1:${port}`;
  const instanceId = `api-bench-${randomUUID()}`;
  // The measured server: its own process, as in production (stdout, its request log, to nothing).
  // BENCH_API_SERVER_ARGS: extra Node options for the measured server, e.g. `--cpu-prof --cpu-prof-dir=/tmp/prof`.
  const server = Object.assign(
    spawn(
      process.execPath,
      [...(process.env.BENCH_API_SERVER_ARGS ?? '').split(' ').filter(Boolean), '--import', 'tsx', 'server/src/server.ts'],
      {
        cwd: path.resolve(__dirname, '../..'),
        env: {
          ...process.env,
          PGDATABASE: database,
          PORT: String(port),
          HOST: '127.0.0.1',
          NODE_ENV: 'development',
          LOG_LEVEL: 'info',
          SMTP_PORT: '1',
          PUBLIC_URL: base,
          SPINCYCLE_INSTANCE_ID: instanceId,
        },
        stdio: ['ignore', 'ignore', 'inherit'],
      },
    ),
    { name: 'bench web server' },
  );
  await waitForOwnServer(`${base}/api/health`, instanceId, { child: server, name: 'bench web server' });

  const tag = `APIB${Date.now().toString(36).toUpperCase()}`;
  const made = emptyBenchRows();
  try {
    const { viewer, email, proposalId } = await createBenchNetwork(ctx, made, {
      tag,
      passwordHash: await hashPassword(PASSWORD),
      sites: ['N', 'S'],
      siteOfNode: [0, 0, 1],
    });
    const proposal = { id: proposalId };
    const csv = Buffer.from(generateCsv(TARGETS));
    await uploadTargets(ctx, viewer, proposal.id, { buffer: csv, originalname: 'bench.csv' } as Express.Multer.File, () => 'replace');
    const plans = await computeAndStoreProposalPlans(db, proposal.id);
    const cookie = await signIn(base, email);

    console.log(
      `${TARGETS} targets on 3 nodes (${plans?.plans} plans, ${plans?.errors} errors); ${RATE} req/s for ${SECONDS} s per endpoint, autocannon over loopback`,
    );
    await load(base, 'GET /api/proposals', '/api/proposals', cookie, server.pid!);
    await load(base, 'GET …/plans?pageSize=200 (all 180)', `/api/proposals/${proposal.id}/plans?pageSize=200`, cookie, server.pid!);
    await load(base, 'GET …/plans (first page)', `/api/proposals/${proposal.id}/plans`, cookie, server.pid!);
    await load(base, 'GET …/plans/status', `/api/proposals/${proposal.id}/plans/status`, cookie, server.pid!);
    console.log('target: p95 ≤ 50 ms with 0 errors for GET /api/proposals and the plans list');
  } finally {
    await stopChild(server);
    await removeBenchRows(db, made);
    await created.close();
  }
}
