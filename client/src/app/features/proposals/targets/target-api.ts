import { HttpClient, HttpEvent, httpResource } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import type { TargetInput, TargetRow, TargetUploadMode, TargetUploadResult } from '@spincycle/shared/proposals/target-schemas';
import { Observable } from 'rxjs';

export type { TargetUploadMode, TargetUploadResult };

/** The example list every upload panel links to. */
export const EXAMPLE_TARGET_LIST_URL = '/api/target-lists/example.csv';

/** All HTTP of a proposal's target list. */
@Injectable({ providedIn: 'root' })
export class TargetApi {
  private readonly http = inject(HttpClient);

  /** GET /api/proposals/:id/targets, idle while `proposalId()` is null. */
  listResource(proposalId: () => number | null) {
    return httpResource<TargetRow[]>(() => {
      const id = proposalId();
      return id === null ? undefined : `/api/proposals/${id}/targets`;
    });
  }

  /** POST /api/proposals/:id/targets → 201 the stored row. */
  create(proposalId: number, target: TargetInput): Observable<TargetRow> {
    return this.http.post<TargetRow>(`/api/proposals/${proposalId}/targets`, target);
  }

  /** PUT /api/proposals/:id/targets/:targetId with the row's version (409 when it changed). */
  update(proposalId: number, targetId: number, version: number, target: TargetInput): Observable<TargetRow> {
    return this.http.put<TargetRow>(`/api/proposals/${proposalId}/targets/${targetId}`, { version, target });
  }

  /** DELETE /api/proposals/:id/targets/:targetId → 204. */
  remove(proposalId: number, targetId: number): Observable<void> {
    return this.http.delete<void>(`/api/proposals/${proposalId}/targets/${targetId}`);
  }

  /**
   * POST /api/proposals/:id/targets/upload?mode=… (multipart `file`), with upload progress.
   * A refused list answers 400 `invalid_target_list` with every row's problem in `rows`
   * (TargetListErrorBody); 400 `wrong_encoding` and 413 (too many rows) carry a message only.
   */
  upload(proposalId: number, file: File, mode: TargetUploadMode): Observable<HttpEvent<TargetUploadResult>> {
    const body = new FormData();
    body.append('file', file, file.name);
    return this.http.post<TargetUploadResult>(`/api/proposals/${proposalId}/targets/upload`, body, {
      params: { mode },
      reportProgress: true,
      observe: 'events',
    });
  }

  /** GET /api/proposals/:id/targets.csv (a download link). */
  exportUrl(proposalId: number): string {
    return `/api/proposals/${proposalId}/targets.csv`;
  }
}
