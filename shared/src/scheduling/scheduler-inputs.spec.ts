import { TYPICAL_NODE, TYPICAL_SITE } from '../cli/typical-node';
import { computeTargetPlan } from '../science/target-plan';
import { computeSkyWindows } from '../sky/sky-windows';
import { cadenceToleranceNights, schedulerNights, schedulerTarget, visitDays } from './scheduler-inputs';

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

  it('a full award keeps the plan’s visits, step and visit nights; its time is the plan’s clear time', () => {
    const t = schedulerTarget({ id: 1, plan, windows: windows.targets[0], weight: 3 });
    const q = plan.quantities;
    expect(t.visitNights).toBe(Math.round(q.visitNights.value));
    expect(t.stepNights).toBe(Math.max(1, Math.round(q.nightStepDays.value)));
    expect(t.visitsPerNight).toBe(Math.round(q.visitsPerNight.value));
    expect(t.visitMs).toBeCloseTo(q.visitSeconds.value * 1000, 6);
    expect(t.budgetMs).toBeCloseTo(t.visitNights * t.visitsPerNight * t.visitMs, 3);
  });

  it('a partial award spreads fewer visit nights over the same baseline (worked by hand in this test)', () => {
    const full = schedulerTarget({ id: 1, plan, windows: windows.targets[0], weight: 1 });
    const nightHours = (full.visitsPerNight * full.visitMs) / 3_600_000;
    // Hours for exactly 5 visit nights: 5 nights, spaced so that 4 steps span the plan's baseline.
    const part = schedulerTarget({ id: 1, plan, windows: windows.targets[0], weight: 1, awardedClearHours: 5 * nightHours + 1e-9 });
    expect(part.visitNights).toBe(5);
    const baseline = Math.max(full.stepNights * (full.visitNights - 1), Math.round(plan.quantities.baselineDays.value));
    expect(part.stepNights).toBe(Math.max(full.stepNights, Math.floor(baseline / 4)));
    expect(part.budgetMs).toBeCloseTo(5 * full.visitsPerNight * full.visitMs, 3);
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
