/**
 * Local nights: naming them and bounding them in UTC.
 *
 * Policy (chosen here, documented in docs/command-line.md):
 * - The site's IANA time zone only NAMES the night: "the night of D" is the one that begins on
 *   the evening of local date D in that zone (a campaign's first and last nights are such dates).
 * - The night's 24-h WINDOW runs from local MEAN solar noon to the next one, i.e. from
 *   12:00 UTC − longitude/15 h on the day whose mean noon falls nearest to 12:00 wall-clock time
 *   of date D in the zone. Mean noon is fixed by longitude, so windows are exactly 24 h long,
 *   do not move when daylight-saving time starts or ends, and do not depend on how far the
 *   zone's offset is from the site's solar time. The Sun culminates within ±16.5 min of mean
 *   noon (equation of time [memory]), so the dark part of a night never touches the window
 *   edges except in polar night, where darkness is clipped to the window.
 */
import { SkyInputError, describeValue } from './sky-input-error';

export const MS_PER_DAY = 86_400_000;
export const MS_PER_HOUR = 3_600_000;

const DATE_PATTERN = /^(\d{4})-(\d{2})-(\d{2})$/;

/**
 * Parses a local date `YYYY-MM-DD` into a day number (days since 1970-01-01), refusing
 * impossible dates such as 2025-02-30.
 */
export function parseNightDate(text: unknown, field: string): number {
  if (typeof text !== 'string') {
    throw new SkyInputError(field, `must be a date YYYY-MM-DD, got ${describeValue(text)}`);
  }
  const match = DATE_PATTERN.exec(text.trim());
  if (!match) throw new SkyInputError(field, `must be a date YYYY-MM-DD, got ${JSON.stringify(text)}`);
  const year = Number(match[1]);
  const month = Number(match[2]);
  const day = Number(match[3]);
  const ms = Date.UTC(year, month - 1, day);
  const back = new Date(ms);
  if (back.getUTCFullYear() !== year || back.getUTCMonth() !== month - 1 || back.getUTCDate() !== day) {
    throw new SkyInputError(field, `is not a calendar date: ${JSON.stringify(text)}`);
  }
  if (year < 1900 || year > 2199) {
    throw new SkyInputError(field, `must be a night between the years 1900 and 2199, got ${JSON.stringify(text)}`);
  }
  return Math.round(ms / MS_PER_DAY);
}

/** Formats a day number (days since 1970-01-01) as `YYYY-MM-DD`. */
export function formatDayNumber(dayNumber: number): string {
  return new Date(dayNumber * MS_PER_DAY).toISOString().slice(0, 10);
}

/** Formats a UTC instant (ms) as ISO 8601 with whole seconds, e.g. `2024-06-22T04:15:53Z`. */
export function toIsoUtc(utcMs: number): string {
  return new Date(Math.round(utcMs / 1000) * 1000).toISOString().replace('.000Z', 'Z');
}

const formatters = new Map<string, Intl.DateTimeFormat>();

function formatterFor(timeZone: string): Intl.DateTimeFormat {
  let formatter = formatters.get(timeZone);
  if (!formatter) {
    formatter = new Intl.DateTimeFormat('en-US', {
      timeZone,
      hourCycle: 'h23',
      year: 'numeric',
      month: 'numeric',
      day: 'numeric',
      hour: 'numeric',
      minute: 'numeric',
      second: 'numeric',
    });
    formatters.set(timeZone, formatter);
  }
  return formatter;
}

/** Throws a `SkyInputError` unless `timeZone` is an IANA zone this runtime knows. */
export function assertTimeZone(timeZone: unknown, field: string): string {
  if (typeof timeZone !== 'string' || timeZone.trim() === '') {
    throw new SkyInputError(field, `must be an IANA time zone such as "America/Santiago", got ${describeValue(timeZone)}`);
  }
  try {
    formatterFor(timeZone);
  } catch {
    throw new SkyInputError(field, `is not a known IANA time zone: ${JSON.stringify(timeZone)}`);
  }
  return timeZone;
}

/** Offset of the zone's wall clock from UTC at an instant, ms (e.g. +3 600 000 for UTC+1). */
export function timeZoneOffsetMs(timeZone: string, utcMs: number): number {
  const parts = formatterFor(timeZone).formatToParts(new Date(utcMs));
  const get = (type: Intl.DateTimeFormatPartTypes): number => Number(parts.find((p) => p.type === type)?.value);
  const wall = Date.UTC(get('year'), get('month') - 1, get('day'), get('hour'), get('minute'), get('second'));
  return wall - Math.floor(utcMs / 1000) * 1000;
}

/**
 * The UTC instant when the zone's wall clock shows 12:00 on the given local date. The offset is
 * looked up at the instant 12:00 UTC − offset(12:00 UTC): daylight-saving changes happen at
 * night, never between those two instants and local noon.
 */
export function zonedNoonUtcMs(dayNumber: number, timeZone: string): number {
  const wallNoon = dayNumber * MS_PER_DAY + 12 * MS_PER_HOUR;
  return wallNoon - timeZoneOffsetMs(timeZone, wallNoon - timeZoneOffsetMs(timeZone, wallNoon));
}

/** UTC bounds of the 24-h window of one local night (see the policy at the top of this file). */
export interface NightWindow {
  dayNumber: number;
  nightDate: string;
  startUtcMs: number;
  endUtcMs: number;
}

/** Local mean noon on UTC day `dayNumber`: 12:00 UTC − longitude × 4 min. */
function meanNoonUtcMs(dayNumber: number, longitudeDeg: number): number {
  return dayNumber * MS_PER_DAY + 12 * MS_PER_HOUR - longitudeDeg * 240_000;
}

/**
 * Days from local mean noon of UTC day `dayNumber` to 12:00 wall-clock time of that date in the
 * zone, with one offset lookup at 12:00 UTC of the date (see `nightWindow` for why one is enough).
 */
function zoneNoonFromMeanNoonDays(dayNumber: number, longitudeDeg: number, timeZone: string): number {
  const wallNoon = dayNumber * MS_PER_DAY + 12 * MS_PER_HOUR;
  const zonedNoon = wallNoon - timeZoneOffsetMs(timeZone, wallNoon);
  return (zonedNoon - meanNoonUtcMs(dayNumber, longitudeDeg)) / MS_PER_DAY;
}

function windowStartingAt(dayNumber: number, startUtcMs: number): NightWindow {
  return { dayNumber, nightDate: formatDayNumber(dayNumber), startUtcMs, endUtcMs: startUtcMs + MS_PER_DAY };
}

/** The window of the night of local date `dayNumber` at a site. */
export function nightWindow(dayNumber: number, longitudeDeg: number, timeZone: string): NightWindow {
  // Only the whole-day rounding below depends on the zone, so one offset lookup (at 12:00 UTC
  // of the date) is enough: being an hour off at a daylight-saving change could only alter the
  // rounding for a zone about 12 h away from the site's solar time, and none is (the extreme,
  // UTC+14 at longitude −157°, is 24.5 h ≈ 0.5 h away).
  const shiftDays = Math.round(zoneNoonFromMeanNoonDays(dayNumber, longitudeDeg, timeZone));
  return windowStartingAt(dayNumber, meanNoonUtcMs(dayNumber, longitudeDeg) + shiftDays * MS_PER_DAY);
}

/**
 * Windows of consecutive nights `firstDayNumber…lastDayNumber`. Looking up a zone offset costs
 * tens of microseconds, so when the first and the last night round to the same mean noon with
 * a margin of more than 3 h (larger than any daylight-saving shift) every night in between does
 * too, and the zone is consulted twice instead of once per night.
 */
export function nightWindows(firstDayNumber: number, lastDayNumber: number, longitudeDeg: number, timeZone: string): NightWindow[] {
  const dayShift = (dayNumber: number): { shift: number; marginDays: number } => {
    const days = zoneNoonFromMeanNoonDays(dayNumber, longitudeDeg, timeZone);
    const shift = Math.round(days);
    return { shift, marginDays: 0.5 - Math.abs(days - shift) };
  };
  const first = dayShift(firstDayNumber);
  const last = dayShift(lastDayNumber);
  const out: NightWindow[] = [];
  const uniform = first.shift === last.shift && first.marginDays > 3 / 24 && last.marginDays > 3 / 24;
  for (let d = firstDayNumber; d <= lastDayNumber; d++) {
    out.push(
      uniform ? windowStartingAt(d, meanNoonUtcMs(d, longitudeDeg) + first.shift * MS_PER_DAY) : nightWindow(d, longitudeDeg, timeZone),
    );
  }
  return out;
}
