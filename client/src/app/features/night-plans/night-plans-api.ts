import { HttpClient, httpResource } from '@angular/common/http';
import { inject, Injectable, InjectionToken } from '@angular/core';
import type {
  CalendarFeedLink,
  CalendarFeedStatus,
  ExecutionUploadResult,
  LostNightInput,
  NightPlan,
  NightPlanBuildStatus,
  NightPlanCycleSummary,
  NightPlanOverview,
  NodeTimeline,
  ProgramProgress,
  VisitStatus,
} from '@spincycle/shared/night-plans/night-plans';
import { Observable } from 'rxjs';

const BASE = '/api/night-plans';

/** How often the page asks for the progress of a queued or running build. */
export const NIGHT_PLAN_POLL_MS = new InjectionToken<number>('NIGHT_PLAN_POLL_MS', { factory: () => 2000 });

/** A month (or part of one) of a node's nights: `from` and `to` are night dates, `YYYY-MM-DD`. */
export interface TimelineWindow {
  cycleId: number;
  nodeId: number;
  from: string;
  to: string;
}

/** One node of one cycle. */
export interface NodeRef {
  cycleId: number;
  nodeId: number;
}

/** One night of one node. */
export interface NightRef {
  cycleId: number;
  nodeId: number;
  date: string;
}

/**
 * All HTTP of the night plans: the manager's cycle picker, overview, builds, timelines, single
 * nights, lost nights, visit statuses, the execution upload, the exports and each node's
 * calendar subscription link; and the team's program progress. Resources must be created in an
 * injection context; a getter returning null reads nothing.
 */
@Injectable({ providedIn: 'root' })
export class NightPlansApi {
  private readonly http = inject(HttpClient);

  /** GET /api/night-plans/cycles: released cycles. */
  cyclesResource() {
    return httpResource<NightPlanCycleSummary[]>(() => `${BASE}/cycles`, { defaultValue: [] });
  }

  /** GET /api/night-plans/cycles/:cycleId: the build, the nodes and the programs' progress. */
  overviewResource(cycleId: () => number | null) {
    return httpResource<NightPlanOverview>(() => {
      const id = cycleId();
      return id === null ? undefined : `${BASE}/cycles/${id}`;
    });
  }

  /** GET …/nodes/:nodeId/timeline?from=&to= (at most 62 nights a call). */
  timelineResource(window: () => TimelineWindow | null) {
    return httpResource<NodeTimeline>(() => {
      const w = window();
      return w === null ? undefined : { url: `${BASE}/cycles/${w.cycleId}/nodes/${w.nodeId}/timeline`, params: { from: w.from, to: w.to } };
    });
  }

  /** GET …/nodes/:nodeId/nights/:date: one night's plan in order. */
  nightResource(night: () => NightRef | null) {
    return httpResource<NightPlan>(() => {
      const n = night();
      return n === null ? undefined : `${BASE}/cycles/${n.cycleId}/nodes/${n.nodeId}/nights/${n.date}`;
    });
  }

  /** GET …/nodes/:nodeId/calendar-feed: whether the node's calendar subscription link works, made when and by whom. */
  calendarFeedResource(node: () => NodeRef | null) {
    return httpResource<CalendarFeedStatus>(() => {
      const n = node();
      return n === null ? undefined : `${BASE}/cycles/${n.cycleId}/nodes/${n.nodeId}/calendar-feed`;
    });
  }

  /** GET /api/night-plans/programs/:proposalId: the team's program progress (404 when there is none). */
  programResource(proposalId: () => number | null) {
    return httpResource<ProgramProgress>(() => {
      const id = proposalId();
      return id === null ? undefined : `${BASE}/programs/${id}`;
    });
  }

  /** POST …/builds: queues a build of all the cycle's night plans. */
  build(cycleId: number): Observable<NightPlanBuildStatus> {
    return this.http.post<NightPlanBuildStatus>(`${BASE}/cycles/${cycleId}/builds`, {});
  }

  /** GET …/builds/latest: the newest build or re-plan (404 before the first). */
  latestBuild(cycleId: number): Observable<NightPlanBuildStatus | null> {
    return this.http.get<NightPlanBuildStatus | null>(`${BASE}/cycles/${cycleId}/builds/latest`);
  }

  /** POST …/nodes/:nodeId/lost-nights: marks the night lost; answers the re-plan it queued. */
  markLost(cycleId: number, nodeId: number, input: LostNightInput): Observable<NightPlanBuildStatus> {
    return this.http.post<NightPlanBuildStatus>(`${BASE}/cycles/${cycleId}/nodes/${nodeId}/lost-nights`, input);
  }

  /** PUT /api/night-plans/visits/:visitId. */
  setVisitStatus(visitId: number, status: VisitStatus): Observable<unknown> {
    return this.http.put<unknown>(`${BASE}/visits/${visitId}`, { status });
  }

  /** POST …/execution (multipart `file`): 400 with `rows` lists every bad row, nothing written. */
  uploadExecution(cycleId: number, file: File): Observable<ExecutionUploadResult> {
    const body = new FormData();
    body.append('file', file, file.name);
    return this.http.post<ExecutionUploadResult>(`${BASE}/cycles/${cycleId}/execution`, body);
  }

  /** POST …/nodes/:nodeId/calendar-feed: a new subscription link (answered this once); the previous one stops working. */
  makeCalendarFeed(cycleId: number, nodeId: number): Observable<CalendarFeedLink> {
    return this.http.post<CalendarFeedLink>(`${BASE}/cycles/${cycleId}/nodes/${nodeId}/calendar-feed`, {});
  }

  /** DELETE …/nodes/:nodeId/calendar-feed: the subscription link stops working (404 when none works). */
  stopCalendarFeed(cycleId: number, nodeId: number): Observable<void> {
    return this.http.delete<void>(`${BASE}/cycles/${cycleId}/nodes/${nodeId}/calendar-feed`);
  }

  /** Download and calendar links of one node's plan. */
  exportUrls(cycleId: number, nodeId: number): { csv: string; ics: string } {
    const base = `${BASE}/cycles/${cycleId}/nodes/${nodeId}`;
    return { csv: `${base}/plan.csv`, ics: `${base}/plan.ics` };
  }
}
