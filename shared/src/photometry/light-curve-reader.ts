/**
 * Reads the rows of one uploaded light-curve file (CSV already split into fields: the server
 * feeds rows from csv-parse's stream API, the command line from a synchronous parse), checks
 * every field, collects every problem with its row and column in plain words, and returns
 * each target's series with its times converted to BJD (TDB).
 *
 * Columns (header names, case-insensitive, trimmed; unknown extra columns are ignored): see
 * {@link LIGHT_CURVE_COLUMN_HELP} in photometry.ts. The time column is the first of `bjd`,
 * `time`, `jd`, `mjd`, `utc` present (bjd preferred: it is what the analysis uses); its name
 * says the time system except for `time`. A `mag` or `flux` column says the value kind; a
 * `value` column needs the form's. Per row, a `time_system` cell overrides both.
 *
 * Memory: rows are appended to growable typed buffers per target (no object per row), so a
 * file of 10⁵ rows costs a few MB.
 */
import { MJD_OFFSET, parseIsoUtc, toBjdTdb } from '../science/rotation/time-systems';
import {
  type LightCurveRowError,
  type LightCurveValueKind,
  type TimeSystem,
  LIGHT_CURVE_LIMITS,
  TIME_SYSTEMS,
  TIME_SYSTEM_LABELS,
} from './photometry';

export interface ReaderTarget {
  id: number;
  name: string;
  raDeg: number;
  decDeg: number;
}

export interface ReaderOptions {
  fileName: string;
  /** The form's choice; a time_system column or the time column's name (bjd/jd/mjd/utc) may say it instead. */
  timeSystem?: TimeSystem;
  /** The form's choice; a `mag` or `flux` column name says it instead. */
  valueKind?: LightCurveValueKind;
  /** The target of a file without a `target` column (and of rows whose target cell is empty). */
  targetId?: number;
  /** The proposal's targets (names matched case-insensitively, trimmed). */
  targets: ReaderTarget[];
  /** Known node codes (case-insensitive); an unknown code is a row error; undefined: any code accepted. */
  nodeCodes?: string[];
}

/** One target's points, in file order, times in BJD (TDB). */
export interface TargetSeries {
  targetId: number;
  bjd: Float64Array;
  values: Float64Array;
  /** Null when the file has no error column. */
  errors: Float64Array | null;
  nodes: (string | null)[];
  /** The time systems the rows used (distinct). */
  timeSystems: TimeSystem[];
  valueKind: LightCurveValueKind;
}

export interface ReaderResult {
  series: TargetSeries[];
  /** Sorted by row; the first LIGHT_CURVE_LIMITS.maxListedErrors. */
  errors: LightCurveRowError[];
  errorCount: number;
}

/** Times accepted: 1990-01-01 to 2100-01-01 (JD, UTC; the same bounds for BJD). */
export const EARLIEST_JD = 2447892.5;
export const LATEST_JD = 2488069.5;
/** Magnitudes accepted. */
export const MAG_RANGE = { min: -5, max: 30 } as const;
/** A JD below this is probably an MJD (and an MJD above it probably a JD). */
const JD_THRESHOLD = 2_400_000;

const TIME_COLUMNS: readonly { name: string; system: TimeSystem | null }[] = [
  { name: 'bjd', system: 'bjd_tdb' },
  { name: 'time', system: null },
  { name: 'jd', system: 'jd_utc' },
  { name: 'mjd', system: 'mjd_utc' },
  { name: 'utc', system: 'iso_utc' },
];
const ERROR_COLUMNS = ['error', 'err', 'sigma', 'uncertainty', 'mag_err', 'flux_err', 'magerr', 'fluxerr', 'e_mag', 'e_flux'];
const ISO_EXAMPLE = '2026-03-14T02:31:07Z';
const NUMBER_PATTERN = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const SYSTEM_CODES: Record<TimeSystem, number> = { bjd_tdb: 0, jd_utc: 1, mjd_utc: 2, iso_utc: 3 };

/** A growable Float64Array. */
class Buffer64 {
  data = new Float64Array(256);
  length = 0;
  push(v: number): void {
    if (this.length === this.data.length) {
      const next = new Float64Array(this.data.length * 2);
      next.set(this.data);
      this.data = next;
    }
    this.data[this.length++] = v;
  }
  view(): Float64Array {
    return this.data.slice(0, this.length);
  }
}

/** A growable Int32Array (node index per point, time system code per point). */
class Buffer32 {
  data = new Int32Array(256);
  length = 0;
  push(v: number): void {
    if (this.length === this.data.length) {
      const next = new Int32Array(this.data.length * 2);
      next.set(this.data);
      this.data = next;
    }
    this.data[this.length++] = v;
  }
}

interface Accumulator {
  target: ReaderTarget;
  /** The time as read: BJD (TDB) or JD (UTC), by `system`. */
  time: Buffer64;
  values: Buffer64;
  errors: Buffer64;
  node: Buffer32;
  system: Buffer32;
  full: boolean;
}

interface Columns {
  time: number;
  timeName: string;
  timeSystem: TimeSystem | null;
  value: number;
  valueName: string;
  error: number;
  node: number;
  target: number;
  timeSystemColumn: number;
  /** Fields a row needs at least. */
  needed: number;
}

/** Shows a cell in a message: quoted, shortened. */
function shown(cell: string): string {
  const t = cell.length > 40 ? `${cell.slice(0, 37)}…` : cell;
  return `"${t}"`;
}

export class LightCurveReader {
  private readonly options: ReaderOptions;
  private readonly targetsByName = new Map<string, ReaderTarget>();
  /** The last target cell read and what it named: files list a target's rows together. */
  private lastTargetCell: string | null = null;
  private lastTarget: ReaderTarget | null = null;
  private readonly targetsById = new Map<number, ReaderTarget>();
  private readonly nodeCodes: Map<string, string> | null;
  private readonly nodeNames: string[] = [];
  private readonly nodeIndex = new Map<string, number>();
  private readonly accumulators = new Map<number, Accumulator>();
  private readonly errors: LightCurveRowError[] = [];
  private count = 0;
  private columns: Columns | null = null;
  private valueKind: LightCurveValueKind | null = null;
  private headerSeen = false;

  constructor(options: ReaderOptions) {
    this.options = options;
    for (const t of options.targets) {
      this.targetsByName.set(t.name.trim().toLowerCase(), t);
      this.targetsById.set(t.id, t);
    }
    this.nodeCodes = options.nodeCodes ? new Map(options.nodeCodes.map((c) => [c.trim().toLowerCase(), c.trim()])) : null;
  }

  /** Problems found so far (all of them, listed or not). */
  get errorCount(): number {
    return this.count;
  }

  private problem(row: number, field: string, message: string): void {
    this.count++;
    if (this.errors.length < LIGHT_CURVE_LIMITS.maxListedErrors) {
      this.errors.push({ file: this.options.fileName, row, field, message });
    }
  }

  /** Reads the header row; its problems become row-0 errors (field `header`). */
  header(names: string[]): void {
    this.headerSeen = true;
    const lower = names.map((n) =>
      n
        .replace(/^\uFEFF/, '')
        .trim()
        .toLowerCase(),
    );
    const at = (name: string) => lower.indexOf(name);
    const bad = (message: string) => this.problem(0, 'header', `header: ${message}`);

    let time = -1;
    let timeName = '';
    let timeSystem: TimeSystem | null = null;
    for (const c of TIME_COLUMNS) {
      const i = at(c.name);
      if (i >= 0) {
        time = i;
        timeName = c.name;
        timeSystem = c.system;
        break;
      }
    }
    if (time < 0) bad(`no time column (found: ${listNames(names)}); name one time, bjd, jd, mjd or utc`);

    const mag = at('mag');
    const flux = at('flux');
    const generic = at('value');
    let value = -1;
    let valueName = '';
    if (mag >= 0 && flux >= 0) {
      bad('both a mag and a flux column: keep one (the file must hold one kind of value)');
    } else if (mag >= 0) {
      value = mag;
      valueName = 'mag';
      this.valueKind = 'mag';
    } else if (flux >= 0) {
      value = flux;
      valueName = 'flux';
      this.valueKind = 'flux';
    } else if (generic >= 0) {
      value = generic;
      valueName = 'value';
      this.valueKind = this.options.valueKind ?? null;
      if (this.valueKind === null)
        bad('the value column is named "value": choose magnitudes or relative flux, or name the column mag or flux');
    } else {
      bad(`no value column (found: ${listNames(names)}); name one mag, flux or value`);
    }

    const timeSystemColumn = at('time_system');
    if (time >= 0 && timeSystem === null && timeSystemColumn < 0 && this.options.timeSystem === undefined) {
      bad(
        'the time column is named "time" and nothing says how it counts: choose the time system, name the column bjd, jd, mjd or utc, or add a time_system column',
      );
    }
    const target = at('target');
    if (target < 0 && this.options.targetId === undefined) {
      bad('no target column: choose the target the file belongs to, or add a target column with the targets’ names');
    }
    if (this.options.targetId !== undefined && !this.targetsById.has(this.options.targetId)) {
      bad(`target ${this.options.targetId} is not a target of this proposal`);
    }
    let error = -1;
    for (const name of ERROR_COLUMNS) {
      const i = at(name);
      if (i >= 0) {
        error = i;
        break;
      }
    }
    const node = at('node');
    if (time < 0 || value < 0 || this.count > 0) return;
    this.columns = {
      time,
      timeName,
      timeSystem,
      value,
      valueName,
      error,
      node,
      target,
      timeSystemColumn,
      needed: Math.max(time, value) + 1,
    };
  }

  /**
   * Reads one data row (`row`: the data row's number, from 1). Every field is checked and every
   * problem recorded; a row without problems is appended to its target's series.
   */
  row(record: string[], row: number): void {
    const c = this.columns;
    if (!c) {
      if (!this.headerSeen) {
        this.headerSeen = true;
        this.problem(0, 'header', 'header: the file has no header row naming its columns (e.g. time,mag,error)');
      }
      return;
    }
    if (record.length < c.needed) {
      this.problem(
        row,
        'row',
        `row ${row}: ${record.length} field${record.length === 1 ? '' : 's'}, but the ${c.timeName} and ${c.valueName} columns need at least ${c.needed}`,
      );
      return;
    }
    const before = this.count;
    const cell = (i: number) => (i >= 0 && i < record.length ? record[i].trim() : '');

    // Target.
    let target: ReaderTarget | null = null;
    const targetCell = cell(c.target);
    if (c.target >= 0 && targetCell !== '') {
      if (targetCell !== this.lastTargetCell) {
        this.lastTargetCell = targetCell;
        this.lastTarget = this.targetsByName.get(targetCell.toLowerCase()) ?? null;
      }
      target = this.lastTarget;
      if (!target) this.problem(row, 'target', `row ${row}, target: ${shown(targetCell)} is not a target of this proposal`);
    } else if (this.options.targetId !== undefined) {
      target = this.targetsById.get(this.options.targetId) ?? null;
    } else {
      this.problem(row, 'target', `row ${row}, target: empty; give the target’s name as in the proposal`);
    }

    // Time system.
    let system: TimeSystem | null = c.timeSystem ?? this.options.timeSystem ?? null;
    const systemCell = cell(c.timeSystemColumn).toLowerCase();
    if (c.timeSystemColumn >= 0 && systemCell !== '') {
      if ((TIME_SYSTEMS as readonly string[]).includes(systemCell)) {
        system = systemCell as TimeSystem;
      } else {
        this.problem(row, 'time_system', `row ${row}, time_system: ${shown(systemCell)} is not one of ${TIME_SYSTEMS.join(', ')}`);
        system = null;
      }
    } else if (system === null) {
      this.problem(row, 'time_system', `row ${row}, time_system: empty, and nothing else says how the time counts`);
    }

    // Time.
    const timeCell = cell(c.time);
    const tf = c.timeName;
    let time = NaN;
    if (timeCell === '') {
      this.problem(row, tf, `row ${row}, ${tf}: empty; every row needs the time of its exposure`);
    } else if (system === 'iso_utc') {
      const jd = parseIsoUtc(timeCell);
      if (jd === null) {
        this.problem(row, tf, `row ${row}, ${tf}: ${shown(timeCell)} is not a date and time (use ISO 8601 UTC, e.g. ${ISO_EXAMPLE})`);
      } else {
        time = jd;
        this.checkEpoch(row, tf, timeCell, jd, 'date');
      }
    } else if (system !== null) {
      const v = parseNumber(timeCell);
      if (v === null) {
        this.problem(row, tf, `row ${row}, ${tf}: ${shown(timeCell)} is not a number (${TIME_SYSTEM_LABELS[system]})`);
      } else if (!Number.isFinite(v)) {
        this.problem(row, tf, `row ${row}, ${tf}: ${shown(timeCell)} is not a finite number`);
      } else if (system === 'jd_utc' && v < JD_THRESHOLD) {
        this.problem(
          row,
          tf,
          `row ${row}, ${tf}: ${shown(timeCell)} is below 2 400 000, too small for a JD: it is probably an MJD (choose MJD, or name the column mjd)`,
        );
      } else if (system === 'mjd_utc' && v > JD_THRESHOLD) {
        this.problem(
          row,
          tf,
          `row ${row}, ${tf}: ${shown(timeCell)} is above 2 400 000, too large for an MJD: it is probably a JD (choose JD, or name the column jd)`,
        );
      } else if (system === 'bjd_tdb' && v < JD_THRESHOLD) {
        this.problem(
          row,
          tf,
          `row ${row}, ${tf}: ${shown(timeCell)} is below 2 400 000, too small for a BJD: give the full BJD (TDB) in days, not days since another zero point`,
        );
      } else {
        time = system === 'mjd_utc' ? v + MJD_OFFSET : v;
        this.checkEpoch(row, tf, timeCell, time, system === 'bjd_tdb' ? 'BJD' : system === 'jd_utc' ? 'JD' : 'MJD');
      }
    }

    // Value.
    const valueCell = cell(c.value);
    const vf = c.valueName;
    const kind = this.valueKind;
    let value = NaN;
    if (valueCell === '') {
      this.problem(row, vf, `row ${row}, ${vf}: empty; every row needs a ${kind === 'flux' ? 'flux' : 'magnitude'}`);
    } else {
      const v = parseNumber(valueCell);
      if (v === null) this.problem(row, vf, `row ${row}, ${vf}: ${shown(valueCell)} is not a number`);
      else if (!Number.isFinite(v)) this.problem(row, vf, `row ${row}, ${vf}: ${shown(valueCell)} is not a finite number`);
      else if (kind === 'flux' && v <= 0) this.problem(row, vf, `row ${row}, ${vf}: ${shown(valueCell)} is not a positive flux`);
      else if (kind === 'mag' && (v < MAG_RANGE.min || v > MAG_RANGE.max)) {
        this.problem(
          row,
          vf,
          `row ${row}, ${vf}: ${shown(valueCell)} is outside the magnitudes accepted (${MAG_RANGE.min} to ${MAG_RANGE.max}); is it a flux?`,
        );
      } else value = v;
    }

    // Error.
    let error = NaN;
    if (c.error >= 0) {
      const errorCell = cell(c.error);
      if (errorCell === '') {
        this.problem(row, 'error', `row ${row}, error: empty; give the 1σ error of every row, or leave the error column out`);
      } else {
        const v = parseNumber(errorCell);
        if (v === null) this.problem(row, 'error', `row ${row}, error: ${shown(errorCell)} is not a number`);
        else if (!Number.isFinite(v)) this.problem(row, 'error', `row ${row}, error: ${shown(errorCell)} is not a finite number`);
        else if (v <= 0) this.problem(row, 'error', `row ${row}, error: ${shown(errorCell)} is not positive (a 1σ error must be above 0)`);
        else error = v;
      }
    }

    // Node.
    let nodeIdx = -1;
    const nodeCell = cell(c.node);
    if (c.node >= 0 && nodeCell !== '') {
      let code: string | undefined = nodeCell;
      if (this.nodeCodes) {
        code = this.nodeCodes.get(nodeCell.toLowerCase());
        if (code === undefined) this.problem(row, 'node', `row ${row}, node: ${shown(nodeCell)} is not the code of a node of this network`);
      }
      if (code !== undefined) {
        const key = code.toLowerCase();
        let idx = this.nodeIndex.get(key);
        if (idx === undefined) {
          idx = this.nodeNames.length;
          this.nodeNames.push(code);
          this.nodeIndex.set(key, idx);
        }
        nodeIdx = idx;
      }
    }

    if (this.count > before || !target || system === null) return;
    let acc = this.accumulators.get(target.id);
    if (!acc) {
      acc = {
        target,
        time: new Buffer64(),
        values: new Buffer64(),
        errors: new Buffer64(),
        node: new Buffer32(),
        system: new Buffer32(),
        full: false,
      };
      this.accumulators.set(target.id, acc);
    }
    if (acc.time.length >= LIGHT_CURVE_LIMITS.maxPointsPerTarget) {
      if (!acc.full) {
        acc.full = true;
        this.problem(
          row,
          'target',
          `row ${row}: ${target.name} has more than ${LIGHT_CURVE_LIMITS.maxPointsPerTarget.toLocaleString('en-GB')} points in this file (the most accepted per target); bin the data or split the season`,
        );
      }
      return;
    }
    acc.time.push(time);
    acc.values.push(value);
    if (c.error >= 0) acc.errors.push(error);
    acc.node.push(nodeIdx);
    acc.system.push(SYSTEM_CODES[system]);
  }

  private checkEpoch(row: number, field: string, cellText: string, jd: number, what: string): void {
    if (jd < EARLIEST_JD || jd > LATEST_JD) {
      this.problem(
        row,
        field,
        `row ${row}, ${field}: ${shown(cellText)} is a ${what} before 1990 or after 2100; check the column and its time system`,
      );
    }
  }

  /** The series of every target (times in BJD (TDB), converted with each target's coordinates) and the problems. */
  finish(): ReaderResult {
    if (!this.headerSeen) this.problem(0, 'header', 'header: the file is empty');
    else if (this.columns && this.accumulators.size === 0 && this.count === 0) {
      this.problem(0, 'file', 'the file holds no data rows');
    }
    const errors = [...this.errors].sort((a, b) => a.row - b.row);
    const series: TargetSeries[] = [];
    const kind = this.valueKind ?? 'mag';
    for (const t of this.options.targets) {
      const acc = this.accumulators.get(t.id);
      if (!acc || acc.time.length === 0) continue;
      series.push(this.seriesOf(acc, kind));
    }
    return { series, errors, errorCount: this.count };
  }

  private seriesOf(acc: Accumulator, valueKind: LightCurveValueKind): TargetSeries {
    const n = acc.time.length;
    const raw = acc.time.data;
    const codes = acc.system.data;
    const bjd = new Float64Array(n);
    // Every UTC time (JD, MJD made JD, ISO as JD) goes through one batch conversion.
    let utcCount = 0;
    const used = new Set<number>();
    for (let i = 0; i < n; i++) {
      used.add(codes[i]);
      if (codes[i] !== SYSTEM_CODES.bjd_tdb) utcCount++;
    }
    if (utcCount > 0) {
      const utc = new Float64Array(utcCount);
      for (let i = 0, j = 0; i < n; i++) if (codes[i] !== SYSTEM_CODES.bjd_tdb) utc[j++] = raw[i];
      const converted = toBjdTdb(utc, acc.target.raDeg, acc.target.decDeg);
      for (let i = 0, j = 0; i < n; i++) bjd[i] = codes[i] === SYSTEM_CODES.bjd_tdb ? raw[i] : converted[j++];
    } else {
      bjd.set(raw.subarray(0, n));
    }
    const nodes: (string | null)[] = new Array<string | null>(n);
    for (let i = 0; i < n; i++) nodes[i] = acc.node.data[i] < 0 ? null : this.nodeNames[acc.node.data[i]];
    return {
      targetId: acc.target.id,
      bjd,
      values: acc.values.view(),
      errors: this.columns && this.columns.error >= 0 ? acc.errors.view() : null,
      nodes,
      timeSystems: TIME_SYSTEMS.filter((s) => used.has(SYSTEM_CODES[s])),
      valueKind,
    };
  }
}

/** A decimal number (sign, digits, point, exponent), or null; may be ±Infinity when out of range. */
function parseNumber(text: string): number | null {
  if (!NUMBER_PATTERN.test(text)) return null;
  return Number(text);
}

function listNames(names: string[]): string {
  const shownNames = names.filter((n) => n.trim() !== '').slice(0, 8);
  return shownNames.length === 0 ? 'none' : shownNames.map((n) => n.trim()).join(', ');
}

/**
 * Joins the series of several files (or readers) target by target, in the order given: the
 * upload's files make one series per target. Each series keeps file order; the analysis
 * sorts by time. The caller checks LIGHT_CURVE_LIMITS.maxPointsPerTarget on the result.
 * Magnitudes and fluxes cannot be joined: a target whose files mix them is left out of
 * `series` and listed in `mixedValueKinds` (the caller refuses the upload).
 */
export function mergeTargetSeries(parts: TargetSeries[]): { series: TargetSeries[]; mixedValueKinds: number[] } {
  const byTarget = new Map<number, TargetSeries[]>();
  for (const s of parts) {
    const list = byTarget.get(s.targetId);
    if (list) list.push(s);
    else byTarget.set(s.targetId, [s]);
  }
  const out: TargetSeries[] = [];
  const mixedValueKinds: number[] = [];
  for (const [targetId, list] of byTarget) {
    if (list.some((x) => x.valueKind !== list[0].valueKind)) {
      mixedValueKinds.push(targetId);
      continue;
    }
    if (list.length === 1) {
      out.push(list[0]);
      continue;
    }
    const n = list.reduce((s, x) => s + x.bjd.length, 0);
    const bjd = new Float64Array(n);
    const values = new Float64Array(n);
    const allErrors = list.every((x) => x.errors !== null);
    const errors = allErrors ? new Float64Array(n) : null;
    const nodes: (string | null)[] = [];
    let o = 0;
    for (const x of list) {
      bjd.set(x.bjd, o);
      values.set(x.values, o);
      if (errors && x.errors) errors.set(x.errors, o);
      for (const node of x.nodes) nodes.push(node);
      o += x.bjd.length;
    }
    const systems = new Set(list.flatMap((x) => x.timeSystems));
    out.push({
      targetId,
      bjd,
      values,
      // Files without errors make the merged series unweighted: weights from some files only would mislead.
      errors,
      nodes,
      timeSystems: TIME_SYSTEMS.filter((s) => systems.has(s)),
      valueKind: list[0].valueKind,
    });
  }
  return { series: out, mixedValueKinds };
}
