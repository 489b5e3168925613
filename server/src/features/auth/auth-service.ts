import type { PasswordResetConfirmInput, SessionUser, SignUpInput } from '@spincycle/shared/accounts/account-schemas';
import type { AppContext } from '../../app-context';
import { isUniqueViolation } from '../../db/unique-violation';
import { AppError } from '../../http/app-error';
import { deliverMail, enqueueMail } from '../../mail/outbox';
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
import { requireAcceptablePassword } from './password-policy';
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

/** The page where someone who forgot their password asks for a reset link. */
const forgotPasswordUrl = (ctx: AppContext) => `${ctx.config.publicUrl}/forgot-password`;

/**
 * Self-registration, run after the request has been answered (202, the same answer whatever
 * happens here, so that sign-up does not reveal which addresses have an account). A new address
 * gets a proposer account and a welcome mail; an address with an account already gets a mail
 * saying that someone tried to sign up with it and how to reset the password; its account is not
 * touched. The password is hashed in both cases so that the work done is alike.
 */
export async function signUp(ctx: AppContext, input: Required<SignUpInput>): Promise<void> {
  const existing = await findAccountByEmail(ctx.db, input.email);
  const passwordHash = await hashPassword(input.password);
  if (existing) {
    await sendAccountExistsMail(ctx, existing.email, existing.displayName);
    return;
  }
  let mailId: number;
  try {
    mailId = await ctx.db.transaction(async (trx) => {
      await insertAccount(trx, {
        email: input.email,
        displayName: input.displayName,
        affiliation: input.affiliation,
        passwordHash,
        roles: ['proposer'],
      });
      return enqueueMail(
        trx,
        {
          to: input.email,
          subject: 'Welcome to Spincycle',
          text: [
            `Hello ${input.displayName},`,
            '',
            'Your Spincycle account is ready. It can write proposals; reviewer, manager and billing roles are added by an administrator.',
            '',
            `Sign in with this e-mail address and the password you chose: ${ctx.config.publicUrl}/sign-in`,
            '',
            `If you did not create this account, someone else used your address: reset the password at ${forgotPasswordUrl(ctx)} and tell an administrator.`,
          ].join('\n'),
        },
        'welcome',
      );
    });
  } catch (err) {
    // Two sign-ups for one address at once: the other one created it.
    if (isUniqueViolation(err)) {
      await sendAccountExistsMail(ctx, input.email, input.displayName);
      return;
    }
    throw err;
  }
  await deliverMail(ctx, [mailId]);
}

/** Nothing changes but the outbox: the mail is the whole of this transaction. */
async function sendAccountExistsMail(ctx: AppContext, to: string, displayName: string): Promise<void> {
  const mail = {
    to,
    subject: 'Someone tried to sign up to Spincycle with your address',
    text: [
      `Hello ${displayName},`,
      '',
      'Someone (hopefully you) tried to create a Spincycle account with this e-mail address, which already has an account.',
      'No new account was created and your password has not changed.',
      '',
      `To sign in, use your existing password: ${ctx.config.publicUrl}/sign-in`,
      `If you have forgotten it, ask for a reset link here: ${forgotPasswordUrl(ctx)}`,
      '',
      'If this was not you, you can ignore this message.',
    ].join('\n'),
  };
  const mailId = await ctx.db.transaction((trx) => enqueueMail(trx, mail, 'sign_up_attempt'));
  await deliverMail(ctx, [mailId]);
}

/**
 * Sends a single-use, expiring reset link when the address belongs to an enabled account.
 * The controller answers before calling this (see auth-controller), so the caller learns
 * nothing either way, not even from the time the answer takes.
 */
export async function requestPasswordReset(ctx: AppContext, email: string): Promise<void> {
  const account = await findAccountByEmail(ctx.db, email);
  if (!account || account.disabled) return;
  const token = newLinkToken();
  const minutes = ctx.config.RESET_TOKEN_MINUTES;
  const link = `${ctx.config.publicUrl}/reset-password?token=${token}`;
  const mail = {
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
  };
  // The link is a credential: its mail's body is blanked in the outbox once sent.
  const mailId = await ctx.db.transaction(async (trx) => {
    await insertResetToken(trx, account.id, hashLinkToken(token), new Date(Date.now() + minutes * 60_000));
    return enqueueMail(trx, mail, 'password_reset', { holdsSecret: true });
  });
  await deliverMail(ctx, [mailId]);
}

/** Sets a new password with a valid link, ends the account's other sessions and spends its other links. */
export async function confirmPasswordReset(ctx: AppContext, input: PasswordResetConfirmInput): Promise<void> {
  const passwordHash = await hashPassword(input.password);
  await ctx.db.transaction(async (trx) => {
    const accountId = await consumeResetToken(trx, hashLinkToken(input.token));
    if (!accountId) {
      throw new AppError(
        'invalid_reset_link',
        'This reset link is not valid: it may have expired or been used already. Ask for a new one.',
        400,
        {
          token: ['expired, used or unknown'],
        },
      );
    }
    // The token is spent only if the whole transaction commits: a refused password leaves it usable.
    const account = await findAccountById(trx, accountId);
    if (account) requireAcceptablePassword(input.password, account.email);
    await setPasswordHash(trx, accountId, passwordHash);
    await spendResetTokensOf(trx, accountId);
    await deleteSessionsOf(trx, accountId);
  });
}
