/**
 * `spincycle windows` end to end: the real entry point spawned with tsx, as a user runs it.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';

const REPO = resolve(__dirname, '../../..');

function cli(args: string[]) {
  const run = spawnSync('npx', ['tsx', 'shared/src/cli/main.ts', 'windows', ...args], { cwd: REPO, encoding: 'utf8' });
  return { code: run.status, stdout: run.stdout, stderr: run.stderr };
}

describe('spincycle windows (CLI)', () => {
  jest.setTimeout(120_000);
  let dir: string;
  beforeAll(() => {
    dir = mkdtempSync(join(tmpdir(), 'sky-cli-'));
  });
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('prints darkness edges, usable hours and summaries as JSON for a targets CSV with mixed notations', () => {
    const csv = join(dir, 'targets.csv');
    writeFileSync(csv, 'name,ra,dec\nStar A-17,18:36:56.336,+38:47:01.28\nField B-2,12.5h,−05°20′30″\nDeep South,95.99,-52.7\n');
    // SCIENCE.md §8 check site (#11/#12): astronomical dusk of the night of 2024-06-21 is 04:15:53 UTC.
    const { code, stdout, stderr } = cli([
      '--lat',
      '31.9583',
      '--lon',
      '-111.5967',
      '--elevation',
      '2096',
      '--tz',
      'America/Phoenix',
      '--from',
      '2024-06-21',
      '--to',
      '2024-06-23',
      '--alt-limit',
      '30',
      '--targets',
      csv,
    ]);
    expect(stderr).toBe('');
    expect(code).toBe(0);
    const out = JSON.parse(stdout);
    expect(out.nights).toHaveLength(3);
    expect(out.nights[0].darkStartUtc).toBe('2024-06-22T04:15:53Z');
    expect(out.targets.map((t: { name: string }) => t.name)).toEqual(['Star A-17', 'Field B-2', 'Deep South']);
    const vega = out.targets[0];
    expect(vega.raDeg).toBeCloseTo(279.23473, 4);
    expect(vega.summary.usableNights).toBe(3);
    expect(vega.nights[0].usableHours).toBeGreaterThan(6);
    expect(vega.nights[0].altitudeAtMidDarkDeg).toBeGreaterThan(70);
    expect(vega.nights[0].intervals[0].startUtc).toBe('2024-06-22T04:15:53Z');
    expect(out.targets[2].summary.visibility).toBe('never-rises');
  });

  it('adds a cadence assessment when a requirement is given, and can leave out the nights', () => {
    const { code, stdout } = cli([
      '--lat',
      '-30.2',
      '--lon',
      '-70.8',
      '--tz',
      'America/Santiago',
      '--from',
      '2025-03-01',
      '--to',
      '2025-05-29',
      '--alt-limit',
      '30',
      '--ra',
      '10:00:00',
      '--dec',
      '-30',
      '--name',
      'Star C-3',
      '--summary-only',
      '--visits-per-night',
      '2',
      '--visit-hours',
      '0.25',
      '--cadence-days',
      '2',
      '--baseline-days',
      '60',
      '--total-visits',
      '60',
      '--weather-loss',
      '0.3',
    ]);
    expect(code).toBe(0);
    const target = JSON.parse(stdout).targets[0];
    expect(target.nights).toBeUndefined();
    expect(target.assessment.fits).toBe(true);
    expect(target.assessment.verdict).toMatch(/^\d+ of 90 nights can hold the 2 visits; no gap; cadence fits$/);
  });

  it('refuses bad input with exit code 2 and a message naming the field and the CSV line', () => {
    const csv = join(dir, 'bad.csv');
    writeFileSync(csv, 'name,ra,dec\nA,10,20\nB,25:00:00,10\n');
    const bad = cli([
      '--lat',
      '10',
      '--lon',
      '0',
      '--tz',
      'UTC',
      '--from',
      '2025-03-01',
      '--to',
      '2025-03-02',
      '--alt-limit',
      '30',
      '--targets',
      csv,
    ]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/targets\[1\]\.ra: right ascension must be below 24 h, got 25:00:00 \(line 3 of .*bad\.csv\)/);
    const order = cli([
      '--lat',
      '10',
      '--lon',
      '0',
      '--tz',
      'UTC',
      '--from',
      '2025-03-05',
      '--to',
      '2025-03-02',
      '--alt-limit',
      '30',
      '--ra',
      '1',
      '--dec',
      '2',
    ]);
    expect(order.code).toBe(2);
    expect(order.stderr).toMatch(/campaign\.lastNight: must not be before/);
  });
});
