/** Random campaigns for the scheduler's property tests (night-scheduler.spec.ts, night-plan-bound.spec.ts). */
import fc from 'fast-check';
import type { SchedulerNight, SchedulerTarget } from '../night-scheduler';

export const HOUR = 3_600_000;
export const DAY = 24 * HOUR;
export const T0 = Date.UTC(2027, 2, 1, 12);

/** A random campaign: nights with dark time, some lost, and targets with usable intervals inside the dark time. */
export const campaignArb = fc
  .record({
    nightCount: fc.integer({ min: 3, max: 30 }),
    // Integers, not fc.double: its bias towards 0 and tiny values would leave most nights without dark time.
    darkQuarterHours: fc.array(fc.integer({ min: 0, max: 44 }), { minLength: 30, maxLength: 30 }),
    // About one night in ten lost.
    lost: fc.array(fc.integer({ min: 0, max: 9 }), { minLength: 30, maxLength: 30 }),
    targets: fc.array(
      fc
        .record({
          weight: fc.integer({ min: 1, max: 10 }),
          visitMinutes: fc.integer({ min: 5, max: 120 }),
          visitsPerNight: fc.integer({ min: 1, max: 3 }),
          stepNights: fc.integer({ min: 1, max: 5 }),
          tolerance: fc.integer({ min: 0, max: 4 }),
          visitNights: fc.integer({ min: 0, max: 15 }),
          budgetHours: fc.option(fc.integer({ min: 0, max: 40 }), { nil: undefined }),
          // Per night: where the usable time sits in the dark time (fractions), and whether it is split in two.
          windows: fc.array(fc.tuple(fc.integer({ min: 0, max: 100 }), fc.integer({ min: 0, max: 100 }), fc.boolean()), {
            minLength: 30,
            maxLength: 30,
          }),
        })
        .map((t) => ({ ...t, tolerance: Math.min(t.tolerance, t.stepNights - 1) })),
      { minLength: 1, maxLength: 8 },
    ),
  })
  .map((c) => {
    const nights: SchedulerNight[] = Array.from({ length: c.nightCount }, (_, n) => {
      const start = T0 + n * DAY + 8 * HOUR;
      const hours = c.darkQuarterHours[n] / 4;
      return hours < 0.5
        ? { darkStartMs: null, darkEndMs: null, lost: false }
        : { darkStartMs: start, darkEndMs: start + hours * HOUR, lost: c.lost[n] === 0 };
    });
    const targets: SchedulerTarget[] = c.targets.map((t, i) => {
      const intervalsByNight = nights.map((night, n) => {
        if (night.darkStartMs === null || night.darkEndMs === null) return [];
        const [a, b, split] = t.windows[n];
        const lo = night.darkStartMs + (Math.min(a, b) / 100) * (night.darkEndMs - night.darkStartMs);
        const hi = night.darkStartMs + (Math.max(a, b) / 100) * (night.darkEndMs - night.darkStartMs);
        if (hi - lo < 60_000) return [];
        if (!split) return [lo, hi];
        const mid = (lo + hi) / 2;
        return [lo, mid - (hi - lo) / 10, mid + (hi - lo) / 10, hi];
      });
      return {
        id: i + 1,
        weight: t.weight,
        visitMs: t.visitMinutes * 60_000,
        visitsPerNight: t.visitsPerNight,
        stepNights: t.stepNights,
        toleranceNights: t.tolerance,
        visitNights: t.visitNights,
        budgetMs: t.budgetHours === undefined ? Number.POSITIVE_INFINITY : t.budgetHours * HOUR,
        intervals: (n: number) => intervalsByNight[n] ?? [],
      };
    });
    return { nights, targets };
  });
