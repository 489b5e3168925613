/**
 * The execution CSV (shared/src/night-plans/night-plans.ts): columns `target`, `node`,
 * `utc_time`, `status` (done or missed). Reading checks each row on its own and collects every
 * problem (row numbers count data rows from 1, as the target upload does); matching rows to
 * planned visits is the service's (it needs the database).
 */
import { parse } from 'csv-parse/sync';
import { EXECUTION_CSV_COLUMNS } from '@spincycle/shared/night-plans/night-plans';
import type { CsvRowError } from '@spincycle/shared/proposals/target-schemas';
import { AppError } from '../../http/app-error';
import { decodeCsvText } from '../proposals/targets/target-csv';

/** Largest execution file accepted, and most rows. */
export const EXECUTION_CSV_MAX_BYTES = 2 * 1024 * 1024;
export const EXECUTION_CSV_MAX_ROWS = 20_000;

export interface ExecutionRow {
  row: number;
  target: string;
  node: string;
  utcMs: number;
  status: 'done' | 'missed';
}

const ISO_INSTANT = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d{1,3})?)?(Z|[+-]\d{2}:\d{2})$/;

/** 400 `invalid_execution_log` with every problem (sorted by row, then column order). */
export function executionErrors(errors: CsvRowError[]): AppError {
  const order = (f: string) => (f === 'columns' ? -1 : EXECUTION_CSV_COLUMNS.indexOf(f as (typeof EXECUTION_CSV_COLUMNS)[number]));
  const sorted = [...errors].sort((a, b) => a.row - b.row || order(a.field) - order(b.field));
  const label = (e: CsvRowError) => (e.row === 0 ? `header: ${e.message}` : `row ${e.row}, ${e.field}: ${e.message}`);
  const fieldErrors: Record<string, string[]> = {};
  for (const e of sorted) (fieldErrors[e.row === 0 ? 'header' : `rows.${e.row}.${e.field}`] ??= []).push(label(e));
  const more =
    sorted.length > 1
      ? ` (and ${sorted.length - 1} more problem${sorted.length > 2 ? 's' : ''}; nothing was saved)`
      : ' (nothing was saved)';
  return new AppError('invalid_execution_log', label(sorted[0]) + more, 400, fieldErrors, { rows: sorted });
}

/** Reads the file: the rows that are well formed, and every problem found. Structural problems throw at once. */
export function readExecutionCsv(buffer: Buffer, filename: string): { rows: ExecutionRow[]; errors: CsvRowError[] } {
  const text = decodeCsvText(buffer, filename);
  let records: string[][];
  try {
    records = parse(text, { bom: true, skip_empty_lines: true, relax_column_count: true, trim: true });
  } catch (err) {
    throw executionErrors([{ row: 0, field: 'header', message: `the file cannot be read as CSV (${(err as Error).message})` }]);
  }
  const [header, ...data] = records;
  const names = (header ?? []).map((h) => h.toLowerCase());
  const missing = EXECUTION_CSV_COLUMNS.filter((c) => !names.includes(c));
  if (missing.length) {
    throw executionErrors([{ row: 0, field: 'header', message: `missing column${missing.length > 1 ? 's' : ''} ${missing.join(', ')}` }]);
  }
  if (!data.length) throw executionErrors([{ row: 0, field: 'header', message: 'the file has no rows after the header' }]);
  if (data.length > EXECUTION_CSV_MAX_ROWS) {
    throw executionErrors([{ row: 0, field: 'header', message: `the file has more than ${EXECUTION_CSV_MAX_ROWS} rows` }]);
  }
  const col = (c: string) => names.indexOf(c);
  const rows: ExecutionRow[] = [];
  const errors: CsvRowError[] = [];
  data.forEach((record, i) => {
    const row = i + 1;
    const get = (c: string) => (record[col(c)] ?? '').trim();
    const before = errors.length;
    const target = get('target');
    const node = get('node');
    const time = get('utc_time');
    const status = get('status').toLowerCase();
    if (!target) errors.push({ row, field: 'target', message: 'name the target' });
    else if (target.length > 200) errors.push({ row, field: 'target', message: 'must be at most 200 characters' });
    if (!node) errors.push({ row, field: 'node', message: 'name the node by its code' });
    const utcMs = ISO_INSTANT.test(time) ? Date.parse(time) : Number.NaN;
    if (!Number.isFinite(utcMs))
      errors.push({ row, field: 'utc_time', message: 'use an ISO 8601 time with its zone, e.g. 2027-03-04T02:15:00Z' });
    if (status !== 'done' && status !== 'missed') errors.push({ row, field: 'status', message: 'must be done or missed' });
    if (errors.length === before) rows.push({ row, target, node, utcMs, status: status as 'done' | 'missed' });
  });
  return { rows, errors };
}
