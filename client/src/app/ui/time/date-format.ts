/**
 * The one date format of the product: calendar days as `16 Jan 2027`, instants as
 * `16 Jan 2027, 00:00 UTC` (UTC written once, at the end), and, beside a deadline, the same
 * instant on the person's own clock (`16 Jan 2027, 01:00 Europe/Berlin`) only when it reads
 * differently. Pure functions on Intl; the pipes in this folder wrap them.
 */

/** A date-only text (`2027-01-16`): a calendar day with no time zone. */
const CALENDAR_DAY = /^(\d{4})-(\d{2})-(\d{2})$/;

type DateInput = string | number | Date | null | undefined;

/** The instant of a value, or null when it has none (empty, unreadable). */
function toDate(value: DateInput): Date | null {
  if (value === null || value === undefined || value === '') return null;
  const day = typeof value === 'string' ? CALENDAR_DAY.exec(value) : null;
  const date = day ? new Date(Date.UTC(Number(day[1]), Number(day[2]) - 1, Number(day[3]))) : new Date(value);
  return Number.isNaN(date.getTime()) ? null : date;
}

interface WallClock {
  day: string;
  month: string;
  year: string;
  hour: string;
  minute: string;
}

function wallClock(date: Date, locale: string, timeZone: string): WallClock {
  const parts = new Intl.DateTimeFormat(locale, {
    timeZone,
    day: 'numeric',
    month: 'short',
    year: 'numeric',
    hour: '2-digit',
    minute: '2-digit',
    hourCycle: 'h23',
  }).formatToParts(date);
  const part = (type: Intl.DateTimeFormatPartTypes) => parts.find((p) => p.type === type)?.value ?? '';
  return { day: part('day'), month: part('month').replace(/\.$/, ''), year: part('year'), hour: part('hour'), minute: part('minute') };
}

const dayText = (w: WallClock) => `${w.day} ${w.month} ${w.year}`;
const timeText = (w: WallClock) => `${dayText(w)}, ${w.hour}:${w.minute}`;

/**
 * `16 Jan 2027`. A date-only text is that calendar day; an instant is its day in UTC (the
 * product's clock), so the same value reads the same everywhere. Empty for no value.
 */
export function formatDay(value: DateInput, locale: string): string {
  const date = toDate(value);
  return date ? dayText(wallClock(date, locale, 'UTC')) : '';
}

/**
 * `16 Jan 2027, 00:00 UTC`; without the zone (`16 Jan 2027, 00:00`) in a table column whose
 * header says UTC once. Empty for no value.
 */
export function formatUtcInstant(value: DateInput, locale: string, withZone = true): string {
  const date = toDate(value);
  if (!date) return '';
  const text = timeText(wallClock(date, locale, 'UTC'));
  return withZone ? `${text} UTC` : text;
}

/** The browser's IANA time zone (`Europe/Berlin`). */
export function browserTimeZone(): string {
  return Intl.DateTimeFormat().resolvedOptions().timeZone || 'UTC';
}

/**
 * `16 Jan 2027, 01:00 Europe/Berlin`: the instant on the person's clock, to show beside the UTC
 * one; empty when it reads the same as in UTC (a UTC or London-in-winter browser), so that the
 * same time is never written twice.
 */
export function formatLocalInstant(value: DateInput, locale: string, timeZone = browserTimeZone()): string {
  const date = toDate(value);
  if (!date) return '';
  const local = timeText(wallClock(date, locale, timeZone));
  return local === timeText(wallClock(date, locale, 'UTC')) ? '' : `${local} ${timeZone}`;
}

/**
 * `14:05`: the time of day of an instant on the person's own clock, for "Saved 14:05" beside
 * something they just did (no day, no zone: it is their clock, a moment ago). Empty for no value.
 */
export function formatClockTime(value: DateInput, locale: string, timeZone = browserTimeZone()): string {
  const date = toDate(value);
  if (!date) return '';
  const w = wallClock(date, locale, timeZone);
  return `${w.hour}:${w.minute}`;
}
