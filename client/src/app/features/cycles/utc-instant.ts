/**
 * The cycle form takes instants as a date and a time of day read in UTC (a call closes at the
 * same instant for every team, wherever they are); these helpers convert between the two
 * inputs and the ISO 8601 instant the API stores. Showing an instant is ui/time's work
 * (`utcInstant`, `localInstant`); nothing here formats one for reading.
 */

const DATE = /^\d{4}-\d{2}-\d{2}$/;
const TIME = /^([01]\d|2[0-3]):[0-5]\d(:[0-5]\d)?$/;

/** `2027-01-15` + `23:59` → `2027-01-15T23:59:00Z`; null when either part is missing or malformed. */
export function joinUtcInstant(date: string, time: string): string | null {
  if (!DATE.test(date) || !TIME.test(time)) return null;
  const withSeconds = time.length === 5 ? `${time}:00` : time;
  const iso = `${date}T${withSeconds}Z`;
  return Number.isNaN(Date.parse(iso)) ? null : iso;
}

/** An instant as the UTC date and time the form shows (`HH:mm`, or `HH:mm:ss` when the seconds are not zero). */
export function splitUtcInstant(iso: string): { date: string; time: string } {
  const utc = new Date(iso).toISOString();
  const seconds = utc.slice(17, 19);
  return { date: utc.slice(0, 10), time: seconds === '00' ? utc.slice(11, 16) : utc.slice(11, 19) };
}

/** A calendar date picked in the datepicker (local midnight) → `YYYY-MM-DD`; '' for none. */
export function toCalendarDate(date: Date | null): string {
  if (!date || Number.isNaN(date.getTime())) return '';
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${date.getFullYear()}-${pad(date.getMonth() + 1)}-${pad(date.getDate())}`;
}

/** `YYYY-MM-DD` → that calendar date at local midnight (what the datepicker holds); null when malformed. */
export function fromCalendarDate(value: string): Date | null {
  const m = /^(\d{4})-(\d{1,2})-(\d{1,2})$/.exec(value.trim());
  if (!m) return null;
  const date = new Date(Number(m[1]), Number(m[2]) - 1, Number(m[3]));
  return date.getMonth() === Number(m[2]) - 1 ? date : null;
}
