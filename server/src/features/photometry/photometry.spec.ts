/**
 * Returned photometry through the API: a program's team uploads light curves, the analysis job
 * (run here in the test's process, from a fake queue) measures them, and the table, a target's
 * measurement and the CSV export show the result. Every bad file is refused whole with every
 * problem named, and nothing is stored. The light curves are synthetic (seeded), sampled as a
 * single site's nights with weather gaps.
 */
import type { Logger } from 'pino';
import pino from 'pino';
import { seededRandom } from '@spincycle/shared/science/seeded-random';
import { LIGHT_CURVE_LIMITS, type ProgramPhotometry, type TargetPhotometry } from '@spincycle/shared/photometry/photometry';
import { Browser, startHarness, type Harness } from '../../../../test/support/api-harness';
import { createTestNetwork, type TestNetwork } from '../../../../test/api/support/proposal-kit';
import { browserFor } from '../awards/testing/award-fixtures';
import { createNightPlanFixture, type NightPlanFixture } from '../night-plans/testing/night-plan-fixtures';
import type { PhotometryQueue } from '../../jobs/photometry-queue';
import { runPhotometryJob, type PhotometryJobData } from './photometry-analysis';

let h: Harness;
let net: TestNetwork;
const jobs: PhotometryJobData[] = [];
const queue: PhotometryQueue = {
  async enqueue(job) {
    jobs.push(job);
  },
  async close() {},
};
const quiet: Logger = pino({ level: 'silent' });

beforeAll(async () => {
  h = await startHarness({ LOGIN_RATE_LIMIT: 10_000 });
  h.created.ctx.photometryQueue = queue;
  net = await createTestNetwork(h, 'PH');
}, 60_000);
afterAll(async () => {
  await net.cleanUp();
  await h.close();
});

async function program(targets = 2): Promise<{ f: NightPlanFixture; pi: Browser }> {
  const f = await createNightPlanFixture(h, net, { nodes: [net.nodes[0]], programs: [{ targets, hours: [5] }], campaignNights: 10 });
  return { f, pi: await browserFor(h, f.pis[0]) };
}

/** Runs every queued analysis job. */
async function runJobs(): Promise<void> {
  while (jobs.length) await runPhotometryJob(h.created.ctx.db, jobs.shift()!, quiet);
}

interface CurveOptions {
  periodDays: number;
  amplitudeMag?: number;
  noiseMag?: number;
  nights?: number;
  /** Minutes between points within a night. */
  cadenceMinutes?: number;
  seed: number;
  /** MJD of the first night's evening (UTC). */
  startMjd?: number;
}

/** Times (MJD, UTC) and magnitudes of a spotted star seen from one site: 6-hour nights, 30 % of nights lost. */
function synthetic(o: CurveOptions): { mjd: number[]; mag: number[] } {
  const rnd = seededRandom(o.seed);
  const mjd: number[] = [];
  const mag: number[] = [];
  const start = o.startMjd ?? 61100.0;
  const step = (o.cadenceMinutes ?? 15) / 1440;
  for (let night = 0; night < (o.nights ?? 60); night++) {
    if (rnd.next() < 0.3) continue;
    for (let t = start + night + 0.05; t < start + night + 0.3; t += step) {
      mjd.push(t);
      mag.push(12 + (o.amplitudeMag ?? 0.01) * Math.sin((2 * Math.PI * t) / o.periodDays) + rnd.normal(0, o.noiseMag ?? 0.003));
    }
  }
  return { mjd, mag };
}

function csv(header: string, rows: (string | number)[][]): Buffer {
  return Buffer.from(`${header}\n${rows.map((r) => r.join(',')).join('\n')}\n`);
}

async function upload(b: Browser, proposalId: number, files: { name: string; body: Buffer }[], fields: Record<string, string> = {}) {
  await b.ready();
  let req = b.agent.post(`/api/proposals/${proposalId}/photometry/uploads`).set('X-XSRF-TOKEN', b.xsrf() ?? '');
  for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
  for (const file of files) req = req.attach('files', file.body, file.name);
  return req;
}

async function stored(proposalId: number) {
  const db = h.created.ctx.db;
  const [curves, uploads, runs] = await Promise.all([
    db('light_curves').where('proposal_id', proposalId).count({ n: '*' }),
    db('light_curve_uploads').where('proposal_id', proposalId).count({ n: '*' }),
    db('photometry_runs').where('proposal_id', proposalId).count({ n: '*' }),
  ]);
  return { curves: Number(curves[0].n), uploads: Number(uploads[0].n), runs: Number(runs[0].n) };
}

describe('upload, analysis and the program table', () => {
  it('measures an uploaded 8.3-day star within its uncertainty and shows it in the table, the target page and the export', async () => {
    const { f, pi } = await program(2);
    const [star, other] = f.targetNames[0];
    const a = synthetic({ periodDays: 8.3, seed: 11 });
    const b = synthetic({ periodDays: 3.1, seed: 12, amplitudeMag: 0 });
    const rows = [
      ...a.mjd.map((t, i) => [star, t.toFixed(6), a.mag[i].toFixed(5), '0.003']),
      ...b.mjd.map((t, i) => [other, t.toFixed(6), b.mag[i].toFixed(5), '0.003']),
    ];
    const res = await upload(pi, f.proposalIds[0], [{ name: 'season.csv', body: csv('target,mjd,mag,error', rows) }]);
    expect(res.status).toBe(202);
    expect(res.body.run).toEqual(expect.objectContaining({ state: 'queued', total: 2, done: 0 }));

    const before = (await pi.get(`/api/proposals/${f.proposalIds[0]}/photometry`)).body as ProgramPhotometry;
    expect(before.progress).toEqual(expect.objectContaining({ targetsAwarded: 2, targetsWithPhotometry: 2, targetsAnalysed: 0 }));
    await runJobs();

    const run = await pi.get(`/api/proposals/${f.proposalIds[0]}/photometry/run`);
    expect(run.body).toEqual(expect.objectContaining({ state: 'done', total: 2, done: 2 }));
    const body = (await pi.get(`/api/proposals/${f.proposalIds[0]}/photometry`)).body as ProgramPhotometry;
    const measured = body.targets.find((t) => t.targetName === star)!;
    expect(measured.verdict).toBe('measured');
    // Recovered within 3σ of the injected period (the σP of SCIENCE.md §6).
    expect(Math.abs(measured.periodDays! - 8.3)).toBeLessThan(3 * measured.periodUncertaintyDays!);
    // 0.01 mag semi-amplitude injected = 10 mmag.
    expect(measured.semiAmplitudeMmag).toBeGreaterThan(8);
    expect(measured.semiAmplitudeMmag).toBeLessThan(12);
    expect(body.targets.find((t) => t.targetName === other)!.verdict).toBe('not_detected');
    expect(body.progress).toEqual(expect.objectContaining({ targetsAnalysed: 2, targetsMeasured: 1 }));
    // Two targets of one age: a cluster program; one measured member is not enough for a fitted age.
    expect(body.cluster).toEqual(expect.objectContaining({ ageMyr: 650 }));

    const page = (await pi.get(`/api/proposals/${f.proposalIds[0]}/photometry/targets/${measured.targetId}`)).body as TargetPhotometry;
    expect(page.measurement!.best!.periodDays).toBeCloseTo(measured.periodDays!, 10);
    expect(page.measurement!.input.timeSystems).toEqual(['mjd_utc']);
    expect(page.measurement!.charts.folded.phase.length).toBeGreaterThan(0);
    expect(page.uploads[0]).toEqual(expect.objectContaining({ fileName: 'season.csv' }));

    const exported = await pi.get(`/api/proposals/${f.proposalIds[0]}/photometry/export.csv`);
    expect(exported.status).toBe(200);
    expect(exported.headers['content-type']).toBe('text/csv; charset=utf-8');
    const lines = exported.text.trim().split('\n');
    expect(lines[0]).toMatch(/^target,colour,colour_system,points,nodes,expected_period_days,/);
    expect(lines).toHaveLength(3);
    expect(lines.find((l) => l.startsWith(`${star},`))).toMatch(/,Measured,8\.\d{4},/);
  });

  it('replaces a target’s curve on the next upload and hides the measurement of the old one until analysed again', async () => {
    const { f, pi } = await program(1);
    const name = f.targetNames[0][0];
    const a = synthetic({ periodDays: 5.2, seed: 21 });
    const file = (s: { mjd: number[]; mag: number[] }) =>
      csv(
        'mjd,mag',
        s.mjd.map((t, i) => [t.toFixed(6), s.mag[i].toFixed(5)]),
      );
    expect((await upload(pi, f.proposalIds[0], [{ name: 'a.csv', body: file(a) }], { targetId: String(f.targetIds[0][0]) })).status).toBe(
      202,
    );
    await runJobs();
    const b = synthetic({ periodDays: 5.2, seed: 22, nights: 30 });
    expect((await upload(pi, f.proposalIds[0], [{ name: 'b.csv', body: file(b) }], { targetId: String(f.targetIds[0][0]) })).status).toBe(
      202,
    );
    const mid = (await pi.get(`/api/proposals/${f.proposalIds[0]}/photometry`)).body as ProgramPhotometry;
    const row = mid.targets.find((t) => t.targetName === name)!;
    expect(row.points).toBe(b.mjd.length);
    expect(row.verdict).toBeNull();
    await runJobs();
    const after = (await pi.get(`/api/proposals/${f.proposalIds[0]}/photometry`)).body as ProgramPhotometry;
    expect(after.targets[0].verdict).not.toBeNull();
    expect(await stored(f.proposalIds[0])).toEqual({ curves: 1, uploads: 2, runs: 2 });
  });

  it('analyses again with new detrending choices, recorded on the run, and stops an older unfinished run', async () => {
    const { f, pi } = await program(1);
    const a = synthetic({ periodDays: 4.4, seed: 31 });
    const body = csv(
      'bjd,mag',
      a.mjd.map((t, i) => [(t + 2400000.5).toFixed(6), a.mag[i].toFixed(5)]),
    );
    expect((await upload(pi, f.proposalIds[0], [{ name: 'a.csv', body }], { targetId: String(f.targetIds[0][0]) })).status).toBe(202);
    const first = jobs.shift()!;
    const again = await pi.post(`/api/proposals/${f.proposalIds[0]}/photometry/analyses`, {
      detrend: { offsets: 'none', clipSigma: null, binMinutes: 30 },
    });
    expect(again.status).toBe(202);
    // The older run was stopped: its job does nothing.
    await runPhotometryJob(h.created.ctx.db, first, quiet);
    const old = await h.created.ctx.db('photometry_runs').where('id', first.runId).first();
    expect(old.state).toBe('failed');
    expect(old.error).toMatch(/newer upload or analysis/);
    await runJobs();
    const program1 = (await pi.get(`/api/proposals/${f.proposalIds[0]}/photometry`)).body as ProgramPhotometry;
    expect(program1.detrend).toEqual({ offsets: 'none', clipSigma: null, binMinutes: 30 });
    const page = (await pi.get(`/api/proposals/${f.proposalIds[0]}/photometry/targets/${f.targetIds[0][0]}`)).body as TargetPhotometry;
    expect(page.measurement!.detrend.options).toEqual({ offsets: 'none', clipSigma: null, binMinutes: 30 });
    expect(page.measurement!.detrend.binnedPoints).toBeLessThan(a.mjd.length);
  });

  it('joins one target’s files (two halves of a season, one in MJD and one in ISO UTC) into one curve', async () => {
    const { f, pi } = await program(1);
    const name = f.targetNames[0][0];
    const a = synthetic({ periodDays: 7.6, seed: 61 });
    const half = Math.floor(a.mjd.length / 2);
    const iso = (mjd: number) => new Date((mjd - 40587) * 86400_000).toISOString();
    const first = csv(
      'target,mjd,mag',
      a.mjd.slice(0, half).map((t, i) => [name, t.toFixed(6), a.mag[i].toFixed(5)]),
    );
    const second = csv(
      'target,utc,mag',
      a.mjd.slice(half).map((t, i) => [name, iso(t), a.mag[half + i].toFixed(5)]),
    );
    const res = await upload(pi, f.proposalIds[0], [
      { name: 'first.csv', body: first },
      { name: 'second.csv', body: second },
    ]);
    expect(res.status).toBe(202);
    await runJobs();
    const page = (await pi.get(`/api/proposals/${f.proposalIds[0]}/photometry/targets/${f.targetIds[0][0]}`)).body as TargetPhotometry;
    expect(page.row.points).toBe(a.mjd.length);
    expect(page.measurement!.input.timeSystems).toEqual(['mjd_utc', 'iso_utc']);
    expect(page.uploads.map((u) => u.fileName)).toEqual(['first.csv', 'second.csv']);
    expect(Math.abs(page.measurement!.best!.periodDays - 7.6)).toBeLessThan(3 * page.measurement!.best!.periodUncertaintyDays!);
  });

  it('lists on a target’s page only the files of its upload that held the target', async () => {
    const { f, pi } = await program(2);
    const [s0, s1] = f.targetNames[0];
    const one = (name: string, seed: number) => {
      const a = synthetic({ periodDays: 7.5, seed, nights: 20 });
      return csv(
        'target,mjd,mag',
        a.mjd.map((t, i) => [name, t.toFixed(6), a.mag[i].toFixed(5)]),
      );
    };
    const res = await upload(pi, f.proposalIds[0], [
      { name: 'first-star.csv', body: one(s0, 81) },
      { name: 'second-star.csv', body: one(s1, 82) },
    ]);
    expect(res.status).toBe(202);
    const page = (await pi.get(`/api/proposals/${f.proposalIds[0]}/photometry/targets/${f.targetIds[0][1]}`)).body as TargetPhotometry;
    expect(page.uploads.map((u) => u.fileName)).toEqual(['second-star.csv']);
    expect(page.row.targetName).toBe(s1);
    jobs.length = 0;
  });

  it('cautions in the table when the rotation period may be twice the best period (two spot groups)', async () => {
    const { f, pi } = await program(1);
    const rnd = seededRandom(71);
    const rows: string[][] = [];
    for (let night = 0; night < 70; night++) {
      if (rnd.next() < 0.3) continue;
      for (let t = 61100 + night + 0.05; t < 61100 + night + 0.3; t += 15 / 1440) {
        // Two unequal dips per 9-day turn (a synthetic case built here).
        const mag =
          12 + 0.0025 * Math.sin((2 * Math.PI * t) / 9 + 0.3) + 0.008 * Math.sin((4 * Math.PI * t) / 9 + 1.1) + rnd.normal(0, 0.003);
        rows.push([t.toFixed(6), mag.toFixed(5)]);
      }
    }
    const res = await upload(pi, f.proposalIds[0], [{ name: 'dips.csv', body: csv('mjd,mag', rows) }], {
      targetId: String(f.targetIds[0][0]),
    });
    expect(res.status).toBe(202);
    await runJobs();
    const row = ((await pi.get(`/api/proposals/${f.proposalIds[0]}/photometry`)).body as ProgramPhotometry).targets[0];
    expect(row.periodDays).toBeCloseTo(4.5, 1);
    expect(row.cautions.join(' ')).toMatch(/may be twice this \(9\.\d\d d\): two spot groups/);
  });

  it('exports target names that a spreadsheet would run as formulas as text (OWASP CSV injection)', async () => {
    const { f, pi } = await program(1);
    await h.created.ctx.db('targets').where('id', f.targetIds[0][0]).update({ name: '=HYPERLINK("x")' });
    const exported = await pi.get(`/api/proposals/${f.proposalIds[0]}/photometry/export.csv`);
    expect(exported.text.trim().split('\n')[1]).toMatch(/^"'=HYPERLINK\(""x""\)",/);
  });

  it('reads a 10⁵-row season of one target', async () => {
    const { f, pi } = await program(1);
    const a = synthetic({ periodDays: 6.1, seed: 41, nights: 220, cadenceMinutes: 0.5 });
    const n = Math.min(a.mjd.length, 100_000);
    expect(n).toBe(100_000);
    const body = csv(
      'mjd,mag,error',
      a.mjd.slice(0, n).map((t, i) => [t.toFixed(7), a.mag[i].toFixed(5), '0.003']),
    );
    const res = await upload(pi, f.proposalIds[0], [{ name: 'minute.csv', body }], { targetId: String(f.targetIds[0][0]) });
    expect(res.status).toBe(202);
    const row = (await h.created.ctx.db('light_curves').where('target_id', f.targetIds[0][0]).first('point_count')) as {
      point_count: number;
    };
    expect(row.point_count).toBe(100_000);
    await runJobs();
    const program1 = (await pi.get(`/api/proposals/${f.proposalIds[0]}/photometry`)).body as ProgramPhotometry;
    expect(program1.targets[0].verdict).toBe('measured');
  }, 60_000);
});

describe('bad files are refused whole, every problem named, nothing stored', () => {
  let f: NightPlanFixture;
  let pi: Browser;
  beforeAll(async () => {
    ({ f, pi } = await program(2));
  });

  const cases: { name: string; files: () => { name: string; body: Buffer }[]; fields?: () => Record<string, string>; expect: RegExp[] }[] =
    [
      {
        name: 'a Latin-1 file',
        files: () => [
          { name: 'latin.csv', body: Buffer.concat([Buffer.from('target,mjd,mag\n'), Buffer.from('Ster\xe9,61100.1,12.0\n', 'latin1')]) },
        ],
        expect: [/UTF-8.*line 2/],
      },
      {
        name: 'a UTF-16 file',
        files: () => [{ name: 'wide.csv', body: Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from('mjd,mag\n', 'utf16le')]) }],
        expect: [/UTF-16/],
      },
      { name: 'an empty file', files: () => [{ name: 'empty.csv', body: Buffer.alloc(0) }], expect: [/empty/] },
      { name: 'a header without rows', files: () => [{ name: 'head.csv', body: Buffer.from('target,mjd,mag\n') }], expect: [/no rows/] },
    ];
  it.each(cases)('$name', async (c) => {
    const before = await stored(f.proposalIds[0]);
    const res = await upload(pi, f.proposalIds[0], c.files(), c.fields?.() ?? {});
    expect(res.status).toBe(400);
    expect(res.body.code).toBe('invalid_light_curve');
    for (const re of c.expect) expect(res.body.message).toMatch(re);
    expect(res.body.rows.length).toBeGreaterThan(0);
    expect(await stored(f.proposalIds[0])).toEqual(before);
  });

  it('lists every bad row of every file with its column, and stores neither the good file nor the good rows', async () => {
    const [s0, s1] = f.targetNames[0];
    const good = csv('target,mjd,mag', [
      [s0, '61100.10', '12.01'],
      [s0, '61100.11', '12.02'],
    ]);
    const bad = csv('target,jd,mag,error,node', [
      [s1, '2461100.1', '12.0', '0.003', f.nodeCodes[0]],
      ['Nobody', '2461100.2', '12.0', '0.003', f.nodeCodes[0]],
      [s1, '61100.3', '12.0', '0.003', f.nodeCodes[0]],
      [s1, '2461100.4', 'bright', '0.003', f.nodeCodes[0]],
      [s1, '2461100.5', '12.0', '-1', f.nodeCodes[0]],
      [s1, '2461100.6', '12.0', '0.003', 'XX-NOPE'],
    ]);
    const before = await stored(f.proposalIds[0]);
    const res = await upload(pi, f.proposalIds[0], [
      { name: 'good.csv', body: good },
      { name: 'bad.csv', body: bad },
    ]);
    expect(res.status).toBe(400);
    expect(res.body.code).toBe('invalid_light_curve');
    const where = (res.body.rows as { file: string; row: number; field: string }[]).map((r) => `${r.file}:${r.row}:${r.field}`);
    expect(where).toEqual(['bad.csv:2:target', 'bad.csv:3:jd', 'bad.csv:4:mag', 'bad.csv:5:error', 'bad.csv:6:node']);
    expect(res.body.totalErrors).toBe(5);
    expect(res.body.message).toMatch(/^bad\.csv: row 2, target: .*\(and 4 more problems; nothing was saved\)$/);
    expect(await stored(f.proposalIds[0])).toEqual(before);
  });

  it('refuses a target given in magnitudes in one file and in flux in another', async () => {
    const [s0] = f.targetNames[0];
    const before = await stored(f.proposalIds[0]);
    const res = await upload(pi, f.proposalIds[0], [
      { name: 'mag.csv', body: csv('target,mjd,mag', [[s0, '61100.10', '12.01']]) },
      { name: 'flux.csv', body: csv('target,mjd,flux', [[s0, '61101.10', '1.002']]) },
    ]);
    expect(res.status).toBe(400);
    expect(res.body.message).toMatch(/in magnitudes in one file and in flux in another/);
    expect(await stored(f.proposalIds[0])).toEqual(before);
  });

  it('refuses more files than allowed, and a file over the size limit', async () => {
    const one = csv('mjd,mag', [['61100.1', '12']]);
    const many = Array.from({ length: LIGHT_CURVE_LIMITS.maxFiles + 1 }, (_, i) => ({ name: `f${i}.csv`, body: one }));
    const res = await upload(pi, f.proposalIds[0], many, { targetId: String(f.targetIds[0][0]) });
    expect(res.status).toBe(400);
    expect(res.body.code).toBe('too_many_files');
    const big = Buffer.alloc(LIGHT_CURVE_LIMITS.maxFileBytes + 1, '1');
    const tooBig = await upload(pi, f.proposalIds[0], [{ name: 'big.csv', body: big }]);
    expect(tooBig.status).toBe(413);
    expect(tooBig.body.code).toBe('file_too_large');
  });

  it('names a missing time system, value kind and target', async () => {
    const res = await upload(pi, f.proposalIds[0], [{ name: 'bare.csv', body: csv('time,value', [['61100.1', '12']]) }]);
    expect(res.status).toBe(400);
    const fields = (res.body.rows as { field: string; message: string }[]).map((r) => r.message).join(' | ');
    expect(fields).toMatch(/time system/i);
    expect(fields).toMatch(/magnitude|flux/i);
    expect(fields).toMatch(/target/i);
  });
});

describe('who may upload', () => {
  it('answers 409 no_program before an award and 404 to a proposer not on the team; a withdrawn program takes no uploads', async () => {
    const { f, pi } = await program(1);
    const db = h.created.ctx.db;
    await db('cycles').where('id', f.cycleId).update({ awards_released_at: null });
    const early = await pi.get(`/api/proposals/${f.proposalIds[0]}/photometry`);
    expect(early.status).toBe(409);
    expect(early.body.code).toBe('no_program');
    await db('cycles').where('id', f.cycleId).update({ awards_released_at: new Date() });
    const outsider = await browserFor(h, f.reviewer);
    expect((await outsider.get(`/api/proposals/${f.proposalIds[0]}/photometry`)).status).toBe(404);
    await db('programs').where('proposal_id', f.proposalIds[0]).update({ state: 'withdrawn' });
    const view = (await pi.get(`/api/proposals/${f.proposalIds[0]}/photometry`)).body as ProgramPhotometry;
    expect(view.canUpload).toBe(false);
    const refused = await upload(pi, f.proposalIds[0], [{ name: 'a.csv', body: csv('mjd,mag', [['61100.1', '12']]) }], {
      targetId: String(f.targetIds[0][0]),
    });
    expect(refused.status).toBe(403);
    expect(refused.body.code).toBe('not_allowed');
  });

  it('answers 503 when the analysis cannot be queued, with the curves kept for a later analysis', async () => {
    const { f, pi } = await program(1);
    h.created.ctx.photometryQueue = {
      async enqueue() {
        throw new Error('queue down');
      },
      async close() {},
    };
    try {
      const a = synthetic({ periodDays: 5, seed: 51, nights: 10 });
      const res = await upload(
        pi,
        f.proposalIds[0],
        [
          {
            name: 'a.csv',
            body: csv(
              'mjd,mag',
              a.mjd.map((t, i) => [t, a.mag[i]]),
            ),
          },
        ],
        {
          targetId: String(f.targetIds[0][0]),
        },
      );
      expect(res.status).toBe(503);
      expect(res.body.code).toBe('queue_unavailable');
      expect((await stored(f.proposalIds[0])).curves).toBe(1);
    } finally {
      h.created.ctx.photometryQueue = queue;
    }
    const again = await pi.post(`/api/proposals/${f.proposalIds[0]}/photometry/analyses`, {
      detrend: { offsets: 'node', clipSigma: 5, binMinutes: null },
    });
    expect(again.status).toBe(202);
    jobs.length = 0;
  });
});
