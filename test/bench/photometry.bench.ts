/**
 * Returned photometry (`npm run bench -- photometry`):
 * 1. 200 targets × 2000 points in one CSV (target column, MJD): read as the server reads an
 *    upload (streamed, every row checked, times to BJD), then each target measured (detrending,
 *    periodogram over its plan's expected range with margin, window function, alias check,
 *    charts). Target ≤ 5 s. Also without an expected period (the widest search), for the record.
 * 2. One target of 10⁵ points (a season of 1-minute photometry): read and measured. Target ≤ 1 s.
 * 3. The worker's job end to end on the test database: the same 200 targets uploaded through the
 *    API, then the analysis job (reading each stored curve, measuring it, storing the result and
 *    the progress). Target ≤ 5 s in the worker.
 * Light curves are synthetic (seeded): single-site nights, a third lost to weather.
 */
import { mkdtempSync, rmSync, writeFileSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import pino from 'pino';
import { DEFAULT_DETREND } from '../../shared/src/photometry/photometry';
import { seededRandom } from '../../shared/src/science/seeded-random';
import { measureRotation } from '../../shared/src/science/rotation';
import { readLightCurveFiles } from '../../server/src/features/photometry/light-curve-files';
import { runPhotometryJob, type PhotometryJobData } from '../../server/src/features/photometry/photometry-analysis';
import { startHarness } from '../support/api-harness';
import { createTestNetwork } from '../api/support/proposal-kit';
import { browserFor } from '../../server/src/features/awards/testing/award-fixtures';
import { createNightPlanFixture } from '../../server/src/features/night-plans/testing/night-plan-fixtures';
import { bringUpBenchDatabase } from './support/bench-network';

const TARGETS = 200;
const POINTS = 2000;
const s = (ms: number) => `${(ms / 1000).toFixed(2)} s`;

/** `n` points of a star of period `p` over nights of 6 hours from MJD 61100, a third of the nights lost. */
function curve(n: number, p: number, seed: number, cadenceMinutes: number): { mjd: number[]; mag: number[] } {
  const rnd = seededRandom(seed);
  const mjd: number[] = [];
  const mag: number[] = [];
  for (let night = 0; mjd.length < n; night++) {
    if (rnd.next() < 1 / 3) continue;
    for (let t = 61100 + night + 0.05; t < 61100 + night + 0.3 && mjd.length < n; t += cadenceMinutes / 1440) {
      mjd.push(t);
      mag.push(12 + 0.008 * Math.sin((2 * Math.PI * t) / p) + rnd.normal(0, 0.004));
    }
  }
  return { mjd, mag };
}

function csvOf(names: string[], curves: { mjd: number[]; mag: number[] }[]): string {
  const parts: string[] = ['target,mjd,mag,error'];
  curves.forEach((c, k) => {
    for (let i = 0; i < c.mjd.length; i++) parts.push(`${names[k]},${c.mjd[i].toFixed(6)},${c.mag[i].toFixed(5)},0.004`);
  });
  return parts.join('\n') + '\n';
}

/** What a target's plan expects, for a star of period `p`: the plan's period a little off, its range ±35 %. */
const expectation = (p: number) => ({ periodDays: p * 1.1, lowDays: p * 0.75, highDays: p * 1.45, from: 'a plan' });

async function readAndMeasure(
  path: string,
  targets: { id: number; name: string; raDeg: number; decDeg: number }[],
  periodOf: (targetId: number) => number | null,
) {
  const t0 = performance.now();
  const read = await readLightCurveFiles([{ path, fileName: 'bench.csv', size: statSync(path).size }], { targets, nodeCodes: [] });
  const t1 = performance.now();
  let measured = 0;
  for (const series of read.series) {
    const m = measureRotation(
      {
        bjd: series.bjd,
        values: series.values,
        errors: series.errors,
        nodes: series.nodes,
        valueKind: series.valueKind,
        timeSystems: series.timeSystems,
      },
      { expected: periodOf(series.targetId) === null ? null : expectation(periodOf(series.targetId)!), band: null, star: null },
      DEFAULT_DETREND,
    );
    if (m.verdict === 'measured') measured++;
  }
  return { readMs: t1 - t0, measureMs: performance.now() - t1, measured, series: read.series.length };
}

export default async function (): Promise<void> {
  const dir = mkdtempSync(join(tmpdir(), 'spincycle-photometry-bench-'));
  try {
    // 1. 200 × 2000 in one file.
    const names = Array.from({ length: TARGETS }, (_, k) => `Bench star ${k}`);
    const curves = names.map((_, k) => curve(POINTS, 2 + (k % 17), k, 10));
    const manyPath = join(dir, 'many.csv');
    writeFileSync(manyPath, csvOf(names, curves));
    const targets = names.map((name, k) => ({ id: k + 1, name, raDeg: (k * 1.7) % 360, decDeg: -30 + (k % 60) }));
    const periodOf = (id: number) => 2 + ((id - 1) % 17);
    await readAndMeasure(manyPath, targets.slice(0, 5), periodOf).catch(() => undefined); // warm-up (unknown targets are refused)
    const many = await readAndMeasure(manyPath, targets, periodOf);
    console.log(
      `${TARGETS} targets × ${POINTS} points (${(statSync(manyPath).size / 1e6).toFixed(1)} MB), each searched around its plan's period: read ${s(many.readMs)}, measured ${s(many.measureMs)}, total ${s(many.readMs + many.measureMs)} (target ≤ 5 s); ${many.measured} of ${many.series} measured`,
    );
    const blind = await readAndMeasure(manyPath, targets, () => null);
    console.log(
      `  the same without an expected period (searched from 0.1 d to two thirds of the time covered): measured ${s(blind.measureMs)}; ${blind.measured} of ${blind.series} measured`,
    );

    // 2. One target of 10⁵ points.
    const longPath = join(dir, 'long.csv');
    writeFileSync(longPath, csvOf(['Long star'], [curve(100_000, 6.1, 99, 1.5)]));
    const long = await readAndMeasure(longPath, [{ id: 1, name: 'Long star', raDeg: 100, decDeg: 20 }], () => 6.1);
    console.log(
      `1 target × 100000 points: read ${s(long.readMs)}, measured ${s(long.measureMs)}, total ${s(long.readMs + long.measureMs)} (target ≤ 1 s); ${long.measured ? 'measured' : 'not measured'}`,
    );

    // 3. The worker's job on the test database.
    const database = process.env.SPINCYCLE_TEST_DB ?? 'spincycle_test';
    process.env.SCRYPT_LOG_N ??= '11';
    await bringUpBenchDatabase(database);
    const jobs: PhotometryJobData[] = [];
    const h = await startHarness(
      { PGDATABASE: database, NODE_ENV: 'test', LOG_LEVEL: 'silent', LOGIN_RATE_LIMIT: 100_000 },
      { photometryQueue: { enqueue: async (j) => void jobs.push(j), close: async () => {} } },
    );
    const net = await createTestNetwork(h, 'PB');
    try {
      const f = await createNightPlanFixture(h, net, {
        nodes: [net.nodes[0]],
        programs: [{ targets: TARGETS, hours: [50] }],
        campaignNights: 10,
      });
      const realPath = join(dir, 'program.csv');
      writeFileSync(realPath, csvOf(f.targetNames[0], curves));
      const pi = await browserFor(h, f.pis[0]);
      const tUp = performance.now();
      const res = await pi.agent
        .post(`/api/proposals/${f.proposalIds[0]}/photometry/uploads`)
        .set('X-XSRF-TOKEN', pi.xsrf() ?? '')
        .attach('files', realPath);
      if (res.status !== 202) throw new Error(`upload: ${res.status} ${JSON.stringify(res.body).slice(0, 500)}`);
      const upMs = performance.now() - tUp;
      const tJob = performance.now();
      await runPhotometryJob(h.created.ctx.db, jobs.shift()!, pino({ level: 'silent' }));
      const jobMs = performance.now() - tJob;
      const run = await h.created.ctx.db('photometry_runs').where('proposal_id', f.proposalIds[0]).orderBy('id', 'desc').first();
      const verdicts = await h.created.ctx.db('rotation_measurements').where('proposal_id', f.proposalIds[0]).count({ n: '*' });
      console.log(
        `upload through the API (200 × 2000 rows, streamed, stored): ${s(upMs)}; worker job: ${s(jobMs)} (target ≤ 5 s), run ${run.state} ${run.done}/${run.total}, ${verdicts[0].n} measurements stored`,
      );
    } finally {
      await net.cleanUp();
      await h.close();
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
