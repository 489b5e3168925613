import type { Knex } from 'knex';
import type { AccountSummary, SessionUser } from '@spincycle/shared/accounts/account-schemas';
import { ROLES, type Role } from '@spincycle/shared/accounts/roles';

interface AccountRow {
  id: number;
  email: string;
  display_name: string;
  affiliation: string;
  password_hash: string;
  disabled_at: Date | null;
  last_sign_in_at: Date | null;
  created_at: Date;
  roles: Role[] | null;
}

export interface AccountWithSecret extends AccountSummary {
  passwordHash: string;
}

function toAccount(row: AccountRow): AccountWithSecret {
  return {
    id: row.id,
    email: row.email,
    displayName: row.display_name,
    affiliation: row.affiliation,
    roles: (row.roles ?? []).filter(Boolean).sort((a, b) => ROLES.indexOf(a) - ROLES.indexOf(b)),
    disabled: row.disabled_at !== null,
    createdAt: row.created_at.toISOString(),
    lastSignInAt: row.last_sign_in_at?.toISOString() ?? null,
    passwordHash: row.password_hash,
  };
}

export function toSessionUser(a: AccountSummary): SessionUser {
  return { id: a.id, email: a.email, displayName: a.displayName, affiliation: a.affiliation, roles: a.roles };
}

export function toAccountSummary({ passwordHash: _hidden, ...rest }: AccountWithSecret): AccountSummary {
  return rest;
}

function accountsWithRoles(db: Knex) {
  return db('accounts as a')
    .leftJoin('account_roles as r', 'r.account_id', 'a.id')
    .groupBy('a.id')
    .select('a.*', db.raw('array_agg(r.role) FILTER (WHERE r.role IS NOT NULL) AS roles'));
}

export async function findAccountByEmail(db: Knex, email: string): Promise<AccountWithSecret | undefined> {
  const row = await accountsWithRoles(db).whereRaw('lower(a.email) = lower(?)', [email]).first();
  return row ? toAccount(row) : undefined;
}

export async function findAccountById(db: Knex, id: number): Promise<AccountWithSecret | undefined> {
  const row = await accountsWithRoles(db).where('a.id', id).first();
  return row ? toAccount(row) : undefined;
}

export async function insertAccount(
  db: Knex,
  input: { email: string; displayName: string; affiliation: string; passwordHash: string; roles: Role[] },
): Promise<number> {
  const [row] = await db('accounts')
    .insert({ email: input.email, display_name: input.displayName, affiliation: input.affiliation, password_hash: input.passwordHash })
    .returning('id');
  if (input.roles.length) await db('account_roles').insert(input.roles.map((role) => ({ account_id: row.id, role })));
  return row.id;
}

export async function listAccounts(
  db: Knex,
  q: { search?: string; role?: Role; page: number; pageSize: number },
): Promise<{ items: AccountSummary[]; total: number }> {
  const base = accountsWithRoles(db);
  if (q.search) {
    const like = `%${q.search.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    base.where((w) => w.whereILike('a.email', like).orWhereILike('a.display_name', like).orWhereILike('a.affiliation', like));
  }
  if (q.role) base.whereExists(db('account_roles').whereRaw('account_id = a.id').where('role', q.role));
  const [{ total }] = await db.from(base.clone().as('x')).count<{ total: number }[]>({ total: '*' });
  const rows = await base
    .orderBy('a.display_name')
    .orderBy('a.id')
    .limit(q.pageSize)
    .offset((q.page - 1) * q.pageSize);
  return { items: rows.map((r: AccountRow) => toAccountSummary(toAccount(r))), total };
}

export async function replaceRoles(db: Knex, accountId: number, roles: Role[], grantedBy: number): Promise<void> {
  const current: Role[] = (await db('account_roles').where({ account_id: accountId }).pluck('role')) as Role[];
  const removed = current.filter((r) => !roles.includes(r));
  const added = roles.filter((r) => !current.includes(r));
  if (removed.length) await db('account_roles').where({ account_id: accountId }).whereIn('role', removed).del();
  if (added.length) await db('account_roles').insert(added.map((role) => ({ account_id: accountId, role, granted_by: grantedBy })));
}

export async function setDisabled(db: Knex, accountId: number, disabled: boolean): Promise<void> {
  await db('accounts')
    .where({ id: accountId })
    .update({ disabled_at: disabled ? db.fn.now() : null, updated_at: db.fn.now() });
}

export async function setPasswordHash(db: Knex, accountId: number, passwordHash: string): Promise<void> {
  await db('accounts').where({ id: accountId }).update({ password_hash: passwordHash, updated_at: db.fn.now() });
}

export async function recordSignIn(db: Knex, accountId: number): Promise<void> {
  await db('accounts').where({ id: accountId }).update({ last_sign_in_at: db.fn.now() });
}

/** Ends every stored session of an account (after a password reset or when it is disabled). */
export async function deleteSessionsOf(db: Knex, accountId: number): Promise<void> {
  await db('sessions').whereRaw('session_account_id(sess) = ?', [accountId]).del();
}

export async function insertResetToken(db: Knex, accountId: number, tokenHash: string, expiresAt: Date): Promise<void> {
  await db('password_reset_tokens').insert({ account_id: accountId, token_hash: tokenHash, expires_at: expiresAt });
}

/** Marks a token used if it is valid; returns its account, or undefined (unknown, used or expired). */
export async function consumeResetToken(db: Knex, tokenHash: string): Promise<number | undefined> {
  const [row] = await db('password_reset_tokens')
    .where({ token_hash: tokenHash })
    .whereNull('used_at')
    .where('expires_at', '>', db.fn.now())
    .update({ used_at: db.fn.now() })
    .returning('account_id');
  return row?.account_id;
}

/** Spends every unused reset link of the account (after its password changed). */
export async function spendResetTokensOf(db: Knex, accountId: number): Promise<void> {
  await db('password_reset_tokens').where({ account_id: accountId }).whereNull('used_at').update({ used_at: db.fn.now() });
}
