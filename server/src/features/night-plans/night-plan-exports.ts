/**
 * A node's night plan as files: CSV (one row per visit, formula-escaped) and iCalendar (one
 * event per visit, "<target> (<program title>)", times in UTC). The iCalendar body is both the
 * manager's download and the calendar subscription feed (calendar-feed-service.ts).
 */
import ical from 'ical-generator';
import { stringify } from 'csv-stringify/sync';
import { escapeFormulaCell } from '../proposals/targets/target-csv';

export interface ExportVisit {
  id: number;
  nightDate: string;
  targetName: string;
  programTitle: string;
  startMs: number;
  endMs: number;
  status: string;
  altitudeDeg: number;
  airmass: number;
}

export const PLAN_CSV_COLUMNS = ['night', 'target', 'program', 'start_utc', 'end_utc', 'status', 'altitude_deg', 'airmass'] as const;

export function planCsv(visits: ExportVisit[]): string {
  const rows = visits.map((v) => [
    v.nightDate,
    escapeFormulaCell(v.targetName),
    escapeFormulaCell(v.programTitle),
    new Date(v.startMs).toISOString(),
    new Date(v.endMs).toISOString(),
    v.status,
    v.altitudeDeg.toFixed(1),
    v.airmass.toFixed(3),
  ]);
  return stringify([[...PLAN_CSV_COLUMNS], ...rows], { record_delimiter: 'windows' });
}

/**
 * How often a subscribed calendar application should ask for the plan again (REFRESH-INTERVAL,
 * RFC 7986, and X-PUBLISHED-TTL). Plans change with a re-plan or a lost night, not by the
 * minute; an hour is common practice, no source. A downloaded file is imported once and the
 * hint is ignored.
 */
export const PLAN_ICS_REFRESH_SECONDS = 3600;

export function planIcs(name: string, visits: ExportVisit[]): string {
  const cal = ical({
    name,
    prodId: { company: 'Spincycle', product: 'night-plans', language: 'EN' },
    ttl: PLAN_ICS_REFRESH_SECONDS,
  });
  for (const v of visits) {
    cal.createEvent({
      id: `visit-${v.id}@spincycle`,
      start: new Date(v.startMs),
      end: new Date(v.endMs),
      summary: `${v.targetName} (${v.programTitle})`,
      description: `Night of ${v.nightDate}; status ${v.status}; altitude ${v.altitudeDeg.toFixed(1)}°, airmass ${v.airmass.toFixed(2)} at mid-visit.`,
    });
  }
  return cal.toString();
}
