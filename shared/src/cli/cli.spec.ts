import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from './run-cli';

/** Runs the CLI in-process and captures its output. */
async function cli(...argv: string[]) {
  let stdout = '';
  let stderr = '';
  const code = await runCli(argv, { stdout: (t) => (stdout += t), stderr: (t) => (stderr += t) });
  return { code, stdout, stderr, json: code === 0 && stdout.startsWith('{') ? JSON.parse(stdout) : undefined };
}

const BIN = join(__dirname, '..', '..', 'bin', 'spincycle.mjs');

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

  it('prints each command\'s usage with --help', async () => {
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

    it('rejects a colour outside all relations, exit 2', async () => {
      const r = await cli('age', '--bprp', '0.2', '--period', '10');
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(/^error: colour.value: BP−RP 0.2 is outside all supported relations/);
    });
  });

  describe('plan', () => {
    it('explains every number of the plan on the default node', async () => {
      const r = await cli('plan', '--name', 'Star A-17', '--bprp', '1.1', '--age', '800', '--age-error', '100', '--mag', '11.5', '--band', 'G');
      expect(r.code).toBe(0);
      expect(r.json.targetName).toBe('Star A-17');
      expect(r.json.quantities.visits.value).toBeGreaterThan(0);
      expect(r.json.quantities.feeMinor.unit).toBe('eur minor units');
      expect(typeof r.json.quantities.baselineDays.why).toBe('string');
    });

    it('reads the node and site from JSON files', async () => {
      const nodeFile = join(dir, 'node.json');
      writeFileSync(nodeFile, JSON.stringify({ node: { apertureM: 1, band: 'R', currency: 'usd' }, site: { elevationM: 100 } }));
      const r = await cli('plan', '--bv', '0.9', '--age', '2000', '--mag', '12', '--node', nodeFile);
      expect(r.code).toBe(0);
      expect(r.json).toMatchObject({ nodeBand: 'R', currency: 'usd', relation: 'barnes2007' });
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
