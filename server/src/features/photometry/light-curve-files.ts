/**
 * Reads uploaded light-curve files as streams (a season of 1-minute photometry is 10⁵ rows a
 * target): bytes are checked as UTF-8 on the way, csv-parse yields records one at a time and
 * the shared LightCurveReader checks every row and field, collecting every problem. Nothing is
 * written here; the service stores the series only when no file has a problem.
 */
import { createReadStream } from 'node:fs';
import { open } from 'node:fs/promises';
import { Transform, type TransformCallback } from 'node:stream';
import { parse } from 'csv-parse';
import {
  LIGHT_CURVE_LIMITS,
  type LightCurveErrorBody,
  type LightCurveRowError,
  type LightCurveValueKind,
  type TimeSystem,
} from '@spincycle/shared/photometry/photometry';
import { LightCurveReader, mergeTargetSeries, type ReaderTarget, type TargetSeries } from '@spincycle/shared/photometry/light-curve-reader';
import { AppError } from '../../http/app-error';
import { detectDelimiter } from '../proposals/targets/target-csv';

/** A refusal listing a file's (or several files') problems: 400 `invalid_light_curve`. */
export function lightCurveErrors(errors: LightCurveRowError[], totalErrors = errors.length): AppError {
  const sorted = [...errors].sort((a, b) => a.file.localeCompare(b.file) || a.row - b.row);
  const listed = sorted.slice(0, LIGHT_CURVE_LIMITS.maxListedErrors);
  // The reader's messages name their row and column already ("row 12, mag: …").
  const label = (e: LightCurveRowError) => `${e.file}: ${e.message}`;
  const fieldErrors: Record<string, string[]> = {};
  for (const e of listed) (fieldErrors[e.row === 0 ? `files.${e.file}` : `files.${e.file}.rows.${e.row}.${e.field}`] ??= []).push(label(e));
  const more =
    totalErrors > 1 ? ` (and ${totalErrors - 1} more problem${totalErrors > 2 ? 's' : ''}; nothing was saved)` : ' (nothing was saved)';
  const body: Omit<LightCurveErrorBody, 'code' | 'message' | 'fieldErrors'> = { rows: listed, totalErrors };
  return new AppError('invalid_light_curve', label(listed[0]) + more, 400, fieldErrors, body);
}

/**
 * Passes bytes through, refusing text that is not UTF-8: a UTF-16 byte-order mark, NUL bytes, or
 * an invalid sequence (Latin-1 or Windows-1252 exports), naming the line where it was found.
 */
class Utf8Check extends Transform {
  private readonly decoder = new TextDecoder('utf-8', { fatal: true });
  private first = true;
  private line = 1;
  constructor(private readonly fileName: string) {
    super();
  }
  override _transform(chunk: Buffer, _enc: BufferEncoding, done: TransformCallback): void {
    if (this.first && chunk.length >= 2 && ((chunk[0] === 0xff && chunk[1] === 0xfe) || (chunk[0] === 0xfe && chunk[1] === 0xff)))
      return done(this.refuse('it is UTF-16'));
    this.first = false;
    if (chunk.includes(0)) return done(this.refuse('it contains NUL bytes, as UTF-16 files do'));
    let text: string;
    try {
      text = this.decoder.decode(chunk, { stream: true });
    } catch {
      const lenient = new TextDecoder('utf-8').decode(chunk);
      const at = this.line + lenient.slice(0, lenient.indexOf('\uFFFD')).split('\n').length - 1;
      return done(this.refuse(`line ${at} has bytes that are not UTF-8, perhaps Latin-1 or Windows-1252`));
    }
    for (let i = text.indexOf('\n'); i !== -1; i = text.indexOf('\n', i + 1)) this.line++;
    done(null, chunk);
  }
  override _flush(done: TransformCallback): void {
    try {
      this.decoder.decode();
    } catch {
      return done(this.refuse('it ends in the middle of a UTF-8 character'));
    }
    done();
  }
  private refuse(why: string): AppError {
    return lightCurveErrors([{ file: this.fileName, row: 0, field: 'file', message: `save it as UTF-8 CSV: ${why}` }]);
  }
}

/** The delimiter of the file's first line (read from its first 64 kB), as the target upload detects it. */
async function delimiterOf(path: string): Promise<string> {
  const handle = await open(path, 'r');
  try {
    const { buffer, bytesRead } = await handle.read(Buffer.alloc(64 * 1024), 0, 64 * 1024, 0);
    return detectDelimiter(buffer.subarray(0, bytesRead).toString('utf8'));
  } finally {
    await handle.close();
  }
}

export interface UploadedLightCurveFile {
  path: string;
  fileName: string;
  size: number;
}

export interface ReadOptions {
  timeSystem?: TimeSystem;
  valueKind?: LightCurveValueKind;
  targetId?: number;
  targets: ReaderTarget[];
  nodeCodes: string[];
}

/** What the files hold, per target (several files of one target joined), and their row counts. */
export interface ReadResult {
  series: TargetSeries[];
  /** The files that held each target's rows, by target id. */
  filesOf: Map<number, string[]>;
  files: { fileName: string; rows: number }[];
  points: number;
}

/** Reads one file; its problems are returned, never thrown (except a wrong encoding, which ends the file). */
async function readOne(
  file: UploadedLightCurveFile,
  options: ReadOptions,
): Promise<{ series: TargetSeries[]; errors: LightCurveRowError[]; errorCount: number; rows: number }> {
  if (file.size === 0)
    return { series: [], errors: [{ file: file.fileName, row: 0, field: 'file', message: 'the file is empty' }], errorCount: 1, rows: 0 };
  const reader = new LightCurveReader({ ...options, fileName: file.fileName });
  // The reader trims each cell itself; one delimiter (from the first line) parses faster than a list.
  const parser = parse({
    bom: true,
    skip_empty_lines: true,
    relax_column_count: true,
    comment: '#',
    delimiter: await delimiterOf(file.path),
  });
  const source = createReadStream(file.path).pipe(new Utf8Check(file.fileName));
  source.on('error', (err) => parser.destroy(err));
  source.pipe(parser);
  let row = -1;
  try {
    for await (const record of parser as AsyncIterable<string[]>) {
      if (row === -1) reader.header(record);
      else reader.row(record, row + 1);
      row++;
      // A file that is wrong throughout (the wrong file, or the wrong delimiter) stops early.
      if (reader.errorCount > 20 * LIGHT_CURVE_LIMITS.maxListedErrors) break;
    }
  } catch (err) {
    if (err instanceof AppError) throw err;
    return {
      series: [],
      errors: [{ file: file.fileName, row: 0, field: 'file', message: `the file cannot be read as CSV (${(err as Error).message})` }],
      errorCount: 1,
      rows: Math.max(row, 0),
    };
  } finally {
    source.destroy();
  }
  if (row === -1)
    return { series: [], errors: [{ file: file.fileName, row: 0, field: 'file', message: 'the file is empty' }], errorCount: 1, rows: 0 };
  if (row === 0)
    return {
      series: [],
      errors: [{ file: file.fileName, row: 0, field: 'file', message: 'the file has no rows after the header' }],
      errorCount: 1,
      rows: 0,
    };
  const out = reader.finish();
  return { series: out.series, errors: out.errors, errorCount: out.errorCount, rows: row };
}

/**
 * Reads every file and joins the series of each target; throws 400 `invalid_light_curve` with
 * every problem of every file (up to the listed maximum, with the total) when there is any.
 */
export async function readLightCurveFiles(files: UploadedLightCurveFile[], options: ReadOptions): Promise<ReadResult> {
  const errors: LightCurveRowError[] = [];
  let errorCount = 0;
  const parts: TargetSeries[] = [];
  const filesOf = new Map<number, string[]>();
  const counts: { fileName: string; rows: number }[] = [];
  for (const file of files) {
    const r = await readOne(file, options);
    errors.push(...r.errors);
    errorCount += r.errorCount;
    counts.push({ fileName: file.fileName, rows: r.rows });
    parts.push(...r.series);
    for (const part of r.series) filesOf.set(part.targetId, [...(filesOf.get(part.targetId) ?? []), file.fileName]);
  }
  const names = new Map(options.targets.map((t) => [t.id, t.name]));
  const merged = mergeTargetSeries(parts);
  for (const targetId of merged.mixedValueKinds) {
    errors.push({
      file: 'the upload',
      row: 0,
      field: 'file',
      message: `${names.get(targetId) ?? 'a target'} is given in magnitudes in one file and in flux in another: upload one kind per target`,
    });
    errorCount++;
  }
  const series: TargetSeries[] = [];
  let points = 0;
  for (const joined of merged.series) {
    if (joined.bjd.length > LIGHT_CURVE_LIMITS.maxPointsPerTarget) {
      errors.push({
        file: 'the upload',
        row: 0,
        field: 'file',
        message: `${names.get(joined.targetId) ?? 'a target'} has ${joined.bjd.length} points; at most ${LIGHT_CURVE_LIMITS.maxPointsPerTarget} are accepted per target`,
      });
      errorCount++;
      continue;
    }
    points += joined.bjd.length;
    series.push(joined);
  }
  if (!errors.length && points > LIGHT_CURVE_LIMITS.maxPointsPerUpload) {
    errors.push({
      file: 'the upload',
      row: 0,
      field: 'file',
      message: `the files hold ${points} points; at most ${LIGHT_CURVE_LIMITS.maxPointsPerUpload} are accepted in one upload (upload fewer targets at a time)`,
    });
    errorCount++;
  }
  if (!errors.length && !series.length) {
    errors.push({ file: 'the upload', row: 0, field: 'file', message: 'the files hold no photometry' });
    errorCount++;
  }
  if (errors.length) throw lightCurveErrors(errors, errorCount);
  return { series, filesOf, files: counts, points };
}
