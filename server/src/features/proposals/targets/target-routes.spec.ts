import { readFileSync } from 'node:fs';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { MAX_TARGETS_PER_PROPOSAL } from '@spincycle/shared/proposals/target-schemas';
import { signedIn, startHarness, type Browser, type Harness } from '../../../../../test/support/api-harness';
import {
  addCoInvestigator,
  countRows,
  createTestNetwork,
  CSV_HEADER,
  csvLine,
  proposerWithDraft,
  target,
  uploadFile,
  type TestNetwork,
} from '../../../../../test/api/support/proposal-kit';

const FIXTURES = path.resolve(__dirname, '../../../../../test/fixtures/target-csv');
const fixture = (name: string) => readFileSync(path.join(FIXTURES, name));

let h: Harness;
let net: TestNetwork;
beforeAll(async () => {
  h = await startHarness();
  net = await createTestNetwork(h, 'TG');
});
afterAll(async () => {
  await net.cleanUp();
  await h.close();
});

async function draftWithTwoTargets() {
  const d = await proposerWithDraft(h, net.cycleId, 'Target list');
  for (const name of ['Star E-1', 'Star E-2']) {
    const res = await d.browser.post(`/api/proposals/${d.proposal.id}/targets`, target({ name }));
    expect(res.status).toBe(201);
  }
  return d;
}

const upload = (b: Browser, id: number, content: Buffer | string, filename = 'targets.csv', mode?: 'replace' | 'append') =>
  uploadFile(b, 'post', `/api/proposals/${id}/targets/upload${mode ? `?mode=${mode}` : ''}`, content, filename);

describe('targets: one row at a time', () => {
  it('POST adds at the end, GET lists in order, PUT with the row version edits, DELETE removes', async () => {
    const { browser, proposal } = await draftWithTwoTargets();
    const list = (await browser.get(`/api/proposals/${proposal.id}/targets`)).body;
    expect(list.map((t: { name: string; position: number }) => [t.name, t.position])).toEqual([
      ['Star E-1', 1],
      ['Star E-2', 2],
    ]);
    expect(list[0]).toMatchObject({
      raDeg: 163.2,
      decDeg: 31.6,
      magnitudeBand: 'V',
      colourSystem: 'BPRP',
      reddeningEbv: null,
      notes: '',
      version: 1,
    });
    const edited = await browser.put(`/api/proposals/${proposal.id}/targets/${list[0].id}`, {
      version: 1,
      target: target({ name: 'Star E-1b', magnitude: 13.5 }),
    });
    expect(edited.status).toBe(200);
    expect(edited.body).toMatchObject({ name: 'Star E-1b', magnitude: 13.5, version: 2, position: 1 });
    expect((await browser.delete(`/api/proposals/${proposal.id}/targets/${list[1].id}`)).status).toBe(204);
    expect((await browser.get(`/api/proposals/${proposal.id}/targets`)).body.map((t: { name: string }) => t.name)).toEqual(['Star E-1b']);
    expect((await browser.delete(`/api/proposals/${proposal.id}/targets/${list[1].id}`)).status).toBe(404);
  });

  it('PUT with a stale version answers 409 version_conflict and keeps the other edit', async () => {
    const { browser: pi, proposal } = await draftWithTwoTargets();
    const coi = await addCoInvestigator(h, pi, proposal.id);
    const [first] = (await pi.get(`/api/proposals/${proposal.id}/targets`)).body;
    expect(
      (await coi.browser.put(`/api/proposals/${proposal.id}/targets/${first.id}`, { version: 1, target: target({ name: 'By the co-I' }) }))
        .status,
    ).toBe(200);
    const stale = await pi.put(`/api/proposals/${proposal.id}/targets/${first.id}`, { version: 1, target: target({ name: 'By the PI' }) });
    expect(stale.status).toBe(409);
    expect(stale.body.code).toBe('version_conflict');
    expect(stale.body.message).toMatch(/changed the target “By the co-I” at \d\d:\d\d UTC/);
    expect((await pi.get(`/api/proposals/${proposal.id}/targets`)).body[0].name).toBe('By the co-I');
  });

  it('refuses a name already in the list (409 on name), values out of range (400 naming them), a target of another proposal (404)', async () => {
    const { browser, proposal } = await draftWithTwoTargets();
    const dup = await browser.post(`/api/proposals/${proposal.id}/targets`, target({ name: 'star e-1' }));
    expect(dup.status).toBe(409);
    expect(dup.body.fieldErrors.name).toBeDefined();
    const bad = await browser.post(
      `/api/proposals/${proposal.id}/targets`,
      target({ decDeg: 95.2, magnitude: 30, colourSystem: 'UBV' as never }),
    );
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.fieldErrors).sort()).toEqual(['colourSystem', 'decDeg', 'magnitude']);
    const other = await draftWithTwoTargets();
    const [foreign] = (await other.browser.get(`/api/proposals/${other.proposal.id}/targets`)).body;
    expect((await browser.put(`/api/proposals/${proposal.id}/targets/${foreign.id}`, { version: 1, target: target() })).status).toBe(404);
    const [mine] = (await browser.get(`/api/proposals/${proposal.id}/targets`)).body;
    const rename = await browser.put(`/api/proposals/${proposal.id}/targets/${mine.id}`, {
      version: 1,
      target: target({ name: 'Star E-2' }),
    });
    expect(rename.status).toBe(409);
    expect(rename.body.fieldErrors['target.name']).toBeDefined();
  });

  it('stores an expected period and its uncertainty (null when not given), and edits them', async () => {
    const { browser, proposal } = await draftWithTwoTargets();
    const res = await browser.post(
      `/api/proposals/${proposal.id}/targets`,
      target({ name: 'Star E-M', colour: 3.1, periodDays: 0.62, periodUncertaintyDays: 0.05 }),
    );
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ name: 'Star E-M', periodDays: 0.62, periodUncertaintyDays: 0.05 });
    // Omitted fields default to null.
    const { periodDays: _p, periodUncertaintyDays: _u, ...withoutPeriod } = target({ name: 'Star E-N' });
    const plain = await browser.post(`/api/proposals/${proposal.id}/targets`, withoutPeriod);
    expect(plain.status).toBe(201);
    expect(plain.body).toMatchObject({ periodDays: null, periodUncertaintyDays: null });
    const edited = await browser.put(`/api/proposals/${proposal.id}/targets/${res.body.id}`, {
      version: 1,
      target: target({ name: 'Star E-M', periodDays: 35, periodUncertaintyDays: null }),
    });
    expect(edited.status).toBe(200);
    expect(edited.body).toMatchObject({ periodDays: 35, periodUncertaintyDays: null, version: 2 });
    expect(
      (await browser.get(`/api/proposals/${proposal.id}/targets`)).body.find((t: { id: number }) => t.id === res.body.id),
    ).toMatchObject({ periodDays: 35 });
  });

  it('refuses a period out of range, a negative uncertainty and an uncertainty without a period (400 naming the field), writing nothing', async () => {
    const { browser, proposal } = await draftWithTwoTargets();
    const cases: [Partial<Parameters<typeof target>[0]>, string, string][] = [
      [{ periodDays: 0 }, 'periodDays', 'Enter a period between 0.05 and 1000 d, or leave it empty (you typed 0).'],
      [{ periodDays: 1500 }, 'periodDays', 'Enter a period between 0.05 and 1000 d, or leave it empty (you typed 1500).'],
      [
        { periodDays: 2, periodUncertaintyDays: -0.1 },
        'periodUncertaintyDays',
        'Enter a period uncertainty of 0 d or more, or leave it empty (you typed −0.1).',
      ],
      [{ periodUncertaintyDays: 0.1 }, 'periodUncertaintyDays', 'Enter the period as well, or clear its uncertainty.'],
      [{ periodDays: 'fast' as never }, 'periodDays', 'Enter the period as a number (you typed fast).'],
    ];
    for (const [overrides, field, message] of cases) {
      const res = await browser.post(`/api/proposals/${proposal.id}/targets`, target(overrides));
      expect(res.status).toBe(400);
      expect(res.body.fieldErrors).toEqual({ [field]: [message] });
    }
    const [first] = (await browser.get(`/api/proposals/${proposal.id}/targets`)).body;
    const put = await browser.put(`/api/proposals/${proposal.id}/targets/${first.id}`, {
      version: 1,
      target: target({ name: first.name, periodDays: -3 }),
    });
    expect(put.status).toBe(400);
    expect(put.body.fieldErrors['target.periodDays']).toEqual([
      'Enter a period between 0.05 and 1000 d, or leave it empty (you typed −3).',
    ]);
    expect(await countRows(h, 'targets', { proposal_id: proposal.id })).toBe(2);
    expect((await browser.get(`/api/proposals/${proposal.id}/targets`)).body[0]).toMatchObject({ version: 1, periodDays: null });
  });
});

describe('POST /api/proposals/:id/targets/upload', () => {
  it('replaces the list by default: sexagesimal and decimal positions, BOM, CRLF, upper-case header, B-V spelled with a dash', async () => {
    const { browser, proposal } = await draftWithTwoTargets();
    const res = await upload(browser, proposal.id, fixture('bom-crlf-valid.csv'));
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ mode: 'replace', added: 2, removed: 2 });
    const [b1, b2] = res.body.targets;
    expect(b1).toMatchObject({ name: 'Star B-1', colourSystem: 'BV', colour: 0.65, position: 1 });
    expect(b1.raDeg).toBeCloseTo(163.302083, 5);
    expect(b1.decDeg).toBeCloseTo(-5.341667, 5);
    expect(b2.raDeg).toBeCloseTo(187.5, 9);
    expect(b2.decDeg).toBeCloseTo(-5.341667, 5);
    expect(await countRows(h, 'targets', { proposal_id: proposal.id })).toBe(2);
  });

  it('appends with mode=append after the existing rows; accepts semicolon-separated files', async () => {
    const { browser, proposal } = await draftWithTwoTargets();
    const res = await upload(browser, proposal.id, fixture('semicolon-valid.csv'), 'semi.csv', 'append');
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ mode: 'append', added: 1, removed: 0 });
    expect(res.body.targets.map((t: { name: string; position: number }) => [t.name, t.position])).toEqual([
      ['Star E-1', 1],
      ['Star E-2', 2],
      ['Star S-1', 3],
    ]);
  });

  it('keeps quoted fields with embedded commas and quotes intact', async () => {
    const { browser, proposal } = await draftWithTwoTargets();
    const res = await upload(browser, proposal.id, fixture('quoted-commas.csv'));
    expect(res.status).toBe(200);
    expect(res.body.targets[0]).toMatchObject({ name: 'Star Q-1, north', decDeg: 31.6, notes: 'comma, inside; and "quotes"' });
  });

  it('accepts the downloadable example list as it is', async () => {
    const { browser, proposal } = await draftWithTwoTargets();
    const example = await browser.get('/api/target-lists/example.csv');
    expect(example.status).toBe(200);
    expect(example.headers['content-type']).toMatch(/^text\/csv/);
    expect(example.headers['content-disposition']).toMatch(/^attachment; filename="?spincycle-target-list-example.csv"?$/);
    const res = await upload(browser, proposal.id, example.text, 'example.csv');
    expect(res.status).toBe(200);
    expect(res.body.added).toBe(9);
    const systems = new Set(res.body.targets.map((t: { colourSystem: string }) => t.colourSystem));
    expect(systems).toEqual(new Set(['BV', 'BPRP']));
    expect(res.body.targets.some((t: { reddeningEbv: number | null }) => t.reddeningEbv === null)).toBe(true);
    expect(res.body.targets.some((t: { periodPrecisionDays: number | null }) => t.periodPrecisionDays !== null)).toBe(true);
    expect(res.body.targets.filter((t: { periodDays: number | null }) => t.periodDays !== null)).toEqual([
      expect.objectContaining({ name: 'Lantern 58', periodDays: 0.62, periodUncertaintyDays: 0.05 }),
    ]);
  });

  it('stores a row whose colour is implausible for its system and answers with a note on that row', async () => {
    const { browser, proposal } = await draftWithTwoTargets();
    const res = await upload(
      browser,
      proposal.id,
      [CSV_HEADER, csvLine('Star P-1'), csvLine('Star P-2', { colour: '2.5', colour_system: 'BV' })].join('\n'),
    );
    expect(res.status).toBe(200);
    expect(res.body.added).toBe(2);
    expect(res.body.notes).toEqual([
      {
        row: 2,
        field: 'colour',
        message:
          'A B−V of 2.5 mag is outside the F5V–M5V dwarfs (between 0.44 and 1.83 mag), but a plausible BP−RP: check the colour system.',
      },
    ]);
  });

  it('reads the period and period_error columns (also spelled period_d / period_err_d); empty cells are null', async () => {
    const { browser, proposal } = await draftWithTwoTargets();
    const res = await upload(
      browser,
      proposal.id,
      [CSV_HEADER, csvLine('Star V-1', { colour: '3.2', period: '0.45', period_error: '0.02' }), csvLine('Star V-2')].join('\n'),
    );
    expect(res.status).toBe(200);
    expect(
      res.body.targets.map((t: { name: string; periodDays: number | null; periodUncertaintyDays: number | null }) => [
        t.name,
        t.periodDays,
        t.periodUncertaintyDays,
      ]),
    ).toEqual([
      ['Star V-1', 0.45, 0.02],
      ['Star V-2', null, null],
    ]);
    const aliased = CSV_HEADER.replace(',period,period_error,', ',Period D,period-err-d,');
    const again = await upload(
      browser,
      proposal.id,
      [aliased, csvLine('Star V-3', { period: '12.5', period_error: '' })].join('\n'),
      'aliased.csv',
      'append',
    );
    expect(again.status).toBe(200);
    expect(again.body.targets[2]).toMatchObject({ name: 'Star V-3', periodDays: 12.5, periodUncertaintyDays: null });
    // A list without the new columns still reads (they are optional).
    const old = 'name,ra,dec,magnitude,band,colour,colour_system,age_myr\nStar V-4,10,10,11,V,0.8,BV,900';
    const oldRes = await upload(browser, proposal.id, old, 'old.csv', 'append');
    expect(oldRes.status).toBe(200);
    expect(oldRes.body.targets[3]).toMatchObject({ name: 'Star V-4', periodDays: null, periodUncertaintyDays: null });
  });

  it('a bad period row → 400 naming the row and the column; nothing written', async () => {
    const { browser, proposal } = await draftWithTwoTargets();
    const before = (await browser.get(`/api/proposals/${proposal.id}/targets`)).body;
    const csv = [
      CSV_HEADER,
      csvLine('Star W-1', { period: '2.5' }),
      csvLine('Star W-2', { period: '1200' }),
      csvLine('Star W-3', { period: 'fast' }),
      csvLine('Star W-4', { period_error: '0.3' }),
      csvLine('Star W-5', { period: '3', period_error: '-1' }),
    ].join('\n');
    const res = await upload(browser, proposal.id, csv);
    expect(res.status).toBe(400);
    expect(res.body.code).toBe('invalid_target_list');
    expect(res.body.message).toBe(
      'row 2, period: Enter a period between 0.05 and 1000 d, or leave it empty (you typed 1200). (and 3 more problems; nothing was saved)',
    );
    expect(res.body.rows).toEqual([
      { row: 2, field: 'period', message: 'Enter a period between 0.05 and 1000 d, or leave it empty (you typed 1200).' },
      { row: 3, field: 'period', message: 'Enter the period as a number (you typed fast).' },
      { row: 4, field: 'period_error', message: 'Enter the period as well, or clear its uncertainty.' },
      { row: 5, field: 'period_error', message: 'Enter a period uncertainty of 0 d or more, or leave it empty (you typed −1).' },
    ]);
    expect(Object.keys(res.body.fieldErrors).sort()).toEqual([
      'rows.2.period',
      'rows.3.period',
      'rows.4.period_error',
      'rows.5.period_error',
    ]);
    expect((await browser.get(`/api/proposals/${proposal.id}/targets`)).body).toEqual(before);
  });

  /** Each malformed file: status, code, where the first problem is reported and what it says. */
  const CORPUS: { file: string; status: number; code: string; keys?: string[]; message: RegExp; mode?: 'append' }[] = [
    {
      file: 'missing-columns.csv',
      status: 400,
      code: 'invalid_target_list',
      keys: ['header'],
      message: /^header: missing required columns magnitude, band/,
    },
    { file: 'unknown-column.csv', status: 400, code: 'invalid_target_list', keys: ['header'], message: /unknown column "mass"/ },
    { file: 'no-header.csv', status: 400, code: 'invalid_target_list', keys: ['header'], message: /first row must name the columns/ },
    {
      file: 'bad-numbers.csv',
      status: 400,
      code: 'invalid_target_list',
      keys: ['rows.2.magnitude', 'rows.3.age_myr'],
      message: /^row 2, magnitude: Enter the magnitude as a number \(you typed bright\)\. \(and 1 more problem; nothing was saved\)$/,
    },
    {
      file: 'bad-sexagesimal.csv',
      status: 400,
      code: 'invalid_target_list',
      keys: ['rows.1.ra', 'rows.2.dec'],
      message: /^row 1, ra: Keep the minutes of the right ascension below 60 \(you typed 10:75:00\)/,
    },
    {
      file: 'ra-dec-out-of-range.csv',
      status: 400,
      code: 'invalid_target_list',
      keys: ['rows.14.dec', 'rows.15.ra'],
      message: /^row 14, dec: Enter a declination between −90° and 90° \(you typed 95\.2\)\. \(and 1 more problem/,
    },
    {
      file: 'duplicates-within-file.csv',
      status: 400,
      code: 'invalid_target_list',
      keys: ['rows.4.name'],
      message: /^row 4, name: “lantern 3” is listed twice \(also on row 2\)/,
    },
    {
      file: 'duplicate-with-existing.csv',
      status: 400,
      code: 'invalid_target_list',
      keys: ['rows.2.name'],
      message: /^row 2, name: “Star E-1” is already in the target list/,
      mode: 'append',
    },
    { file: 'empty.csv', status: 400, code: 'empty_target_list', message: /is empty/ },
    { file: 'header-only.csv', status: 400, code: 'empty_target_list', message: /header row but no targets/ },
    { file: 'utf16le.csv', status: 400, code: 'wrong_encoding', message: /UTF-16.*save the file as UTF-8/ },
    { file: 'latin1.csv', status: 400, code: 'wrong_encoding', message: /line 3 has bytes that are not UTF-8.*save the file as UTF-8/ },
    {
      file: 'unquoted-comma.csv',
      status: 400,
      code: 'invalid_target_list',
      keys: ['rows.2.columns'],
      message: /^row 2, columns: has 13 values but the header names 12 columns/,
    },
    {
      file: 'ragged-rows.csv',
      status: 400,
      code: 'invalid_target_list',
      keys: ['rows.2.columns', 'rows.3.columns'],
      message: /^row 2, columns: has 5 values/,
    },
    {
      file: 'unclosed-quote.csv',
      status: 400,
      code: 'invalid_target_list',
      keys: ['rows.2.columns'],
      message: /^row 2, columns: cannot be read: a quoted value is never closed/,
    },
    {
      file: 'bad-enums.csv',
      status: 400,
      code: 'invalid_target_list',
      keys: ['rows.1.band', 'rows.1.colour_system'],
      message: /^row 1, band: Choose the band of the magnitude: B, V, R, I, G \(you typed Q\)/,
    },
    {
      file: 'missing-values.csv',
      status: 400,
      code: 'invalid_target_list',
      keys: ['rows.1.name', 'rows.1.age_myr', 'rows.2.ra', 'rows.2.dec'],
      message: /^row 1, name: Give the target a name\./,
    },
    {
      file: 'science-ranges.csv',
      status: 400,
      code: 'invalid_target_list',
      keys: ['rows.1.magnitude', 'rows.1.colour', 'rows.1.ebv', 'rows.1.age_myr', 'rows.1.age_err_myr', 'rows.1.period_precision_d'],
      message: /^row 1, magnitude: Enter a magnitude between −2 and 22 mag \(you typed 25\)\. \(and 5 more problems/,
    },
  ];

  it.each(CORPUS)(
    '$file → $status $code with a row-level message, and nothing written',
    async ({ file, status, code, keys, message, mode }) => {
      const { browser, proposal } = await draftWithTwoTargets();
      const before = (await browser.get(`/api/proposals/${proposal.id}/targets`)).body;
      const plansBefore = await countRows(h, 'plan_runs', { proposal_id: proposal.id, state: 'queued' });
      const res = await upload(browser, proposal.id, fixture(file), file, mode);
      expect(res.status).toBe(status);
      expect(res.body.code).toBe(code);
      expect(res.body.message).toMatch(message);
      if (keys) {
        expect(Object.keys(res.body.fieldErrors).sort()).toEqual([...keys].sort());
        expect(res.body.rows).toHaveLength(keys.length);
        for (const r of res.body.rows)
          expect(r).toEqual({ row: expect.any(Number), field: expect.any(String), message: expect.any(String) });
      }
      expect(await countRows(h, 'targets', { proposal_id: proposal.id })).toBe(2);
      expect((await browser.get(`/api/proposals/${proposal.id}/targets`)).body).toEqual(before);
      expect(await countRows(h, 'plan_runs', { proposal_id: proposal.id, state: 'queued' })).toBe(plansBefore);
    },
  );

  it(`refuses more than ${MAX_TARGETS_PER_PROPOSAL} rows with 400 naming the limit, stopping at the row after it; nothing written`, async () => {
    const { browser, proposal } = await draftWithTwoTargets();
    const lines = Array.from({ length: MAX_TARGETS_PER_PROPOSAL + 1 }, (_, i) => csvLine(`Star G-${i + 1}`));
    const res = await upload(browser, proposal.id, [CSV_HEADER, ...lines].join('\n'));
    expect(res.status).toBe(400);
    expect(res.body).toMatchObject({
      code: 'too_many_targets',
      message: `The list has more than ${MAX_TARGETS_PER_PROPOSAL} targets; a proposal holds at most ${MAX_TARGETS_PER_PROPOSAL}`,
    });
    expect(await countRows(h, 'targets', { proposal_id: proposal.id })).toBe(2);
    // In append mode the rows already in the list count too.
    const fits = Array.from({ length: MAX_TARGETS_PER_PROPOSAL - 1 }, (_, i) => csvLine(`Star G-${i + 1}`));
    const append = await upload(browser, proposal.id, [CSV_HEADER, ...fits].join('\n'), 'many.csv', 'append');
    expect(append.status).toBe(413);
    expect(append.body.message).toMatch(/holds 2 targets and the file adds 1999/);
    expect(await countRows(h, 'targets', { proposal_id: proposal.id })).toBe(2);
  });

  it('collects every problem of a large file, not just the first', async () => {
    const { browser, proposal } = await draftWithTwoTargets();
    const lines = Array.from({ length: 300 }, (_, i) => csvLine(`Star H-${i + 1}`, i % 10 === 9 ? { dec: '-91' } : {}));
    const res = await upload(browser, proposal.id, [CSV_HEADER, ...lines].join('\n'));
    expect(res.status).toBe(400);
    expect(res.body.rows).toHaveLength(30);
    expect(res.body.message).toMatch(/^row 10, dec: .* \(and 29 more problems; nothing was saved\)$/);
    expect(res.body.fieldErrors['rows.300.dec']).toBeDefined();
  });

  it('multipart mistakes leave in the API error shape: no file 400, another field 400, bad mode 400', async () => {
    const { browser, proposal } = await draftWithTwoTargets();
    const none = await browser.post(`/api/proposals/${proposal.id}/targets/upload`, {});
    expect(none.status).toBe(400);
    expect(none.body.code).toBe('file_missing');
    const field = await uploadFile(
      browser,
      'post',
      `/api/proposals/${proposal.id}/targets/upload`,
      fixture('semicolon-valid.csv'),
      'x.csv',
      { field: 'targets' },
    );
    expect(field.status).toBe(400);
    expect(field.body).toMatchObject({ code: 'unexpected_file_field', message: expect.stringContaining('"file"') });
    const mode = await upload(browser, proposal.id, fixture('semicolon-valid.csv'), 'x.csv', 'merge' as never);
    expect(mode.status).toBe(400);
    expect(mode.body.fieldErrors.mode).toBeDefined();
  });
});

describe('GET /api/proposals/:id/targets.csv', () => {
  it('exports the list in the upload columns; a formula cell accepted on upload comes back escaped, numbers stay numbers', async () => {
    const { browser, proposal } = await draftWithTwoTargets();
    const up = await upload(browser, proposal.id, fixture('formula-injection.csv'));
    expect(up.status).toBe(200);
    expect(up.body.targets[0]).toMatchObject({ name: "=cmd|' /C calc'!A0", notes: "=cmd|' /C calc'!A0" });
    const res = await browser.get(`/api/proposals/${proposal.id}/targets.csv`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    expect(res.headers['content-disposition']).toContain(`proposal-${proposal.id}-targets.csv`);
    const rows: string[][] = parse(res.text);
    expect(rows[0].join(',')).toBe(CSV_HEADER);
    expect(rows[1][0]).toBe("'=cmd|' /C calc'!A0");
    expect(rows[1][13]).toBe("'=cmd|' /C calc'!A0");
    expect(rows[2]).toEqual(['Star Plain', '163.2', '-5.25', '12.1', 'V', '1.1', 'BPRP', '', '650', '60', '', '', '', "'@SUM(1+1)"]);
    // The raw text: the negative declination is written as a bare number, not quoted or escaped.
    expect(res.text).toContain('Star Plain,163.2,-5.25,');
  });

  it('round-trips: an exported list uploads again to the same values', async () => {
    const { browser, proposal } = await draftWithTwoTargets();
    await upload(browser, proposal.id, fixture('bom-crlf-valid.csv'));
    expect(
      (
        await browser.post(
          `/api/proposals/${proposal.id}/targets`,
          target({ name: 'Star R-M', colour: 3.0, periodDays: 0.71, periodUncertaintyDays: 0.04 }),
        )
      ).status,
    ).toBe(201);
    const before = (await browser.get(`/api/proposals/${proposal.id}/targets`)).body;
    const csv = (await browser.get(`/api/proposals/${proposal.id}/targets.csv`)).text;
    const again = await upload(browser, proposal.id, csv, 'export.csv');
    expect(again.status).toBe(200);
    const strip = (t: Record<string, unknown>) => ({ ...t, id: 0, version: 0 });
    expect(again.body.targets.map(strip)).toEqual(before.map(strip));
  });
});

describe('target routes for people outside the team', () => {
  it('answer 404 (uploads included) and write nothing', async () => {
    const { proposal } = await draftWithTwoTargets();
    const { browser } = await signedIn(h, ['proposer']);
    expect((await browser.get(`/api/proposals/${proposal.id}/targets`)).status).toBe(404);
    expect((await upload(browser, proposal.id, fixture('bad-numbers.csv'))).status).toBe(404);
    expect(await countRows(h, 'targets', { proposal_id: proposal.id })).toBe(2);
  });
});
