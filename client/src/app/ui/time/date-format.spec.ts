import { formatClockTime, formatDay, formatLocalInstant, formatUtcInstant } from './date-format';

describe('date-format', () => {
  it('formatDay: a date-only text is its calendar day in any zone; an instant is its UTC day', () => {
    expect(formatDay('2027-01-16', 'en-US')).toBe('16 Jan 2027');
    expect(formatDay('2027-01-16T23:30:00Z', 'en-US')).toBe('16 Jan 2027');
    expect(formatDay('2027-01-16T23:30:00-05:00', 'en-US')).toBe('17 Jan 2027');
    expect(formatDay(null, 'en-US')).toBe('');
    expect(formatDay('not a date', 'en-US')).toBe('');
  });

  it('formatUtcInstant: day, 24-hour time and UTC written once', () => {
    expect(formatUtcInstant('2027-01-16T00:00:00Z', 'en-US')).toBe('16 Jan 2027, 00:00 UTC');
    expect(formatUtcInstant('2026-03-13T17:05:00Z', 'en-US')).toBe('13 Mar 2026, 17:05 UTC');
    expect(formatUtcInstant(Date.UTC(2027, 6, 4, 23, 59), 'en-US')).toBe('4 Jul 2027, 23:59 UTC');
    expect(formatUtcInstant(undefined, 'en-US')).toBe('');
    // In a column whose header says UTC.
    expect(formatUtcInstant('2027-01-16T00:00:00Z', 'en-US', false)).toBe('16 Jan 2027, 00:00');
  });

  it('formatLocalInstant: the person’s clock with its zone, empty when it reads as UTC', () => {
    expect(formatLocalInstant('2027-01-16T00:00:00Z', 'en-US', 'Europe/Berlin')).toBe('16 Jan 2027, 01:00 Europe/Berlin');
    expect(formatLocalInstant('2027-01-16T00:00:00Z', 'en-US', 'America/Santiago')).toBe('15 Jan 2027, 21:00 America/Santiago');
    expect(formatLocalInstant('2027-01-16T00:00:00Z', 'en-US', 'UTC')).toBe('');
    // London in winter reads as UTC; in summer it does not.
    expect(formatLocalInstant('2027-01-16T00:00:00Z', 'en-US', 'Europe/London')).toBe('');
    expect(formatLocalInstant('2027-07-16T00:00:00Z', 'en-US', 'Europe/London')).toBe('16 Jul 2027, 01:00 Europe/London');
  });

  it('formatClockTime: hours and minutes on the person’s clock, 24-hour', () => {
    expect(formatClockTime('2027-01-16T13:05:00Z', 'en-US', 'Europe/Berlin')).toBe('14:05');
    expect(formatClockTime('2027-01-16T00:05:00Z', 'en-US', 'UTC')).toBe('00:05');
    expect(formatClockTime(new Date(Date.UTC(2027, 0, 16, 23, 59)), 'en-US', 'Asia/Tokyo')).toBe('08:59');
    expect(formatClockTime(null, 'en-US')).toBe('');
  });
});
