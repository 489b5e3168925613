import { HttpClient, httpResource } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import type { CycleSummary } from '@spincycle/shared/facility/facility-types';
import type {
  AssignmentMatrix,
  AssignmentToggleInput,
  AutomaticAssignmentResult,
  CycleReviewProposal,
  DistributionResult,
  Panel,
  PanelInput,
  PanelUpdate,
  ReviewerAccount,
  ReviewSettings,
  ReviewSettingsInput,
  TeamReviewerRow,
} from '@spincycle/shared/review/panels';
import { Observable } from 'rxjs';

/** All HTTP of the manager's review pages. Resources must be created in an injection context. */
@Injectable({ providedIn: 'root' })
export class ReviewAdminApi {
  private readonly http = inject(HttpClient);

  /** GET /api/cycles: every cycle (managers see all). */
  cyclesResource() {
    return httpResource<CycleSummary[]>(() => '/api/cycles', { defaultValue: [] });
  }

  /** GET /api/review/cycles/:cycleId/settings. */
  settingsResource(cycleId: () => number | null) {
    return httpResource<ReviewSettings>(() => (cycleId() === null ? undefined : `/api/review/cycles/${cycleId()}/settings`));
  }

  /** GET /api/review/cycles/:cycleId/panels. */
  panelsResource(cycleId: () => number | null) {
    return httpResource<Panel[]>(() => (cycleId() === null ? undefined : `/api/review/cycles/${cycleId()}/panels`), { defaultValue: [] });
  }

  /** GET /api/review/cycles/:cycleId/proposals: submitted proposals and their panels. */
  proposalsResource(cycleId: () => number | null) {
    return httpResource<CycleReviewProposal[]>(() => (cycleId() === null ? undefined : `/api/review/cycles/${cycleId()}/proposals`), {
      defaultValue: [],
    });
  }

  /** GET /api/review/cycles/:cycleId/team-reviewers (distributed review), or nothing while `cycleId()` is null. */
  teamReviewersResource(cycleId: () => number | null) {
    return httpResource<TeamReviewerRow[]>(() => (cycleId() === null ? undefined : `/api/review/cycles/${cycleId()}/team-reviewers`), {
      defaultValue: [],
    });
  }

  /** GET /api/review/reviewers: accounts holding the reviewer role (the member picker). */
  reviewersResource() {
    return httpResource<ReviewerAccount[]>(() => '/api/review/reviewers', { defaultValue: [] });
  }

  /** GET /api/review/panels/:panelId/matrix. */
  matrixResource(panelId: () => number | null) {
    return httpResource<AssignmentMatrix>(() => (panelId() === null ? undefined : `/api/review/panels/${panelId()}/matrix`));
  }

  saveSettings(cycleId: number, input: ReviewSettingsInput): Observable<ReviewSettings> {
    return this.http.put<ReviewSettings>(`/api/review/cycles/${cycleId}/settings`, input);
  }

  createPanel(cycleId: number, input: PanelInput): Observable<Panel> {
    return this.http.post<Panel>(`/api/review/cycles/${cycleId}/panels`, input);
  }

  /** PUT with the version read: 409 `version_conflict` when someone changed the panel meanwhile. */
  updatePanel(panelId: number, input: PanelUpdate): Observable<Panel> {
    return this.http.put<Panel>(`/api/review/panels/${panelId}`, input);
  }

  deletePanel(panelId: number, version: number): Observable<void> {
    return this.http.delete<void>(`/api/review/panels/${panelId}`, { params: { version } });
  }

  setPanelProposals(panelId: number, proposalIds: number[]): Observable<Panel> {
    return this.http.put<Panel>(`/api/review/panels/${panelId}/proposals`, { proposalIds });
  }

  toggleAssignment(panelId: number, input: AssignmentToggleInput): Observable<AssignmentMatrix> {
    return this.http.put<AssignmentMatrix>(`/api/review/panels/${panelId}/assignments`, input);
  }

  assignAutomatically(panelId: number): Observable<AutomaticAssignmentResult> {
    return this.http.post<AutomaticAssignmentResult>(`/api/review/panels/${panelId}/assign-automatically`, {});
  }

  distribute(cycleId: number): Observable<DistributionResult> {
    return this.http.post<DistributionResult>(`/api/review/cycles/${cycleId}/distribute`, {});
  }
}
