/**
 * Night plans (`npm run bench -- schedule`): 200 programs of 25 targets (5000 targets), each
 * program on one of 3 nodes at 3 sites, 180 nights. Targets are seeded random stars over the
 * sky each node can reach; their plans come from the product's own planner on their node; the
 * sky windows from the product's own computation. Each program's value per visit night follows
 * its place in the standing (the best of 200 is worth 200, the last 1). Awards: every program
 * gets its plan's clear-weather hours, scaled down on a node where they would exceed its dark
 * hours (a full, slightly overbooked campaign). The scenario is heavily oversubscribed (the plans
 * of 5000 rotation targets ask some 30 times the dark hours of three nodes), so the awards are a
 * few per cent of each plan, spread over its baseline (scheduler-inputs.ts), and few periods are
 * recovered: the recovery figure measures the work, not the science of a sensible campaign.
 * Prints:
 * 1. the plan build (sky windows and scheduling of all three nodes; target ≤ 10 s);
 * 2. a re-plan after one lost night (night 60 of each node, the visits before it kept; ≤ 2 s);
 * 3. the plan's value as a share of the HiGHS upper bound (night-plan-bound.ts; target ≥ 90 %);
 * 4. injection–recovery with 20 trials per target (science-yield.ts; target ≤ 60 s in the
 *    worker) — on a sample of targets, extrapolated to all 5000 and said so, unless
 *    BENCH_SCHEDULE_FULL_YIELD=1.
 */
import loadHighs from 'highs';
import { TYPICAL_NODE } from '../../shared/src/cli/typical-node';
import type { NodeSpec, SiteSpec } from '../../shared/src/facility/facility-types';
import { nightPlanBound, type HighsLike } from '../../shared/src/scheduling/night-plan-bound';
import { scheduleNights, type PlannedVisit, type SchedulerTarget } from '../../shared/src/scheduling/night-scheduler';
import { schedulerNights, schedulerTarget, visitDays } from '../../shared/src/scheduling/scheduler-inputs';
import { scienceYield } from '../../shared/src/scheduling/science-yield';
import { computeTargetPlan, seededRandom, type TargetPlan, type TargetPlanTarget } from '../../shared/src/science/index';
import { computeSkyWindows } from '../../shared/src/sky/sky-windows';
import type { SkyWindowsResult } from '../../shared/src/sky/sky-types';

const PROGRAMS = 200;
const PER_PROGRAM = 25;
const CAMPAIGN = { firstNight: '2027-03-01', lastNight: '2027-08-27' }; // 180 nights
const TRIALS = 20;
const YIELD_SAMPLE = Number(process.env.BENCH_SCHEDULE_YIELD_SAMPLE ?? 250);

const NODES: { name: string; node: NodeSpec; site: SiteSpec }[] = [
  {
    name: 'node A',
    node: TYPICAL_NODE,
    site: { latitudeDeg: 30, longitudeDeg: -70, elevationM: 2000, timeZone: 'UTC', skyBrightnessMagPerArcsec2: 21.5 },
  },
  {
    name: 'node B',
    node: { ...TYPICAL_NODE, apertureM: 0.4, weatherLossFraction: 0.45 },
    site: { latitudeDeg: -25, longitudeDeg: 20, elevationM: 1200, timeZone: 'UTC', skyBrightnessMagPerArcsec2: 20.8 },
  },
  {
    name: 'node C',
    node: { ...TYPICAL_NODE, apertureM: 1.0, saturationE: 90000 },
    site: { latitudeDeg: 40, longitudeDeg: 140, elevationM: 2500, timeZone: 'UTC', skyBrightnessMagPerArcsec2: 21.6 },
  },
];

interface BenchTarget {
  id: number;
  program: number;
  raDeg: number;
  decDeg: number;
  star: TargetPlanTarget;
}

function makeTargets(): BenchTarget[][] {
  const r = seededRandom(1202);
  const byNode: BenchTarget[][] = NODES.map(() => []);
  for (let p = 0; p < PROGRAMS; p++) {
    const node = p % NODES.length;
    const lat = NODES[node].site.latitudeDeg;
    // A program's stars in one region of the sky the node reaches (like a cluster or a field).
    const ra0 = r.uniform(0, 360);
    const dec0 = Math.max(-85, Math.min(85, lat + r.uniform(-35, 35)));
    for (let i = 0; i < PER_PROGRAM; i++) {
      const ageMyr = r.uniform(300, 4000);
      byNode[node].push({
        id: p * PER_PROGRAM + i + 1,
        program: p,
        raDeg: (ra0 + r.uniform(-8, 8) + 360) % 360,
        decDeg: Math.max(-89, Math.min(89, dec0 + r.uniform(-5, 5))),
        star: {
          name: `Bench star ${p}-${i}`,
          colour: { value: r.uniform(0.7, 2.2), system: 'BPRP' },
          ageMyr,
          ageUncertaintyMyr: ageMyr * 0.15,
          magnitude: { value: r.uniform(9, 13.5), band: 'V' },
        },
      });
    }
  }
  return byNode;
}

const s = (ms: number) => `${(ms / 1000).toFixed(2)} s`;

export default async function (): Promise<void> {
  const byNode = makeTargets();
  const tPlans = performance.now();
  const plans: TargetPlan[][] = byNode.map((list, k) => list.map((t) => computeTargetPlan(t.star, NODES[k].node, NODES[k].site)));
  const feasibleCount = plans.flat().filter((p) => p.feasible).length;
  console.log(
    `${PROGRAMS} programs × ${PER_PROGRAM} targets = ${PROGRAMS * PER_PROGRAM} targets on ${NODES.length} nodes, 180 nights; their plans in ${s(performance.now() - tPlans)} (${feasibleCount} feasible; the others are scheduled too, for what their windows allow)`,
  );

  // 1. Plan build: sky windows and scheduling, per node.
  const t0 = performance.now();
  const built = byNode.map((list, k) => {
    const windows = computeSkyWindows({
      site: NODES[k].site,
      limits: { altitudeLimitDeg: NODES[k].node.altitudeLimitDeg, moonSeparationMinDeg: 30 },
      campaign: CAMPAIGN,
      targets: list.map((t) => ({ raDeg: t.raDeg, decDeg: t.decDeg })),
    });
    const nights = schedulerNights(windows);
    const darkHours = windows.nights.reduce((sum, n) => sum + n.darkHours, 0);
    const planHours =
      plans[k].reduce(
        (sum, p) => sum + p.quantities.visitNights.value * p.quantities.visitsPerNight.value * p.quantities.visitSeconds.value,
        0,
      ) / 3600;
    const scale = Math.min(1, (1.05 * darkHours) / planHours);
    const targets: SchedulerTarget[] = list.map((t, i) => {
      const plan = plans[k][i];
      const clear = (plan.quantities.visitNights.value * plan.quantities.visitsPerNight.value * plan.quantities.visitSeconds.value) / 3600;
      return schedulerTarget({
        id: t.id,
        plan,
        windows: windows.targets[i],
        weight: PROGRAMS - t.program,
        awardedClearHours: clear * scale,
      });
    });
    const result = scheduleNights({ nights, targets });
    return { windows, nights, targets, result, darkHours, planHours, scale };
  });
  const buildMs = performance.now() - t0;
  for (const [k, b] of built.entries()) {
    const placed = b.result.targets.reduce((sum, o) => sum + o.visitNights, 0);
    const needed = b.targets.reduce((sum, t) => sum + t.visitNights, 0);
    const usedHours = b.result.visits.reduce((sum, v) => sum + (v.endMs - v.startMs), 0) / 3_600_000;
    console.log(
      `  ${NODES[k].name}: ${b.targets.length} targets, ${b.darkHours.toFixed(0)} dark hours, plans ask ${b.planHours.toFixed(0)} clear hours (awards scaled by ${b.scale.toFixed(2)}); ` +
        `${b.result.visits.length} visits on ${placed} of ${needed} visit nights, ${usedHours.toFixed(0)} h used`,
    );
  }
  console.log(`1. plan build (sky windows + scheduling, 3 nodes): ${s(buildMs)}; target ≤ 10 s`);

  // 2. Re-plan after one lost night.
  const LOST = 60;
  const t1 = performance.now();
  const replans = built.map((b) => {
    const nights = b.nights.map((n, i) => (i === LOST ? { ...n, lost: true } : n));
    const fixed: PlannedVisit[] = b.result.visits.filter((v) => v.night < LOST);
    return scheduleNights({ nights, targets: b.targets, fixed, fromNight: LOST });
  });
  const replanMs = performance.now() - t1;
  const moved = replans.reduce(
    (sum, r, k) =>
      sum +
      r.visits.filter((v) => v.night < LOST && !built[k].result.visits.some((w) => w.targetId === v.targetId && w.startMs === v.startMs))
        .length,
    0,
  );
  console.log(
    `2. re-plan after one lost night (night ${LOST} of each node, earlier visits kept): ${s(replanMs)} (${moved} earlier visits moved); target ≤ 2 s`,
  );

  // 3. Value against the HiGHS bound.
  const highs = (await loadHighs()) as unknown as HighsLike;
  let value = 0;
  let bound = 0;
  const t2 = performance.now();
  for (const [k, b] of built.entries()) {
    const tb = performance.now();
    const nb = nightPlanBound({ nights: b.nights, targets: b.targets }, highs);
    value += b.result.value;
    bound += nb.bound;
    console.log(
      `  ${NODES[k].name}: value ${b.result.value.toFixed(0)} of bound ${nb.bound.toFixed(1)} (${((100 * b.result.value) / nb.bound).toFixed(1)} %), LP ${nb.variables} variables × ${nb.constraints} rows, ${nb.status}, ${s(performance.now() - tb)}`,
    );
  }
  console.log(
    `3. value as a share of the HiGHS upper bound: ${((100 * value) / bound).toFixed(1)} % (bounds in ${s(performance.now() - t2)}); target ≥ 90 %`,
  );

  // 4. Injection–recovery.
  const all = built.flatMap((b, k) => b.targets.map((t, i) => ({ k, i, t })));
  const full = process.env.BENCH_SCHEDULE_FULL_YIELD === '1';
  const sample = full ? all : all.filter((_, j) => j % Math.max(1, Math.floor(all.length / YIELD_SAMPLE)) === 0).slice(0, YIELD_SAMPLE);
  const byTarget = built.map((b) => {
    const m = new Map<number, PlannedVisit[]>();
    for (const v of b.result.visits) m.set(v.targetId, [...(m.get(v.targetId) ?? []), v]);
    return m;
  });
  const t3 = performance.now();
  let fractionSum = 0;
  let counted = 0;
  for (const { k, i, t } of sample) {
    const visits = byTarget[k].get(t.id) ?? [];
    const y = scienceYield(plans[k][i], visitDays(visits, built[k].windows as SkyWindowsResult), {
      trials: TRIALS,
      seed: t.id,
      weatherLossFraction: NODES[k].node.weatherLossFraction,
    });
    if (y.fraction !== null) {
      fractionSum += y.fraction;
      counted++;
    }
  }
  const yieldMs = performance.now() - t3;
  const perTarget = yieldMs / sample.length;
  console.log(
    `4. injection–recovery, ${TRIALS} trials per target: ${sample.length} targets in ${s(yieldMs)} (${perTarget.toFixed(1)} ms per target)` +
      (full ? '' : `, extrapolated to all ${all.length}: ${s(perTarget * all.length)}`) +
      `; mean recovery ${counted ? ((100 * fractionSum) / counted).toFixed(0) : '—'} % over targets with visits; target ≤ 60 s`,
  );
}
