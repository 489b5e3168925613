import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import {
  MAX_TARGETS_PER_PROPOSAL,
  type CsvRowError,
  type TargetRow,
  type TargetUploadMode,
  type TargetUploadResult,
  type TargetValues,
} from '@spincycle/shared/proposals/target-schemas';
import type { z } from 'zod';
import type { targetUpdateSchema } from '@spincycle/shared/proposals/target-schemas';
import type { AppContext } from '../../../app-context';
import { isUniqueViolation } from '../../../db/unique-violation';
import { AppError } from '../../../http/app-error';
import { requireUploadedFile } from '../../../http/upload-limits';
import { formatUtcTime } from '../../cycles/cycle-service';
import { markPlansRequested } from '../plans/plan-repository';
import { queuePlanComputations } from '../plans/plan-requests';
import { accessProposal, requireEditable } from '../proposal-access';
import { touchProposal } from '../proposal-repository';
import { decodeCsvText, readTargetCsvStream, rowErrorsToAppError, writeTargetCsv } from './target-csv';
import {
  deleteAllTargets,
  deleteTargetRow,
  findTarget,
  insertTarget,
  insertTargets,
  listTargets,
  maxTargetPosition,
  targetNamesOf,
  toTargetRow,
  updateTargetRow,
} from './target-repository';

type TargetUpdate = z.output<typeof targetUpdateSchema>;

function nameTaken(name: string, field: string) {
  return new AppError('target_name_taken', `A target named “${name}” is already in the list`, 409, { [field]: ['already in the list'] });
}

/** GET /api/proposals/:id/targets (team members), in list order. */
export async function listProposalTargets(ctx: AppContext, viewer: SessionUser, id: number): Promise<TargetRow[]> {
  await accessProposal(ctx.db, viewer, id);
  return (await listTargets(ctx.db, id)).map(toTargetRow);
}

/** POST /api/proposals/:id/targets: one row at the end of the list; the plans are queued again. */
export async function addTarget(ctx: AppContext, viewer: SessionUser, id: number, values: TargetValues): Promise<TargetRow> {
  const targetId = await ctx.db.transaction(async (trx) => {
    const access = await accessProposal(trx, viewer, id, { forUpdate: true });
    requireEditable(access, ctx.now());
    const names = await targetNamesOf(trx, id);
    if (names.size >= MAX_TARGETS_PER_PROPOSAL) {
      throw new AppError(
        'too_many_targets',
        `The list holds ${names.size} targets already; a proposal holds at most ${MAX_TARGETS_PER_PROPOSAL}`,
        409,
      );
    }
    if (names.has(values.name.toLowerCase())) throw nameTaken(values.name, 'name');
    const newId = await insertTarget(trx, id, values, (await maxTargetPosition(trx, id)) + 1);
    await markPlansRequested(trx, [id]);
    await touchProposal(trx, id);
    return newId;
  });
  await queuePlanComputations(ctx, [id]);
  return toTargetRow((await findTarget(ctx.db, id, targetId))!);
}

/**
 * PUT /api/proposals/:id/targets/:targetId with the row's version: someone else's change in
 * between → 409 `version_conflict`, nothing written.
 */
export async function updateTarget(
  ctx: AppContext,
  viewer: SessionUser,
  id: number,
  targetId: number,
  update: TargetUpdate,
): Promise<TargetRow> {
  try {
    await ctx.db.transaction(async (trx) => {
      const access = await accessProposal(trx, viewer, id, { forUpdate: true });
      requireEditable(access, ctx.now());
      const current = await findTarget(trx, id, targetId, { forUpdate: true });
      if (!current) throw new AppError('target_not_found', `No target ${targetId} in proposal ${id}`, 404);
      if (current.version !== update.version) {
        throw new AppError(
          'version_conflict',
          `Someone else on the team changed the target “${current.name}” at ${formatUtcTime(current.updatedAt)}; reload to see their changes`,
          409,
          { version: [`the current version is ${current.version}, not ${update.version}`] },
        );
      }
      const clash = (await targetNamesOf(trx, id)).get(update.target.name.toLowerCase());
      if (clash !== undefined && clash !== targetId) throw nameTaken(update.target.name, 'target.name');
      await updateTargetRow(trx, targetId, update.target);
      await markPlansRequested(trx, [id]);
      await touchProposal(trx, id);
    });
  } catch (err) {
    if (isUniqueViolation(err)) throw nameTaken(update.target.name, 'target.name');
    throw err;
  }
  await queuePlanComputations(ctx, [id]);
  return toTargetRow((await findTarget(ctx.db, id, targetId))!);
}

/** DELETE /api/proposals/:id/targets/:targetId (its plans go with it). */
export async function deleteTarget(ctx: AppContext, viewer: SessionUser, id: number, targetId: number): Promise<void> {
  await ctx.db.transaction(async (trx) => {
    const access = await accessProposal(trx, viewer, id, { forUpdate: true });
    requireEditable(access, ctx.now());
    if (!(await findTarget(trx, id, targetId, { forUpdate: true })))
      throw new AppError('target_not_found', `No target ${targetId} in proposal ${id}`, 404);
    await deleteTargetRow(trx, targetId);
    await markPlansRequested(trx, [id]);
    await touchProposal(trx, id);
  });
  await queuePlanComputations(ctx, [id]);
}

/**
 * POST /api/proposals/:id/targets/upload: a CSV target list replaces the list (default) or
 * is appended to it. Every row is checked, and every problem of the file reported at once
 * (400 `invalid_target_list` with `rows`); one bad row and nothing is written. In append
 * mode a name already in the list is a problem of its row too. All in one transaction.
 * `readMode` parses the query's mode, after the membership check (like the file itself).
 */
export async function uploadTargets(
  ctx: AppContext,
  viewer: SessionUser,
  id: number,
  upload: Express.Multer.File | undefined,
  readMode: () => TargetUploadMode,
): Promise<TargetUploadResult> {
  // Membership first: someone outside the team learns nothing, not even how their file reads.
  await accessProposal(ctx.db, viewer, id);
  const mode = readMode();
  const file = requireUploadedFile(upload, 'file');
  // Streamed, stopping at the row limit: a large file neither holds the event loop nor is parsed whole.
  const list = await readTargetCsvStream(decodeCsvText(file.buffer, file.originalname || 'the file'));
  const result = await ctx.db.transaction(async (trx) => {
    const access = await accessProposal(trx, viewer, id, { forUpdate: true });
    requireEditable(access, ctx.now());
    const errors: CsvRowError[] = [...list.errors];
    let removed = 0;
    let after = 0;
    if (mode === 'append') {
      const existing = await targetNamesOf(trx, id);
      for (const r of list.rows) {
        if (existing.has(r.values.name.toLowerCase()))
          errors.push({ row: r.row, field: 'name', message: `“${r.values.name}” is already in the target list` });
      }
      const total = existing.size + list.rows.length;
      if (!errors.length && total > MAX_TARGETS_PER_PROPOSAL) {
        throw new AppError(
          'too_many_targets',
          `The list holds ${existing.size} targets and the file adds ${list.rows.length}; a proposal holds at most ${MAX_TARGETS_PER_PROPOSAL}`,
          413,
          { file: [`at most ${MAX_TARGETS_PER_PROPOSAL} targets in all`] },
        );
      }
      after = await maxTargetPosition(trx, id);
    }
    if (errors.length) throw rowErrorsToAppError(errors);
    if (mode === 'replace') removed = await deleteAllTargets(trx, id);
    await insertTargets(
      trx,
      id,
      list.rows.map((r) => r.values),
      after,
    );
    await markPlansRequested(trx, [id]);
    await touchProposal(trx, id);
    return { mode, added: list.rows.length, removed };
  });
  await queuePlanComputations(ctx, [id]);
  return { ...result, notes: list.notes, targets: (await listTargets(ctx.db, id)).map(toTargetRow) };
}

/** GET /api/proposals/:id/targets.csv: the list in the upload's columns, formula-escaped. */
export async function exportTargetsCsv(ctx: AppContext, viewer: SessionUser, id: number): Promise<{ filename: string; csv: string }> {
  await accessProposal(ctx.db, viewer, id);
  return { filename: `proposal-${id}-targets.csv`, csv: writeTargetCsv(await listTargets(ctx.db, id)) };
}
