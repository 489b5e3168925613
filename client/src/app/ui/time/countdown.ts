import { differenceInMinutes, formatDistanceStrict } from 'date-fns';

const MINUTES_PER_DAY = 24 * 60;

/**
 * How far away an instant is, in words: "in 12 days", "in 5 hours", "3 days ago". Deadlines
 * between one and 99 days away are counted in days (date-fns would switch to months at 30),
 * because people plan a proposal in days.
 */
export function describeCountdown(target: Date | string, now: Date | number): string {
  const when = typeof target === 'string' ? new Date(target) : target;
  const minutes = Math.abs(differenceInMinutes(when, now));
  const inDays = minutes >= MINUTES_PER_DAY && minutes < 100 * MINUTES_PER_DAY;
  return formatDistanceStrict(when, now, {
    addSuffix: true,
    roundingMethod: 'floor',
    ...(inDays ? { unit: 'day' as const } : {}),
  });
}
