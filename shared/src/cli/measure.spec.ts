import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { seededRandom } from '../science/seeded-random';
import { runCli } from './run-cli';

async function cli(...argv: string[]) {
  let stdout = '';
  let stderr = '';
  const code = await runCli(argv, { stdout: (t) => (stdout += t), stderr: (t) => (stderr += t) });
  return { code, stdout, stderr, json: code === 0 && stdout.startsWith('{') ? JSON.parse(stdout) : undefined };
}

/** A seeded two-node season at 5.3 d (mag, BJD), nights of 3 visits, node N2 0.03 mag fainter. */
function seasonCsv(timeColumn: 'bjd' | 'mjd', extra = ''): string {
  const r = seededRandom(21);
  const lines = [`# synthetic season, 5.3-d period${extra ? '' : ''}`, `${timeColumn},mag,error,node${extra ? ',target' : ''}`];
  for (let night = 0; night < 50; night++) {
    for (const [node, lon, zp] of [
      ['N1', 0, 0],
      ['N2', 0.4, 0.03],
    ] as const) {
      if (r.next() < 0.3) continue;
      for (let k = 0; k < 3; k++) {
        const bjd = 2460700.6 + night + lon + 0.08 * k + 0.01 * r.next();
        const mag = 12 + zp + 0.006 * Math.sin((2 * Math.PI * bjd) / 5.3) + r.normal(0, 0.003);
        const t = timeColumn === 'bjd' ? bjd.toFixed(6) : (bjd - 2400000.5).toFixed(6);
        lines.push(`${t},${mag.toFixed(5)},0.003,${node}${extra ? `,${extra}` : ''}`);
      }
    }
  }
  return lines.join('\n');
}

describe('spincycle measure', () => {
  let dir = '';
  beforeAll(() => {
    dir = mkdtempSync(join(tmpdir(), 'spincycle-measure-'));
  });
  afterAll(() => rmSync(dir, { recursive: true, force: true }));
  const file = (name: string, text: string) => {
    const path = join(dir, name);
    writeFileSync(path, text);
    return path;
  };

  it('is listed and has a usage text with an example', async () => {
    expect((await cli('--help')).stdout).toMatch(/\n {2}measure +rotation period/);
    const r = await cli('measure', '--help');
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^Usage: spincycle measure FILE\.csv/);
    expect(r.stdout).toMatch(/Example:/);
  });

  it('measures a two-node season: verdict, period within 3σ, amplitude, node zero points, age; no charts by default', async () => {
    const r = await cli(
      'measure',
      file('season.csv', seasonCsv('bjd')),
      '--bv',
      '0.85',
      '--expected-period',
      '5',
      '--expected-low',
      '3.5',
      '--expected-high',
      '7',
    );
    expect(r.code).toBe(0);
    const s = r.json.summary;
    expect(s.verdict).toBe('measured');
    // Injected 5.3 d in this test; the measured period must lie within 3σ of it.
    expect(Math.abs(s.periodDays - 5.3)).toBeLessThanOrEqual(3 * s.periodUncertaintyDays);
    expect(s.semiAmplitudeMmag).toBeGreaterThan(4.5);
    expect(s.semiAmplitudeMmag).toBeLessThan(7.5);
    expect(s.ageMyr).toBeGreaterThan(0);
    expect(r.json.input.nodes).toEqual(['N1', 'N2']);
    const zp = Object.fromEntries(r.json.detrend.offsets.map((o: { label: string; value: number }) => [o.label, o.value]));
    expect(zp['node N2'] - zp['node N1']).toBeCloseTo(0.03, 2);
    expect(r.json.charts).toBeUndefined();
    expect(r.json.expected.from).toBe('the command line');
  });

  it('converts MJD (UTC) with --ra/--dec, and refuses UTC times without them', async () => {
    const path = file('season-mjd.csv', seasonCsv('mjd'));
    const ok = await cli(
      'measure',
      path,
      '--ra',
      '150.25',
      '--dec',
      '20.5',
      '--charts',
      '--offsets',
      'node_night',
      '--clip',
      'none',
      '--bin',
      '30',
    );
    expect(ok.code).toBe(0);
    expect(ok.json.input.timeSystems).toEqual(['mjd_utc']);
    expect(ok.json.charts.periodogram.power.length).toBeGreaterThan(0);
    expect(ok.json.detrend.options).toEqual({ offsets: 'node_night', clipSigma: null, binMinutes: 30 });
    const bad = await cli('measure', path);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/^error: raDeg: the times are UTC/);
  });

  it('lists every problem of the file with its row and column, exit 2', async () => {
    const path = file('bad.csv', 'bjd,mag\n2460700.1,12\nnoon,12\n2460700.3,99\n');
    const r = await cli('measure', path);
    expect(r.code).toBe(2);
    expect(r.stderr).toBe(
      `error: file: 2 problems in ${path}:\n  row 2, bjd: "noon" is not a number (BJD (TDB), days)\n  row 3, mag: "99" is outside the magnitudes accepted (-5 to 30); is it a flux?\n`,
    );
    expect(r.stdout).toBe('');
  });

  it('takes the rows of one target with --target, and asks for it when the file names targets', async () => {
    const path = file('targets.csv', seasonCsv('bjd', 'Star D-4'));
    const ask = await cli('measure', path);
    expect(ask.code).toBe(2);
    expect(ask.stderr).toMatch(/choose the target with --target NAME/);
    const r = await cli('measure', path, '--target', 'star d-4');
    expect(r.code).toBe(0);
    expect(r.json.input.points).toBeGreaterThan(100);
    const none = await cli('measure', path, '--target', 'Star E-1');
    expect(none.code).toBe(2);
    expect(none.stderr).toMatch(/no rows of Star E-1/);
  });

  it.each([
    [['--offsets', 'nightly'], /^error: offsets: offsets must be none, node or node_night/],
    [['--clip', '1'], /^error: clipSigma: Clip at 2σ or more/],
    [['--bin', 'x'], /^error: binMinutes: must be a number/],
    [['--time-system', 'gps'], /^error: timeSystem: must be one of/],
    [['--ra', '10'], /give both --ra and --dec/],
    [['--age', '600'], /--age needs a colour/],
    [['--expected-period', '5', '--expected-low', '6'], /^error: expectedLowDays: must be positive and at most/],
  ])('rejects %j with exit 2', async (args, message) => {
    const r = await cli('measure', file('ok.csv', seasonCsv('bjd')), ...args);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(message);
  });

  it('gives the expected period from --age and the colour (Barnes 2007)', async () => {
    const r = await cli('measure', file('age.csv', seasonCsv('bjd')), '--bv', '0.85', '--age', '300');
    expect(r.code).toBe(0);
    expect(r.json.expected.from).toBe('Barnes (2007) at 300 Myr');
  });
});
