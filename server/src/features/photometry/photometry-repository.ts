/**
 * Queries of the returned photometry: uploads, stored light curves (float64 arrays in bytea),
 * analysis runs and measurements. Converts rows to camelCase here and nowhere else.
 */
import type { Knex } from 'knex';
import {
  DEFAULT_DETREND,
  detrendOptionsSchema,
  type DetrendOptions,
  type ImpliedAge,
  type LightCurveValueKind,
  type PhotometryRunState,
  type PhotometryRunStatus,
  type RotationMeasurement,
  type RotationVerdict,
  type TimeSystem,
} from '@spincycle/shared/photometry/photometry';
import type { TargetSeries } from '@spincycle/shared/photometry/light-curve-reader';

/** No node given for the point (in `node_index`). */
const NO_NODE = 0xffff;

const toFloat64Bytes = (a: ArrayLike<number>): Buffer => {
  const f = a instanceof Float64Array ? a : Float64Array.from(a);
  return Buffer.from(f.buffer, f.byteOffset, f.byteLength);
};

/** A bytea's float64 array (copied: a Buffer from the pool may not be 8-byte aligned). */
const fromFloat64Bytes = (b: Buffer): Float64Array => {
  const out = new Float64Array(b.length / 8);
  for (let i = 0; i < out.length; i++) out[i] = b.readDoubleLE(i * 8);
  return out;
};

export interface StoredLightCurve {
  targetId: number;
  proposalId: number;
  uploadId: number;
  points: number;
  valueKind: LightCurveValueKind;
  timeSystems: TimeSystem[];
  nodeCodes: string[];
  /** The files of its upload that held this target's rows. */
  fileNames: string[];
  firstBjd: number;
  lastBjd: number;
  updatedAt: Date;
}

export interface LightCurveData extends StoredLightCurve {
  bjd: Float64Array;
  values: Float64Array;
  errors: Float64Array | null;
  nodes: (string | null)[] | null;
}

interface LightCurveRow {
  target_id: number;
  proposal_id: number;
  upload_id: number;
  point_count: number;
  value_kind: LightCurveValueKind;
  time_systems: TimeSystem[];
  node_codes: string[];
  file_names: string[];
  first_bjd: number;
  last_bjd: number;
  updated_at: Date;
  bjd?: Buffer;
  values?: Buffer;
  errors?: Buffer | null;
  node_index?: Buffer | null;
}

const SUMMARY_COLUMNS = [
  'target_id',
  'proposal_id',
  'upload_id',
  'point_count',
  'value_kind',
  'time_systems',
  'node_codes',
  'file_names',
  'first_bjd',
  'last_bjd',
  'updated_at',
];

function toStoredLightCurve(r: LightCurveRow): StoredLightCurve {
  return {
    targetId: r.target_id,
    proposalId: r.proposal_id,
    uploadId: r.upload_id,
    points: r.point_count,
    valueKind: r.value_kind,
    timeSystems: r.time_systems,
    nodeCodes: r.node_codes,
    fileNames: r.file_names,
    firstBjd: r.first_bjd,
    lastBjd: r.last_bjd,
    updatedAt: r.updated_at,
  };
}

/** Records an upload; returns its id. */
export async function insertUpload(
  db: Knex,
  u: { proposalId: number; uploadedBy: number; files: { fileName: string; rows: number }[]; points: number; at: Date },
): Promise<number> {
  const [{ id }] = await db('light_curve_uploads')
    .insert({ proposal_id: u.proposalId, uploaded_by: u.uploadedBy, files: JSON.stringify(u.files), points: u.points, uploaded_at: u.at })
    .returning('id');
  return Number(id);
}

/** Stores (replaces) a target's light curve. */
export async function upsertLightCurve(
  db: Knex,
  c: { proposalId: number; uploadId: number; series: TargetSeries; fileNames: string[]; at: Date },
): Promise<void> {
  const s = c.series;
  const n = s.bjd.length;
  const codes = [...new Set(s.nodes.filter((x): x is string => x !== null))].sort();
  let nodeIndex: Buffer | null = null;
  if (codes.length) {
    const index = new Map(codes.map((code, i) => [code, i]));
    nodeIndex = Buffer.alloc(2 * n);
    for (let i = 0; i < n; i++) nodeIndex.writeUInt16LE(s.nodes[i] === null ? NO_NODE : index.get(s.nodes[i]!)!, 2 * i);
  }
  let first = Infinity;
  let last = -Infinity;
  for (let i = 0; i < n; i++) {
    if (s.bjd[i] < first) first = s.bjd[i];
    if (s.bjd[i] > last) last = s.bjd[i];
  }
  const row = {
    target_id: s.targetId,
    proposal_id: c.proposalId,
    upload_id: c.uploadId,
    point_count: n,
    value_kind: s.valueKind,
    time_systems: s.timeSystems,
    node_codes: codes,
    file_names: c.fileNames,
    first_bjd: first,
    last_bjd: last,
    bjd: toFloat64Bytes(s.bjd),
    values: toFloat64Bytes(s.values),
    errors: s.errors ? toFloat64Bytes(s.errors) : null,
    node_index: nodeIndex,
    updated_at: c.at,
  };
  await db('light_curves').insert(row).onConflict('target_id').merge();
}

/** The program's stored light curves, without their data. */
export async function listLightCurves(db: Knex, proposalId: number): Promise<StoredLightCurve[]> {
  const rows = (await db('light_curves').where('proposal_id', proposalId).select(SUMMARY_COLUMNS)) as LightCurveRow[];
  return rows.map(toStoredLightCurve);
}

/** One target's light curve with its data. */
export async function findLightCurveData(db: Knex, targetId: number): Promise<LightCurveData | undefined> {
  const r = (await db('light_curves').where('target_id', targetId).first()) as LightCurveRow | undefined;
  if (!r) return undefined;
  let nodes: (string | null)[] | null = null;
  if (r.node_index) {
    nodes = new Array<string | null>(r.point_count);
    for (let i = 0; i < r.point_count; i++) {
      const k = r.node_index.readUInt16LE(2 * i);
      nodes[i] = k === NO_NODE ? null : r.node_codes[k];
    }
  }
  return {
    ...toStoredLightCurve(r),
    bjd: fromFloat64Bytes(r.bjd!),
    values: fromFloat64Bytes(r.values!),
    errors: r.errors ? fromFloat64Bytes(r.errors) : null,
    nodes,
  };
}

/** One upload: its files (name and rows), when and by whom. */
export async function findUpload(db: Knex, uploadId: number) {
  const r = await db('light_curve_uploads as u')
    .leftJoin('accounts as a', 'a.id', 'u.uploaded_by')
    .where('u.id', uploadId)
    .first('u.id', 'u.files', 'u.uploaded_at', 'a.display_name');
  if (!r) return undefined;
  return {
    id: Number(r.id),
    files: r.files as { fileName: string; rows: number }[],
    uploadedAt: r.uploaded_at as Date,
    uploadedBy: (r.display_name as string | null) ?? null,
  };
}

interface RunRow {
  id: number;
  proposal_id: number;
  state: PhotometryRunState;
  total: number;
  done: number;
  detrend: unknown;
  requested_at: Date;
  started_at: Date | null;
  finished_at: Date | null;
  error: string | null;
}

export interface StoredRun extends PhotometryRunStatus {
  proposalId: number;
  detrend: DetrendOptions;
}

const iso = (d: Date | null) => (d ? d.toISOString() : null);

function toRun(r: RunRow): StoredRun {
  const parsed = detrendOptionsSchema.safeParse(r.detrend);
  return {
    id: r.id,
    proposalId: r.proposal_id,
    state: r.state,
    total: r.total,
    done: r.done,
    requestedAt: r.requested_at.toISOString(),
    startedAt: iso(r.started_at),
    finishedAt: iso(r.finished_at),
    error: r.error,
    detrend: parsed.success ? parsed.data : DEFAULT_DETREND,
  };
}

export function toRunStatus({ proposalId: _p, detrend: _d, ...status }: StoredRun): PhotometryRunStatus {
  return status;
}

export async function insertRun(
  db: Knex,
  r: { proposalId: number; total: number; detrend: DetrendOptions; requestedBy: number; at: Date },
): Promise<StoredRun> {
  const [row] = (await db('photometry_runs')
    .insert({
      proposal_id: r.proposalId,
      total: r.total,
      detrend: JSON.stringify(r.detrend),
      requested_by: r.requestedBy,
      requested_at: r.at,
    })
    .returning('*')) as RunRow[];
  return toRun(row);
}

export async function findRun(db: Knex, runId: number): Promise<StoredRun | undefined> {
  const r = (await db('photometry_runs').where('id', runId).first()) as RunRow | undefined;
  return r && toRun(r);
}

export async function findLatestRun(db: Knex, proposalId: number): Promise<StoredRun | undefined> {
  const r = (await db('photometry_runs').where('proposal_id', proposalId).orderBy('id', 'desc').first()) as RunRow | undefined;
  return r && toRun(r);
}

/** Stops the program's unfinished runs older than `runId` (a newer upload or analysis replaced them). */
export async function supersedeRuns(db: Knex, proposalId: number, runId: number, at: Date): Promise<void> {
  await db('photometry_runs')
    .where('proposal_id', proposalId)
    .where('id', '<', runId)
    .whereIn('state', ['queued', 'running'])
    .update({ state: 'failed', finished_at: at, error: 'Stopped: a newer upload or analysis replaced it.' });
}

/** queued → running; false when the run is gone or no longer queued. */
export async function markRunRunning(db: Knex, runId: number, at: Date): Promise<boolean> {
  const n = await db('photometry_runs').where({ id: runId, state: 'queued' }).update({ state: 'running', started_at: at });
  return n === 1;
}

/** One more target analysed; false when the run was stopped meanwhile. */
export async function addRunProgress(db: Knex, runId: number): Promise<boolean> {
  const n = await db('photometry_runs')
    .where({ id: runId, state: 'running' })
    .update({ done: db.raw('LEAST(done + 1, total)') });
  return n === 1;
}

export async function finishRun(db: Knex, runId: number, at: Date): Promise<void> {
  await db('photometry_runs')
    .where({ id: runId, state: 'running' })
    .update({ state: 'done', finished_at: at, done: db.raw('total') });
}

export async function failRun(db: Knex, runId: number, message: string, at: Date): Promise<void> {
  await db('photometry_runs')
    .where('id', runId)
    .whereIn('state', ['queued', 'running'])
    .update({ state: 'failed', finished_at: at, error: message });
}

/** Runs queued or running for longer than `olderThanMs` (a worker died): failed, so that the team can ask again. */
export async function failStaleRuns(db: Knex, proposalId: number, now: Date, olderThanMs: number): Promise<void> {
  await db('photometry_runs')
    .where('proposal_id', proposalId)
    .whereIn('state', ['queued', 'running'])
    .where('requested_at', '<', new Date(now.getTime() - olderThanMs))
    .update({ state: 'failed', finished_at: now, error: 'The analysis did not finish within an hour; upload or analyse again.' });
}

/** Stores a target's measurement (replacing the earlier one). */
export async function upsertMeasurement(
  db: Knex,
  m: { targetId: number; proposalId: number; runId: number; uploadId: number; result: RotationMeasurement; at: Date },
): Promise<void> {
  const r = m.result;
  await db('rotation_measurements')
    .insert({
      target_id: m.targetId,
      proposal_id: m.proposalId,
      run_id: m.runId,
      light_curve_upload_id: m.uploadId,
      verdict: r.verdict,
      period_days: r.best?.periodDays ?? null,
      period_uncertainty_days: r.best?.periodUncertaintyDays ?? null,
      false_alarm_probability: r.best?.falseAlarmProbability ?? null,
      semi_amplitude_ppm: r.best?.semiAmplitudePpm ?? null,
      semi_amplitude_mmag: r.best?.semiAmplitudeMmag ?? null,
      alias_flagged: r.alias.flagged,
      double_period_days: r.doublePeriod?.flagged ? r.doublePeriod.doublePeriodDays : null,
      age: r.age ? JSON.stringify(r.age) : null,
      result: JSON.stringify(r),
      analysed_at: m.at,
    })
    .onConflict('target_id')
    .merge();
}

export interface MeasurementSummary {
  targetId: number;
  runId: number;
  uploadId: number;
  verdict: RotationVerdict;
  periodDays: number | null;
  periodUncertaintyDays: number | null;
  falseAlarmProbability: number | null;
  semiAmplitudePpm: number | null;
  semiAmplitudeMmag: number | null;
  aliasFlagged: boolean;
  /** Twice the best period when the light curve suggests two spot groups, else null. */
  doublePeriodDays: number | null;
  age: ImpliedAge | null;
  analysedAt: Date;
}

/** The program's measurements without their full results. */
export async function listMeasurements(db: Knex, proposalId: number): Promise<MeasurementSummary[]> {
  const rows = await db('rotation_measurements')
    .where('proposal_id', proposalId)
    .select(
      'target_id',
      'run_id',
      'light_curve_upload_id',
      'verdict',
      'period_days',
      'period_uncertainty_days',
      'false_alarm_probability',
      'semi_amplitude_ppm',
      'semi_amplitude_mmag',
      'alias_flagged',
      'double_period_days',
      'age',
      'analysed_at',
    );
  return rows.map((r) => ({
    targetId: r.target_id,
    runId: r.run_id,
    uploadId: r.light_curve_upload_id,
    verdict: r.verdict,
    periodDays: r.period_days,
    periodUncertaintyDays: r.period_uncertainty_days,
    falseAlarmProbability: r.false_alarm_probability,
    semiAmplitudePpm: r.semi_amplitude_ppm,
    semiAmplitudeMmag: r.semi_amplitude_mmag,
    aliasFlagged: r.alias_flagged,
    doublePeriodDays: r.double_period_days,
    age: (r.age as ImpliedAge | null) ?? null,
    analysedAt: r.analysed_at,
  }));
}

export async function findMeasurementResult(db: Knex, targetId: number): Promise<RotationMeasurement | undefined> {
  const r = await db('rotation_measurements').where('target_id', targetId).first('result');
  return r ? (r.result as RotationMeasurement) : undefined;
}
