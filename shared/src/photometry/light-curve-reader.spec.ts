import { LIGHT_CURVE_LIMITS } from './photometry';
import { LightCurveReader, type ReaderOptions, mergeTargetSeries } from './light-curve-reader';
import { MJD_OFFSET, parseIsoUtc, toBjdTdb } from '../science/rotation/time-systems';

const TARGETS = [
  { id: 11, name: 'Star A-17', raDeg: 120.5, decDeg: -30.2 },
  { id: 12, name: 'Star B-3', raDeg: 250.1, decDeg: 45.0 },
];

function read(lines: string[][], options: Partial<ReaderOptions> = {}) {
  const reader = new LightCurveReader({ fileName: 'night.csv', targets: TARGETS, ...options });
  const [header, ...rows] = lines;
  reader.header(header);
  rows.forEach((r, i) => reader.row(r, i + 1));
  return reader.finish();
}

const one = (header: string[], row: string[], options: Partial<ReaderOptions> = { targetId: 11 }) => read([header, row], options);

describe('LightCurveReader', () => {
  it('reads a BJD file of one target with errors and nodes', () => {
    const r = read(
      [
        ['BJD', 'Mag', 'Error', 'Node'],
        ['2460500.1', '11.30', '0.003', 'n1'],
        ['2460500.2', '11.31', '0.003', 'N2'],
      ],
      { targetId: 11, nodeCodes: ['N1', 'N2'] },
    );
    expect(r.errors).toEqual([]);
    expect(r.errorCount).toBe(0);
    expect(r.series).toHaveLength(1);
    const s = r.series[0];
    expect(s.targetId).toBe(11);
    expect(Array.from(s.bjd)).toEqual([2460500.1, 2460500.2]);
    expect(Array.from(s.values)).toEqual([11.3, 11.31]);
    expect(Array.from(s.errors ?? [])).toEqual([0.003, 0.003]);
    // Codes are given back as the network spells them.
    expect(s.nodes).toEqual(['N1', 'N2']);
    expect(s.timeSystems).toEqual(['bjd_tdb']);
    expect(s.valueKind).toBe('mag');
  });

  it('splits a file by its target column (names trimmed, any case) and has no errors array without an error column', () => {
    const r = read(
      [
        ['time', 'flux', 'target'],
        ['2460500.1', '1.01', ' star a-17 '],
        ['2460500.2', '0.99', 'STAR B-3'],
        ['2460500.3', '1.00', 'Star A-17'],
      ],
      { timeSystem: 'bjd_tdb' },
    );
    expect(r.errors).toEqual([]);
    expect(r.series.map((s) => [s.targetId, s.bjd.length])).toEqual([
      [11, 2],
      [12, 1],
    ]);
    expect(r.series[0].errors).toBeNull();
    expect(r.series[0].valueKind).toBe('flux');
  });

  it('converts MJD (UTC) as JD − 2400000.5 and then to BJD (TDB) with the target’s coordinates', () => {
    // MJD = JD − 2400000.5 (definition; SCIENCE.md, photometry.ts).
    const mjd = 60500.25;
    const r = one(['mjd', 'mag'], [String(mjd), '11']);
    const expected = toBjdTdb(new Float64Array([mjd + MJD_OFFSET]), 120.5, -30.2)[0];
    expect(r.series[0].bjd[0]).toBe(expected);
    expect(r.series[0].timeSystems).toEqual(['mjd_utc']);
    const jd = one(['jd', 'mag'], [String(mjd + 2400000.5), '11']);
    expect(jd.series[0].bjd[0]).toBeCloseTo(expected, 9);
    const iso = one(['utc', 'mag'], ['2024-07-07T06:00:00Z', '11']);
    expect(iso.series[0].bjd[0]).toBeCloseTo(
      toBjdTdb(new Float64Array([parseIsoUtc('2024-07-07T06:00:00Z') as number]), 120.5, -30.2)[0],
      9,
    );
    // The BJD differs from the JD(UTC) by the leap seconds + 32.184 s and at most ≈ 8.3 min of light time.
    expect(Math.abs((jd.series[0].bjd[0] - (mjd + 2400000.5)) * 86400)).toBeLessThan(500 + 70);
  });

  it('takes the time system from a time_system column per row', () => {
    const r = read(
      [
        ['time', 'mag', 'time_system'],
        ['2460500.5', '11', 'bjd_tdb'],
        ['60500.0', '11', 'mjd_utc'],
        ['2024-07-08T00:00:00Z', '11', 'iso_utc'],
      ],
      { targetId: 11 },
    );
    expect(r.errors).toEqual([]);
    expect(r.series[0].timeSystems).toEqual(['bjd_tdb', 'mjd_utc', 'iso_utc']);
    expect(r.series[0].bjd[0]).toBe(2460500.5);
  });

  describe('header problems (row 0, field header)', () => {
    it.each([
      [['when', 'mag'], { targetId: 11 }, /no time column \(found: when, mag\)/],
      [['bjd', 'brightness'], { targetId: 11 }, /no value column/],
      [['bjd', 'mag', 'flux'], { targetId: 11 }, /both a mag and a flux column/],
      [['time', 'mag'], { targetId: 11 }, /nothing says how it counts/],
      [['bjd', 'value'], { targetId: 11 }, /choose magnitudes or relative flux/],
      [['bjd', 'mag'], {}, /no target column/],
      [['bjd', 'mag'], { targetId: 99 }, /target 99 is not a target of this proposal/],
    ])('%j %j', (header, options, message) => {
      const r = read([header, ['2460500.1', '11']], options as Partial<ReaderOptions>);
      expect(r.errors.length).toBeGreaterThan(0);
      expect(r.errors[0]).toMatchObject({ file: 'night.csv', row: 0, field: 'header' });
      expect(r.errors.map((e) => e.message).join('\n')).toMatch(message);
      expect(r.series).toEqual([]);
    });

    it('accepts `value` with the form’s value kind and `time` with the form’s time system', () => {
      const r = one(['time', 'value'], ['60500.1', '1.2'], { targetId: 11, timeSystem: 'mjd_utc', valueKind: 'flux' });
      expect(r.errors).toEqual([]);
      expect(r.series[0].valueKind).toBe('flux');
    });

    it('says so when the file has no rows, or no header', () => {
      expect(read([['bjd', 'mag']], { targetId: 11 }).errors[0].message).toMatch(/no data rows/);
      const reader = new LightCurveReader({ fileName: 'x.csv', targets: TARGETS, targetId: 11 });
      expect(reader.finish().errors[0].message).toMatch(/empty/);
    });
  });

  describe('row problems name the row, the column and what was found', () => {
    it.each([
      [
        ['utc', 'mag'],
        ['2024-13-01T00:00Z', '11'],
        'utc',
        'row 1, utc: "2024-13-01T00:00Z" is not a date and time (use ISO 8601 UTC, e.g. 2026-03-14T02:31:07Z)',
      ],
      [['utc', 'mag'], ['2024-02-30T00:00Z', '11'], 'utc', /is not a date and time/],
      [['bjd', 'mag'], ['abc', '11'], 'bjd', 'row 1, bjd: "abc" is not a number (BJD (TDB), days)'],
      [['bjd', 'mag'], ['1e999', '11'], 'bjd', /is not a finite number/],
      [['bjd', 'mag'], ['NaN', '11'], 'bjd', /is not a number/],
      [['bjd', 'mag'], ['2460500.1', 'x'], 'mag', 'row 1, mag: "x" is not a number'],
      [['bjd', 'mag'], ['2460500.1', 'Infinity'], 'mag', /is not a number/],
      [['bjd', 'mag', 'error'], ['2460500.1', '11', '0'], 'error', /"0" is not positive/],
      [['bjd', 'mag', 'error'], ['2460500.1', '11', '-0.01'], 'error', /is not positive/],
      [['bjd', 'mag', 'error'], ['2460500.1', '11', 'n/a'], 'error', /is not a number/],
      [['bjd', 'flux'], ['2460500.1', '0'], 'flux', /"0" is not a positive flux/],
      [['bjd', 'flux'], ['2460500.1', '-3'], 'flux', /is not a positive flux/],
      [['bjd', 'mag'], ['2460500.1', '31'], 'mag', /outside the magnitudes accepted \(-5 to 30\)/],
      [['bjd', 'mag'], ['2460500.1', '-6'], 'mag', /outside the magnitudes accepted/],
      [['jd', 'mag'], ['60500.1', '11'], 'jd', /too small for a JD: it is probably an MJD/],
      [['mjd', 'mag'], ['2460500.1', '11'], 'mjd', /too large for an MJD: it is probably a JD/],
      [['bjd', 'mag'], ['60500.1', '11'], 'bjd', /too small for a BJD/],
      [['jd', 'mag'], ['2440000.5', '11'], 'jd', /before 1990 or after 2100/],
      [['bjd', 'mag'], ['2490000.5', '11'], 'bjd', /before 1990 or after 2100/],
      [['utc', 'mag'], ['1989-12-31T23:00:00Z', '11'], 'utc', /before 1990 or after 2100/],
      [['bjd', 'mag'], ['', '11'], 'bjd', /empty; every row needs the time/],
      [['bjd', 'mag'], ['2460500.1', ' '], 'mag', /empty; every row needs a magnitude/],
      [['bjd', 'mag', 'error'], ['2460500.1', '11', ''], 'error', /error: empty/],
      [['bjd', 'mag', 'time_system'], ['2460500.1', '11', 'gps'], 'time_system', /"gps" is not one of bjd_tdb, jd_utc, mjd_utc, iso_utc/],
      [['time', 'mag', 'time_system'], ['2460500.1', '11', ''], 'time_system', /empty, and nothing else says how the time counts/],
    ])('%j %j → %s', (header, row, field, message) => {
      const r = one(header, row);
      expect(r.errorCount).toBe(1);
      expect(r.errors[0]).toMatchObject({ file: 'night.csv', row: 1, field });
      if (typeof message === 'string') expect(r.errors[0].message).toBe(message);
      else expect(r.errors[0].message).toMatch(message);
      expect(r.series).toEqual([]);
    });

    it('reports an unknown target name and an empty target cell', () => {
      const r = read([
        ['bjd', 'mag', 'target'],
        ['2460500.1', '11', 'Star Z-9'],
        ['2460500.2', '11', ''],
      ]);
      expect(r.errors.map((e) => [e.row, e.field, e.message])).toEqual([
        [1, 'target', 'row 1, target: "Star Z-9" is not a target of this proposal'],
        [2, 'target', 'row 2, target: empty; give the target’s name as in the proposal'],
      ]);
    });

    it('uses the form’s target for rows whose target cell is empty', () => {
      const r = read(
        [
          ['bjd', 'mag', 'target'],
          ['2460500.1', '11', ''],
        ],
        { targetId: 12 },
      );
      expect(r.errors).toEqual([]);
      expect(r.series[0].targetId).toBe(12);
    });

    it('reports an unknown node code only when the codes are known', () => {
      const bad = one(['bjd', 'mag', 'node'], ['2460500.1', '11', 'Q7'], { targetId: 11, nodeCodes: ['N1'] });
      expect(bad.errors[0]).toMatchObject({
        row: 1,
        field: 'node',
        message: 'row 1, node: "Q7" is not the code of a node of this network',
      });
      const any = one(['bjd', 'mag', 'node'], ['2460500.1', '11', 'Q7'], { targetId: 11 });
      expect(any.errors).toEqual([]);
      expect(any.series[0].nodes).toEqual(['Q7']);
    });

    it('reports a row with too few fields', () => {
      const r = one(['bjd', 'error', 'mag'], ['2460500.1', '0.01']);
      expect(r.errors[0]).toMatchObject({ row: 1, field: 'row' });
      expect(r.errors[0].message).toBe('row 1: 2 fields, but the bjd and mag columns need at least 3');
    });

    it('collects every problem of a row, and of every row, still reads the rows without problems', () => {
      const r = read(
        [
          ['bjd', 'mag', 'error'],
          ['x', 'y', '-1'],
          ['2460500.1', '11', '0.01'],
          ['2460500.2', '40', '0.01'],
        ],
        { targetId: 11 },
      );
      expect(r.errors.map((e) => [e.row, e.field])).toEqual([
        [1, 'bjd'],
        [1, 'mag'],
        [1, 'error'],
        [3, 'mag'],
      ]);
      expect(r.errorCount).toBe(4);
      // The good row is still read (the caller refuses the upload when errorCount > 0).
      expect(r.series[0].bjd.length).toBe(1);
    });

    it('lists the first maxListedErrors problems and counts all', () => {
      const rows = [['bjd', 'mag']];
      for (let i = 0; i < 250; i++) rows.push(['bad', '11']);
      const r = read(rows, { targetId: 11 });
      expect(r.errorCount).toBe(250);
      expect(r.errors).toHaveLength(LIGHT_CURVE_LIMITS.maxListedErrors);
      expect(r.errors[0].row).toBe(1);
      expect(r.errors[199].row).toBe(200);
    });

    it('reports too many points for one target once', () => {
      const reader = new LightCurveReader({ fileName: 'big.csv', targets: TARGETS, targetId: 11 });
      reader.header(['bjd', 'mag']);
      const max = LIGHT_CURVE_LIMITS.maxPointsPerTarget;
      for (let i = 1; i <= max + 5; i++) reader.row([String(2460500 + i * 1e-4), '11'], i);
      const r = reader.finish();
      expect(r.errorCount).toBe(1);
      expect(r.errors[0]).toMatchObject({ row: max + 1, field: 'target' });
      expect(r.errors[0].message).toMatch(/Star A-17 has more than 200,000 points/);
    });
  });

  it('reads 10⁵ rows of ISO times into one series', () => {
    const reader = new LightCurveReader({ fileName: 'season.csv', targets: TARGETS, targetId: 12 });
    reader.header(['utc', 'flux', 'error', 'node']);
    const start = Date.parse('2025-03-01T00:00:00Z');
    for (let i = 0; i < 100_000; i++) {
      const iso = new Date(start + i * 60_000).toISOString();
      reader.row([iso, String(1 + 0.01 * Math.sin(i / 1000)), '0.002', i % 2 ? 'N1' : 'N2'], i + 1);
    }
    const r = reader.finish();
    expect(r.errorCount).toBe(0);
    expect(r.series[0].bjd.length).toBe(100_000);
    // Consecutive minutes stay one minute apart in BJD (the Rømer delay changes by < 0.01 s per minute).
    expect((r.series[0].bjd[1] - r.series[0].bjd[0]) * 1440).toBeCloseTo(1, 4);
  });

  it('merges the series of several files target by target, refusing mixed value kinds', () => {
    const a = one(['bjd', 'mag', 'error'], ['2460500.1', '11', '0.01']).series;
    const b = one(['bjd', 'mag'], ['2460501.1', '11.1']).series;
    const c = one(['bjd', 'flux'], ['2460502.1', '1.1'], { targetId: 12 }).series;
    const d = one(['bjd', 'mag'], ['2460502.1', '11'], { targetId: 12 }).series;
    const merged = mergeTargetSeries([...a, ...b, ...c, ...d]);
    expect(merged.mixedValueKinds).toEqual([12]);
    expect(merged.series).toHaveLength(1);
    expect(Array.from(merged.series[0].bjd)).toEqual([2460500.1, 2460501.1]);
    // One file without errors: the merged series has none.
    expect(merged.series[0].errors).toBeNull();
  });
});
