/**
 * Night plans: a released cycle's awarded programs turned into each node's visits, night by
 * night (shared/src/scheduling/, docs/night-plans.md), built and re-built as jobs in the worker;
 * lost nights, the execution log and each program's progress and science yield. Request schemas
 * and response shapes of /api/night-plans/….
 *
 * Times are UTC ISO 8601 instants; nights are named by the local date on whose evening they
 * begin (`YYYY-MM-DD`), as the sky windows name them.
 */
import { z } from 'zod';
import { safeMultiLineText } from '../http/text';
import type { ProgramState } from '../awards/awards';

/** A visit's state in the execution log. */
export const VISIT_STATUSES = ['planned', 'done', 'missed'] as const;
export type VisitStatus = (typeof VISIT_STATUSES)[number];

export const VISIT_STATUS_LABELS: Record<VisitStatus, string> = {
  planned: 'Planned',
  done: 'Done',
  missed: 'Missed',
};

/** A build of the cycle's night plans: all nights (`build`), or from a night on (`replan`). */
export type NightPlanBuildKind = 'build' | 'replan';
export type NightPlanBuildState = 'queued' | 'running' | 'done' | 'failed';

/**
 * GET …/builds/latest (404 `build_not_found` before the first build) and the 202 answer of
 * POST …/builds and of marking a night lost. Refusals: 409 `not_released` (decisions not yet
 * released), 409 `build_running` (a build of the cycle is queued or running; one unfinished an
 * hour after it was asked for is failed instead), 503 `queue_unavailable`.
 */
export interface NightPlanBuildStatus {
  id: number;
  cycleId: number;
  kind: NightPlanBuildKind;
  state: NightPlanBuildState;
  /** Work units (nodes × nights, then targets for the science yield) and those done: the progress bar. */
  total: number;
  done: number;
  /** Night from which a re-plan plans (null for a full build). */
  fromNight: string | null;
  requestedAt: string;
  startedAt: string | null;
  finishedAt: string | null;
  /** Why the build failed, in plain words. */
  error: string | null;
}

/** One target of a program on one node: what is planned, needed and done, and the yield. */
export interface TargetProgress {
  targetId: number;
  targetName: string;
  nodeId: number;
  nodeCode: string;
  visitsRequired: number;
  visitsPlanned: number;
  visitsDone: number;
  visitNightsRequired: number;
  visitNightsPlanned: number;
  /** The cadence asked: nights between visit nights, with its tolerance. */
  stepNights: number;
  toleranceNights: number;
  /** Cadence achieved by the plan: median and largest nights between visit nights (null with fewer than two). */
  medianGapNights: number | null;
  largestGapNights: number | null;
  /** Injection–recovery on the planned visits (docs/night-plans.md#science-yield); null before a build. */
  recoveryFraction: number | null;
  recoveryExplanation: string | null;
  /** Why the target is at risk, in plain words (empty when it is not). */
  atRisk: string[];
}

/**
 * Why a program became complete (docs/night-plans.md#complete-programs): every awarded target has
 * the visit nights its plan needs (`visits_done`), or its cycle's campaign ended
 * (`campaign_ended`).
 */
export type ProgramCompletionCause = 'visits_done' | 'campaign_ended';

/** When and why a program became complete. */
export interface ProgramCompletion {
  cause: ProgramCompletionCause;
  /** The instant it became complete. */
  at: string;
  /** The campaign's last night (`YYYY-MM-DD`) when the campaign's end completed it; else null. */
  campaignEnd: string | null;
}

/** One program (an awarded proposal) of the cycle. */
export interface ProgramProgress {
  proposalId: number;
  title: string;
  piName: string;
  programState: ProgramState;
  /**
   * Position in its panel's standing (1 = best; null when it has none); the scheduler's value
   * follows it: programs are ranked by position / panel size over every panel, and the k-th of
   * N programs weighs N + 1 − k per visit night.
   */
  position: number | null;
  visitsRequired: number;
  visitsPlanned: number;
  visitsDone: number;
  /** Mean of the targets' recovery fractions (null before a build). */
  recoveryFraction: number | null;
  /** Why and when it became complete; null unless its state is complete (or no reason was recorded). */
  completion: ProgramCompletion | null;
  targets: TargetProgress[];
}

/** A node of the cycle in the overview. */
export interface NightPlanNode {
  nodeId: number;
  code: string;
  name: string;
  siteName: string;
  timeZone: string;
  nights: number;
  lostNights: number;
  visitsPlanned: number;
  visitsDone: number;
  /** Hours of visits planned, and of darkness over the campaign's nights. */
  plannedHours: number;
  darkHours: number;
}

/** GET /api/night-plans/cycles/:cycleId (facility managers). */
export interface NightPlanOverview {
  cycle: { id: number; code: string; title: string; campaignStart: string; campaignEnd: string; releasedAt: string | null };
  build: NightPlanBuildStatus | null;
  nodes: NightPlanNode[];
  programs: ProgramProgress[];
}

/** GET /api/night-plans/cycles: released cycles (the manager's picker). */
export interface NightPlanCycleSummary {
  id: number;
  code: string;
  title: string;
  programs: number;
  releasedAt: string;
  lastBuildAt: string | null;
}

/** One visit as the timeline shows it. */
export interface TimelineVisit {
  id: number;
  targetId: number;
  targetName: string;
  proposalId: number;
  programTitle: string;
  start: string;
  end: string;
  status: VisitStatus;
}

/** One night of a node on the timeline. */
export interface TimelineNight {
  date: string;
  /** Start and end of darkness; null when it never gets dark. */
  darkStart: string | null;
  darkEnd: string | null;
  /** Illuminated fraction of the Moon at the middle of the night, 0–1. */
  moonIllumination: number;
  lost: { reason: string; markedBy: string | null; markedAt: string } | null;
  visits: TimelineVisit[];
}

/** GET /api/night-plans/cycles/:cycleId/nodes/:nodeId/timeline?from=&to= (managers; at most 62 nights a call). */
export interface NodeTimeline {
  node: NightPlanNode;
  nights: TimelineNight[];
}

/** One visit of a single night's plan, in order. */
export interface NightPlanVisit extends TimelineVisit {
  order: number;
  /** Start and end in the site's local time zone, `HH:mm`. */
  startLocal: string;
  endLocal: string;
  /** Altitude and airmass (Kasten & Young 1989) of the target at the middle of the visit. */
  altitudeDeg: number;
  airmass: number;
}

/** GET /api/night-plans/cycles/:cycleId/nodes/:nodeId/nights/:date (managers). */
export interface NightPlan {
  node: { nodeId: number; code: string; name: string; siteName: string; timeZone: string };
  date: string;
  darkStart: string | null;
  darkEnd: string | null;
  darkStartLocal: string | null;
  darkEndLocal: string | null;
  moonIllumination: number;
  lost: TimelineNight['lost'];
  visits: NightPlanVisit[];
  /** Hours of visits and of darkness in the night. */
  plannedHours: number;
  darkHours: number;
}

const localDate = z.iso.date({ message: 'use a date YYYY-MM-DD' });

/**
 * POST /api/night-plans/cycles/:cycleId/nodes/:nodeId/lost-nights: the night is lost; its planned
 * visits become missed and the node is re-planned from it (202 with the re-plan's
 * NightPlanBuildStatus). Missed visits keep their time but count for nothing, so the re-plan
 * makes up for them. 400 naming `date` outside the campaign; 409 `night_already_lost`,
 * `build_running`, `not_released`. DELETE …/lost-nights/:date un-marks it (204; 404
 * `lost_night_not_found`); its missed visits stay missed until a new build.
 */
export const lostNightSchema = z.object({
  date: localDate,
  reason: safeMultiLineText(
    z
      .string({ message: 'say why the night was lost (weather, fault…)' })
      .trim()
      .min(1, { message: 'say why the night was lost (weather, fault…)' })
      .max(500, { message: 'must be at most 500 characters' }),
  ),
});
export type LostNightInput = z.infer<typeof lostNightSchema>;

/** PUT /api/night-plans/visits/:visitId: the manager marks a visit done or missed (or planned again); answers the TimelineVisit. */
export const visitStatusSchema = z.object({
  status: z.enum(VISIT_STATUSES, { message: 'must be one of planned, done, missed' }),
});
export type VisitStatusInput = z.infer<typeof visitStatusSchema>;

/** GET …/timeline query. */
export const timelineQuerySchema = z.object({ from: localDate, to: localDate });

/**
 * POST /api/night-plans/cycles/:cycleId/execution (multipart, field `file`): an execution CSV
 * with the columns `target`, `node`, `utc_time` (ISO 8601, e.g. 2027-03-04T02:15:00Z) and
 * `status` (done or missed). Each row marks the planned visit of that target on that node whose
 * time span holds `utc_time` (or starts within 30 minutes of it). Every bad row and field is
 * reported at once and nothing is written (400 `invalid_execution_log` with `rows`, each
 * `{ row, field, message }`, rows counted from 1 after the header; `fieldErrors` keyed
 * `rows.<row>.<field>`). At most 2 MB (413 `file_too_large`) and 20 000 rows.
 */
export const EXECUTION_CSV_COLUMNS = ['target', 'node', 'utc_time', 'status'] as const;
export const EXECUTION_MATCH_MINUTES = 30;

export interface ExecutionUploadResult {
  /** Visits whose status changed. */
  updated: number;
  rows: number;
}

/**
 * Calendar subscription link of a node's night plan: a calendar application subscribes to
 * `GET /api/calendar-feeds/<secret>.ics` without signing in and polls it for the node's visits
 * (the same iCalendar as the download). Facility managers make, replace and stop the link at
 * `/api/night-plans/cycles/:cycleId/nodes/:nodeId/calendar-feed`; the secret is shown once,
 * when the link is made, and only its hash is stored. Making a new link stops the previous one;
 * a stopped or unknown link answers 404 `calendar_feed_not_found`.
 */

/** GET …/calendar-feed: whether the node's plan has a working link (never the link itself). */
export interface CalendarFeedStatus {
  active: boolean;
  /** When the working link was made; null when there is none. */
  createdAt: string | null;
  /** Display name of who made it; null when there is no link or that account no longer exists. */
  createdBy: string | null;
}

/** POST …/calendar-feed (201): the new link, answered this once; the previous link stops working. */
export interface CalendarFeedLink {
  /** The address to subscribe to, `<public address>/api/calendar-feeds/<secret>.ics`. */
  url: string;
  createdAt: string;
}

/** Shape of a link's secret: 32 random bytes in base64url (43 characters). Anything else is no link (404). */
export const calendarFeedTokenSchema = z.string().regex(/^[A-Za-z0-9_-]{43}$/);

/** How long a calendar application or cache may keep the feed before asking again (Cache-Control max-age). */
export const CALENDAR_FEED_MAX_AGE_SECONDS = 300;
