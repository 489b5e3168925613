/**
 * Reference: our Lomb–Scargle against astropy 5.2.1 (Debian's python3-astropy) on seeded
 * random, unevenly sampled series — exact power within 1e-6, fast power within 1e-3, the
 * same peak, the Baluev false-alarm probability, and the best-fit model. Fails (never skips)
 * when astropy cannot be imported. Also runs the `periodogram` command end to end.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import {
  type FrequencyGrid,
  baluevFalseAlarmProbability,
  fitSinusoid,
  gridMaxFrequency,
  lombScarglePower,
  prepareLightCurve,
  seededRandom,
  topPeaks,
} from '../../shared/src/science/index';
import { requireAstropy, runAstropyOracle } from './astropy-oracle';

interface Case {
  label: string;
  t: number[];
  y: number[];
  dy: number[] | null;
  f0: number;
  df: number;
  nf: number;
  fapPowers: number[];
  modelTimes: number[];
}

interface Answer {
  slow: number[];
  fast: number[];
  fapPowers: number[];
  fap: number[];
  bestFrequency: number;
  model: number[];
}

/** A seeded, unevenly sampled series: a sinusoid (or two) in noise, optionally with per-point errors. */
function makeCase(label: string, seed: number, n: number, withErrors: boolean, sorted: boolean, nf: number): Case {
  const r = seededRandom(seed);
  const span = r.uniform(20, 200);
  const period = r.uniform(0.7, span / 4);
  const t: number[] = [];
  // Nightly clumps with gaps, as a ground-based node samples.
  for (let i = 0; i < n; i++) t.push(Math.floor(r.uniform(0, span)) + r.uniform(0.2, 0.45) + 0.01 * r.next());
  if (sorted) t.sort((a, b) => a - b);
  const dy = withErrors ? t.map(() => r.uniform(0.002, 0.02)) : null;
  const y = t.map(
    (ti, i) =>
      12 + 0.01 * Math.sin((2 * Math.PI * ti) / period + 1) + 0.003 * Math.cos((2 * Math.PI * ti) / 0.9) + r.normal(0, dy ? dy[i] : 0.008),
  );
  const tMin = Math.min(...t);
  const T = Math.max(...t) - tMin;
  const df = 1 / (5 * T);
  return { label, t, y, dy, f0: 0.5 * df, df, nf, fapPowers: [0.01, 0.05, 0.1, 0.3], modelTimes: [tMin, tMin + 1.3, tMin + T / 2] };
}

const CASES: Case[] = [
  makeCase('N 40, no errors', 1, 40, false, true, 400),
  makeCase('N 300, errors, unsorted times', 2, 300, true, false, 1500),
  makeCase('N 1200, no errors', 3, 1200, false, true, 2500),
  makeCase('N 4000, errors', 4, 4000, true, true, 3000),
];

describe('Lomb–Scargle against astropy (oracle)', () => {
  let answers: Answer[] = [];
  let version = '';

  beforeAll(() => {
    version = requireAstropy();
    answers = runAstropyOracle<{ cases: Answer[] }>({ cases: CASES }).cases;
  }, 120_000);

  it('has astropy available through /usr/bin/python3', () => {
    expect(version).toMatch(/^\d+\.\d+/);
  });

  describe.each(CASES.map((c, i) => [c.label, i] as const))('%s', (_label, index) => {
    const c = CASES[index];
    const grid: FrequencyGrid = { minFrequencyPerDay: c.f0, stepPerDay: c.df, count: c.nf };
    const lc = { timeDays: c.t, values: c.y, uncertainties: c.dy ?? undefined };

    it('exact power within 1e-6 of astropy method="slow", same peak', () => {
      const ours = lombScarglePower(lc, grid, { method: 'exact' });
      const theirs = answers[index].slow;
      let maxDiff = 0;
      for (let k = 0; k < c.nf; k++) maxDiff = Math.max(maxDiff, Math.abs(ours[k] - theirs[k]));
      expect(maxDiff).toBeLessThan(1e-6);
      expect(topPeaks(ours, 1)[0]).toBe(argMax(theirs));
    });

    it('fast power within 1e-3 of astropy method="fast", same peak', () => {
      const ours = lombScarglePower(lc, grid, { method: 'fast' });
      const theirs = answers[index].fast;
      let maxDiff = 0;
      for (let k = 0; k < c.nf; k++) maxDiff = Math.max(maxDiff, Math.abs(ours[k] - theirs[k]));
      expect(maxDiff).toBeLessThan(1e-3);
      expect(argMax(Array.from(ours))).toBe(argMax(theirs));
    });

    it('Baluev false-alarm probability as astropy false_alarm_probability(method="baluev")', () => {
      const d = prepareLightCurve(lc);
      const a = answers[index];
      a.fapPowers.forEach((z, i) => {
        const ours = baluevFalseAlarmProbability(z, {
          pointCount: d.n,
          maximumFrequencyPerDay: gridMaxFrequency(grid),
          timeVarianceDays2: d.timeVariance,
        });
        const theirs = a.fap[i];
        // Relative 1e-6 where the FAP is not tiny; absolute 1e-12 near 0.
        expect(Math.abs(ours - theirs)).toBeLessThanOrEqual(Math.max(1e-12, 1e-6 * theirs));
      });
    });

    it('best-fit sinusoid as astropy LombScargle.model at the best frequency', () => {
      const fit = fitSinusoid(lc, answers[index].bestFrequency);
      c.modelTimes.forEach((t, i) => {
        const x = 2 * Math.PI * fit.frequencyPerDay * (t - fit.referenceTimeDays);
        const ours = fit.offset + fit.sinCoefficient * Math.sin(x) + fit.cosCoefficient * Math.cos(x);
        expect(ours).toBeCloseTo(answers[index].model[i], 9);
      });
    });
  });
});

describe('spincycle periodogram (end to end)', () => {
  let dir = '';
  beforeAll(() => {
    dir = mkdtempSync(join(tmpdir(), 'spincycle-ls-'));
  });
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('reads a generated CSV and returns the period, power, FAP and amplitude as JSON', () => {
    const r = seededRandom(2024);
    const rows = ['time,mag,err'];
    const t: number[] = [];
    const y: number[] = [];
    for (let i = 0; i < 400; i++) {
      const ti = 60000 + Math.floor(r.uniform(0, 90)) + r.uniform(0.1, 0.4);
      if (t.includes(ti)) continue;
      const yi = 11.2 + 0.006 * Math.sin((2 * Math.PI * ti) / 8.4) + r.normal(0, 0.003);
      t.push(ti);
      y.push(yi);
      rows.push(`${ti},${yi},0.003`);
    }
    const file = join(dir, 'star-a17.csv');
    writeFileSync(file, `# Star A-17, synthetic\n${rows.join('\n')}\n`);
    const bin = join(__dirname, '..', '..', 'shared', 'bin', 'spincycle.mjs');
    const run = spawnSync(process.execPath, [bin, 'periodogram', file, '--fmax', '2', '--top', '3'], { cwd: dir, encoding: 'utf8' });
    expect(run.stderr).toBe('');
    expect(run.status).toBe(0);
    const out = JSON.parse(run.stdout);
    expect(out.pointCount).toBe(t.length);
    // Within a grid step: df = 1/(10·T) ≈ 1/900 d⁻¹ is ΔP = P²·df ≈ 0.08 d at 8.4 d.
    expect(Math.abs(out.best.periodDays - 8.4)).toBeLessThan(0.16);
    expect(out.best.falseAlarmProbability).toBeLessThan(1e-6);
    expect(out.best.semiAmplitudePpm).toBeGreaterThan(4000);
    expect(out.best.semiAmplitudePpm).toBeLessThan(7000);
    expect(out.peaks).toHaveLength(3);
    // The reported power is the exact power at the best frequency: check it with astropy.
    const oracle = runAstropyOracle<{ cases: Answer[] }>({
      cases: [{ t, y, dy: t.map(() => 0.003), f0: out.best.frequencyPerDay, df: 1, nf: 1, methods: ['slow'], fapPowers: [] }],
    });
    expect(out.best.power).toBeCloseTo(oracle.cases[0].slow[0], 9);
  });

  it('exits with code 2 and names the row of a duplicate time', () => {
    const file = join(dir, 'dup.csv');
    writeFileSync(file, '1.0,10.1\n2.0,10.2\n2.0,10.3\n3.0,10.0\n4.0,10.4\n');
    const bin = join(__dirname, '..', '..', 'shared', 'bin', 'spincycle.mjs');
    const run = spawnSync(process.execPath, [bin, 'periodogram', file], { encoding: 'utf8' });
    expect(run.status).toBe(2);
    expect(run.stderr).toMatch(/^error: series\[2\]\.timeDays: duplicates the time of series\[1\]/);
    expect(run.stdout).toBe('');
  });
});

function argMax(values: ArrayLike<number>): number {
  let best = 0;
  for (let i = 1; i < values.length; i++) if (values[i] > values[best]) best = i;
  return best;
}
