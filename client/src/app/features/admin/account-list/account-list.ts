import { ChangeDetectionStrategy, Component, computed, inject, linkedSignal, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormField, MatLabel, MatPrefix } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatPaginator, PageEvent } from '@angular/material/paginator';
import { MatOption, MatSelect } from '@angular/material/select';
import { MatSlideToggle, MatSlideToggleChange } from '@angular/material/slide-toggle';
import { MatSnackBar } from '@angular/material/snack-bar';
import {
  MatCell,
  MatCellDef,
  MatColumnDef,
  MatHeaderCell,
  MatHeaderCellDef,
  MatHeaderRow,
  MatHeaderRowDef,
  MatRow,
  MatRowDef,
  MatTable,
} from '@angular/material/table';
import { MatTooltip } from '@angular/material/tooltip';
import type { AccountSummary, UpdateAccountInput } from '@spincycle/shared/accounts/account-schemas';
import { ROLE_LABELS, ROLES, type Role } from '@spincycle/shared/accounts/roles';
import { debounceTime, distinctUntilChanged, map } from 'rxjs';
import { SessionAuth } from '../../../core/auth/session-auth';
import { loadErrorText, readApiError } from '../../../core/http/api-error-message';
import { confirmAction } from '../../../ui/confirm-dialog/confirm-dialog';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { AccountApi, AccountPage } from '../account-api';
import { UtcInstantPipe } from '../../../ui/time/date-pipes';

export const SEARCH_DEBOUNCE_MS = 300;
export const DEFAULT_PAGE_SIZE = 25;
const EMPTY_PAGE: AccountPage = { items: [], total: 0 };

/**
 * The administrator's account table: search, role filter, paging, a switch per role per
 * account, and disabling. Rows change only from the server's answer (nothing optimistic).
 */
@Component({
  selector: 'app-account-list',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    UtcInstantPipe,
    LoadStatus,
    MatButton,
    MatCell,
    MatCellDef,
    MatColumnDef,
    MatFormField,
    MatHeaderCell,
    MatHeaderCellDef,
    MatHeaderRow,
    MatHeaderRowDef,
    MatIcon,
    MatInput,
    MatLabel,
    MatOption,
    MatPaginator,
    MatPrefix,
    MatRow,
    MatRowDef,
    MatSelect,
    MatSlideToggle,
    MatTable,
    MatTooltip,
    ReactiveFormsModule,
  ],
  templateUrl: './account-list.html',
  styleUrl: './account-list.scss',
})
export default class AccountList {
  private readonly api = inject(AccountApi);
  private readonly auth = inject(SessionAuth);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);

  protected readonly roles = ROLES;
  protected readonly roleLabels = ROLE_LABELS;
  protected readonly columns = ['account', ...ROLES.map((role) => `role-${role}`), 'status', 'lastSignIn', 'actions'];
  protected readonly pageSizeOptions = [10, 25, 50, 100];

  protected readonly searchControl = new FormControl('', { nonNullable: true });
  protected readonly roleControl = new FormControl<Role | ''>('', { nonNullable: true });

  private readonly search = toSignal(
    this.searchControl.valueChanges.pipe(
      debounceTime(SEARCH_DEBOUNCE_MS),
      map((value) => value.trim()),
      distinctUntilChanged(),
    ),
    { initialValue: '' },
  );
  private readonly role = toSignal(this.roleControl.valueChanges, { initialValue: '' as Role | '' });

  /** Back to the first page whenever the filters change. */
  protected readonly pageIndex = linkedSignal({
    source: () => ({ search: this.search(), role: this.role() }),
    computation: () => 0,
  });
  protected readonly pageSize = signal(DEFAULT_PAGE_SIZE);

  protected readonly accounts = this.api.listResource(() => ({
    search: this.search(),
    role: this.role(),
    page: this.pageIndex() + 1,
    pageSize: this.pageSize(),
  }));

  /** The rows shown: the last page the server sent, patched with the answers to each change. */
  protected readonly page = linkedSignal<AccountPage | undefined, AccountPage>({
    source: () => (this.accounts.hasValue() ? this.accounts.value() : undefined),
    computation: (next, previous) => next ?? previous?.value ?? EMPTY_PAGE,
  });

  protected readonly selfId = computed(() => this.auth.user()?.id ?? null);
  /** Ids of the accounts with a change on its way; their controls wait for the answer. */
  protected readonly pending = signal<ReadonlySet<number>>(new Set());
  /** Announced politely after each change. */
  protected readonly announcement = signal('');

  protected readonly error = computed(() => loadErrorText(this.accounts.error(), 'The accounts could not be loaded.'));
  protected readonly empty = computed(() => this.accounts.hasValue() && this.page().total === 0);
  protected readonly emptyText = computed(() =>
    this.search() || this.role() ? 'No account matches these filters.' : 'There are no accounts yet.',
  );

  /** Keeps a row (and the keyboard focus inside it) when the server's answer replaces its account. */
  protected readonly trackById = (_index: number, account: AccountSummary) => account.id;

  protected isSelf(account: AccountSummary): boolean {
    return account.id === this.selfId();
  }

  /** The administrator cannot take away their own administrator role (the server refuses too). */
  protected roleLocked(account: AccountSummary, role: Role): boolean {
    return role === 'administrator' && this.isSelf(account);
  }

  protected onPage(event: PageEvent): void {
    this.pageSize.set(event.pageSize);
    this.pageIndex.set(event.pageIndex);
  }

  protected toggleRole(account: AccountSummary, role: Role, change: MatSlideToggleChange): void {
    const wanted = new Set(account.roles);
    if (change.checked) wanted.add(role);
    else wanted.delete(role);
    const roles = ROLES.filter((r) => wanted.has(r));
    this.save(account, { roles }, `${ROLE_LABELS[role]} role ${change.checked ? 'given to' : 'taken from'} ${account.displayName}.`, () => {
      // The switch moved on its own; put it back, since the account did not change.
      change.source.checked = !change.checked;
    });
  }

  protected setDisabled(account: AccountSummary, disabled: boolean): void {
    confirmAction(this.dialog, {
      title: disabled ? `Disable ${account.displayName}?` : `Enable ${account.displayName}?`,
      message: disabled
        ? `${account.email} will be signed out and can no longer sign in until the account is enabled again.`
        : `${account.email} will be able to sign in again with the roles the account holds.`,
      confirmLabel: disabled ? 'Disable' : 'Enable',
      destructive: disabled,
    }).subscribe((confirmed) => {
      if (confirmed) {
        this.save(account, { disabled }, `${account.displayName} is ${disabled ? 'disabled' : 'enabled'}.`);
      }
    });
  }

  private save(account: AccountSummary, input: UpdateAccountInput, done: string, onError?: () => void): void {
    this.setPending(account.id, true);
    this.api.update(account.id, input).subscribe({
      next: (updated) => {
        this.page.update((page) => ({
          ...page,
          items: page.items.map((item) => (item.id === updated.id ? updated : item)),
        }));
        this.setPending(account.id, false);
        this.announcement.set(done);
      },
      error: (error: unknown) => {
        onError?.();
        this.setPending(account.id, false);
        this.snackBar.open(`${account.displayName} was not changed: ${readApiError(error).message}`, 'Dismiss', {
          duration: 10000,
        });
      },
    });
  }

  private setPending(id: number, on: boolean): void {
    this.pending.update((ids) => {
      const next = new Set(ids);
      if (on) next.add(id);
      else next.delete(id);
      return next;
    });
  }
}
