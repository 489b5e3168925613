import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import type { ListOutboxQuery, OutboxMail, OutboxPage } from '@spincycle/shared/mail/mail-outbox';
import type { AppContext } from '../../app-context';
import { AppError } from '../../http/app-error';
import { deliverMail } from '../../mail/outbox';
import { findOutboxMail, listOutboxMails, requeueFailedMail } from './mail-outbox-repository';

/** GET /api/admin/mail-outbox: newest first; recipients and subjects, never bodies. */
export function listOutboxPage(ctx: AppContext, query: ListOutboxQuery): Promise<OutboxPage> {
  return listOutboxMails(ctx.db, query);
}

/**
 * POST /api/admin/mail-outbox/:id/resend: a failed mail goes back to pending with a fresh set of
 * attempts and is tried at once; answers the mail after that attempt (sent, or pending again
 * with the reason, for the sweep to retry). 404 for an unknown mail, 409 `mail_not_failed`
 * unless it failed (a pending mail is on its way already; a sent one is never sent twice).
 */
export async function resendFailedMail(ctx: AppContext, actor: SessionUser, id: number): Promise<OutboxMail> {
  const outcome = await requeueFailedMail(ctx.db, id);
  if (outcome === 'unknown') throw new AppError('mail_not_found', `No outgoing mail ${id}`, 404);
  if (outcome !== 'requeued') {
    const why = outcome === 'sent' ? 'it was sent already' : 'it is still waiting for its next attempt';
    throw new AppError('mail_not_failed', `Mail ${id} can be sent again only after it failed: ${why}`, 409);
  }
  ctx.logger.info({ mailId: id, by: actor.id }, 'an administrator sent a failed mail again');
  await deliverMail(ctx, [id]);
  return (await findOutboxMail(ctx.db, id))!;
}
