/**
 * An upper bound on the value any night plan can reach, to measure the scheduler against
 * (night-scheduler.ts): the linear relaxation of a time-indexed formulation with one variable per
 * target and night, solved with HiGHS (the `highs` package, HiGHS compiled to WebAssembly).
 *
 *   maximise   Σ_t Σ_n w_t · x_tn                                   (value of new visit nights)
 *   subject to Σ_t k_t·v_t · x_tn ≤ D_n − F_n        for each night n (dark time left by fixed visits)
 *              Σ_n x_tn ≤ N_t − f_t                  for each target t (visit nights still needed)
 *              Σ_n k_t·v_t · x_tn ≤ B_t − U_t        for each target t (award time left)
 *              Σ_{n=m}^{m+L_t−1} x_tn ≤ 1            for each target t with L_t = step − tolerance ≥ 2
 *                                                     and each run of L_t consecutive nights m…
 *              0 ≤ x_tn ≤ 1, and x_tn = 0 where the target's visits do not fit its usable
 *              intervals on night n alone, on lost nights, before the re-plan night, and within
 *              L_t − 1 nights of one of its fixed visit nights.
 *
 * Every plan the scheduler makes satisfies these constraints (its visits do not overlap inside
 * the dark time, a target's visit nights are at least L_t apart, needs and award time are kept),
 * so its value is at most the fixed visits' value plus this optimum. The relaxation drops the
 * order of visits inside a night and the cadence's upper tolerance, so the bound can be loose
 * where intervals are narrow or cadences tight; the scheduler's share of it is a lower estimate
 * of how good the plan is.
 */
import type { PlannedVisit, ScheduleInput } from './night-scheduler';
import { fitsOnEmptyNight } from './night-scheduler';

/** The `highs` module's default export (loaded by the caller: `await (await import('highs')).default()`). */
export interface HighsLike {
  solve(problem: string, options?: Record<string, unknown>): { Status: string; ObjectiveValue: number };
}

export interface NightPlanBound {
  /** Fixed visits' value plus the relaxation's optimum. */
  bound: number;
  /** Value of the fixed visits alone (counted once per visit night, capped at the need). */
  fixedValue: number;
  variables: number;
  constraints: number;
  /** HiGHS's model status ("Optimal" when the bound holds). */
  status: string;
}

/** The LP text (CPLEX LP format) of the relaxation, with its sizes; exported for tests. */
export function boundModel(input: ScheduleInput): { lp: string; fixedValue: number; variables: number; constraints: number } {
  const { nights, targets } = input;
  const from = Math.max(0, input.fromNight ?? 0);
  const fixed: readonly PlannedVisit[] = input.fixed ?? [];
  const fixedMsByNight = new Map<number, number>();
  for (const v of fixed) fixedMsByNight.set(v.night, (fixedMsByNight.get(v.night) ?? 0) + (v.endMs - v.startMs));

  const objective: string[] = [];
  const rows: string[] = [];
  const perNight = new Map<number, string[]>();
  let variables = 0;
  let fixedValue = 0;
  targets.forEach((t, ti) => {
    const mine = fixed.filter((v) => v.targetId === t.id);
    const fixedNights = [...new Set(mine.map((v) => v.night))];
    const usedMs = mine.reduce((s, v) => s + (v.endMs - v.startMs), 0);
    fixedValue += t.weight * Math.min(fixedNights.length, t.visitNights);
    const needLeft = t.visitNights - fixedNights.length;
    const nightMs = t.visitMs * t.visitsPerNight;
    const floor = t.stepNights - t.toleranceNights;
    const names: { n: number; name: string }[] = [];
    if (needLeft > 0) {
      for (let n = from; n < nights.length; n++) {
        const night = nights[n];
        if (night.lost || night.darkStartMs === null || night.darkEndMs === null) continue;
        if (fixedNights.some((f) => Math.abs(f - n) < floor)) continue;
        if (!fitsOnEmptyNight(t, n, t.intervals(n))) continue;
        const name = `x${ti}_${n}`;
        names.push({ n, name });
        objective.push(`${t.weight} ${name}`);
        const list = perNight.get(n) ?? [];
        list.push(`${nightMs / 3_600_000} ${name}`);
        perNight.set(n, list);
      }
    }
    variables += names.length;
    if (!names.length) return;
    rows.push(`need${ti}: ${names.map((v) => v.name).join(' + ')} <= ${needLeft}`);
    if (Number.isFinite(t.budgetMs)) {
      rows.push(
        `award${ti}: ${names.map((v) => `${nightMs / 3_600_000} ${v.name}`).join(' + ')} <= ${Math.max(0, (t.budgetMs - usedMs) / 3_600_000)}`,
      );
    }
    if (floor >= 2) {
      // One row per run of `floor` consecutive nights holding two or more variables; a run whose
      // variables all belong to the previous run adds nothing and is skipped.
      let end = 0;
      let previousEnd = -1;
      for (let i = 0; i < names.length; i++) {
        while (end < names.length && names[end].n < names[i].n + floor) end++;
        if (end - i >= 2 && end !== previousEnd) {
          rows.push(
            `gap${ti}_${names[i].n}: ${names
              .slice(i, end)
              .map((v) => v.name)
              .join(' + ')} <= 1`,
          );
          previousEnd = end;
        }
      }
    }
  });
  for (const [n, terms] of perNight) {
    const night = nights[n];
    const dark = (night.darkEndMs! - night.darkStartMs! - (fixedMsByNight.get(n) ?? 0)) / 3_600_000;
    rows.push(`night${n}: ${terms.join(' + ')} <= ${Math.max(0, dark)}`);
  }
  const names = objective.map((o) => o.split(' ')[1]);
  const lp = [
    'Maximize',
    ` value: ${objective.length ? objective.join(' + ') : '0 zero'}`,
    'Subject To',
    ...(rows.length ? rows.map((r) => ` ${r}`) : [' none: zero <= 0']),
    'Bounds',
    ...(names.length ? names.map((n) => ` 0 <= ${n} <= 1`) : [' 0 <= zero <= 0']),
    'End',
  ].join('\n');
  return { lp, fixedValue, variables, constraints: rows.length };
}

/** The upper bound (see the file comment); `highs` is the loaded HiGHS module. */
export function nightPlanBound(input: ScheduleInput, highs: HighsLike): NightPlanBound {
  const model = boundModel(input);
  if (model.variables === 0)
    return { bound: model.fixedValue, fixedValue: model.fixedValue, variables: 0, constraints: 0, status: 'Optimal' };
  const solution = highs.solve(model.lp, { output_flag: false, presolve: 'on' });
  return {
    bound: model.fixedValue + solution.ObjectiveValue,
    fixedValue: model.fixedValue,
    variables: model.variables,
    constraints: model.constraints,
    status: solution.Status,
  };
}
