import type { NightPlanBuildStatus, ProgramProgress, TargetProgress } from '@spincycle/shared/night-plans/night-plans';
import { OKABE_ITO } from '../../ui/charts/chart-palette';

/** A build still being worked on (the progress bar shows and the page polls). */
export function isBuildActive(build: NightPlanBuildStatus | null | undefined): boolean {
  return !!build && (build.state === 'queued' || build.state === 'running');
}

/** Work done as a whole percentage, 0 before the worker has counted the work. */
export function buildPercent(build: Pick<NightPlanBuildStatus, 'done' | 'total' | 'state'>): number {
  if (build.state === 'done') return 100;
  if (!(build.total > 0)) return 0;
  return Math.min(100, Math.max(0, Math.floor((100 * build.done) / build.total)));
}

/** What the progress bar says in words: "Building the night plans: 1,200 of 3,000 steps done (40 %)". */
export function buildWords(build: NightPlanBuildStatus, locale: string): string {
  const what =
    build.kind === 'replan' ? `Re-planning from the night of ${build.fromNight ?? 'the lost night'}` : 'Building the night plans';
  if (build.state === 'queued') return `${what}: waiting to start.`;
  if (build.state === 'running' && !(build.total > 0)) return `${what}: counting the work.`;
  const n = new Intl.NumberFormat(locale);
  return `${what}: ${n.format(build.done)} of ${n.format(build.total)} steps done (${buildPercent(build)} %).`;
}

/** Minutes the time zone is ahead of UTC at an instant (Europe/Berlin in winter: 60). */
export function zoneOffsetMinutes(at: Date, timeZone: string): number {
  const parts = new Intl.DateTimeFormat('en-GB', {
    timeZone,
    hourCycle: 'h23',
    year: 'numeric',
    month: '2-digit',
    day: '2-digit',
    hour: '2-digit',
    minute: '2-digit',
    second: '2-digit',
  }).formatToParts(at);
  const get = (type: string) => Number(parts.find((p) => p.type === type)?.value ?? 0);
  const wall = Date.UTC(get('year'), get('month') - 1, get('day'), get('hour'), get('minute'), get('second'));
  return Math.round((wall - Math.floor(at.getTime() / 1000) * 1000) / 60_000);
}

const two = (n: number) => String(n).padStart(2, '0');

/** `02:15`: the UTC time of day of an instant. */
export function utcClock(iso: string): string {
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? '' : `${two(d.getUTCHours())}:${two(d.getUTCMinutes())}`;
}

/** `22:15`: the time of day of an instant at the site. */
export function siteClock(iso: string, timeZone: string): string {
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return '';
  const local = new Date(d.getTime() + zoneOffsetMinutes(d, timeZone) * 60_000);
  return `${two(local.getUTCHours())}:${two(local.getUTCMinutes())}`;
}

/** The instant of local noon at the site on a night's date: the origin of the night's hours. */
export function siteNoon(date: string, timeZone: string): number {
  const [y, m, d] = date.split('-').map(Number);
  const guess = Date.UTC(y, m - 1, d, 12);
  return guess - zoneOffsetMinutes(new Date(guess), timeZone) * 60_000;
}

/** One month of the campaign on the timeline. */
export interface MonthWindow {
  from: string;
  to: string;
  /** `March 2027`. */
  label: string;
}

/** The campaign's nights cut into calendar months (the first and last may be partial). */
export function campaignMonths(campaignStart: string, campaignEnd: string, locale: string): MonthWindow[] {
  const start = campaignStart.slice(0, 10);
  const end = campaignEnd.slice(0, 10);
  const months: MonthWindow[] = [];
  const format = new Intl.DateTimeFormat(locale, { month: 'long', year: 'numeric', timeZone: 'UTC' });
  let [y, m] = start.split('-').map(Number);
  for (let guard = 0; guard < 240; guard++) {
    const first = new Date(Date.UTC(y, m - 1, 1)).toISOString().slice(0, 10);
    if (first > end) break;
    const last = new Date(Date.UTC(y, m, 0)).toISOString().slice(0, 10);
    months.push({
      from: first < start ? start : first,
      to: last > end ? end : last,
      label: format.format(new Date(Date.UTC(y, m - 1, 1))),
    });
    m += 1;
    if (m > 12) {
      m = 1;
      y += 1;
    }
  }
  return months;
}

/** Colours of the programs on the timeline: the charts' colour-blind-safe palette, by position in the programs list. */
export const PROGRAM_PALETTE: readonly string[] = [
  OKABE_ITO.blue,
  OKABE_ITO.orange,
  OKABE_ITO.bluishGreen,
  OKABE_ITO.reddishPurple,
  OKABE_ITO.skyBlue,
  OKABE_ITO.vermillion,
  OKABE_ITO.yellow,
];

export function programColours(programs: readonly Pick<ProgramProgress, 'proposalId'>[]): Map<number, string> {
  return new Map(programs.map((p, i) => [p.proposalId, PROGRAM_PALETTE[i % PROGRAM_PALETTE.length]]));
}

function nights(n: number): string {
  return `${n} ${n === 1 ? 'night' : 'nights'}`;
}

/** The cadence asked: "every 6 nights (4 to 8)" or "every night". */
export function cadenceAsked(t: Pick<TargetProgress, 'stepNights' | 'toleranceNights'>): string {
  const every = t.stepNights === 1 ? 'every night' : `every ${t.stepNights} nights`;
  return t.toleranceNights > 0 ? `${every} (${t.stepNights - t.toleranceNights} to ${t.stepNights + t.toleranceNights})` : every;
}

/** The cadence achieved: "median 6 nights, largest gap 9 nights", or why there is none. */
export function cadenceAchieved(t: Pick<TargetProgress, 'medianGapNights' | 'largestGapNights'>): string {
  if (t.medianGapNights === null || t.largestGapNights === null) return 'fewer than two visit nights planned';
  return `median ${nights(t.medianGapNights)}, largest gap ${nights(t.largestGapNights)}`;
}

/** The largest gap goes past the step and its tolerance. */
export function cadenceLate(t: Pick<TargetProgress, 'largestGapNights' | 'stepNights' | 'toleranceNights'>): boolean {
  return t.largestGapNights !== null && t.largestGapNights > t.stepNights + t.toleranceNights;
}

/** What the recovery fraction means, in plain words (docs/night-plans.md#science-yield). */
export const RECOVERY_EXPLANATION =
  'The recovery fraction estimates how likely the planned visits are to reveal a target’s rotation period. Many light curves are ' +
  'simulated at the expected period and amplitude, with the node’s precision and its usual weather losses, and sampled at the planned ' +
  'visit times; a curve counts as recovered when the period found lies within 10 % of the true one and is unlikely to be noise (a ' +
  'false-alarm probability below 1 %). A program’s figure is the mean over its targets.';
