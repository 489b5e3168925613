import fc from 'fast-check';
import loadHighs from 'highs';
import { boundModel, nightPlanBound, type HighsLike } from './night-plan-bound';
import { scheduleNights, type SchedulerNight, type SchedulerTarget } from './night-scheduler';
import { campaignArb, DAY, HOUR, T0 } from './testing/campaign-arbitrary';

let highs: HighsLike;
beforeAll(async () => {
  highs = (await loadHighs()) as unknown as HighsLike;
});

const night = (n: number, hours = 8): SchedulerNight => ({
  darkStartMs: T0 + n * DAY,
  darkEndMs: T0 + n * DAY + hours * HOUR,
  lost: false,
});
const always =
  (hours = 8) =>
  (n: number) => [T0 + n * DAY, T0 + n * DAY + hours * HOUR];

describe('nightPlanBound', () => {
  it('one night, two 8-h visits: the bound is the better one (worked by hand in this test)', () => {
    const mk = (id: number, weight: number): SchedulerTarget => ({
      id,
      weight,
      visitMs: 8 * HOUR,
      visitsPerNight: 1,
      stepNights: 1,
      toleranceNights: 0,
      visitNights: 1,
      budgetMs: Number.POSITIVE_INFINITY,
      intervals: always(),
    });
    const input = { nights: [night(0)], targets: [mk(1, 1), mk(2, 5)] };
    // max x1 + 5 x2 subject to 8 x1 + 8 x2 ≤ 8, 0 ≤ x ≤ 1 → x2 = 1: 5.
    expect(nightPlanBound(input, highs)).toMatchObject({ bound: 5, status: 'Optimal', variables: 2 });
    expect(scheduleNights(input).value).toBe(5);
  });

  it('the cadence floor tightens the relaxation: step 3, tolerance 0 over 7 nights allows at most 3 visit nights (worked by hand in this test)', () => {
    const t: SchedulerTarget = {
      id: 1,
      weight: 2,
      visitMs: HOUR,
      visitsPerNight: 1,
      stepNights: 3,
      toleranceNights: 0,
      visitNights: 7,
      budgetMs: Number.POSITIVE_INFINITY,
      intervals: always(),
    };
    const input = { nights: Array.from({ length: 7 }, (_, n) => night(n)), targets: [t] };
    // Nights 0, 3, 6: three visit nights of value 2; every run of 3 nights holds one at most, so the LP cannot beat 6
    // (runs {0,1,2}, {3,4,5} and night 6 alone: at most 1 + 1 + 1).
    expect(nightPlanBound(input, highs).bound).toBeCloseTo(6, 6);
    expect(scheduleNights(input).value).toBe(6);
  });

  it('fixed visits count once and block their neighbours; the award caps the rest', () => {
    const t: SchedulerTarget = {
      id: 1,
      weight: 1,
      visitMs: HOUR,
      visitsPerNight: 1,
      stepNights: 2,
      toleranceNights: 0,
      visitNights: 10,
      budgetMs: 3 * HOUR,
      intervals: always(),
    };
    const fixed = [{ targetId: 1, night: 0, startMs: T0, endMs: T0 + HOUR }];
    const model = boundModel({ nights: Array.from({ length: 10 }, (_, n) => night(n)), targets: [t], fixed, fromNight: 1 });
    expect(model.fixedValue).toBe(1);
    // Night 1 is within one night of the fixed visit: no variable for it; nights 2…9 remain.
    expect(model.variables).toBe(8);
    expect(model.lp).toContain('award0:');
    // 3 h of award, 1 h used: two more visit nights at most.
    expect(
      nightPlanBound({ nights: Array.from({ length: 10 }, (_, n) => night(n)), targets: [t], fixed, fromNight: 1 }, highs).bound,
    ).toBeCloseTo(3, 6);
  });

  it('really bounds: the scheduler’s value never exceeds it on random small campaigns (fast-check)', () => {
    let shareSum = 0;
    let cases = 0;
    fc.assert(
      fc.property(campaignArb, ({ nights, targets }) => {
        const input = { nights, targets };
        const value = scheduleNights(input).value;
        const b = nightPlanBound(input, highs);
        expect(b.status).toBe('Optimal');
        expect(value).toBeLessThanOrEqual(b.bound + 1e-6);
        if (b.bound > 0) {
          shareSum += value / b.bound;
          cases++;
        }
      }),
      { numRuns: 150 },
    );
    // Not a target, a sanity check that the comparison is about something: most cases have value to share.
    expect(cases).toBeGreaterThan(100);
    expect(shareSum / cases).toBeGreaterThan(0.5);
  });
});
