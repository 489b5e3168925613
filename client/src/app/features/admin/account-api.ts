import { HttpClient, httpResource } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import type { AccountSummary, UpdateAccountInput } from '@spincycle/shared/accounts/account-schemas';
import type { Role } from '@spincycle/shared/accounts/roles';
import { Observable } from 'rxjs';

/** Filters and page of the account table; `page` counts from 1 as the API does. */
export interface AccountQuery {
  search: string;
  role: Role | '';
  page: number;
  pageSize: number;
}

/** Body of GET /api/admin/accounts. */
export interface AccountPage {
  items: AccountSummary[];
  total: number;
}

/** All HTTP of the admin feature. */
@Injectable({ providedIn: 'root' })
export class AccountApi {
  private readonly http = inject(HttpClient);

  /**
   * GET /api/admin/accounts?page=…&pageSize=…[&search=…][&role=…], reloaded whenever the query
   * changes. Empty filters are left out rather than sent as `search=` / `role=`.
   * No default value: while a new page loads, `value()` is undefined and the page keeps the old rows.
   */
  listResource(query: () => AccountQuery) {
    return httpResource<AccountPage>(() => {
      const { search, role, page, pageSize } = query();
      const params: Record<string, string | number> = { page, pageSize };
      if (search) params['search'] = search;
      if (role) params['role'] = role;
      return { url: '/api/admin/accounts', params };
    });
  }

  /** PATCH /api/admin/accounts/:id → the updated account. */
  update(id: number, input: UpdateAccountInput): Observable<AccountSummary> {
    return this.http.patch<AccountSummary>(`/api/admin/accounts/${id}`, input);
  }
}
