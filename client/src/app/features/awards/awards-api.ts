import { HttpClient, httpResource } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import type {
  AuditEntry,
  AwardBoard,
  AwardCycleSummary,
  AwardInput,
  ReleaseInput,
  ReleaseResult,
  TeamDecision,
} from '@spincycle/shared/awards/awards';
import { Observable } from 'rxjs';

/**
 * All HTTP of the awards: the manager's cycle picker, award board, decisions, release and
 * audit log, and the team's decision on its proposal. Resources must be created in an
 * injection context; a getter returning null reads nothing.
 */
@Injectable({ providedIn: 'root' })
export class AwardsApi {
  private readonly http = inject(HttpClient);

  /** GET /api/awards/cycles: cycles whose review has panels, with their award progress. */
  cyclesResource() {
    return httpResource<AwardCycleSummary[]>(() => '/api/awards/cycles', { defaultValue: [] });
  }

  /** GET /api/awards/cycles/:cycleId: capacity per node, panels and the ranked proposals with their decisions. */
  boardResource(cycleId: () => number | null) {
    return httpResource<AwardBoard>(() => {
      const id = cycleId();
      return id === null ? undefined : `/api/awards/cycles/${id}`;
    });
  }

  /** GET /api/awards/cycles/:cycleId/audit: every decision, change, release and program event. */
  auditResource(cycleId: () => number | null) {
    return httpResource<AuditEntry[]>(() => {
      const id = cycleId();
      return id === null ? undefined : `/api/awards/cycles/${id}/audit`;
    });
  }

  /** GET /api/awards/proposals/:proposalId/decision: the team's decision once released (404 before). */
  decisionResource(proposalId: () => number | null) {
    return httpResource<TeamDecision>(() => {
      const id = proposalId();
      return id === null ? undefined : `/api/awards/proposals/${id}/decision`;
    });
  }

  /**
   * PUT /api/awards/proposals/:proposalId → the board after the decision. 409
   * `capacity_exceeded` (naming `nodes.<i>.nodeHours`) unless `overrideReason` is given, 409
   * `stale_version` when someone changed the decision since it was read, 400 naming the field.
   */
  decide(proposalId: number, input: AwardInput): Observable<AwardBoard> {
    return this.http.put<AwardBoard>(`/api/awards/proposals/${proposalId}`, input);
  }

  /** POST /api/awards/cycles/:cycleId/release: mails the teams, changes the proposals' states, creates the programs. */
  release(cycleId: number, input: ReleaseInput): Observable<ReleaseResult> {
    return this.http.post<ReleaseResult>(`/api/awards/cycles/${cycleId}/release`, input);
  }
}
