import { HttpClient, httpResource } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import type { MemberRole } from '@spincycle/shared/proposals/proposal-schemas';
import type { ReviewMode, TeamReviewer, TeamReviewerInput } from '@spincycle/shared/review/panels';
import { Observable } from 'rxjs';

/**
 * GET/PUT /api/review/proposals/:proposalId/team-reviewer as the team's card reads it.
 *
 * The card appears only where the answer says the cycle is in distributed review, and offers
 * the form only to the PI before the deadline, so it reads four facts beside `TeamReviewer`.
 * Optional here because the server does not send them yet: until it does, the card shows
 * nothing (a panel-mode cycle answers the same `reviewer: null` as a distributed one where no
 * reviewer is named yet, so the two cannot be told apart without them).
 */
export type TeamReviewerAnswer = TeamReviewer & {
  /** The cycle's review mode: teams name a reviewer only in 'distributed'. */
  reviewMode?: ReviewMode;
  /** The cycle's review deadline (ISO instant), null until the facility sets it. */
  reviewDeadline?: string | null;
  /** True once the deadline has passed (by the server's clock): the name can no longer change. */
  deadlinePassed?: boolean;
  /** The viewer's part in the team: only the PI names the reviewer. */
  myRole?: MemberRole;
};

/** All HTTP of the team-reviewer card. Resources must be created in an injection context. */
@Injectable({ providedIn: 'root' })
export class TeamReviewerApi {
  private readonly http = inject(HttpClient);

  /** GET /api/review/proposals/:proposalId/team-reviewer → the team's reviewer (404 outside the team). */
  teamReviewerResource(proposalId: () => number) {
    return httpResource<TeamReviewerAnswer>(() => `/api/review/proposals/${proposalId()}/team-reviewer`);
  }

  /**
   * PUT /api/review/proposals/:proposalId/team-reviewer → the team's reviewer; 403 `pi_only`,
   * 409 outside distributed review or after the deadline, 400 naming `email` for an address
   * that belongs to no reviewer.
   */
  name(proposalId: number, input: TeamReviewerInput): Observable<TeamReviewerAnswer> {
    return this.http.put<TeamReviewerAnswer>(`/api/review/proposals/${proposalId}/team-reviewer`, input);
  }
}
