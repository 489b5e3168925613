import type { PasswordResetConfirmInput, SessionUser, SignUpInput } from '@spincycle/shared/accounts/account-schemas';
import type { AppContext } from '../../app-context';
import { isUniqueViolation } from '../../db/unique-violation';
import { AppError } from '../../http/app-error';
import {
  consumeResetToken,
  deleteSessionsOf,
  findAccountByEmail,
  findAccountById,
  insertAccount,
  insertResetToken,
  recordSignIn,
  setPasswordHash,
  spendResetTokensOf,
  toSessionUser,
} from '../accounts/account-repository';
import { hashLinkToken, newLinkToken } from './link-token';
import { dummyPasswordHash, hashPassword, verifyPassword } from './password-hash';

/** 401 `invalid_credentials`: the same answer for an unknown address and a wrong password. */
export const invalidCredentials = () => new AppError('invalid_credentials', 'The e-mail address or the password is not right', 401);

/** Checks an e-mail and password; the same answer and similar timing whether or not the account exists. */
export async function verifyCredentials(ctx: AppContext, email: string, password: string): Promise<SessionUser> {
  const account = await findAccountByEmail(ctx.db, email);
  const ok = await verifyPassword(password, account?.passwordHash ?? (await dummyPasswordHash()));
  if (!account || !ok) throw invalidCredentials();
  if (account.disabled) throw new AppError('account_disabled', 'This account has been disabled. Ask an administrator to enable it.', 403);
  return toSessionUser(account);
}

/** The account behind a session, or null when it was deleted or disabled since. */
export async function loadSessionUser(ctx: AppContext, id: number): Promise<SessionUser | null> {
  const account = await findAccountById(ctx.db, id);
  return account && !account.disabled ? toSessionUser(account) : null;
}

/** Notes the time of a successful sign-in (shown to administrators). */
export async function noteSignIn(ctx: AppContext, accountId: number): Promise<void> {
  await recordSignIn(ctx.db, accountId);
}

/** Self-registration: always a proposer; other roles come from an administrator. */
export async function signUp(ctx: AppContext, input: Required<SignUpInput>): Promise<SessionUser> {
  const taken = () =>
    new AppError('email_taken', 'An account with this e-mail address exists already', 409, {
      email: ['An account with this e-mail address exists already'],
    });
  if (await findAccountByEmail(ctx.db, input.email)) throw taken();
  const passwordHash = await hashPassword(input.password);
  try {
    const id = await ctx.db.transaction((trx) =>
      insertAccount(trx, { email: input.email, displayName: input.displayName, affiliation: input.affiliation, passwordHash, roles: ['proposer'] }),
    );
    return (await loadSessionUser(ctx, id))!;
  } catch (err) {
    if (isUniqueViolation(err)) throw taken();
    throw err;
  }
}

/**
 * Sends a single-use, expiring reset link when the address belongs to an enabled account.
 * Says nothing either way to the caller, so the form cannot be used to probe for accounts.
 */
export async function requestPasswordReset(ctx: AppContext, email: string): Promise<void> {
  const account = await findAccountByEmail(ctx.db, email);
  if (!account || account.disabled) return;
  const token = newLinkToken();
  const minutes = ctx.config.RESET_TOKEN_MINUTES;
  await insertResetToken(ctx.db, account.id, hashLinkToken(token), new Date(Date.now() + minutes * 60_000));
  const link = `${ctx.config.publicUrl}/reset-password?token=${token}`;
  try {
    await ctx.mailer.send({
      to: account.email,
      subject: 'Reset your Spincycle password',
      text: [
        `Hello ${account.displayName},`,
        '',
        'Someone (hopefully you) asked to reset the password of your Spincycle account.',
        `Open this link within ${minutes} minutes to choose a new password. It works once.`,
        '',
        link,
        '',
        'If you did not ask for this, ignore this message: your password stays as it is.',
      ].join('\n'),
    });
  } catch (err) {
    ctx.logger.error({ err, accountId: account.id }, 'password reset mail could not be sent');
  }
}

/** Sets a new password with a valid link, ends the account's other sessions and spends its other links. */
export async function confirmPasswordReset(ctx: AppContext, input: PasswordResetConfirmInput): Promise<void> {
  const passwordHash = await hashPassword(input.password);
  await ctx.db.transaction(async (trx) => {
    const accountId = await consumeResetToken(trx, hashLinkToken(input.token));
    if (!accountId) {
      throw new AppError('invalid_reset_link', 'This reset link is not valid: it may have expired or been used already. Ask for a new one.', 400, {
        token: ['expired, used or unknown'],
      });
    }
    await setPasswordHash(trx, accountId, passwordHash);
    await spendResetTokensOf(trx, accountId);
    await deleteSessionsOf(trx, accountId);
  });
}
