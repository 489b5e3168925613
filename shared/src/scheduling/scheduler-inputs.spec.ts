import { TYPICAL_NODE, TYPICAL_SITE } from '../cli/typical-node';
import { computeTargetPlan } from '../science/target-plan';
import { computeSkyWindows } from '../sky/sky-windows';
import { scheduleNights } from './night-scheduler';
import { cadenceToleranceNights, nightsWithWeatherAllowance, schedulerNights, schedulerTarget, visitDays } from './scheduler-inputs';
import { scienceYield } from './science-yield';

const plan = computeTargetPlan(
  { name: 'K, 1 Gyr', colour: { value: 1.1, system: 'BPRP' }, ageMyr: 1000, ageUncertaintyMyr: 120, magnitude: { value: 12, band: 'V' } },
  TYPICAL_NODE,
  TYPICAL_SITE,
);
const windows = computeSkyWindows({
  site: TYPICAL_SITE,
  limits: { altitudeLimitDeg: 30, moonSeparationMinDeg: 30 },
  campaign: { firstNight: '2027-03-01', lastNight: '2027-05-29' },
  targets: [{ raDeg: 150, decDeg: 10 }],
});

describe('scheduler inputs', () => {
  it('tolerance: a third of the step, rounded down (common practice, no source)', () => {
    expect([1, 2, 3, 6, 9].map(cadenceToleranceNights)).toEqual([0, 0, 1, 2, 3]);
  });

  it('a full award without weather keeps the plan’s visits, step and visit nights; its time is the plan’s clear time', () => {
    const t = schedulerTarget({ id: 1, plan, windows: windows.targets[0], weight: 3 });
    const q = plan.quantities;
    expect(t.visitNights).toBe(Math.round(q.visitNights.value));
    expect(t.stepNights).toBe(Math.max(1, Math.round(q.nightStepDays.value)));
    expect(t.visitsPerNight).toBe(Math.round(q.visitsPerNight.value));
    expect(t.visitMs).toBeCloseTo(q.visitSeconds.value * 1000, 6);
    expect(t.budgetMs).toBeCloseTo(t.visitNights * t.visitsPerNight * t.visitMs, 3);
  });

  it('with weather, a full award books clear nights / (1 − loss) over the same baseline (worked by hand in this test)', () => {
    expect([0, 1, 7, 10, 70].map((n) => nightsWithWeatherAllowance(n, 0.3))).toEqual([0, 2, 10, 15, 100]);
    const dry = schedulerTarget({ id: 1, plan, windows: windows.targets[0], weight: 1 });
    const wet = schedulerTarget({ id: 1, plan, windows: windows.targets[0], weight: 1, weatherLossFraction: 0.3 });
    expect(wet.visitNights).toBe(Math.ceil(dry.visitNights / 0.7 - 1e-9));
    const baseline = Math.max(dry.stepNights * (dry.visitNights - 1), Math.round(plan.quantities.baselineDays.value));
    expect(wet.stepNights).toBe(Math.max(1, Math.min(dry.stepNights, Math.round(baseline / (wet.visitNights - 1)))));
    expect(wet.budgetMs).toBeCloseTo(wet.visitNights * wet.visitsPerNight * wet.visitMs, 3);
  });

  it('a partial award spreads fewer visit nights over the same baseline (worked by hand in this test)', () => {
    const full = schedulerTarget({ id: 1, plan, windows: windows.targets[0], weight: 1 });
    const nightHours = (full.visitsPerNight * full.visitMs) / 3_600_000;
    // Hours for exactly 5 visit nights: 5 nights, spaced so that 4 steps span the plan's baseline.
    const part = schedulerTarget({
      id: 1,
      plan,
      windows: windows.targets[0],
      weight: 1,
      awardedNodeHours: 5 * nightHours + 1e-9,
      weatherLossFraction: 0.3,
    });
    expect(part.visitNights).toBe(5);
    const baseline = Math.max(full.stepNights * (full.visitNights - 1), Math.round(plan.quantities.baselineDays.value));
    expect(part.stepNights).toBe(Math.max(full.stepNights, Math.floor(baseline / 4)));
    expect(part.budgetMs).toBeCloseTo(5 * full.visitsPerNight * full.visitMs, 3);
  });

  it('keeps the plan’s promise through the weather: a fully awarded target, scheduled and simulated with the node’s weather, is recovered about as often as its plan says', () => {
    // A target up all night through the campaign, alone on the node: nothing but the weather stands between
    // the plan and its completeness. The yield's criterion (within 10 %, false alarms below 1 %) is close to
    // the plan's own (within half a resolution element, its false-alarm level), so the fractions agree
    // within the binomial scatter of 100 trials (3σ ≈ 0.09 at 0.9).
    const weather = 0.3;
    const up = computeSkyWindows({
      site: TYPICAL_SITE,
      limits: { altitudeLimitDeg: 30, moonSeparationMinDeg: 30 },
      campaign: { firstNight: '2027-01-15', lastNight: '2027-07-13' },
      targets: [{ raDeg: 180, decDeg: 60 }],
    });
    const yieldWith = (loss: number) => {
      const t = schedulerTarget({ id: 1, plan, windows: up.targets[0], weight: 1, weatherLossFraction: loss });
      const { visits } = scheduleNights({ nights: schedulerNights(up), targets: [t] });
      expect(new Set(visits.map((v) => v.night)).size).toBe(t.visitNights);
      return scienceYield(plan, visitDays(visits, up), { trials: 100, seed: 3, weatherLossFraction: weather }).fraction!;
    };
    const promised = plan.quantities.completeness.value;
    expect(promised).toBeGreaterThanOrEqual(0.9);
    const withAllowance = yieldWith(weather);
    expect(withAllowance).toBeGreaterThanOrEqual(0.9 - 0.09);
    // Booking only the clear nights would leave the weather to eat into the plan (about 0.7 here).
    expect(yieldWith(0)).toBeLessThan(withAllowance - 0.1);
  });

  it('the Moon rule removes a night; lost nights are marked; visit days fall within half a day of their night', () => {
    const t = schedulerTarget({ id: 1, plan, windows: windows.targets[0], weight: 1 });
    const w = windows.targets[0];
    for (let n = 0; n < windows.nights.length; n++) {
      if (w.moonExcludedByNight[n] === 1) expect(t.intervals(n)).toHaveLength(0);
      else expect(t.intervals(n)).toHaveLength(2 * w.intervalCountByNight[n]);
    }
    expect(
      schedulerNights(windows, new Set([4]))
        .map((x) => x.lost)
        .indexOf(true),
    ).toBe(4);
    const night = windows.nights.findIndex((_, n) => t.intervals(n).length > 0 && n > 30);
    const iv = t.intervals(night);
    const days = visitDays([{ targetId: 1, night, startMs: iv[0], endMs: iv[0] + t.visitMs }], windows);
    expect(Math.floor(days[0] + 0.5)).toBe(night);
  });
});
