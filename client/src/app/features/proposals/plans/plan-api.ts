import { HttpClient, httpResource } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import type { PlanExplanation, PlanListParams, PlanMarker, PlanRunStatus, ProposalPlans } from '@spincycle/shared/proposals/plan-types';
import type { SkyWindowsReport } from '@spincycle/shared/sky/sky-windows-report';
import { Observable } from 'rxjs';

/** Which target on which node a sky window is asked for. */
export interface SkyWindowQuery {
  proposalId: number;
  targetId: number;
  nodeId: number;
  /** Read through the reviewer's route (/api/review/my/…) rather than the team's. */
  reviewing?: boolean;
}

/** All HTTP of a proposal's target plans and sky windows. */
@Injectable({ providedIn: 'root' })
export class PlanApi {
  private readonly http = inject(HttpClient);

  /** GET /api/proposals/:id/plans?page=…: one page of the stored plans (paged, filtered and sorted on the server) and the run. */
  plansResource(query: () => { proposalId: number; params: PlanListParams } | null) {
    return httpResource<ProposalPlans>(() => {
      const q = query();
      if (q === null) return undefined;
      const params: Record<string, string | number | boolean> = {};
      for (const [key, value] of Object.entries(q.params)) if (value !== undefined && value !== '') params[key] = value;
      return { url: `/api/proposals/${q.proposalId}/plans`, params };
    });
  }

  /** GET /api/proposals/:id/plans/markers: every plan reduced to target, node, feasibility and period (the cluster chart). */
  markersResource(proposalId: () => number | null) {
    return httpResource<PlanMarker[]>(() => {
      const id = proposalId();
      return id === null ? undefined : `/api/proposals/${id}/plans/markers`;
    });
  }

  /** GET /api/proposals/:id/plans/status: the run alone (polled while it is in progress). */
  status(proposalId: number): Observable<PlanRunStatus> {
    return this.http.get<PlanRunStatus>(`/api/proposals/${proposalId}/plans/status`);
  }

  /** POST /api/proposals/:id/plans/recompute → the queued run. */
  recompute(proposalId: number): Observable<PlanRunStatus> {
    return this.http.post<PlanRunStatus>(`/api/proposals/${proposalId}/plans/recompute`, null);
  }

  /** GET /api/proposals/:id/targets/:targetId/plan?nodeId=N: every number of one stored plan, explained. */
  explanationResource(query: () => SkyWindowQuery | null) {
    return httpResource<PlanExplanation>(() => {
      const q = query();
      return q === null ? undefined : { url: `/api/proposals/${q.proposalId}/targets/${q.targetId}/plan`, params: { nodeId: q.nodeId } };
    });
  }

  /** GET /api/proposals/:id/targets/:targetId/sky?nodeId=N: one target's sky window, night by night. */
  skyWindowResource(query: () => SkyWindowQuery | null) {
    return httpResource<SkyWindowsReport>(() => {
      const q = query();
      if (q === null) return undefined;
      const url = q.reviewing
        ? `/api/review/my/${q.proposalId}/targets/${q.targetId}/sky`
        : `/api/proposals/${q.proposalId}/targets/${q.targetId}/sky`;
      return { url, params: { nodeId: q.nodeId } };
    });
  }
}
