import { AppError } from '../../../http/app-error';
import { decodeCsvText, escapeFormulaCell, EXAMPLE_TARGET_CSV, readTargetCsv, readTargetCsvStream, writeTargetCsv } from './target-csv';

const HEADER = 'name,ra,dec,magnitude,band,colour,colour_system,ebv,age_myr,age_err_myr,period_precision_d,period,period_error,notes';

describe('readTargetCsv', () => {
  it('reads the example list: 9 rows, no problems, both colour systems, empty optional cells as null', () => {
    const { rows, errors } = readTargetCsv(EXAMPLE_TARGET_CSV);
    expect(errors).toEqual([]);
    expect(rows).toHaveLength(9);
    expect(rows[0]).toEqual({
      row: 1,
      values: expect.objectContaining({
        name: 'Lantern 12',
        colourSystem: 'BPRP',
        reddeningEbv: 0.02,
        periodPrecisionDays: null,
        periodDays: null,
        periodUncertaintyDays: null,
      }),
    });
    expect(rows[3].values).toMatchObject({ name: 'Lantern 58', periodDays: 0.62, periodUncertaintyDays: 0.05 });
    expect(rows[2].values.raDeg).toBeCloseTo(163.508333, 5);
    expect(rows[2].values.decDeg).toBeCloseTo(32.086389, 5);
    expect(new Set(rows.map((r) => r.values.colourSystem))).toEqual(new Set(['BV', 'BPRP']));
  });

  it('accepts a tab-separated file and header names with spaces or capitals', () => {
    const text = [
      HEADER.replace('colour_system', 'Colour System').replace(/,/g, '\t'),
      'Star T-1\t10\t-10\t11\tv\t0.7\tbv\t\t900\t\t\t\t\t',
    ].join('\n');
    const { rows, errors } = readTargetCsv(text);
    expect(errors).toEqual([]);
    expect(rows[0].values).toMatchObject({ name: 'Star T-1', magnitudeBand: 'V', colourSystem: 'BV', decDeg: -10 });
  });

  it('reports every problem of a row with its column, and a name listed twice at its second row', () => {
    const text = [
      HEADER,
      'Star A,10,100,x,V,1,BPRP,,0,,,,,',
      'Star B,10,10,11,V,1,BPRP,,500,,,,,',
      'star a,10,10,11,V,1,BPRP,,500,,,,,',
    ].join('\n');
    const { rows, errors } = readTargetCsv(text);
    expect(rows.map((r) => r.values.name)).toEqual(['Star B']);
    expect(errors).toEqual([
      { row: 1, field: 'dec', message: 'Enter a declination between −90° and 90° (you typed 100).' },
      { row: 1, field: 'magnitude', message: 'Enter the magnitude as a number (you typed x).' },
      { row: 1, field: 'age_myr', message: 'Enter an age above 0 Myr and at most 14000 Myr (you typed 0).' },
      { row: 3, field: 'name', message: '“star a” is listed twice (also on row 1)' },
    ]);
  });

  it('row errors name the row and column and echo the cell as typed, every bad column of a row at once', () => {
    const text = [HEADER, 'Star C,25h,-95,4e1,Q,red,UBV,5,,-5,0,1200,,'].join('\n');
    const { rows, errors } = readTargetCsv(text);
    expect(rows).toEqual([]);
    expect(errors).toEqual([
      { row: 1, field: 'ra', message: 'Enter a right ascension between 0 and 24 h or between 0° and 360° (you typed 25h).' },
      { row: 1, field: 'dec', message: 'Enter a declination between −90° and 90° (you typed −95).' },
      { row: 1, field: 'magnitude', message: 'Enter a magnitude between −2 and 22 mag (you typed 4e1).' },
      { row: 1, field: 'band', message: 'Choose the band of the magnitude: B, V, R, I, G (you typed Q).' },
      { row: 1, field: 'colour', message: 'Enter the colour index as a number (you typed red).' },
      { row: 1, field: 'colour_system', message: 'Choose the colour system: BPRP for Gaia BP−RP or BV for B−V (you typed UBV).' },
      { row: 1, field: 'ebv', message: 'Enter an E(B−V) between 0 and 3 mag, or leave it empty (you typed 5).' },
      { row: 1, field: 'age_myr', message: 'Enter the age.' },
      { row: 1, field: 'age_err_myr', message: 'Enter an age uncertainty of 0 Myr or more, or leave it empty (you typed −5).' },
      { row: 1, field: 'period_precision_d', message: 'Enter a period precision above 0 d, or leave it empty (you typed 0).' },
      { row: 1, field: 'period', message: 'Enter a period between 0.05 and 1000 d, or leave it empty (you typed 1200).' },
    ]);
  });

  it('a colour implausible for its system is stored with a note on its row, not refused', () => {
    const text = [HEADER, 'Star N-1,10,10,11,V,2.5,BV,,900,,,,,', 'Star N-2,10,10,11,G,1.2,BPRP,,900,,,,,'].join('\n');
    const { rows, errors, notes } = readTargetCsv(text);
    expect(errors).toEqual([]);
    expect(rows).toHaveLength(2);
    expect(notes).toEqual([
      {
        row: 1,
        field: 'colour',
        message:
          'A B−V of 2.5 mag is outside the F5V–M5V dwarfs (between 0.44 and 1.83 mag), but a plausible BP−RP: check the colour system.',
      },
    ]);
    expect(readTargetCsv(EXAMPLE_TARGET_CSV).notes).toEqual([]);
  });

  it('refuses a file without rows, with too many rows, or without its required columns', () => {
    expect(() => readTargetCsv('  \n ')).toThrow(AppError);
    expect(() => readTargetCsv(`${HEADER}\n`)).toThrow(/header row but no targets/);
    expect(() => readTargetCsv([HEADER, 'a,1,1,1,V,1,BV,,1,,,,,', 'b,1,1,1,V,1,BV,,1,,,,,'].join('\n'), 1)).toThrow(
      /The list has more than 1 targets; a proposal holds at most 1/,
    );
    expect(() => readTargetCsv('name,ra,dec\nx,1,1')).toThrow(/missing required columns magnitude, band, colour, colour_system, age_myr/);
  });
});

describe('readTargetCsvStream', () => {
  it('reads a list like readTargetCsv: the example, a semicolon file, every row problem', async () => {
    expect(await readTargetCsvStream(EXAMPLE_TARGET_CSV)).toEqual(readTargetCsv(EXAMPLE_TARGET_CSV));
    const semicolons = [HEADER.replace(/,/g, ';'), 'Star S-1;10;-10;11;V;0.7;BV;;900;;;;;', 'Star S-2;10;100;11;V;0.7;BV;;900;;;;;'].join(
      '\r\n',
    );
    expect(await readTargetCsvStream(semicolons)).toEqual(readTargetCsv(semicolons));
    // Many rows: several parser chunks and yields.
    const many = [
      HEADER,
      ...Array.from(
        { length: 1500 },
        (_, i) => `Star M-${i + 1},${(i * 0.2) % 360},${i % 2 ? '' : '-'}12.5,11,V,0.7,BV,,900,,,,,${'n'.repeat(i % 300)}`,
      ),
    ].join('\n');
    const streamed = await readTargetCsvStream(many);
    expect(streamed.rows).toHaveLength(1500);
    expect(streamed).toEqual(readTargetCsv(many));
  });

  it('stops at the row after the limit with 400 too_many_targets naming the limit, without parsing the rest of the file', async () => {
    // 300 kB of rows, then an unclosed quote: parsing that far would report the quote instead.
    const rows = Array.from({ length: 4000 }, (_, i) => `Star R-${i + 1},1,1,1,V,1,BV,,1,,,,,padding padding padding padding`);
    const text = [HEADER, ...rows, '"never closed,1,1'].join('\n');
    await expect(readTargetCsvStream(text, 2)).rejects.toMatchObject({
      status: 400,
      code: 'too_many_targets',
      message: 'The list has more than 2 targets; a proposal holds at most 2',
    });
    await expect(readTargetCsvStream(text, 10_000)).rejects.toMatchObject({
      status: 400,
      message: expect.stringMatching(/^row 4001, columns: cannot be read: a quoted value is never closed/),
    });
  });

  it('refuses an empty file, a header without rows and an unreadable header like readTargetCsv', async () => {
    await expect(readTargetCsvStream('  \n ')).rejects.toMatchObject({ code: 'empty_target_list' });
    await expect(readTargetCsvStream(`${HEADER}\n,,,\n`)).rejects.toThrow(/header row but no targets/);
    await expect(readTargetCsvStream('name,ra,dec\nx,1,1')).rejects.toThrow(
      /missing required columns magnitude, band, colour, colour_system, age_myr/,
    );
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
      {
        name: '-Star',
        raDeg: 1,
        decDeg: -5,
        magnitude: 10,
        magnitudeBand: 'V',
        colour: 0.6,
        colourSystem: 'BV',
        reddeningEbv: null,
        ageMyr: 100,
        ageUncertaintyMyr: null,
        periodPrecisionDays: null,
        periodDays: null,
        periodUncertaintyDays: null,
        notes: '',
      },
      {
        name: 'Star M',
        raDeg: 2,
        decDeg: 5,
        magnitude: 14,
        magnitudeBand: 'G',
        colour: 3.1,
        colourSystem: 'BPRP',
        reddeningEbv: null,
        ageMyr: 800,
        ageUncertaintyMyr: null,
        periodPrecisionDays: null,
        periodDays: 0.5,
        periodUncertaintyDays: 0.02,
        notes: '',
      },
    ]);
    expect(csv).toBe(`${HEADER}\r\n'-Star,1,-5,10,V,0.6,BV,,100,,,,,\r\nStar M,2,5,14,G,3.1,BPRP,,800,,,0.5,0.02,\r\n`);
  });
});
