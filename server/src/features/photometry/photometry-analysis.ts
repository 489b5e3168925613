/**
 * The photometry analysis job (worker process, pg-boss queue `photometry`): one job per run,
 * measuring each of the program's stored light curves in turn (shared/src/science/rotation/)
 * and storing each measurement as soon as it is made, so that the progress bar moves target by
 * target. A newer run of the same program stops an older one between targets.
 */
import type { Knex } from 'knex';
import type { Logger } from 'pino';
import type { ExpectedPeriod } from '@spincycle/shared/photometry/photometry';
import type { TargetColourSystem } from '@spincycle/shared/science/colour-sequence';
import type { GyroRelationId } from '@spincycle/shared/science/gyrochronology';
import { defaultRelationFor } from '@spincycle/shared/science/target-plan';
import { expectedPeriodFor, measureRotation, type MeasureContext } from '@spincycle/shared/science/rotation';
import {
  addRunProgress,
  failRun,
  findLightCurveData,
  findRun,
  finishRun,
  listLightCurves,
  markRunRunning,
  upsertMeasurement,
} from './photometry-repository';

export interface PhotometryJobData {
  runId: number;
}

export interface TargetRow {
  id: number;
  name: string;
  colour: number;
  colour_system: TargetColourSystem;
  reddening_ebv: number | null;
  age_myr: number;
  age_uncertainty_myr: number | null;
}

/** What a target's plan says the analysis should expect (one plan per target: see {@link planBasesOf}). */
interface PlanBasis {
  code: string;
  relation: GyroRelationId | null;
  periodDays: number | null;
  shortestDays: number | null;
  longestDays: number | null;
  minFrequencyPerDay: number | null;
  maxFrequencyPerDay: number | null;
}

/**
 * The plan each target's analysis follows: the plan on a node the program was awarded (first by
 * node code), else on any node; only the numbers needed are read out of the stored results.
 */
export async function planBasesOf(db: Knex, proposalId: number, targetIds: number[]): Promise<Map<number, PlanBasis>> {
  const out = new Map<number, PlanBasis>();
  if (!targetIds.length) return out;
  const rows = await db('target_plans as tp')
    .join('nodes as n', 'n.id', 'tp.node_id')
    .leftJoin('award_nodes as an', (on) => on.on('an.node_id', 'tp.node_id').andOn('an.proposal_id', db.raw('?', [proposalId])))
    .whereIn('tp.target_id', targetIds)
    .whereNull('tp.error')
    .orderByRaw('tp.target_id, an.node_id IS NULL, n.code')
    .select(
      'tp.target_id',
      'n.code',
      db.raw("tp.result->>'relation' AS relation"),
      db.raw("(tp.result->'quantities'->'periodDays'->>'value')::float8 AS period_days"),
      db.raw("(tp.result->'quantities'->'shortestPeriodDays'->>'value')::float8 AS shortest_days"),
      db.raw("(tp.result->'quantities'->'longestPeriodDays'->>'value')::float8 AS longest_days"),
      db.raw("(tp.result->'analysis'->>'minFrequencyPerDay')::float8 AS min_f"),
      db.raw("(tp.result->'analysis'->>'maxFrequencyPerDay')::float8 AS max_f"),
    );
  for (const r of rows) {
    if (out.has(r.target_id)) continue;
    out.set(r.target_id, {
      code: r.code,
      relation: r.relation ?? null,
      periodDays: r.period_days,
      shortestDays: r.shortest_days,
      longestDays: r.longest_days,
      minFrequencyPerDay: r.min_f,
      maxFrequencyPerDay: r.max_f,
    });
  }
  return out;
}

/**
 * What the analysis of one target is told: the period its plan expected and the plan's search
 * band, or, without a plan, the relation's period at the target's age.
 */
export function measureContextFor(target: TargetRow, plan: PlanBasis | undefined): MeasureContext {
  const star = {
    colour: { value: target.colour, system: target.colour_system },
    reddeningEbvMag: target.reddening_ebv,
    relation: plan?.relation ?? defaultRelationFor(target.colour_system),
  };
  let expected: ExpectedPeriod | null;
  if (plan && plan.periodDays !== null && plan.shortestDays !== null && plan.longestDays !== null) {
    expected = {
      periodDays: plan.periodDays,
      lowDays: plan.shortestDays,
      highDays: plan.longestDays,
      from: `the target plan on node ${plan.code}`,
    };
  } else {
    try {
      expected = expectedPeriodFor(star, target.age_myr, target.age_uncertainty_myr);
    } catch {
      expected = null;
    }
  }
  const band =
    plan && plan.minFrequencyPerDay !== null && plan.maxFrequencyPerDay !== null
      ? { minFrequencyPerDay: plan.minFrequencyPerDay, maxFrequencyPerDay: plan.maxFrequencyPerDay }
      : null;
  return { expected, band, star };
}

export const TARGET_COLUMNS = ['id', 'name', 'colour', 'colour_system', 'reddening_ebv', 'age_myr', 'age_uncertainty_myr'] as const;

/** Runs one analysis; every failure is recorded on the run, never thrown to the queue. */
export async function runPhotometryJob(
  db: Knex,
  data: PhotometryJobData,
  logger: Logger,
  now: () => Date = () => new Date(),
): Promise<void> {
  const run = await findRun(db, data.runId);
  if (!run) return;
  if (!(await markRunRunning(db, run.id, now()))) return;
  try {
    const curves = await listLightCurves(db, run.proposalId);
    const targets = (await db('targets')
      .whereIn(
        'id',
        curves.map((c) => c.targetId),
      )
      .select(TARGET_COLUMNS)) as TargetRow[];
    const byId = new Map(targets.map((t) => [t.id, t]));
    const plans = await planBasesOf(
      db,
      run.proposalId,
      targets.map((t) => t.id),
    );
    const t0 = performance.now();
    for (const curve of curves.sort((a, b) => a.targetId - b.targetId)) {
      const target = byId.get(curve.targetId);
      const data = await findLightCurveData(db, curve.targetId);
      if (target && data) {
        const context = measureContextFor(target, plans.get(target.id));
        const result = measureRotation(
          {
            bjd: data.bjd,
            values: data.values,
            errors: data.errors,
            nodes: data.nodes,
            valueKind: data.valueKind,
            timeSystems: data.timeSystems,
          },
          context,
          run.detrend,
        );
        await upsertMeasurement(db, {
          targetId: target.id,
          proposalId: run.proposalId,
          runId: run.id,
          uploadId: data.uploadId,
          result,
          at: now(),
        });
      }
      // Stopped by a newer run: leave the rest to it.
      if (!(await addRunProgress(db, run.id))) return;
    }
    await finishRun(db, run.id, now());
    logger.info({ runId: run.id, targets: curves.length, ms: Math.round(performance.now() - t0) }, 'photometry analysed');
  } catch (err) {
    logger.error({ err, runId: run.id }, 'photometry analysis failed');
    await failRun(db, run.id, 'The analysis failed unexpectedly; the team can analyse again. The error was logged.', now());
  }
}
