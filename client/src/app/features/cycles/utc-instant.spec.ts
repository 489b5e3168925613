import { fromCalendarDate, joinUtcInstant, splitUtcInstant, toCalendarDate } from './utc-instant';

describe('utc-instant', () => {
  it('joinUtcInstant: date and time read as UTC, seconds optional', () => {
    expect(joinUtcInstant('2027-01-15', '23:59')).toBe('2027-01-15T23:59:00Z');
    expect(joinUtcInstant('2027-01-15', '23:59:59')).toBe('2027-01-15T23:59:59Z');
  });

  it('joinUtcInstant: missing or malformed parts give null', () => {
    expect(joinUtcInstant('', '12:00')).toBeNull();
    expect(joinUtcInstant('2027-01-15', '')).toBeNull();
    expect(joinUtcInstant('2027-01-15', '24:00')).toBeNull();
    expect(joinUtcInstant('15/01/2027', '12:00')).toBeNull();
  });

  it('splitUtcInstant: any offset comes back as UTC date and time', () => {
    expect(splitUtcInstant('2027-01-16T00:59:00+01:00')).toEqual({ date: '2027-01-15', time: '23:59' });
    expect(splitUtcInstant('2027-01-15T23:59:59Z')).toEqual({ date: '2027-01-15', time: '23:59:59' });
  });

  it('calendar dates: YYYY-MM-DD ↔ the local-midnight Date the datepicker holds, whatever the zone', () => {
    const date = fromCalendarDate('2027-01-16')!;
    expect([date.getFullYear(), date.getMonth(), date.getDate(), date.getHours()]).toEqual([2027, 0, 16, 0]);
    expect(toCalendarDate(date)).toBe('2027-01-16');
    expect(fromCalendarDate('2027-02-30')).toBeNull();
    expect(fromCalendarDate('16/01/2027')).toBeNull();
    expect(toCalendarDate(null)).toBe('');
  });
});
