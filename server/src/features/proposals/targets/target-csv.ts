/**
 * Reading and writing target lists as CSV (columns: TARGET_CSV_COLUMNS). The reader never
 * stops at the first problem: every row is checked and every problem reported with its row
 * and column, so that a list can be fixed in one pass. The writer escapes text cells that a
 * spreadsheet would run as a formula.
 */
import { Readable } from 'node:stream';
import { parse as parseStream } from 'csv-parse';
import { parse } from 'csv-parse/sync';
import { stringify } from 'csv-stringify/sync';
import {
  MAX_TARGETS_PER_PROPOSAL,
  TARGET_CSV_COLUMNS,
  TARGET_CSV_HEADER_ALIASES,
  targetInputSchema,
  type CsvRowError,
  type TargetValues,
} from '@spincycle/shared/proposals/target-schemas';
import { NODE_BANDS } from '@spincycle/shared/facility/facility-types';
import { replaceTyped } from '@spincycle/shared/http/range-text';
import { stripControlCharacters } from '@spincycle/shared/http/text';
import { colourPlausibilityWarning } from '@spincycle/shared/proposals/colour-plausibility';
import { coordinateMessage } from '@spincycle/shared/proposals/coordinate-messages';
import { parseDec, parseRa, SkyInputError } from '@spincycle/shared/sky/index';
import { AppError } from '../../../http/app-error';

type ColumnName = (typeof TARGET_CSV_COLUMNS)[number]['name'];
const COLUMN_NAMES = TARGET_CSV_COLUMNS.map((c) => c.name) as ColumnName[];
const REQUIRED = TARGET_CSV_COLUMNS.filter((c) => c.required).map((c) => c.name) as ColumnName[];

/** Schema field → CSV column, for naming the column of a schema issue. */
const COLUMN_OF_FIELD: Record<keyof TargetValues, ColumnName> = {
  name: 'name',
  raDeg: 'ra',
  decDeg: 'dec',
  magnitude: 'magnitude',
  magnitudeBand: 'band',
  colour: 'colour',
  colourSystem: 'colour_system',
  reddeningEbv: 'ebv',
  ageMyr: 'age_myr',
  ageUncertaintyMyr: 'age_err_myr',
  periodPrecisionDays: 'period_precision_d',
  periodDays: 'period',
  periodUncertaintyDays: 'period_error',
  notes: 'notes',
};

/** A data row that passed every check, with its row number (1 = first data row). */
export interface ReadTargetRow {
  row: number;
  values: TargetValues;
}

export interface ReadTargetList {
  rows: ReadTargetRow[];
  errors: CsvRowError[];
  /** Warnings of rows that were read (a colour implausible for its system): stored anyway. */
  notes: CsvRowError[];
}

const wrongEncoding = (filename: string, what: string) =>
  new AppError(
    'wrong_encoding',
    `“${filename}” is not UTF-8 text (${what}): save the file as UTF-8 (in a spreadsheet: “CSV UTF-8”) and upload it again`,
    400,
    { file: ['save the file as UTF-8'] },
  );

/**
 * The text of an uploaded CSV. Refuses (400 `wrong_encoding`) UTF-16 files (byte-order mark
 * or NUL bytes) and bytes that are not UTF-8, e.g. Latin-1 or Windows-1252 exports, naming
 * the line; a UTF-8 byte-order mark is dropped.
 */
export function decodeCsvText(buffer: Buffer, filename: string): string {
  if (buffer.length === 0)
    throw new AppError('empty_target_list', `“${filename}” is empty: the list needs a header row and at least one target`, 400, {
      file: ['the file is empty'],
    });
  if ((buffer[0] === 0xff && buffer[1] === 0xfe) || (buffer[0] === 0xfe && buffer[1] === 0xff))
    throw wrongEncoding(filename, 'it is UTF-16');
  if (buffer.includes(0)) throw wrongEncoding(filename, 'it contains NUL bytes, as UTF-16 files do');
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(buffer);
  } catch {
    const lenient = new TextDecoder('utf-8').decode(buffer);
    const line = lenient.slice(0, lenient.indexOf('\uFFFD')).split('\n').length;
    throw wrongEncoding(filename, `line ${line} has bytes that are not UTF-8, perhaps Latin-1 or Windows-1252`);
  }
  return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
}

/** The delimiter of the header line: comma, or semicolon / tab as some spreadsheets export. */
export function detectDelimiter(text: string): string {
  // Only the start of the text: splitting a whole large file into lines would hold the event loop.
  const firstLine =
    text
      .slice(0, 64 * 1024)
      .split(/\r?\n/)
      .find((l) => l.trim() !== '') ?? '';
  const counts = [',', ';', '\t'].map((d) => ({ d, n: firstLine.split(d).length - 1 }));
  counts.sort((a, b) => b.n - a.n);
  return counts[0].n > 0 ? counts[0].d : ',';
}

/** A header cell as a column name: case, spaces and hyphens do not matter; aliases name their column. */
const normalizeHeader = (h: string) => {
  const name = h
    .trim()
    .toLowerCase()
    .replace(/[\s-]+/g, '_');
  return TARGET_CSV_HEADER_ALIASES[name] ?? name;
};

const NUMBER = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

function headerError(message: string): AppError {
  const error: CsvRowError = { row: 0, field: 'header', message };
  return new AppError('invalid_target_list', `header: ${message}`, 400, { header: [message] }, { rows: [error] });
}

/** 400 `invalid_target_list` with every problem (sorted by row, then column order). */
export function rowErrorsToAppError(errors: CsvRowError[]): AppError {
  const order = (f: string) => (f === 'columns' ? -1 : COLUMN_NAMES.indexOf(f as ColumnName));
  const sorted = [...errors].sort((a, b) => a.row - b.row || order(a.field) - order(b.field));
  const label = (e: CsvRowError) => (e.row === 0 ? `header: ${e.message}` : `row ${e.row}, ${e.field}: ${e.message}`);
  const fieldErrors: Record<string, string[]> = {};
  for (const e of sorted) (fieldErrors[e.row === 0 ? 'header' : `rows.${e.row}.${e.field}`] ??= []).push(label(e));
  const more =
    sorted.length > 1
      ? ` (and ${sorted.length - 1} more problem${sorted.length > 2 ? 's' : ''}; nothing was saved)`
      : ' (nothing was saved)';
  return new AppError('invalid_target_list', label(sorted[0]) + more, 400, fieldErrors, { rows: sorted });
}

/** Longest stretch of reading a list without a yield to the event loop, in milliseconds. */
const MAX_MS_BETWEEN_YIELDS = 5;
/**
 * Characters handed to the streaming parser at a time: it parses a chunk in one go, at about
 * 1 ms per kilobyte for long rows, so a chunk must stay small for the yields to come often.
 */
const PARSE_CHUNK_CHARS = 4 * 1024;

const emptyList = () =>
  new AppError('empty_target_list', 'The file is empty: the list needs a header row and at least one target', 400, {
    file: ['the file is empty'],
  });

/** 400 `too_many_targets` as soon as the row after the limit is read (the rest of the file is not parsed). */
const tooManyRows = (maxRows: number) =>
  new AppError('too_many_targets', `The list has more than ${maxRows} targets; a proposal holds at most ${maxRows}`, 400, {
    file: [`at most ${maxRows} targets`],
  });

/** csv-parse's error (unclosed quote, bad quoting) as the file's 400, naming the row. */
function parseErrorToAppError(err: unknown): unknown {
  const e = err as { code?: string; records?: number; message?: string };
  if (typeof e.code !== 'string' || typeof e.records !== 'number') return err;
  const row = e.records;
  const why = e.code === 'CSV_QUOTE_NOT_CLOSED' ? 'a quoted value is never closed' : (e.message ?? 'unreadable').replace(/^[^:]*:\s*/, '');
  if (row === 0) return headerError(`the header row cannot be read: ${why}`);
  return rowErrorsToAppError([{ row, field: 'columns', message: `cannot be read: ${why}` }]);
}

const parseOptions = (text: string) => ({
  delimiter: detectDelimiter(text),
  relax_column_count: true,
  skip_empty_lines: true,
  trim: true,
  bom: true,
});

/**
 * Takes the parsed records one at a time: the header first, then the data rows. Rows that
 * hold only delimiters are skipped and not counted; the row after `maxRows` throws at once.
 */
class TargetListCollector {
  private header: string[] | undefined;
  private index = new Map<ColumnName, number>();
  private readonly firstRowOfName = new Map<string, number>();
  private dataRows = 0;
  readonly errors: CsvRowError[] = [];
  readonly rows: ReadTargetRow[] = [];
  readonly notes: CsvRowError[] = [];

  constructor(private readonly maxRows: number) {}

  /** Adds one record; false when it was skipped (empty). */
  add(record: string[]): boolean {
    if (!record.some((cell) => cell !== '')) return false;
    if (!this.header) {
      this.readHeader(record);
      return true;
    }
    const row = ++this.dataRows;
    if (row > this.maxRows) throw tooManyRows(this.maxRows);
    this.readData(row, record);
    return true;
  }

  finish(): ReadTargetList {
    if (!this.header) throw emptyList();
    if (this.dataRows === 0)
      throw new AppError('empty_target_list', 'The file has a header row but no targets', 400, {
        file: ['no target rows after the header'],
      });
    return { rows: this.rows, errors: this.errors, notes: this.notes };
  }

  private readHeader(record: string[]): void {
    const header = record.map(normalizeHeader);
    const known = new Set<string>(COLUMN_NAMES);
    if (!header.some((h) => known.has(h))) {
      throw headerError(
        `the first row must name the columns (${COLUMN_NAMES.join(', ')}); it reads ${record
          .slice(0, 4)
          .map((c) => JSON.stringify(c))
          .join(', ')}`,
      );
    }
    const unknown = header.filter((h) => !known.has(h));
    const missing = REQUIRED.filter((c) => !header.includes(c));
    const repeated = header.filter((h, i) => header.indexOf(h) !== i);
    const problems: string[] = [];
    if (missing.length) problems.push(`missing required column${missing.length > 1 ? 's' : ''} ${missing.join(', ')}`);
    if (unknown.length)
      problems.push(
        `unknown column${unknown.length > 1 ? 's' : ''} ${unknown.map((u) => JSON.stringify(u)).join(', ')} (the columns are ${COLUMN_NAMES.join(', ')})`,
      );
    if (repeated.length) problems.push(`column${repeated.length > 1 ? 's' : ''} ${[...new Set(repeated)].join(', ')} listed twice`);
    if (problems.length) throw headerError(problems.join('; '));
    this.header = header;
    this.index = new Map(header.map((h, i) => [h as ColumnName, i]));
  }

  private readData(row: number, cells: string[]): void {
    const header = this.header!;
    if (cells.length !== header.length) {
      this.errors.push({ row, field: 'columns', message: `has ${cells.length} values but the header names ${header.length} columns` });
      return;
    }
    const result = readRow(row, (c) => (this.index.has(c) ? cells[this.index.get(c)!] : ''));
    this.errors.push(...result.errors);
    if (result.values) {
      const key = result.values.name.toLowerCase();
      const first = this.firstRowOfName.get(key);
      if (first !== undefined) {
        this.errors.push({ row, field: 'name', message: `“${result.values.name}” is listed twice (also on row ${first})` });
        return;
      }
      this.firstRowOfName.set(key, row);
      if (!result.errors.length) {
        this.rows.push({ row, values: result.values });
        this.notes.push(...result.notes);
      }
    }
  }
}

/**
 * Reads a target list at once, on the calling thread (small texts in tests; uploads and the
 * benchmark go through `readTargetCsvStream`, which shares the row checks). File-level problems (empty,
 * header only, missing or unknown columns, too many rows, unreadable quoting) throw an
 * AppError at once; row problems are collected in `errors` (the caller adds its own, e.g.
 * names already in the proposal, and refuses the whole file if any). Row 1 is the first data
 * row; lines that are empty or hold only delimiters are skipped and not counted.
 */
export function readTargetCsv(text: string, maxRows = MAX_TARGETS_PER_PROPOSAL): ReadTargetList {
  if (text.trim() === '') throw emptyList();
  let records: string[][];
  try {
    records = parse(text, parseOptions(text));
  } catch (err) {
    throw parseErrorToAppError(err);
  }
  const collector = new TargetListCollector(maxRows);
  for (const record of records) collector.add(record);
  return collector.finish();
}

/**
 * Reads an uploaded target list like `readTargetCsv`, without holding the event loop: the
 * text goes through csv-parse's streaming parser in 4 kB chunks, the records are taken from
 * its async iterator and checked as they come, with a yield to the event loop (setImmediate,
 * so that waiting requests are served) after at most MAX_MS_BETWEEN_YIELDS of work. Parsing stops at the row
 * after `maxRows` (400 `too_many_targets` naming the limit): a large file is never parsed whole.
 */
export async function readTargetCsvStream(text: string, maxRows = MAX_TARGETS_PER_PROPOSAL): Promise<ReadTargetList> {
  if (text.trim() === '') throw emptyList();
  const parser = parseStream(parseOptions(text));
  const source = Readable.from(textChunks(text), { objectMode: false });
  source.pipe(parser);
  const collector = new TargetListCollector(maxRows);
  let lastYield = performance.now();
  try {
    for await (const record of parser as AsyncIterable<string[]>) {
      collector.add(record);
      // The async iterator alone resolves promises (microtasks): other requests would still wait.
      if (performance.now() - lastYield >= MAX_MS_BETWEEN_YIELDS) {
        await new Promise<void>((resolve) => setImmediate(resolve));
        lastYield = performance.now();
      }
    }
  } catch (err) {
    throw parseErrorToAppError(err);
  } finally {
    source.unpipe(parser);
    source.destroy();
    parser.destroy();
  }
  return collector.finish();
}

function* textChunks(text: string): Generator<string> {
  for (let i = 0; i < text.length; i += PARSE_CHUNK_CHARS) yield text.slice(i, i + PARSE_CHUNK_CHARS);
}

/** What an empty required text column asks for. */
const REQUIRED_TEXT: Partial<Record<ColumnName, string>> = {
  name: 'Give the target a name.',
  band: `Enter the band of the magnitude: ${NODE_BANDS.join(', ')}.`,
  colour_system: 'Enter the colour system: BPRP for Gaia BP−RP or BV for B−V.',
};

/**
 * Checks one data row; `values` is set when the name at least could be read (for duplicate
 * checks). Every problem of the row is reported, each in the schema's words but echoing the
 * cell's own text ("you typed 4e1", not the 40 it was read as).
 */
function readRow(row: number, cell: (c: ColumnName) => string): { values?: TargetValues; errors: CsvRowError[]; notes: CsvRowError[] } {
  const errors: CsvRowError[] = [];
  const fail = (field: ColumnName, message: string) => errors.push({ row, field, message });
  const candidate: Record<string, unknown> = {};

  const text = (c: ColumnName) => {
    const v = cell(c);
    if (v === '' && REQUIRED_TEXT[c]) fail(c, REQUIRED_TEXT[c]);
    return v;
  };
  // An empty cell is null (the schema asks for a required one); unreadable text goes to the
  // schema as text, which says what number it wants.
  const number = (c: ColumnName, field: keyof TargetValues) => {
    const v = cell(c).replace(/[\u2212\u2012\u2013]/g, '-');
    candidate[field] = v === '' ? null : NUMBER.test(v) ? Number(v) : cell(c);
  };

  candidate.name = text('name');
  for (const [c, parseAngle, field] of [
    ['ra', parseRa, 'raDeg'],
    ['dec', parseDec, 'decDeg'],
  ] as const) {
    const v = cell(c);
    try {
      candidate[field] = parseAngle(v, c);
    } catch (err) {
      if (!(err instanceof SkyInputError)) throw err;
      fail(c, coordinateMessage(c, err.reason, v));
    }
  }
  number('magnitude', 'magnitude');
  const band = text('band');
  if (band) candidate.magnitudeBand = band.toUpperCase();
  number('colour', 'colour');
  const system = text('colour_system');
  // "B-V", "BP−RP", "bp_rp" all name the same systems.
  if (system) candidate.colourSystem = system.toUpperCase().replace(/[\s_\-\u2212\u2013]/g, '');
  number('ebv', 'reddeningEbv');
  number('age_myr', 'ageMyr');
  number('age_err_myr', 'ageUncertaintyMyr');
  number('period_precision_d', 'periodPrecisionDays');
  number('period', 'periodDays');
  number('period_error', 'periodUncertaintyDays');
  candidate.notes = cell('notes');

  const parsed = targetInputSchema.safeParse(candidate);
  if (!parsed.success) {
    const reported = new Set(errors.map((e) => e.field));
    for (const issue of parsed.error.issues) {
      const column = COLUMN_OF_FIELD[issue.path[0] as keyof TargetValues] ?? 'columns';
      // A column already reported (unreadable, empty) has no value for the schema to judge.
      if (reported.has(column)) continue;
      reported.add(column);
      const typed = cell(column as ColumnName);
      fail(
        column as ColumnName,
        typed !== '' && issue.message.includes('(you typed ') ? replaceTyped(issue.message, typed) : issue.message,
      );
    }
  }
  if (errors.length || !parsed.success)
    return {
      values: typeof candidate.name === 'string' && candidate.name ? ({ name: candidate.name } as TargetValues) : undefined,
      errors,
      notes: [],
    };
  const warning = colourPlausibilityWarning(parsed.data.colour, parsed.data.colourSystem, parsed.data.reddeningEbv);
  return { values: parsed.data, errors, notes: warning ? [{ row, field: 'colour', message: warning }] : [] };
}

/**
 * OWASP CSV-injection guidance: a text cell that starts with = + - @ tab or carriage return
 * gets a leading apostrophe, so that a spreadsheet shows it as text instead of running it.
 * Numbers are written as numbers (a negative declination is not a formula).
 */
export function escapeFormulaCell(text: string): string {
  return /^[=+\-@\t\r]/.test(text) ? `'${text}` : text;
}

/**
 * A stored text as written to a cell: without control and direction-override characters (the
 * API refuses them, but rows stored before it did may hold them), then formula-escaped. Notes
 * keep their tabs and line breaks, which the CSV quoting carries.
 */
function textCell(text: string, multiLine = false): string {
  const clean = multiLine
    ? // eslint-disable-next-line no-control-regex -- control characters are what this strips
      text.replace(/[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]/gu, '')
    : stripControlCharacters(text);
  return escapeFormulaCell(clean);
}

/** Writes targets in the upload's columns (RA/Dec in degrees), text cells cleaned and escaped. */
export function writeTargetCsv(targets: TargetValues[]): string {
  const rows = targets.map((t) => [
    textCell(t.name),
    t.raDeg,
    t.decDeg,
    t.magnitude,
    t.magnitudeBand,
    t.colour,
    t.colourSystem,
    t.reddeningEbv ?? '',
    t.ageMyr,
    t.ageUncertaintyMyr ?? '',
    t.periodPrecisionDays ?? '',
    t.periodDays ?? '',
    t.periodUncertaintyDays ?? '',
    textCell(t.notes, true),
  ]);
  return stringify([COLUMN_NAMES, ...rows], { record_delimiter: 'windows' });
}

/**
 * The downloadable example: invented stars covering both colour systems, decimal and
 * sexagesimal positions, and the optional columns both used and left empty (one M dwarf with
 * an expected period of its own).
 */
export const EXAMPLE_TARGET_CSV =
  [
    'name,ra,dec,magnitude,band,colour,colour_system,ebv,age_myr,age_err_myr,period_precision_d,period,period_error,notes',
    'Lantern 12,163.41,31.72,11.8,V,0.82,BPRP,0.02,650,60,,,,cluster member; G dwarf',
    'Lantern 27,10:53:12.5,+31:18:40,13.6,G,1.45,BPRP,0.02,650,60,0.1,,,K dwarf; period precision requested',
    'Lantern 41,10h54m02s,+32d05m11s,15.1,G,2.31,BPRP,,650,60,,,,early M dwarf',
    'Lantern 58,10:51:40,+31:02:10,16.2,G,3.05,BPRP,,650,60,,0.62,0.05,fast-rotating M dwarf beyond the relations: expected period given',
    'Star F-3,84.125,-12.5,9.7,V,0.64,BV,,2400,400,,,,field G dwarf',
    'Star F-8,05:41:30,-12:02:15,10.9,V,0.95,BV,0.05,4100,900,0.5,,,field K dwarf with a known planet candidate',
    'Star F-11,201.7,-47.25,12.4,R,1.12,BV,,1200,,,,,southern field star; no age uncertainty given',
    'Star F-14,18.5h,+5:30:00,8.9,V,0.58,BV,,3000,500,,,,bright: check saturation on the larger nodes',
    'Star F-19,277.4,62.8,11.1,G,1.05,BPRP,0.01,800,150,,,,',
  ].join('\r\n') + '\r\n';
