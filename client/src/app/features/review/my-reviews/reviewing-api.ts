import { HttpClient, httpResource } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import type { MyReviewRow, MyReviews, ReviewProposal, SaveReviewInput, SubmitReviewsResult } from '@spincycle/shared/review/reviewing';
import type { Expertise, ExpertiseInput, MyPanel } from '@spincycle/shared/review/panels';
import { Observable } from 'rxjs';

/** All HTTP of the reviewer's pages (/review/my). Resources must be created in an injection context. */
@Injectable({ providedIn: 'root' })
export class ReviewingApi {
  private readonly http = inject(HttpClient);

  /** GET /api/review/my → the reviewer's assignments across cycles with their own reviews. */
  myReviewsResource() {
    return httpResource<MyReviews>(() => '/api/review/my');
  }

  /** GET /api/review/me/panels → the panels the reviewer sits on (as member or chair). */
  myPanelsResource() {
    return httpResource<MyPanel[]>(() => '/api/review/me/panels');
  }

  /** GET /api/review/my/:proposalId → what the reviewer reads, or nothing while `id()` is null. */
  proposalResource(id: () => number | null) {
    return httpResource<ReviewProposal>(() => {
      const current = id();
      return current === null ? undefined : `/api/review/my/${current}`;
    });
  }

  /** URL of the justification PDF shown inline on the reading page. */
  justificationUrl(proposalId: number): string {
    return `/api/review/my/${proposalId}/justification`;
  }

  /** PUT /api/review/my/:proposalId/review → the saved row; 409 `version_conflict` (with `current`) or `review_locked`. */
  save(proposalId: number, input: SaveReviewInput): Observable<MyReviewRow> {
    return this.http.put<MyReviewRow>(`/api/review/my/${proposalId}/review`, input);
  }

  /** POST /api/review/my/submit → every review of the cycle submitted; 400 `grades_missing` naming the proposals. */
  submit(cycleId: number): Observable<SubmitReviewsResult> {
    return this.http.post<SubmitReviewsResult>('/api/review/my/submit', { cycleId });
  }

  /** POST /api/review/my/:proposalId/conflict → the assignment is removed. */
  declareConflict(proposalId: number, reason: string): Observable<{ proposalId: number; declaredAt: string }> {
    return this.http.post<{ proposalId: number; declaredAt: string }>(`/api/review/my/${proposalId}/conflict`, { reason });
  }

  /** GET /api/review/me/expertise → the categories the reviewer declared, and every cycle's categories as suggestions. */
  expertiseResource() {
    return httpResource<Expertise>(() => '/api/review/me/expertise');
  }

  /** PUT /api/review/me/expertise → the stored list; 400 with `fieldErrors['expertise.<i>']` naming the bad entry. */
  saveExpertise(input: ExpertiseInput): Observable<Expertise> {
    return this.http.put<Expertise>('/api/review/me/expertise', input);
  }
}
