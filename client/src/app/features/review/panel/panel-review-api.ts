import { HttpClient, httpResource } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import type { CyclePressureReport } from '@spincycle/shared/review/pressure';
import type { PanelStanding, PanelStatisticsReport, StandingMoveInput } from '@spincycle/shared/review/standing';
import { Observable } from 'rxjs';

/**
 * All HTTP of a panel's statistics, standing and pressure (its chair from the panel stage, and
 * facility managers). Resources must be created in an injection context.
 */
@Injectable({ providedIn: 'root' })
export class PanelReviewApi {
  private readonly http = inject(HttpClient);

  /** GET /api/review/panels/:panelId/statistics, nothing while the id is null. */
  statisticsResource(panelId: () => number | null) {
    return httpResource<PanelStatisticsReport>(() => {
      const id = panelId();
      return id === null ? undefined : `/api/review/panels/${id}/statistics`;
    });
  }

  /** GET /api/review/panels/:panelId/standing (created on first read). */
  standingResource(panelId: () => number | null) {
    return httpResource<PanelStanding>(() => {
      const id = panelId();
      return id === null ? undefined : `/api/review/panels/${id}/standing`;
    });
  }

  /** GET /api/review/cycles/:cycleId/pressure. */
  pressureResource(cycleId: () => number | null) {
    return httpResource<CyclePressureReport>(() => {
      const id = cycleId();
      return id === null ? undefined : `/api/review/cycles/${id}/pressure`;
    });
  }

  /** PUT …/spread-threshold → the statistics with the new flags. */
  setSpreadThreshold(panelId: number, spreadThreshold: number): Observable<PanelStatisticsReport> {
    return this.http.put<PanelStatisticsReport>(`/api/review/panels/${panelId}/spread-threshold`, { spreadThreshold });
  }

  /** PUT …/triage (facility managers) → the statistics with the not-discussed flags. */
  setTriage(panelId: number, fraction: number): Observable<PanelStatisticsReport> {
    return this.http.put<PanelStatisticsReport>(`/api/review/panels/${panelId}/triage`, { fraction });
  }

  /** POST …/standing/moves → the standing after the move. */
  move(panelId: number, input: StandingMoveInput): Observable<PanelStanding> {
    return this.http.post<PanelStanding>(`/api/review/panels/${panelId}/standing/moves`, input);
  }

  /** POST …/standing/lock → the final standing. */
  lock(panelId: number): Observable<PanelStanding> {
    return this.http.post<PanelStanding>(`/api/review/panels/${panelId}/standing/lock`, {});
  }

  /** Address of the grade matrix CSV. */
  matrixCsvUrl(panelId: number): string {
    return `/api/review/panels/${panelId}/matrix.csv`;
  }

  /** Address of the standing CSV. */
  standingCsvUrl(panelId: number): string {
    return `/api/review/panels/${panelId}/standing.csv`;
  }
}
