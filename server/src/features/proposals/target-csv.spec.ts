import { AppError } from '../../http/app-error';
import { decodeCsvText, escapeFormulaCell, EXAMPLE_TARGET_CSV, readTargetCsv, writeTargetCsv } from './target-csv';

const HEADER = 'name,ra,dec,magnitude,band,colour,colour_system,ebv,age_myr,age_err_myr,period_precision_d,period,period_error,notes';

describe('readTargetCsv', () => {
  it('reads the example list: 9 rows, no problems, both colour systems, empty optional cells as null', () => {
    const { rows, errors } = readTargetCsv(EXAMPLE_TARGET_CSV);
    expect(errors).toEqual([]);
    expect(rows).toHaveLength(9);
    expect(rows[0]).toEqual({
      row: 1,
      values: expect.objectContaining({ name: 'Lantern 12', colourSystem: 'BPRP', reddeningEbv: 0.02, periodPrecisionDays: null, periodDays: null, periodUncertaintyDays: null }),
    });
    expect(rows[3].values).toMatchObject({ name: 'Lantern 58', periodDays: 0.62, periodUncertaintyDays: 0.05 });
    expect(rows[2].values.raDeg).toBeCloseTo(163.508333, 5);
    expect(rows[2].values.decDeg).toBeCloseTo(32.086389, 5);
    expect(new Set(rows.map((r) => r.values.colourSystem))).toEqual(new Set(['BV', 'BPRP']));
  });

  it('accepts a tab-separated file and header names with spaces or capitals', () => {
    const text = [HEADER.replace('colour_system', 'Colour System').replace(/,/g, '\t'), 'Star T-1\t10\t-10\t11\tv\t0.7\tbv\t\t900\t\t\t\t\t'].join('\n');
    const { rows, errors } = readTargetCsv(text);
    expect(errors).toEqual([]);
    expect(rows[0].values).toMatchObject({ name: 'Star T-1', magnitudeBand: 'V', colourSystem: 'BV', decDeg: -10 });
  });

  it('reports every problem of a row with its column, and a name listed twice at its second row', () => {
    const text = [HEADER, 'Star A,10,100,x,V,1,BPRP,,0,,,,,', 'Star B,10,10,11,V,1,BPRP,,500,,,,,', 'star a,10,10,11,V,1,BPRP,,500,,,,,'].join('\n');
    const { rows, errors } = readTargetCsv(text);
    expect(rows.map((r) => r.values.name)).toEqual(['Star B']);
    expect(errors).toEqual([
      { row: 1, field: 'dec', message: expect.stringContaining('got 100') },
      { row: 1, field: 'magnitude', message: '"x" is not a number' },
      { row: 1, field: 'age_myr', message: 'age must be positive (got 0)' },
      { row: 3, field: 'name', message: '“star a” is listed twice (also on row 1)' },
    ]);
  });

  it('refuses a file without rows, with too many rows, or without its required columns', () => {
    expect(() => readTargetCsv('  \n ')).toThrow(AppError);
    expect(() => readTargetCsv(`${HEADER}\n`)).toThrow(/header row but no targets/);
    expect(() => readTargetCsv([HEADER, 'a,1,1,1,V,1,BV,,1,,,,,', 'b,1,1,1,V,1,BV,,1,,,,,'].join('\n'), 1)).toThrow(/The list has 2 targets; a proposal holds at most 1/);
    expect(() => readTargetCsv('name,ra,dec\nx,1,1')).toThrow(/missing required columns magnitude, band, colour, colour_system, age_myr/);
  });
});

describe('decodeCsvText', () => {
  it('drops a UTF-8 byte-order mark and refuses UTF-16 and Latin-1', () => {
    expect(decodeCsvText(Buffer.from('\ufeffname', 'utf8'), 'a.csv')).toBe('name');
    expect(() => decodeCsvText(Buffer.from('\ufeffname', 'utf16le'), 'b.csv')).toThrow(/“b.csv” is not UTF-8 text \(it is UTF-16\)/);
    expect(() => decodeCsvText(Buffer.from('name\n\xc9toile', 'latin1'), 'c.csv')).toThrow(/line 2 has bytes that are not UTF-8/);
  });
});

describe('escapeFormulaCell and writeTargetCsv', () => {
  it('escapes = + - @ tab and CR at the start of text cells only', () => {
    for (const s of ['=1+1', '+1', '-1', '@SUM(A1)', '\tx', '\rx']) expect(escapeFormulaCell(s)).toBe(`'${s}`);
    expect(escapeFormulaCell('Star 1 = bright')).toBe('Star 1 = bright');
    const csv = writeTargetCsv([
      { name: '-Star', raDeg: 1, decDeg: -5, magnitude: 10, magnitudeBand: 'V', colour: 0.6, colourSystem: 'BV', reddeningEbv: null, ageMyr: 100, ageUncertaintyMyr: null, periodPrecisionDays: null, periodDays: null, periodUncertaintyDays: null, notes: '' },
      { name: 'Star M', raDeg: 2, decDeg: 5, magnitude: 14, magnitudeBand: 'G', colour: 3.1, colourSystem: 'BPRP', reddeningEbv: null, ageMyr: 800, ageUncertaintyMyr: null, periodPrecisionDays: null, periodDays: 0.5, periodUncertaintyDays: 0.02, notes: '' },
    ]);
    expect(csv).toBe(`${HEADER}\r\n'-Star,1,-5,10,V,0.6,BV,,100,,,,,\r\nStar M,2,5,14,G,3.1,BPRP,,800,,,0.5,0.02,\r\n`);
  });
});
