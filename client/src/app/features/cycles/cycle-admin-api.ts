import { HttpClient, httpResource } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import type { CycleProposalsReport } from '@spincycle/shared/cycles/cycle-proposals';
import type { CycleInput, CycleUpdate } from '@spincycle/shared/cycles/cycle-schemas';
import type { CycleSummary, TelescopeNode } from '@spincycle/shared/facility/facility-types';
import { Observable } from 'rxjs';

/** All HTTP of the cycles feature (facility managers). Resources must be created in an injection context. */
@Injectable({ providedIn: 'root' })
export class CycleAdminApi {
  private readonly http = inject(HttpClient);

  /** GET /api/cycles → every cycle with its call status and node capacities. */
  listResource() {
    return httpResource<CycleSummary[]>(() => '/api/cycles', { defaultValue: [] });
  }

  /** GET /api/cycles/:id, or nothing while `id()` is null (a new cycle). */
  cycleResource(id: () => number | null) {
    return httpResource<CycleSummary>(() => {
      const current = id();
      return current === null ? undefined : `/api/cycles/${current}`;
    });
  }

  /** GET /api/cycles/:id/proposals → the submitted proposals with their requests and the pressure per node. */
  proposalsResource(id: () => number | null) {
    return httpResource<CycleProposalsReport>(() => {
      const current = id();
      return current === null ? undefined : `/api/cycles/${current}/proposals`;
    });
  }

  /** GET /api/nodes: the nodes a cycle can offer time on. */
  nodesResource() {
    return httpResource<TelescopeNode[]>(() => '/api/nodes', { defaultValue: [] });
  }

  /** POST /api/cycles → 201 the new cycle. */
  create(input: CycleInput): Observable<CycleSummary> {
    return this.http.post<CycleSummary>('/api/cycles', input);
  }

  /**
   * PUT /api/cycles/:id with the version read → the saved cycle; 409 `version_conflict` when it
   * changed meanwhile, 409 `capacity_below_requests` when a capacity cut needs `confirmCapacityCut`.
   */
  update(id: number, update: CycleUpdate): Observable<CycleSummary> {
    return this.http.put<CycleSummary>(`/api/cycles/${id}`, update);
  }
}
