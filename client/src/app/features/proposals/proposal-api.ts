import { HttpClient, HttpEvent, httpResource } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import type { CycleSummary } from '@spincycle/shared/facility/facility-types';
import type {
  CreateProposalInput,
  InvitationAccepted,
  InviteMemberInput,
  JustificationFile,
  Proposal,
  ProposalMember,
  ProposalSummary,
  SubmissionCheck,
  UpdateProposalInput,
} from '@spincycle/shared/proposals/proposal-schemas';
import { Observable } from 'rxjs';

/** Largest justification PDF the server takes (413 `file_too_large` above it). */
export const MAX_JUSTIFICATION_BYTES = 10 * 1024 * 1024;

/**
 * HTTP of proposals, their team, justification and submission (targets: TargetApi; plans:
 * PlanApi). Resources must be created in an injection context.
 */
@Injectable({ providedIn: 'root' })
export class ProposalApi {
  private readonly http = inject(HttpClient);

  /** GET /api/proposals: the signed-in person's own proposals. */
  listResource() {
    return httpResource<ProposalSummary[]>(() => '/api/proposals', { defaultValue: [] });
  }

  /** GET /api/cycles (the new-proposal dialog offers the open ones). */
  cyclesResource() {
    return httpResource<CycleSummary[]>(() => '/api/cycles', { defaultValue: [] });
  }

  /** GET /api/proposals/:id, idle while `id()` is null. 404 for people outside the team. */
  proposalResource(id: () => number | null) {
    return httpResource<Proposal>(() => {
      const current = id();
      return current === null ? undefined : `/api/proposals/${current}`;
    });
  }

  /** POST /api/proposals → 201 the new draft (422 `call_not_open`). */
  create(input: CreateProposalInput): Observable<Proposal> {
    return this.http.post<Proposal>('/api/proposals', input);
  }

  /** PATCH /api/proposals/:id with the version read (409 `version_conflict` / `not_editable`). */
  update(id: number, input: UpdateProposalInput): Observable<Proposal> {
    return this.http.patch<Proposal>(`/api/proposals/${id}`, input);
  }

  /** DELETE /api/proposals/:id → 204 (a draft, by its PI). */
  remove(id: number): Observable<void> {
    return this.http.delete<void>(`/api/proposals/${id}`);
  }

  /** POST /api/proposals/:id/members → 201 the invited member. */
  invite(id: number, input: InviteMemberInput): Observable<ProposalMember> {
    return this.http.post<ProposalMember>(`/api/proposals/${id}/members`, input);
  }

  /** DELETE /api/proposals/:id/members/:memberId → 204. */
  removeMember(id: number, memberId: number): Observable<void> {
    return this.http.delete<void>(`/api/proposals/${id}/members/${memberId}`);
  }

  /** POST /api/invitations/accept → the proposal joined (409 when already on the team). */
  acceptInvitation(token: string): Observable<InvitationAccepted> {
    return this.http.post<InvitationAccepted>('/api/invitations/accept', { token });
  }

  /**
   * PUT /api/proposals/:id/justification, multipart field `file` → the stored file's
   * description, with upload progress events (413 `file_too_large`, 415 `not_a_pdf`).
   */
  uploadJustification(id: number, file: File): Observable<HttpEvent<JustificationFile>> {
    const body = new FormData();
    body.append('file', file, file.name);
    return this.http.put<JustificationFile>(`/api/proposals/${id}/justification`, body, {
      reportProgress: true,
      observe: 'events',
    });
  }

  /** GET /api/proposals/:id/justification: the PDF itself (a link, not a call). */
  justificationUrl(id: number): string {
    return `/api/proposals/${id}/justification`;
  }

  /** GET /api/proposals/:id/readiness → what still stops submission. */
  readinessResource(id: () => number | null) {
    return httpResource<SubmissionCheck>(() => {
      const current = id();
      return current === null ? undefined : `/api/proposals/${current}/readiness`;
    });
  }

  /** POST /api/proposals/:id/submit → the submitted proposal (422 `call_closed` / `not_ready`). */
  submit(id: number): Observable<Proposal> {
    return this.http.post<Proposal>(`/api/proposals/${id}/submit`, null);
  }

  /** POST /api/proposals/:id/withdraw → the proposal, back to draft. */
  withdraw(id: number): Observable<Proposal> {
    return this.http.post<Proposal>(`/api/proposals/${id}/withdraw`, null);
  }

  /** GET /api/proposals/:id/summary.pdf (a link). */
  summaryPdfUrl(id: number): string {
    return `/api/proposals/${id}/summary.pdf`;
  }
}
