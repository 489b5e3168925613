import { createHash } from 'node:crypto';
import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import type { JustificationFile } from '@spincycle/shared/proposals/proposal-schemas';
import type { AppContext } from '../../../app-context';
import { AppError } from '../../../http/app-error';
import { requireUploadedFile } from '../../../http/upload-limits';
import { accessProposal, requireEditable } from '../proposal-access';
import { touchProposal } from '../proposal-repository';
import { findJustificationContent, findJustificationMeta, upsertJustification } from './justification-repository';

/**
 * Whether the bytes are a PDF, judged by content rather than by name or declared type: the
 * header `%PDF-` at the start and the `%%EOF` marker within the last kilobyte (where the PDF
 * specification puts it, allowing for trailing line ends or padding).
 */
export function looksLikePdf(content: Buffer): boolean {
  if (content.length < 16 || content.subarray(0, 5).toString('latin1') !== '%PDF-') return false;
  return content
    .subarray(Math.max(0, content.length - 1024))
    .toString('latin1')
    .includes('%%EOF');
}

/** The last path segment of an uploaded name without controls, quotes and invisible format characters (as named in messages). */
export function visibleFilename(name: string | undefined): string {
  const base = (name ?? '').split(/[\\/]/).pop() ?? '';
  return (
    base
      .normalize('NFC')
      // Controls (C0, DEL, C1), quotes, and Unicode format characters (Cf: bidi controls, zero-width characters, BOM…).
      // eslint-disable-next-line no-control-regex
      .replace(/[\u0000-\u001f\u007f-\u009f"]|\p{Cf}/gu, '')
      .trim()
      .slice(0, 200)
  );
}

/**
 * A file name safe to store and send back, for a file whose content is a PDF: no path, no
 * control characters, no bidirectional embedding/override/isolate characters (which can make
 * `report\u202Efdp.exe` display as `reportexe.pdf`), no zero-width or other invisible format
 * characters, no quotes, at most 200 characters, and always ending in `.pdf` (the type the
 * content was found to be): any other extension is replaced, so the name never suggests a type
 * the bytes are not.
 */
export function cleanFilename(name: string | undefined): string {
  const stem = visibleFilename(name)
    .replace(/\.[^.]{0,10}$/, '')
    .replace(/[.\s]+$/, '')
    .slice(0, 196);
  return `${stem || 'justification'}.pdf`;
}

/**
 * PUT /api/proposals/:id/justification (team members, editable proposals): stores the PDF
 * with its SHA-256, replacing the previous one. 415 `not_a_pdf` naming the file when its
 * content is not a PDF, whatever its name or declared type.
 */
export async function uploadJustification(
  ctx: AppContext,
  viewer: SessionUser,
  id: number,
  upload: Express.Multer.File | undefined,
): Promise<JustificationFile> {
  // Membership first: someone outside the team learns nothing, not even about their upload.
  await accessProposal(ctx.db, viewer, id);
  const file = requireUploadedFile(upload, 'file');
  if (!looksLikePdf(file.buffer)) {
    const shown = visibleFilename(file.originalname) || 'the file';
    throw new AppError('not_a_pdf', `“${shown}” is not a PDF: export the justification as PDF and upload that file`, 415, {
      file: [`“${shown}” is not a PDF`],
    });
  }
  const filename = cleanFilename(file.originalname);
  const sha256 = createHash('sha256').update(file.buffer).digest('hex');
  await ctx.db.transaction(async (trx) => {
    const access = await accessProposal(trx, viewer, id, { forUpdate: true });
    requireEditable(access, ctx.now());
    await upsertJustification(trx, {
      proposalId: id,
      filename,
      contentType: 'application/pdf',
      content: file.buffer,
      sha256,
      uploadedBy: viewer.id,
    });
    await touchProposal(trx, id);
  });
  return (await findJustificationMeta(ctx.db, id))!;
}

/** GET /api/proposals/:id/justification (team members): the stored PDF. */
export async function downloadJustification(
  ctx: AppContext,
  viewer: SessionUser,
  id: number,
): Promise<{ filename: string; contentType: string; content: Buffer }> {
  await accessProposal(ctx.db, viewer, id);
  const file = await findJustificationContent(ctx.db, id);
  if (!file) throw new AppError('justification_not_found', 'No justification PDF has been uploaded yet', 404);
  return file;
}
