import fc from 'fast-check';
import { scheduleNights, type PlannedVisit, type ScheduleInput, type SchedulerNight, type SchedulerTarget } from './night-scheduler';
import { campaignArb, DAY, HOUR, T0 } from './testing/campaign-arbitrary';

/** Every guarantee the scheduler states (night-scheduler.ts), checked on one result. */
function checkGuarantees(input: ScheduleInput, visits: PlannedVisit[]): void {
  const byId = new Map(input.targets.map((t) => [t.id, t]));
  const fixedKeys = new Set((input.fixed ?? []).map((v) => `${v.targetId}:${v.night}:${v.startMs}`));
  const from = input.fromNight ?? 0;
  for (const v of visits) {
    const t = byId.get(v.targetId)!;
    const isFixed = fixedKeys.has(`${v.targetId}:${v.night}:${v.startMs}`);
    // Inside one usable interval of its target on its night (sky window, darkness, altitude, Moon).
    const iv = t.intervals(v.night);
    let inside = false;
    for (let k = 0; k + 1 < iv.length; k += 2) if (v.startMs >= iv[k] - 1e-6 && v.endMs <= iv[k + 1] + 1e-6) inside = true;
    expect(inside).toBe(true);
    expect(v.endMs - v.startMs).toBeCloseTo(t.visitMs, 6);
    // No new visit on a lost night or before the re-plan start.
    if (!isFixed) {
      expect(input.nights[v.night].lost).toBe(false);
      expect(v.night).toBeGreaterThanOrEqual(from);
    }
  }
  // No overlap within a night, so no night holds more than its dark time.
  const byNight = new Map<number, PlannedVisit[]>();
  for (const v of visits) byNight.set(v.night, [...(byNight.get(v.night) ?? []), v]);
  for (const [n, list] of byNight) {
    const sorted = [...list].sort((a, b) => a.startMs - b.startMs);
    for (let i = 1; i < sorted.length; i++) expect(sorted[i].startMs).toBeGreaterThanOrEqual(sorted[i - 1].endMs - 1e-6);
    const night = input.nights[n];
    const busy = sorted.reduce((s, v) => s + (v.endMs - v.startMs), 0);
    expect(busy).toBeLessThanOrEqual(night.darkEndMs! - night.darkStartMs! + 1e-6);
  }
  for (const t of input.targets) {
    const mine = visits.filter((v) => v.targetId === t.id);
    const nightsOf = [...new Set(mine.map((v) => v.night))].sort((a, b) => a - b);
    const fixedNights = new Set((input.fixed ?? []).filter((v) => v.targetId === t.id).map((v) => v.night));
    // Visit nights never closer than step − tolerance (fixed pairs are the caller's business).
    for (let i = 1; i < nightsOf.length; i++) {
      if (fixedNights.has(nightsOf[i]) && fixedNights.has(nightsOf[i - 1])) continue;
      expect(nightsOf[i] - nightsOf[i - 1]).toBeGreaterThanOrEqual(t.stepNights - t.toleranceNights);
    }
    // Never more visit nights than needed (beyond fixed ones), never more time than the award.
    const newNights = nightsOf.filter((n) => !fixedNights.has(n));
    expect(newNights.length).toBeLessThanOrEqual(Math.max(0, t.visitNights - fixedNights.size));
    const newMs = mine.filter((v) => !fixedKeys.has(`${v.targetId}:${v.night}:${v.startMs}`)).reduce((s, v) => s + v.endMs - v.startMs, 0);
    const fixedMs = mine.filter((v) => fixedKeys.has(`${v.targetId}:${v.night}:${v.startMs}`)).reduce((s, v) => s + v.endMs - v.startMs, 0);
    if (newMs > 0) expect(newMs + fixedMs).toBeLessThanOrEqual(t.budgetMs + 1e-3);
    // Each visit night holds exactly the target's visits per night.
    for (const n of newNights) expect(mine.filter((v) => v.night === n)).toHaveLength(t.visitsPerNight);
  }
}

describe('scheduleNights: guarantees (fast-check)', () => {
  it('every visit in its target’s usable time, no overlap, no overfull or lost night, cadence floor, needs and award kept', () => {
    let visits = 0;
    let busyNights = 0;
    fc.assert(
      fc.property(campaignArb, ({ nights, targets }) => {
        const input = { nights, targets };
        const result = scheduleNights(input);
        checkGuarantees(input, result.visits);
        visits += result.visits.length;
        busyNights += new Set(result.visits.map((v) => v.night)).size;
      }),
      { numRuns: 300 },
    );
    // The properties are about something: the campaigns keep nights busy with many visits.
    expect(visits).toBeGreaterThan(3000);
    expect(busyNights).toBeGreaterThan(1000);
  });

  it('re-planning from a night never moves a visit already fixed, and marks no lost night', () => {
    fc.assert(
      fc.property(campaignArb, fc.integer({ min: 0, max: 100 }), fc.integer({ min: 0, max: 29 }), ({ nights, targets }, share, lostAt) => {
        const first = scheduleNights({ nights, targets });
        const from = Math.floor((share / 100) * nights.length);
        // Done: every visit before the re-plan night; that night becomes lost (weather), as a manager would mark it.
        const fixed = first.visits.filter((v) => v.night < from);
        const replanned = nights.map((n, i) => (i === Math.min(lostAt, nights.length - 1) && i >= from ? { ...n, lost: true } : n));
        const input = { nights: replanned, targets, fixed, fromNight: from };
        const second = scheduleNights(input);
        for (const v of fixed) {
          expect(second.visits).toContainEqual({ ...v, fixed: true });
        }
        checkGuarantees(input, second.visits);
      }),
      { numRuns: 200 },
    );
  });
});

describe('scheduleNights: cadence where feasible (fast-check)', () => {
  it('a target alone keeps step ± tolerance wherever a usable night lies in that span', () => {
    let gapsSeen = 0;
    fc.assert(
      fc.property(campaignArb, ({ nights, targets }) => {
        const t = { ...targets[0], budgetMs: Number.POSITIVE_INFINITY };
        const result = scheduleNights({ nights, targets: [t] });
        const nightsOf = [...new Set(result.visits.map((v) => v.night))].sort((a, b) => a - b);
        const fits = (m: number) => {
          const iv = t.intervals(m);
          let usable = 0;
          for (let k = 0; k + 1 < iv.length; k += 2) usable += iv[k + 1] - iv[k];
          return !nights[m].lost && nights[m].darkStartMs !== null && usable >= t.visitMs * t.visitsPerNight;
        };
        for (let i = 1; i < nightsOf.length; i++) {
          const [a, b] = [nightsOf[i - 1], nightsOf[i]];
          gapsSeen++;
          if (b - a <= t.stepNights + t.toleranceNights) continue;
          // A longer gap only when no night of the span could take the visit… (the visits always
          // fit a usable night: nothing else competes, so a usable night means room).
          for (let m = a + t.stepNights - t.toleranceNights; m <= Math.min(a + t.stepNights + t.toleranceNights, nights.length - 1); m++) {
            const cannotFit = !fits(m) || !placeableAlone(t, m);
            expect(cannotFit).toBe(true);
          }
        }
      }),
      { numRuns: 300 },
    );
    // The property is about something: many runs have consecutive visit nights.
    expect(gapsSeen).toBeGreaterThan(200);
  });
});

/** Whether the target's visits of night `m` fit its usable intervals with nothing else planned (spread as the scheduler spreads them). */
function placeableAlone(t: SchedulerTarget, m: number): boolean {
  const r = scheduleNights({
    nights: Array.from({ length: m + 1 }, (_, i) => ({
      darkStartMs: i === m ? 0 : null,
      darkEndMs: i === m ? Number.MAX_SAFE_INTEGER : null,
      lost: false,
    })),
    targets: [{ ...t, visitNights: 1, budgetMs: Number.POSITIVE_INFINITY }],
    fromNight: m,
  });
  return r.visits.length > 0;
}

describe('scheduleNights: worked cases (worked by hand in this test)', () => {
  const night = (n: number, hours = 8): SchedulerNight => ({
    darkStartMs: T0 + n * DAY,
    darkEndMs: T0 + n * DAY + hours * HOUR,
    lost: false,
  });
  const always =
    (hours = 8) =>
    (n: number) => [T0 + n * DAY, T0 + n * DAY + hours * HOUR];

  it('one target with room every night: a visit night every step, exactly as many as needed', () => {
    const nights = Array.from({ length: 20 }, (_, n) => night(n));
    const target: SchedulerTarget = {
      id: 7,
      weight: 1,
      visitMs: 0.5 * HOUR,
      visitsPerNight: 2,
      stepNights: 3,
      toleranceNights: 1,
      visitNights: 5,
      budgetMs: Number.POSITIVE_INFINITY,
      intervals: always(),
    };
    const r = scheduleNights({ nights, targets: [target] });
    // Nights 0, 3, 6, 9, 12; two visits each, spread over the 8 h: at 0 h and at 4 h.
    expect([...new Set(r.visits.map((v) => v.night))]).toEqual([0, 3, 6, 9, 12]);
    expect(r.visits.filter((v) => v.night === 0).map((v) => (v.startMs - T0) / HOUR)).toEqual([0, 4]);
    expect(r.targets[0]).toMatchObject({ visitNights: 5, visits: 10, largestGapNights: 3, medianGapNights: 3, gapsOverTolerance: 0 });
    expect(r.value).toBe(5);
  });

  it('a lost night moves the visit to the next usable night within tolerance', () => {
    const nights = Array.from({ length: 10 }, (_, n) => ({ ...night(n), lost: n === 2 }));
    const target: SchedulerTarget = {
      id: 1,
      weight: 1,
      visitMs: HOUR,
      visitsPerNight: 1,
      stepNights: 2,
      toleranceNights: 1,
      visitNights: 4,
      budgetMs: Number.POSITIVE_INFINITY,
      intervals: always(),
    };
    const r = scheduleNights({ nights, targets: [target] });
    // 0, then 2 is lost → 3 (within tolerance), then 5, 7.
    expect([...new Set(r.visits.map((v) => v.night))]).toEqual([0, 3, 5, 7]);
  });

  it('a full night goes to the more valuable target; the other keeps its cadence on the next night it can', () => {
    // Night 0 holds one 8-h visit; both targets want it. Weight decides; the other has night 1 as an alternative.
    const nights = [night(0), night(1)];
    const mk = (id: number, weight: number): SchedulerTarget => ({
      id,
      weight,
      visitMs: 8 * HOUR,
      visitsPerNight: 1,
      stepNights: 2,
      toleranceNights: 1,
      visitNights: 1,
      budgetMs: Number.POSITIVE_INFINITY,
      intervals: always(),
    });
    const r = scheduleNights({ nights, targets: [mk(1, 1), mk(2, 5)] });
    expect(r.visits.map((v) => [v.targetId, v.night])).toEqual([
      [2, 0],
      [1, 1],
    ]);
  });

  it('the last chance comes before value: a target with no other usable night before its cadence breaks goes first', () => {
    // Target 1 (low value) can only be seen on night 0; target 2 (high value) on nights 0 and 1.
    const nights = [night(0), night(1)];
    const base = {
      visitMs: 8 * HOUR,
      visitsPerNight: 1,
      stepNights: 2,
      toleranceNights: 0,
      visitNights: 1,
      budgetMs: Number.POSITIVE_INFINITY,
    };
    const r = scheduleNights({
      nights,
      targets: [
        { ...base, id: 1, weight: 1, intervals: (n) => (n === 0 ? always()(0) : []) },
        { ...base, id: 2, weight: 9, intervals: always() },
      ],
    });
    expect(r.visits.map((v) => [v.targetId, v.night])).toEqual([
      [1, 0],
      [2, 1],
    ]);
    expect(r.value).toBe(10);
  });

  it('stops at the award: a 3-h award of 1-h visits gives three visit nights', () => {
    const nights = Array.from({ length: 10 }, (_, n) => night(n));
    const r = scheduleNights({
      nights,
      targets: [
        {
          id: 1,
          weight: 1,
          visitMs: HOUR,
          visitsPerNight: 1,
          stepNights: 1,
          toleranceNights: 0,
          visitNights: 8,
          budgetMs: 3 * HOUR,
          intervals: always(),
        },
      ],
    });
    expect(r.targets[0].visitNights).toBe(3);
  });

  it('refuses impossible numbers with the target and the field named', () => {
    const t: SchedulerTarget = {
      id: 4,
      weight: 1,
      visitMs: HOUR,
      visitsPerNight: 1,
      stepNights: 2,
      toleranceNights: 2,
      visitNights: 1,
      budgetMs: 1,
      intervals: () => [],
    };
    expect(() => scheduleNights({ nights: [night(0)], targets: [t] })).toThrow('target 4: toleranceNights');
  });
});
