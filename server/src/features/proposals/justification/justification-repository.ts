import type { Knex } from 'knex';
import type { JustificationFile } from '@spincycle/shared/proposals/proposal-schemas';

/** The justification file without its content, or null. */
export async function findJustificationMeta(db: Knex, proposalId: number): Promise<JustificationFile | null> {
  const row = await db('proposal_files as f')
    .leftJoin('accounts as a', 'a.id', 'f.uploaded_by')
    .where({ 'f.proposal_id': proposalId, 'f.kind': 'justification' })
    .first('f.filename', 'f.size_bytes', 'f.sha256', 'f.uploaded_at', 'a.display_name');
  return row
    ? {
        filename: row.filename,
        sizeBytes: row.size_bytes,
        sha256: row.sha256,
        uploadedAt: row.uploaded_at.toISOString(),
        uploadedBy: row.display_name ?? 'a former member',
      }
    : null;
}

/** The justification file with its bytes. */
export async function findJustificationContent(
  db: Knex,
  proposalId: number,
): Promise<{ filename: string; contentType: string; content: Buffer } | undefined> {
  const row = await db('proposal_files')
    .where({ proposal_id: proposalId, kind: 'justification' })
    .first('filename', 'content_type', 'content');
  return row ? { filename: row.filename, contentType: row.content_type, content: row.content } : undefined;
}

/** Stores the justification, replacing the current one. */
export async function upsertJustification(
  db: Knex,
  input: { proposalId: number; filename: string; contentType: string; content: Buffer; sha256: string; uploadedBy: number },
): Promise<void> {
  await db('proposal_files')
    .insert({
      proposal_id: input.proposalId,
      kind: 'justification',
      content: input.content,
      filename: input.filename,
      content_type: input.contentType,
      size_bytes: input.content.length,
      sha256: input.sha256,
      uploaded_by: input.uploadedBy,
      uploaded_at: db.fn.now(),
    })
    .onConflict(['proposal_id', 'kind'])
    .merge();
}
