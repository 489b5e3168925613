import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { seededRandom } from '../science/seeded-random';
import { runCli } from './run-cli';

/** Runs the CLI in-process and captures its output. */
async function cli(...argv: string[]) {
  let stdout = '';
  let stderr = '';
  const code = await runCli(argv, { stdout: (t) => (stdout += t), stderr: (t) => (stderr += t) });
  return { code, stdout, stderr, json: code === 0 && stdout.startsWith('{') ? JSON.parse(stdout) : undefined };
}

const BIN = join(__dirname, '..', '..', 'bin', 'spincycle.mjs');
const REPO = join(__dirname, '..', '..', '..');

/** Splits a documented command line into arguments (double quotes group words). */
function shellWords(line: string): string[] {
  return [...line.matchAll(/"([^"]*)"|(\S+)/g)].map((m) => m[1] ?? m[2]);
}

/**
 * The `console` blocks of a Markdown file whose command (after `$ `) starts with `prefix`:
 * the CLI arguments after `prefix` and the documented output (the block's other lines).
 */
function documentedExamples(file: string, prefix: string): { argv: string[]; output: string }[] {
  const text = readFileSync(join(REPO, file), 'utf8');
  const out: { argv: string[]; output: string }[] = [];
  for (const block of text.matchAll(/```console\n([\s\S]*?)```/g)) {
    const [first, ...rest] = block[1].split('\n');
    if (first.startsWith(`$ ${prefix}`)) out.push({ argv: shellWords(first.slice(2 + prefix.length)), output: rest.join('\n') });
  }
  return out;
}

describe('spincycle CLI', () => {
  let dir = '';
  beforeAll(() => {
    dir = mkdtempSync(join(tmpdir(), 'spincycle-cli-'));
  });
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('lists the commands with --help and exits 0', async () => {
    const r = await cli('--help');
    expect(r.code).toBe(0);
    for (const name of ['period', 'age', 'plan', 'periodogram']) expect(r.stdout).toMatch(new RegExp(`\\n  ${name} `));
  });

  it("prints each command's usage with --help", async () => {
    for (const name of ['period', 'age', 'plan', 'periodogram']) {
      const r = await cli(name, '--help');
      expect(r.code).toBe(0);
      expect(r.stdout).toMatch(new RegExp(`^Usage: spincycle ${name}`));
      expect(r.stdout).toMatch(/Example:/);
    }
  });

  it('rejects an unknown command with exit 2', async () => {
    const r = await cli('orbit');
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/^error: unknown command "orbit"/);
  });

  describe('period', () => {
    it('returns the period, range and flags as JSON', async () => {
      const r = await cli('period', '--bv', '0.642', '--age', '4566', '--age-error', '500', '--relation', 'barnes2007');
      expect(r.code).toBe(0);
      expect(r.json.periodDays).toBeCloseTo(26.09, 2);
      expect(r.json.rangeDays.low).toBeLessThan(26.09);
      expect(r.json.relation).toBe('barnes2007');
      expect(r.json.rossby.scale).toBe('noyes1984');
    });

    it('says what is wrong with a negative age, exit 2', async () => {
      const r = await cli('period', '--bv', '0.642', '--age', '-5');
      expect(r.code).toBe(2);
      expect(r.stderr).toBe('error: ageMyr: must be positive (got -5)\n');
      expect(r.stdout).toBe('');
    });

    it('prints periodDays null with the reason when the relation has none (age above the age of the universe, Planck Collaboration 2020), exit 0', async () => {
      const r = await cli('period', '--bv', '0.642', '--age', '15000', '--relation', 'barnes2007');
      expect(r.code).toBe(0);
      expect(r.json.periodDays).toBeNull();
      expect(r.json.reason).toMatch(/15000 Myr exceeds the age of the universe/);
      expect(r.json.noResult.code).toBe('ageBeyondUniverse');
      expect(r.json.rangeDays).toBeUndefined();
      expect(r.json.flags.find((f: { code: string }) => f.code === 'noExpectedPeriod').severity).toBe('blocking');
      const ok = await cli('period', '--bv', '0.642', '--age', '13000', '--relation', 'barnes2007');
      expect(typeof ok.json.periodDays).toBe('number');
      expect(ok.json.noResult).toBeNull();
    });

    it('reports a missing option and an unknown option as usage errors, exit 2', async () => {
      expect((await cli('period', '--bv', '0.642')).stderr).toMatch(/^error: missing --age/);
      const r = await cli('period', '--bv', '0.642', '--age', '100', '--colour', 'red');
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(/Unknown option '--colour'/);
    });
  });

  describe('age', () => {
    it('returns the age and the eq. 16 uncertainty for Barnes', async () => {
      const r = await cli('age', '--bv', '0.642', '--period', '26.09');
      expect(r.code).toBe(0);
      expect(r.json.ageMyr).toBeCloseTo(4565, 0);
      expect(r.json.fractionalUncertainty).toBeCloseTo(0.168, 3);
    });

    it('prints ageMyr null with the reason for a period below the slow sequence (Ro ≤ 0.1, Wright et al. 2011), exit 0', async () => {
      const r = await cli('age', '--bv', '0.884', '--period', '1.5');
      expect(r.code).toBe(0);
      expect(r.json.ageMyr).toBeNull();
      expect(r.json.reason).toMatch(/period 1.5 d gives Ro 0.069/);
      expect(r.json.rangeMyr).toBeUndefined();
      expect(r.json.fractionalUncertainty).toBeUndefined();
      const ok = await cli('age', '--bv', '0.884', '--period', '5');
      expect(typeof ok.json.ageMyr).toBe('number');
    });

    it('rejects a colour outside all relations, exit 2', async () => {
      const r = await cli('age', '--bprp', '0.2', '--period', '10');
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(/^error: colour.value: BP−RP 0.2 is outside all supported relations/);
    });
  });

  describe('plan', () => {
    it('explains every number of the plan on the default node', async () => {
      const r = await cli(
        'plan',
        '--name',
        'Star A-17',
        '--bprp',
        '1.1',
        '--age',
        '800',
        '--age-error',
        '100',
        '--mag',
        '11.5',
        '--band',
        'G',
      );
      expect(r.code).toBe(0);
      expect(r.json.targetName).toBe('Star A-17');
      expect(r.json.quantities.visits.value).toBeGreaterThan(0);
      expect(r.json.quantities.feeMinor.unit).toBe('eur minor units');
      expect(typeof r.json.quantities.baselineDays.why).toBe('string');
      // Each number points to the section of the methods document that derives it.
      expect(r.json.methods.completeness).toBe('docs/science.md#completeness');
      expect(Object.keys(r.json.methods).sort()).toEqual(Object.keys(r.json.quantities).sort());
      const doc = readFileSync(join(__dirname, '../../../docs/science.md'), 'utf8');
      for (const link of Object.values(r.json.methods) as string[]) expect(doc).toContain(`<a id="${link.split('#')[1]}"></a>`);
    });

    it('reads the node and site from JSON files', async () => {
      const nodeFile = join(dir, 'node.json');
      writeFileSync(nodeFile, JSON.stringify({ node: { apertureM: 1, band: 'R', currency: 'usd' }, site: { elevationM: 100 } }));
      const r = await cli('plan', '--bv', '0.9', '--age', '2000', '--mag', '12', '--node', nodeFile);
      expect(r.code).toBe(0);
      expect(r.json).toMatchObject({ nodeBand: 'R', currency: 'usd', relation: 'barnes2007' });
    });

    // docs/command-line.md, section "`plan`", the `--summary` example: its output is pasted
    // whole, so the documented numbers (quantities, analysis, flags) must be today's.
    it('prints exactly the --summary example of docs/command-line.md', async () => {
      const [example] = documentedExamples('docs/command-line.md', 'spincycle ').filter(
        (e) => e.argv[0] === 'plan' && e.argv.includes('--summary'),
      );
      expect(example.argv).toEqual(expect.arrayContaining(['plan', '--summary']));
      const r = await cli(...example.argv);
      expect(r.code).toBe(0);
      const documented = JSON.parse(example.output);
      expect(documented.quantities).toEqual(r.json.quantities);
      expect(documented.analysis).toEqual(r.json.analysis);
      expect(documented).toEqual(r.json);
      for (const key of [
        'completeness',
        'visitsForCompleteness50',
        'visitsForCompleteness90',
        'visitsForCompleteness99',
        'searchMinFrequencyPerDay',
        'searchMaxFrequencyPerDay',
      ]) {
        expect(typeof documented.quantities[key]).toBe('string');
      }
    });

    // README.md, section "Command line": the plan example is trimmed with …; every
    // "quantity": "value" pair it shows must be today's.
    it('prints the numbers of the README plan example', async () => {
      const [example] = documentedExamples('README.md', 'npm run -s cli -- ').filter((e) => e.argv[0] === 'plan');
      const r = await cli(...example.argv);
      expect(r.code).toBe(0);
      const shown = [...example.output.matchAll(/"(\w+)": "([^"]*)"/g)].filter(([, key]) => key in r.json.quantities);
      expect(shown.length).toBeGreaterThanOrEqual(8);
      for (const [, key, value] of shown) expect(`${key}: ${r.json.quantities[key]}`).toBe(`${key}: ${value}`);
      expect(example.output).toContain(`"feasible": ${r.json.feasible}`);
      // The analysis band, shown to three significant figures.
      const analysis = /"analysis": (\{[^}]*\})/.exec(example.output);
      expect(analysis).not.toBeNull();
      const shownAnalysis = JSON.parse((analysis as RegExpExecArray)[1]);
      expect(shownAnalysis).toEqual({
        series: r.json.analysis.series,
        minFrequencyPerDay: Number(r.json.analysis.minFrequencyPerDay.toPrecision(3)),
        maxFrequencyPerDay: Number(r.json.analysis.maxFrequencyPerDay.toPrecision(3)),
        falseAlarmProbability: r.json.analysis.falseAlarmProbability,
      });
    });

    it('summarises completeness, the visits for 50/90/99 % and the analysis band', async () => {
      const r = await cli('plan', '--bprp', '1.1', '--age', '800', '--mag', '11.5', '--band', 'G', '--completeness', '0.5', '--summary');
      expect(r.code).toBe(0);
      expect(r.json.quantities.requestedCompleteness).toBe('0.5');
      for (const key of ['completeness', 'visitsForCompleteness50', 'visitsForCompleteness90', 'visitsForCompleteness99'])
        expect(r.json.quantities[key]).toMatch(/^\d/);
      expect(r.json.analysis).toEqual({
        series: expect.stringMatching(/^(nightlyMeans|visits)$/),
        minFrequencyPerDay: expect.any(Number),
        maxFrequencyPerDay: expect.any(Number),
        falseAlarmProbability: 0.01,
      });
      expect(r.json.precision).toBeUndefined();
    });

    it('names the node field of a bad node file, exit 2', async () => {
      const nodeFile = join(dir, 'bad-node.json');
      writeFileSync(nodeFile, JSON.stringify({ apertureM: -0.5 }));
      const r = await cli('plan', '--bv', '0.9', '--age', '2000', '--mag', '12', '--node', nodeFile);
      expect(r.code).toBe(2);
      expect(r.stderr).toBe('error: node.apertureM: must be positive (got -0.5)\n');
    });
  });

  describe('periodogram', () => {
    it('analyses a CSV file', async () => {
      const file = join(dir, 'lc.csv');
      const lines = ['bjd flux'];
      for (let i = 0; i < 120; i++) {
        const t = i * 0.53 + 0.1 * Math.sin(i);
        lines.push(`${t} ${1 + 0.01 * Math.sin((2 * Math.PI * t) / 4.2) + 0.001 * Math.cos(7.7 * i)}`);
      }
      writeFileSync(file, lines.join('\n'));
      const r = await cli('periodogram', file, '--kind', 'flux', '--fmax', '1', '--method', 'exact', '--top', '2');
      expect(r.code).toBe(0);
      expect(r.json.best.periodDays).toBeCloseTo(4.2, 1);
      expect(r.json.best.semiAmplitudePpm).toBeCloseTo(10000, -3);
      expect(r.json.input.columns).toEqual({ time: 'bjd', value: 'flux', error: null });
      expect(r.json.peaks).toHaveLength(2);
    });

    it('rejects a file with too few rows, exit 2', async () => {
      const file = join(dir, 'short.csv');
      writeFileSync(file, '1,10\n2,11\n');
      const r = await cli('periodogram', file);
      expect(r.code).toBe(2);
      expect(r.stderr).toBe('error: series: needs at least 4 points (got 2)\n');
    });

    it('names the row of a value that is not a number', async () => {
      const file = join(dir, 'text.csv');
      writeFileSync(file, '1,10\n2,11\n3,x\n4,12\n');
      const r = await cli('periodogram', file);
      expect(r.stderr).toMatch(/^error: series\[2\]\.value: line 3: "x" is not a number/);
    });
  });

  describe('periodogram --plan', () => {
    const PERIOD = 9.3;
    /** 3 visits a night on 50 nights, relative flux: a 4000-ppm sinusoid (or none), 3000 ppm white noise, 800 ppm per night. */
    function campaignCsv(name: string, seed: number, semiAmplitude: number, withErrors = true): string {
      const rng = seededRandom(seed);
      const rows = [withErrors ? 'mjd,flux,err' : 'mjd,flux'];
      for (let night = 0; night < 50; night++) {
        const offset = rng.normal(0, 8e-4);
        for (let j = 0; j < 3; j++) {
          const t = 61000 + night + (j - 1) * 0.08 + rng.uniform(-0.02, 0.02);
          const y = 1 + semiAmplitude * Math.sin((2 * Math.PI * t) / PERIOD) + offset + rng.normal(0, 3e-3);
          rows.push(withErrors ? `${t.toFixed(5)},${y.toFixed(6)},0.003` : `${t.toFixed(5)},${y.toFixed(6)}`);
        }
      }
      const file = join(dir, name);
      writeFileSync(file, rows.join('\n'));
      return file;
    }
    let planFile = '';
    let analysis: { series: string; minFrequencyPerDay: number; maxFrequencyPerDay: number; falseAlarmProbability: number };
    beforeAll(async () => {
      const r = await cli('plan', '--bprp', '1.0', '--age', '600', '--age-error', '80', '--mag', '11', '--summary');
      expect(r.code).toBe(0);
      analysis = r.json.analysis;
      planFile = join(dir, 'plan.json');
      writeFileSync(planFile, r.stdout);
    });

    it("searches the plan's band on nightly means and says whether the peak clears the plan's false-alarm level", async () => {
      expect(analysis.minFrequencyPerDay).toBeLessThan(1 / PERIOD);
      expect(analysis.maxFrequencyPerDay).toBeGreaterThan(1 / PERIOD);
      const r = await cli('periodogram', campaignCsv('signal.csv', 7, 4e-3), '--plan', planFile, '--kind', 'flux');
      expect(r.code).toBe(0);
      expect(r.json.search).toEqual({
        minFrequencyPerDay: analysis.minFrequencyPerDay,
        maxFrequencyPerDay: analysis.maxFrequencyPerDay,
        from: 'plan',
      });
      expect(r.json.grid.maxFrequencyPerDay).toBeCloseTo(analysis.maxFrequencyPerDay, 12);
      expect(r.json.series).toEqual({ analysed: analysis.series, from: 'plan', points: 150, nights: 50, nightSigma: 'errors' });
      expect(r.json.pointCount).toBe(analysis.series === 'nightlyMeans' ? 50 : 150);
      expect(r.json.best.periodDays).toBeCloseTo(PERIOD, 0);
      expect(r.json.detection).toEqual({
        falseAlarmProbabilityLevel: analysis.falseAlarmProbability,
        from: 'plan',
        bestFalseAlarmProbability: r.json.best.falseAlarmProbability,
        detected: true,
      });
      expect(r.json.notes).toBeUndefined();
    });

    it('does not claim a detection in pure noise', async () => {
      const r = await cli('periodogram', campaignCsv('noise.csv', 11, 0), '--plan', planFile, '--kind', 'flux');
      expect(r.code).toBe(0);
      expect(r.json.detection.detected).toBe(false);
      expect(r.json.best.falseAlarmProbability).toBeGreaterThan(analysis.falseAlarmProbability);
    });

    it("lets --fmin/--fmax override the plan's band, with a note", async () => {
      const r = await cli('periodogram', campaignCsv('signal2.csv', 7, 4e-3), '--plan', planFile, '--fmax', '2', '--kind', 'flux');
      expect(r.code).toBe(0);
      expect(r.json.search.from).toBe('options');
      expect(r.json.search.minFrequencyPerDay).toBe(analysis.minFrequencyPerDay);
      expect(r.json.search.maxFrequencyPerDay).toBeCloseTo(2, 2);
      expect(r.json.notes).toEqual([expect.stringMatching(/^--fmax overrides the plan's band .* only comparable over the same band$/)]);
      // The wider band makes the same peak less significant.
      const inBand = await cli('periodogram', join(dir, 'signal2.csv'), '--plan', planFile, '--kind', 'flux');
      expect(r.json.best.falseAlarmProbability).toBeGreaterThan(inBand.json.best.falseAlarmProbability);
    });

    it('reports the default band when there is no plan, and --nightly-means from the scatter', async () => {
      const file = campaignCsv('noerr.csv', 3, 4e-3, false);
      const r = await cli('periodogram', file, '--kind', 'flux', '--top', '1');
      expect(r.json.search).toEqual({
        minFrequencyPerDay: r.json.grid.minFrequencyPerDay,
        maxFrequencyPerDay: r.json.grid.maxFrequencyPerDay,
        from: 'default',
      });
      expect(r.json.search.minFrequencyPerDay).toBeCloseTo(r.json.grid.stepPerDay / 2, 15);
      expect(r.json.search.maxFrequencyPerDay).toBeCloseTo((5 * 150) / (2 * r.json.baselineDays), 1);
      expect(r.json.series).toEqual({ analysed: 'visits', from: 'default', points: 150 });
      expect(r.json.detection).toBeUndefined();
      const n = await cli('periodogram', file, '--kind', 'flux', '--nightly-means', '--fmax', '0.4', '--fap', '0.001');
      expect(n.json.series).toMatchObject({ analysed: 'nightlyMeans', from: 'options', nights: 50, nightSigma: 'scatter' });
      expect(n.json.series.withinNightRms).toBeCloseTo(3e-3, 3);
      expect(n.json.search.from).toBe('options');
      expect(n.json.detection).toMatchObject({ falseAlarmProbabilityLevel: 0.001, from: 'options', detected: true });
    });

    it('names the plan field or option that is wrong, exit 2', async () => {
      const file = campaignCsv('e.csv', 5, 4e-3);
      const noAnalysis = join(dir, 'no-analysis.json');
      writeFileSync(noAnalysis, JSON.stringify({ quantities: {} }));
      let r = await cli('periodogram', file, '--plan', noAnalysis);
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(/^error: plan\.analysis: .*has no "analysis" object/);
      const badBand = join(dir, 'bad-band.json');
      writeFileSync(badBand, JSON.stringify({ analysis: { ...analysis, maxFrequencyPerDay: 0 } }));
      r = await cli('periodogram', file, '--plan', badBand);
      expect(r.stderr).toMatch(/^error: plan\.analysis\.maxFrequencyPerDay: must be a frequency above minFrequencyPerDay/);
      r = await cli('periodogram', file, '--plan', join(dir, 'missing.json'));
      expect(r.stderr).toMatch(/^error: plan: cannot read .*missing\.json: ENOENT/);
      r = await cli('periodogram', file, '--fap', '2');
      expect(r.code).toBe(2);
      expect(r.stderr).toBe('error: falseAlarmProbability: must be within (0, 1) (got 2)\n');
      r = await cli('periodogram', file, '--nightly-means', '--single-visits');
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(/^error: give either --nightly-means or --single-visits/);
    });
  });

  describe('launcher (shared/bin/spincycle.mjs)', () => {
    it('runs from any directory and reads stdin with "-"', () => {
      const rows = Array.from({ length: 60 }, (_, i) => `${i * 0.9 + 0.05 * Math.sin(i)},${10 + 0.02 * Math.sin(i * 0.7)}`).join('\n');
      const r = spawnSync(process.execPath, [BIN, 'periodogram', '-', '--fmax', '0.5'], { cwd: tmpdir(), input: rows, encoding: 'utf8' });
      expect(r.stderr).toBe('');
      expect(r.status).toBe(0);
      expect(JSON.parse(r.stdout).input.source).toBe('stdin');
    });

    it('exits 2 with the message on stderr for bad input', () => {
      const r = spawnSync(process.execPath, [BIN, 'period', '--bv', '0.65', '--age', '-5'], { cwd: tmpdir(), encoding: 'utf8' });
      expect(r.status).toBe(2);
      expect(r.stderr).toBe('error: ageMyr: must be positive (got -5)\n');
    });
  });
});
