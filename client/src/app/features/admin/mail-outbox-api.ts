import { HttpClient, httpResource } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import type { MailStateFilter, OutboxMail, OutboxPage } from '@spincycle/shared/mail/mail-outbox';
import { Observable } from 'rxjs';

/** Filter and page of the outgoing-mail table; `page` counts from 1 as the API does. */
export interface OutboxQuery {
  state: MailStateFilter;
  page: number;
  pageSize: number;
}

/** HTTP of the administrator's outgoing-mail page. */
@Injectable({ providedIn: 'root' })
export class MailOutboxApi {
  private readonly http = inject(HttpClient);

  /**
   * GET /api/admin/mail-outbox?state=…&page=…&pageSize=…, reloaded whenever the query changes.
   * No default value: while a new page loads, `value()` is undefined and the page keeps the old rows.
   */
  listResource(query: () => OutboxQuery) {
    return httpResource<OutboxPage>(() => {
      const { state, page, pageSize } = query();
      return { url: '/api/admin/mail-outbox', params: { state, page, pageSize } };
    });
  }

  /** POST /api/admin/mail-outbox/:id/resend → the mail after its new attempt. */
  resend(id: number): Observable<OutboxMail> {
    return this.http.post<OutboxMail>(`/api/admin/mail-outbox/${id}/resend`, {});
  }
}
