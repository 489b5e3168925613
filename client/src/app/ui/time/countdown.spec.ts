import { describeCountdown } from './countdown';

const NOW = Date.parse('2026-03-01T12:00:00Z');

describe('describeCountdown', () => {
  it('whole days, rounded down, between one and 99 days', () => {
    expect(describeCountdown('2026-03-13T17:00:00Z', NOW)).toBe('in 12 days');
    expect(describeCountdown('2026-05-05T12:00:00Z', NOW)).toBe('in 65 days');
  });

  it('under a day: hours or minutes', () => {
    expect(describeCountdown('2026-03-01T17:30:00Z', NOW)).toBe('in 5 hours');
    expect(describeCountdown('2026-03-01T12:20:00Z', NOW)).toBe('in 20 minutes');
  });

  it('past instants read as "ago"', () => {
    expect(describeCountdown('2026-02-26T12:00:00Z', NOW)).toBe('3 days ago');
  });

  it('beyond 99 days: date-fns picks months', () => {
    expect(describeCountdown('2026-08-01T12:00:00Z', NOW)).toBe('in 5 months');
  });
});
