import { HttpClient } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import type { SkyWindowsRequest, SkyWindowsResponse } from '@spincycle/shared/planning/sky-windows-request';
import type { Observable } from 'rxjs';

/** Sky windows of targets from nodes' sites over a cycle's campaign. */
@Injectable({ providedIn: 'root' })
export class SkyWindowsApi {
  private readonly http = inject(HttpClient);

  /** POST /api/sky-windows (a computation, not a write; POST because the target list can be long). */
  compute(request: SkyWindowsRequest): Observable<SkyWindowsResponse> {
    return this.http.post<SkyWindowsResponse>('/api/sky-windows', request);
  }
}
