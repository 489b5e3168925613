/**
 * Load-testing helpers shared by the API benchmarks (api.bench.ts, review.bench.ts): signing in
 * over HTTP as a browser does, a free port, the measured web server in its own process, and one
 * endpoint under a fixed request rate (autocannon) with its latency percentiles and the server's
 * CPU time per request.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { createServer } from 'node:net';
import path from 'node:path';
import autocannon from 'autocannon';
import { waitForOwnServer } from '../../../server/scripts/processes.cjs';

/** Requests per second of every measured endpoint, and seconds of each measurement (BENCH_API_SECONDS). */
export const RATE = 200;
export const SECONDS = Number(process.env.BENCH_API_SECONDS ?? 30);

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
export async function signIn(base: string, email: string, password: string): Promise<string> {
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
    body: JSON.stringify({ email, password }),
  });
  if (res.status !== 200) throw new Error(`sign-in failed: ${res.status} ${await res.text()}`);
  keep(res);
  return cookie();
}

/** A port nothing listens on now (the OS picks it). */
export function freePort(): Promise<number> {
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

/** What one run of a load pattern saw. */
interface Seen {
  latencies: number[];
  bytes: number;
  errors: number;
  non2xx: number;
  timeouts: number;
}

/**
 * One autocannon instance (`connections` keep-alive connections sharing `rate` requests per
 * second), its answers' latencies added to `seen`.
 */
function cannon(url: string, cookie: string, connections: number, rate: number, seconds: number, seen?: Seen): Promise<void> {
  return new Promise<void>((resolve, reject) => {
    const instance = autocannon(
      { url, connections, overallRate: rate, duration: seconds, headers: { cookie, accept: 'application/json' } },
      (err, res) => {
        if (err) return reject(err);
        if (seen) {
          seen.errors += res.errors;
          seen.timeouts += res.timeouts;
          seen.non2xx += res.non2xx;
        }
        resolve();
      },
    );
    if (seen)
      instance.on('response', (_client, _status, resBytes, responseTime) => {
        seen.latencies.push(responseTime);
        seen.bytes += resBytes;
      });
  });
}

/**
 * The two arrival patterns, each at RATE requests per second:
 * - **paced**: RATE clients, each on its own keep-alive connection sending one request a second,
 *   their start times spread evenly over the second (one autocannon instance each, started
 *   1000 / RATE ms apart), so requests arrive every 1000 / RATE ms, as from many independent
 *   users. This is the figure the targets are read on.
 * - **bursts**: one autocannon instance with 20 connections and `overallRate`. autocannon limits
 *   the rate by letting each connection send its share of the second back to back as soon as the
 *   second begins (httpClient.js: a counter reset by a 1 s interval), so all RATE requests of a
 *   second arrive at once, 20 at a time; the latency is then about 20 × the per-request cost.
 *   Printed as well, as the harsher pattern.
 */
async function run(pattern: 'paced' | 'bursts', url: string, cookie: string, seconds: number, seen?: Seen): Promise<void> {
  if (pattern === 'bursts') return cannon(url, cookie, 20, RATE, seconds, seen);
  const gap = 1000 / RATE;
  const clients: Promise<void>[] = [];
  for (let i = 0; i < RATE; i++) {
    clients.push(cannon(url, cookie, 1, 1, seconds, seen));
    await new Promise((resolve) => setTimeout(resolve, gap));
  }
  await Promise.all(clients);
}

/**
 * One endpoint at RATE requests per second, in each arrival pattern (see `run`): latency
 * percentiles of every answer, non-2xx and socket errors, answer size, and the server's CPU
 * time per request.
 */
export async function load(base: string, label: string, urlPath: string, cookie: string, serverPid: number): Promise<void> {
  if (ONLY && !label.includes(ONLY)) return;
  const url = `${base}${urlPath}`;
  for (const pattern of ['paced', 'bursts'] as const) {
    await run(pattern, url, cookie, WARM_UP_SECONDS);
    const seen: Seen = { latencies: [], bytes: 0, errors: 0, non2xx: 0, timeouts: 0 };
    const cpuBefore = cpuSecondsOf(serverPid);
    await run(pattern, url, cookie, SECONDS, seen);
    const { latencies } = seen;
    const cpuMsPerRequest = ((cpuSecondsOf(serverPid) - cpuBefore) * 1000) / Math.max(1, latencies.length);
    latencies.sort((a, b) => a - b);
    const errors = seen.errors + seen.timeouts + seen.non2xx;
    const f = (v: number) => `${v.toFixed(1).padStart(7)} ms`;
    console.log(
      `${label.padEnd(34)} ${pattern.padEnd(6)} ${String(latencies.length).padStart(6)} req  p50 ${f(percentile(latencies, 50))}  p95 ${f(percentile(latencies, 95))}  p99 ${f(percentile(latencies, 99))}  ` +
        `errors ${errors} (non-2xx ${seen.non2xx}, socket ${seen.errors}, timeouts ${seen.timeouts})  ${(seen.bytes / Math.max(1, latencies.length) / 1024).toFixed(1)} kB/answer  server CPU ${cpuMsPerRequest.toFixed(2)} ms/request`,
    );
  }
}

/**
 * The measured server: its own process, as in production (stdout, its request log, to nothing),
 * on `database`. BENCH_API_SERVER_ARGS: extra Node options for it, e.g. `--cpu-prof --cpu-prof-dir=/tmp/prof`.
 */
export async function startMeasuredServer(database: string, port: number, instanceId: string): Promise<ChildProcess & { name: string }> {
  const base = `http://127.0.0.1:${port}`;
  const server = Object.assign(
    spawn(
      process.execPath,
      [...(process.env.BENCH_API_SERVER_ARGS ?? '').split(' ').filter(Boolean), '--import', 'tsx', 'server/src/server.ts'],
      {
        cwd: path.resolve(__dirname, '../../..'),
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
  return server;
}
