/**
 * Returned photometry of a program, for its team: upload light curves (every problem of every
 * file reported at once, nothing stored on any), analyse them in the worker (a run with a
 * progress bar), read the program's table, a target's measurement, and export the table.
 * Everyone else gets the proposal's 404 (proposal-access.ts).
 */
import { stringify } from 'csv-stringify/sync';
import type { Knex } from 'knex';
import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import { stripControlCharacters } from '@spincycle/shared/http/text';
import {
  DEFAULT_DETREND,
  detrendOptionsSchema,
  type DetrendOptions,
  type LightCurveUploadFields,
  type PhotometryRunStatus,
  type PhotometryTargetRow,
  type ProgramPhotometry,
  type TargetPhotometry,
  ROTATION_VERDICT_LABELS,
} from '@spincycle/shared/photometry/photometry';
import type { TargetColourSystem } from '@spincycle/shared/science/colour-sequence';
import { fitClusterAge } from '@spincycle/shared/science/rotation';
import type { AppContext } from '../../app-context';
import { AppError } from '../../http/app-error';
import { accessProposal } from '../proposals/proposal-access';
import { escapeFormulaCell } from '../proposals/targets/target-csv';
import { listPrograms } from '../night-plans/night-plan-repository';
import { programProgress } from '../night-plans/night-plan-service';
import { readLightCurveFiles } from './light-curve-files';
import { measureContextFor, planBasesOf, TARGET_COLUMNS, type TargetRow } from './photometry-analysis';
import {
  failStaleRuns,
  findLatestRun,
  findMeasurementResult,
  insertRun,
  insertUpload,
  listLightCurves,
  listMeasurements,
  findUpload,
  supersedeRuns,
  toRunStatus,
  upsertLightCurve,
  type MeasurementSummary,
  type StoredLightCurve,
  type StoredRun,
} from './photometry-repository';

/** A run unfinished this long after it was asked for is failed (its worker has gone). */
const STALE_RUN_MS = 60 * 60_000;

interface ProgramAccess {
  proposalId: number;
  title: string;
  programState: string;
  cycleId: number;
  targets: TargetRow[];
}

/** The team's view of the program: 404 for non-members, 409 `no_program` before an award is released. */
async function accessProgram(db: Knex, viewer: SessionUser, proposalId: number): Promise<ProgramAccess> {
  const access = await accessProposal(db, viewer, proposalId);
  const program = await db('programs as g')
    .join('cycles as c', 'c.id', 'g.cycle_id')
    .join('awards as a', 'a.proposal_id', 'g.proposal_id')
    .where('g.proposal_id', proposalId)
    .whereNotNull('c.awards_released_at')
    .first('g.state', 'g.cycle_id', 'a.target_ids');
  if (!program) throw new AppError('no_program', 'Light curves can be uploaded once the proposal is awarded and its program starts', 409);
  const awarded = program.target_ids as number[] | null;
  const q = db('targets').where('proposal_id', proposalId).orderBy('position').select(TARGET_COLUMNS);
  if (awarded) q.whereIn('id', awarded);
  return {
    proposalId,
    title: access.proposal.title,
    programState: program.state,
    cycleId: program.cycle_id,
    targets: (await q) as TargetRow[],
  };
}

const canUploadTo = (p: ProgramAccess) => p.programState !== 'withdrawn';

function requireUploadable(p: ProgramAccess): void {
  if (!canUploadTo(p)) throw new AppError('not_allowed', 'The program was withdrawn: no light curves can be added', 403);
}

/** 404 / 409 / 403 before an upload is received: the files are not even written for someone who may not upload. */
export async function requireUploader(ctx: AppContext, viewer: SessionUser, proposalId: number): Promise<void> {
  requireUploadable(await accessProgram(ctx.db, viewer, proposalId));
}

/** Queues a stored run; a queue that cannot be reached fails the run (503). */
async function enqueueRun(ctx: AppContext, run: StoredRun): Promise<PhotometryRunStatus> {
  try {
    if (!ctx.photometryQueue) throw new Error('no photometry queue in this context');
    await ctx.photometryQueue.enqueue({ runId: run.id });
  } catch (err) {
    ctx.logger.error({ err, runId: run.id }, 'queueing the photometry analysis failed');
    await ctx
      .db('photometry_runs')
      .where('id', run.id)
      .update({ state: 'failed', finished_at: ctx.now(), error: 'The analysis could not be queued.' });
    throw new AppError(
      'queue_unavailable',
      'The light curves were saved but the analysis could not be queued; analyse again in a moment',
      503,
    );
  }
  return toRunStatus(run);
}

/** The detrending choices of the upload form, over the program's last ones. */
function detrendFrom(fields: LightCurveUploadFields, previous: DetrendOptions): DetrendOptions {
  const num = (v: number | '' | undefined, keep: number | null) => (v === undefined ? keep : v === '' ? null : v);
  return detrendOptionsSchema.parse({
    offsets: fields.offsets ?? previous.offsets,
    clipSigma: num(fields.clipSigma, previous.clipSigma),
    binMinutes: num(fields.binMinutes, previous.binMinutes),
  });
}

/**
 * POST …/uploads: reads every file (streamed), stores each target's curve (replacing the earlier
 * one) and an upload row in one transaction, then queues the analysis of all the program's curves.
 */
export async function uploadLightCurves(
  ctx: AppContext,
  viewer: SessionUser,
  proposalId: number,
  files: Express.Multer.File[],
  fields: LightCurveUploadFields,
): Promise<{ run: PhotometryRunStatus }> {
  const program = await accessProgram(ctx.db, viewer, proposalId);
  requireUploadable(program);
  if (!files.length) {
    const message = 'Attach one or more CSV files in the form field "files"';
    throw new AppError('file_missing', message, 400, { files: [message] });
  }
  if (fields.targetId !== undefined && !program.targets.some((t) => t.id === fields.targetId)) {
    throw new AppError('validation_failed', 'targetId: no such target in this program', 400, {
      targetId: ['Choose one of the program’s targets'],
    });
  }
  const nodeCodes = (await ctx.db('nodes').select('code')).map((n) => n.code as string);
  const coords = await ctx
    .db('targets')
    .whereIn(
      'id',
      program.targets.map((t) => t.id),
    )
    .select('id', 'name', 'ra_deg', 'dec_deg');
  const read = await readLightCurveFiles(
    files.map((f) => ({ path: f.path, fileName: f.originalname || 'the file', size: f.size })),
    {
      timeSystem: fields.timeSystem,
      valueKind: fields.valueKind,
      targetId: fields.targetId,
      targets: coords.map((t) => ({ id: t.id, name: t.name, raDeg: t.ra_deg, decDeg: t.dec_deg })),
      nodeCodes,
    },
  );
  const previous = (await findLatestRun(ctx.db, proposalId))?.detrend ?? DEFAULT_DETREND;
  const detrend = detrendFrom(fields, previous);
  const at = ctx.now();
  const run = await ctx.db.transaction(async (trx) => {
    const uploadId = await insertUpload(trx, { proposalId, uploadedBy: viewer.id, files: read.files, points: read.points, at });
    for (const series of read.series) {
      await upsertLightCurve(trx, { proposalId, uploadId, series, fileNames: read.filesOf.get(series.targetId) ?? [], at });
    }
    const total = Number((await trx('light_curves').where('proposal_id', proposalId).count({ n: '*' }))[0].n);
    const created = await insertRun(trx, { proposalId, total, detrend, requestedBy: viewer.id, at });
    await supersedeRuns(trx, proposalId, created.id, at);
    return created;
  });
  return { run: await enqueueRun(ctx, run) };
}

/** POST …/analyses: every stored curve analysed again with these detrending choices. */
export async function reanalyse(
  ctx: AppContext,
  viewer: SessionUser,
  proposalId: number,
  detrend: DetrendOptions,
): Promise<{ run: PhotometryRunStatus }> {
  const program = await accessProgram(ctx.db, viewer, proposalId);
  requireUploadable(program);
  const at = ctx.now();
  const run = await ctx.db.transaction(async (trx) => {
    const total = Number((await trx('light_curves').where('proposal_id', proposalId).count({ n: '*' }))[0].n);
    if (!total) throw new AppError('no_light_curves', 'Upload light curves first: there is nothing to analyse', 409);
    const created = await insertRun(trx, { proposalId, total, detrend, requestedBy: viewer.id, at });
    await supersedeRuns(trx, proposalId, created.id, at);
    return created;
  });
  return { run: await enqueueRun(ctx, run) };
}

/** GET …/run: the newest run (404 `run_not_found` before any). */
export async function getRunStatus(ctx: AppContext, viewer: SessionUser, proposalId: number): Promise<PhotometryRunStatus> {
  await accessProgram(ctx.db, viewer, proposalId);
  await failStaleRuns(ctx.db, proposalId, ctx.now(), STALE_RUN_MS);
  const run = await findLatestRun(ctx.db, proposalId);
  if (!run) throw new AppError('run_not_found', 'No light curves have been analysed yet', 404);
  return toRunStatus(run);
}

/** Short cautions for the table: the age's cautions, the alias, a period outside the expectation. */
function cautionsOf(m: MeasurementSummary | undefined, withinExpected: boolean | null): string[] {
  if (!m) return [];
  const out: string[] = [];
  if (m.aliasFlagged) out.push('The period may be an alias of another peak.');
  if (m.doublePeriodDays !== null) out.push(`The rotation period may be twice this (${m.doublePeriodDays.toFixed(2)} d): two spot groups.`);
  if (withinExpected === false) out.push('The period lies outside the expected range.');
  for (const f of m.age?.flags ?? []) if (f.severity !== 'info') out.push(f.message);
  return out;
}

function rowsOf(
  program: ProgramAccess,
  curves: StoredLightCurve[],
  measurements: MeasurementSummary[],
  contexts: Map<number, ReturnType<typeof measureContextFor>>,
): PhotometryTargetRow[] {
  const curveOf = new Map(curves.map((c) => [c.targetId, c]));
  const measured = new Map(measurements.map((m) => [m.targetId, m]));
  return program.targets.map((t) => {
    const c = curveOf.get(t.id);
    // A measurement of an earlier curve than the stored one is out of date: not shown.
    const m0 = measured.get(t.id);
    const m = m0 && c && m0.uploadId === c.uploadId ? m0 : undefined;
    const expected = contexts.get(t.id)?.expected ?? null;
    const withinExpected = m?.periodDays != null && expected ? m.periodDays >= expected.lowDays && m.periodDays <= expected.highDays : null;
    const shown = m && m.verdict !== 'not_detected';
    return {
      targetId: t.id,
      targetName: t.name,
      colour: t.colour,
      colourSystem: t.colour_system,
      reddeningEbv: t.reddening_ebv,
      points: c?.points ?? null,
      valueKind: c?.valueKind ?? null,
      nodes: c?.nodeCodes ?? [],
      uploadedAt: c ? c.updatedAt.toISOString() : null,
      expected,
      verdict: m?.verdict ?? null,
      periodDays: shown ? m.periodDays : null,
      periodUncertaintyDays: shown ? m.periodUncertaintyDays : null,
      falseAlarmProbability: m?.falseAlarmProbability ?? null,
      semiAmplitudePpm: shown ? m.semiAmplitudePpm : null,
      semiAmplitudeMmag: shown ? m.semiAmplitudeMmag : null,
      aliasFlagged: m ? m.aliasFlagged : null,
      ageMyr: shown ? (m.age?.ageMyr ?? null) : null,
      ageLowMyr: shown ? (m.age?.lowMyr ?? null) : null,
      ageHighMyr: shown ? (m.age?.highMyr ?? null) : null,
      cautions: shown ? cautionsOf(m, withinExpected) : [],
      analysedAt: m ? m.analysedAt.toISOString() : null,
    };
  });
}

/** The age all the program's targets share (a cluster, or any coeval group of two or more), or null. */
function sharedAge(targets: TargetRow[]): number | null {
  if (targets.length < 2) return null;
  return targets.every((t) => t.age_myr === targets[0].age_myr) ? targets[0].age_myr : null;
}

function mostCommonSystem(targets: TargetRow[]): TargetColourSystem {
  const counts = new Map<TargetColourSystem, number>();
  for (const t of targets) counts.set(t.colour_system, (counts.get(t.colour_system) ?? 0) + 1);
  return [...counts].sort((a, b) => b[1] - a[1])[0][0];
}

async function loadProgramTable(ctx: AppContext, program: ProgramAccess) {
  const [curves, measurements, plans] = await Promise.all([
    listLightCurves(ctx.db, program.proposalId),
    listMeasurements(ctx.db, program.proposalId),
    planBasesOf(
      ctx.db,
      program.proposalId,
      program.targets.map((t) => t.id),
    ),
  ]);
  const contexts = new Map(program.targets.map((t) => [t.id, measureContextFor(t, plans.get(t.id))]));
  return { curves, measurements, rows: rowsOf(program, curves, measurements, contexts) };
}

/** GET …/photometry. */
export async function getProgramPhotometry(ctx: AppContext, viewer: SessionUser, proposalId: number): Promise<ProgramPhotometry> {
  const program = await accessProgram(ctx.db, viewer, proposalId);
  await failStaleRuns(ctx.db, proposalId, ctx.now(), STALE_RUN_MS);
  const [{ rows, measurements }, run, progressRow] = await Promise.all([
    loadProgramTable(ctx, program),
    findLatestRun(ctx.db, proposalId),
    listPrograms(ctx.db, program.cycleId).then((all) => all.filter((p) => p.proposalId === proposalId)),
  ]);
  const [visits] = progressRow.length ? await programProgress(ctx.db, progressRow) : [];
  const age = sharedAge(program.targets);
  let cluster: ProgramPhotometry['cluster'] = null;
  if (age !== null) {
    // The members measured on their current curves (the rows show no older measurement).
    const byTarget = new Map(measurements.map((m) => [m.targetId, m]));
    const current = new Set(rows.filter((r) => r.analysedAt !== null).map((r) => r.targetId));
    const members = program.targets
      .filter((t) => current.has(t.id))
      .map((t) => ({ targetName: t.name, verdict: byTarget.get(t.id)!.verdict, age: byTarget.get(t.id)!.age }));
    cluster = { ageMyr: age, colourSystem: mostCommonSystem(program.targets), fit: members.length ? fitClusterAge(members) : null };
  }
  return {
    proposalId,
    title: program.title,
    programState: program.programState,
    canUpload: canUploadTo(program),
    detrend: run?.detrend ?? DEFAULT_DETREND,
    run: run ? toRunStatus(run) : null,
    targets: rows,
    cluster,
    progress: {
      visitsDone: visits?.visitsDone ?? 0,
      visitsRequired: visits?.visitsRequired ?? 0,
      targetsAwarded: program.targets.length,
      targetsWithPhotometry: rows.filter((r) => r.points !== null).length,
      targetsAnalysed: rows.filter((r) => r.verdict !== null).length,
      targetsMeasured: rows.filter((r) => r.verdict === 'measured').length,
    },
  };
}

/** GET …/targets/:targetId. */
export async function getTargetPhotometry(
  ctx: AppContext,
  viewer: SessionUser,
  proposalId: number,
  targetId: number,
): Promise<TargetPhotometry> {
  const program = await accessProgram(ctx.db, viewer, proposalId);
  if (!program.targets.some((t) => t.id === targetId)) throw new AppError('target_not_found', `No target ${targetId} in this program`, 404);
  // The table's row of this one target (its plan alone is read).
  const { rows, curves } = await loadProgramTable(ctx, { ...program, targets: program.targets.filter((t) => t.id === targetId) });
  const row = rows[0];
  const curve = curves.find((c) => c.targetId === targetId);
  const upload = curve ? await findUpload(ctx.db, curve.uploadId) : undefined;
  const measurement = row.analysedAt ? ((await findMeasurementResult(ctx.db, targetId)) ?? null) : null;
  return {
    proposalId,
    row,
    // The files of the upload that carried the stored curve, those that held this target.
    uploads: (upload?.files ?? [])
      .filter((f) => curve!.fileNames.includes(f.fileName))
      .map((f) => ({ fileName: f.fileName, points: f.rows, uploadedAt: upload!.uploadedAt.toISOString(), uploadedBy: upload!.uploadedBy })),
    measurement,
  };
}

/** A stored text as a cell: control characters removed, formula-escaped (OWASP CSV injection). */
const text = (value: string) => escapeFormulaCell(stripControlCharacters(value));
const fixed = (v: number | null, digits: number) => (v === null ? '' : v.toFixed(digits));
const sig = (v: number | null) => (v === null ? '' : String(Number(v.toPrecision(4))));

/** GET …/export.csv: the table as shown, one row per target. */
export async function exportProgramPhotometry(
  ctx: AppContext,
  viewer: SessionUser,
  proposalId: number,
): Promise<{ filename: string; body: string }> {
  const program = await accessProgram(ctx.db, viewer, proposalId);
  const { rows } = await loadProgramTable(ctx, program);
  const body = stringify(
    rows.map((r) => ({
      target: text(r.targetName),
      colour: r.colour,
      colour_system: r.colourSystem,
      points: r.points ?? '',
      nodes: text(r.nodes.join(' ')),
      expected_period_days: fixed(r.expected?.periodDays ?? null, 3),
      expected_low_days: fixed(r.expected?.lowDays ?? null, 3),
      expected_high_days: fixed(r.expected?.highDays ?? null, 3),
      verdict: r.verdict ? ROTATION_VERDICT_LABELS[r.verdict] : '',
      period_days: fixed(r.periodDays, 4),
      period_uncertainty_days: fixed(r.periodUncertaintyDays, 4),
      false_alarm_probability: sig(r.falseAlarmProbability),
      semi_amplitude_ppm: fixed(r.semiAmplitudePpm, 0),
      semi_amplitude_mmag: fixed(r.semiAmplitudeMmag, 2),
      possible_alias: r.aliasFlagged === null ? '' : r.aliasFlagged ? 'yes' : 'no',
      age_myr: fixed(r.ageMyr, 0),
      age_low_myr: fixed(r.ageLowMyr, 0),
      age_high_myr: fixed(r.ageHighMyr, 0),
      cautions: text(r.cautions.join(' ')),
      analysed_at: r.analysedAt ?? '',
    })),
    { header: true, columns: undefined },
  );
  return { filename: `light-curves-${proposalId}.csv`, body };
}
