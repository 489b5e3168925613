import { joinUtcInstant, splitUtcInstant } from './utc-instant';

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
});
