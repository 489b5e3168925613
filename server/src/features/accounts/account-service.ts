import type {
  AccountPage,
  AccountSummary,
  ListAccountsQuery,
  SessionUser,
  UpdateAccountInput,
} from '@spincycle/shared/accounts/account-schemas';
import type { AppContext } from '../../app-context';
import { AppError, notFound } from '../../http/app-error';
import { deleteSessionsOf, findAccountById, listAccounts, replaceRoles, setDisabled, toAccountSummary } from './account-repository';

export function listAccountsPage(ctx: AppContext, query: ListAccountsQuery): Promise<AccountPage> {
  return listAccounts(ctx.db, query);
}

/**
 * Grants or removes roles and disables or enables an account. Administrators cannot lock
 * themselves out (remove their own administrator role or disable themselves), which also
 * keeps at least one administrator in place.
 */
export async function updateAccount(ctx: AppContext, actor: SessionUser, id: number, input: UpdateAccountInput): Promise<AccountSummary> {
  return ctx.db.transaction(async (trx) => {
    const account = await findAccountById(trx, id);
    if (!account) throw notFound(`Account ${id}`);
    if (actor.id === id && input.roles && !input.roles.includes('administrator')) {
      throw new AppError('cannot_change_self', 'You cannot remove your own administrator role', 409, {
        roles: ['keep administrator on your own account'],
      });
    }
    if (actor.id === id && input.disabled) {
      throw new AppError('cannot_change_self', 'You cannot disable your own account', 409, { disabled: ['you cannot disable yourself'] });
    }
    if (input.roles) await replaceRoles(trx, id, [...new Set(input.roles)], actor.id);
    if (input.disabled !== undefined && input.disabled !== account.disabled) {
      await setDisabled(trx, id, input.disabled);
      if (input.disabled) await deleteSessionsOf(trx, id);
    }
    return toAccountSummary((await findAccountById(trx, id))!);
  });
}
