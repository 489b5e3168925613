/**
 * Night plans (`npm run bench -- schedule`): 200 programs of 25 targets (5000 targets), each
 * program on one of 3 nodes at 3 sites, 180 nights. Targets are seeded random stars over the
 * sky each node can reach; their plans come from the product's own planner on their node; the
 * sky windows from the product's own computation. Each program's value per visit night follows
 * its place in the standing (the best of 200 is worth 200, the last 1).
 *
 * The scenario — every program awarded: each gets its plan's node-hours (clear hours
 * with the weather allowance), scaled down on a node where they would exceed its dark hours (a
 * full, slightly overbooked campaign). It is heavily oversubscribed (the plans of 5000 rotation
 * targets ask some 40 times the dark hours of three nodes), so the awards are a few per cent of
 * each plan, spread over its baseline (scheduler-inputs.ts), and few periods are recovered.
 * Prints:
 * 1. the plan build (sky windows and scheduling of all three nodes; target ≤ 10 s);
 * 2. a re-plan after one lost night (night 60 of each node, the visits before it kept; ≤ 2 s);
 * 3. the plan's value as a share of the HiGHS upper bound (night-plan-bound.ts; target ≥ 90 %);
 * 4. injection–recovery with 20 trials for every one of the 5000 targets (science-yield.ts, the
 *    code the worker runs, here in one process; target ≤ 60 s).
 *
 * Then a campaign whose awards fit (what a panel would award): on each node, the best programs
 * in standing order while their full plans' node-hours stay within 95 % of its dark hours, each
 * awarded its whole plan. Its plan build, value against the bound, and injection–recovery for
 * every awarded target: there the recovery figure says whether full awards keep their plans'
 * promise through the weather.
 */
import loadHighs from 'highs';
import { TYPICAL_NODE } from '../../shared/src/cli/typical-node';
import type { NodeSpec, SiteSpec } from '../../shared/src/facility/facility-types';
import { nightPlanBound, type HighsLike } from '../../shared/src/scheduling/night-plan-bound';
import {
  scheduleNights,
  type PlannedVisit,
  type ScheduleResult,
  type SchedulerNight,
  type SchedulerTarget,
} from '../../shared/src/scheduling/night-scheduler';
import { schedulerNights, schedulerTarget, visitDays } from '../../shared/src/scheduling/scheduler-inputs';
import { scienceYield } from '../../shared/src/scheduling/science-yield';
import { computeTargetPlan, seededRandom, type TargetPlan, type TargetPlanTarget } from '../../shared/src/science/index';
import { computeSkyWindows } from '../../shared/src/sky/sky-windows';
import type { SkyWindowsResult } from '../../shared/src/sky/sky-types';

const PROGRAMS = 200;
const PER_PROGRAM = 25;
const CAMPAIGN = { firstNight: '2027-03-01', lastNight: '2027-08-27' }; // 180 nights
const TRIALS = 20;

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

/** Node-hours a plan asks on its node (its clear hours with the weather allowance). */
const planNodeHours = (plan: TargetPlan) => plan.quantities.nodeHours.value;

interface BuiltNode {
  windows: SkyWindowsResult;
  nights: SchedulerNight[];
  /** The node's targets that were awarded, with their index in the node's list. */
  awarded: { t: BenchTarget; i: number }[];
  targets: SchedulerTarget[];
  result: ScheduleResult;
  darkHours: number;
  awardedHours: number;
}

/** Schedules one node for the awarded targets (index into the node's list → node-hours). */
function scheduleNode(
  k: number,
  list: BenchTarget[],
  plans: TargetPlan[],
  windows: SkyWindowsResult,
  awards: Map<number, number>,
): BuiltNode {
  const nights = schedulerNights(windows);
  const darkHours = windows.nights.reduce((sum, n) => sum + n.darkHours, 0);
  const awarded = [...awards.keys()].sort((a, b) => a - b).map((i) => ({ t: list[i], i }));
  const targets = awarded.map(({ t, i }) =>
    schedulerTarget({
      id: t.id,
      plan: plans[i],
      windows: windows.targets[i],
      weight: PROGRAMS - t.program,
      awardedNodeHours: awards.get(i)!,
      weatherLossFraction: NODES[k].node.weatherLossFraction,
    }),
  );
  const result = scheduleNights({ nights, targets });
  const awardedHours = [...awards.values()].reduce((a, b) => a + b, 0);
  return { windows, nights, awarded, targets, result, darkHours, awardedHours };
}

function describeNode(k: number, b: BuiltNode): string {
  const placed = b.result.targets.reduce((sum, o) => sum + o.visitNights, 0);
  const needed = b.targets.reduce((sum, t) => sum + t.visitNights, 0);
  const usedHours = b.result.visits.reduce((sum, v) => sum + (v.endMs - v.startMs), 0) / 3_600_000;
  return (
    `  ${NODES[k].name}: ${b.targets.length} targets, ${b.darkHours.toFixed(0)} dark hours, ${b.awardedHours.toFixed(0)} node-hours awarded; ` +
    `${b.result.visits.length} visits on ${placed} of ${needed} visit nights, ${usedHours.toFixed(0)} h used`
  );
}

async function valueAgainstBound(built: BuiltNode[], highs: HighsLike): Promise<number> {
  let value = 0;
  let bound = 0;
  for (const [k, b] of built.entries()) {
    const tb = performance.now();
    const nb = nightPlanBound({ nights: b.nights, targets: b.targets }, highs);
    value += b.result.value;
    bound += nb.bound;
    console.log(
      `  ${NODES[k].name}: value ${b.result.value.toFixed(0)} of bound ${nb.bound.toFixed(1)} (${((100 * b.result.value) / nb.bound).toFixed(1)} %), LP ${nb.variables} variables × ${nb.constraints} rows, ${nb.status}, ${s(performance.now() - tb)}`,
    );
  }
  return (100 * value) / bound;
}

/** Injection–recovery for every awarded target of every node: time, and the recovery figures. */
function yieldOf(built: BuiltNode[], plans: TargetPlan[][]) {
  const t0 = performance.now();
  const fractions: number[] = [];
  /** Recovery of the targets that got every visit night they asked for. */
  const whole: number[] = [];
  let targets = 0;
  for (const [k, b] of built.entries()) {
    const wanted = new Map(b.targets.map((t) => [t.id, t.visitNights]));
    const got = new Map(b.result.targets.map((o) => [o.targetId, o.visitNights]));
    const byTarget = new Map<number, PlannedVisit[]>();
    for (const v of b.result.visits) byTarget.set(v.targetId, [...(byTarget.get(v.targetId) ?? []), v]);
    for (const { t, i } of b.awarded) {
      targets++;
      const y = scienceYield(plans[k][i], visitDays(byTarget.get(t.id) ?? [], b.windows), {
        trials: TRIALS,
        seed: t.id,
        weatherLossFraction: NODES[k].node.weatherLossFraction,
      });
      if (y.fraction !== null) fractions.push(y.fraction);
      if (y.fraction !== null && (got.get(t.id) ?? 0) >= (wanted.get(t.id) ?? Infinity)) whole.push(y.fraction);
    }
  }
  const ms = performance.now() - t0;
  const mean = fractions.length ? fractions.reduce((a, b) => a + b, 0) / fractions.length : Number.NaN;
  const sorted = [...fractions].sort((a, b) => a - b);
  const median = sorted.length ? sorted[Math.floor(sorted.length / 2)] : Number.NaN;
  const atLeast80 = fractions.filter((f) => f >= 0.8).length;
  const wholeMean = whole.length ? whole.reduce((a, b) => a + b, 0) / whole.length : Number.NaN;
  return { ms, targets, withVisits: fractions.length, mean, median, atLeast80, whole: whole.length, wholeMean };
}

const pct = (x: number) => (Number.isFinite(x) ? `${(100 * x).toFixed(0)} %` : '—');

export default async function (): Promise<void> {
  const byNode = makeTargets();
  const tPlans = performance.now();
  const plans: TargetPlan[][] = byNode.map((list, k) => list.map((t) => computeTargetPlan(t.star, NODES[k].node, NODES[k].site)));
  const feasibleCount = plans.flat().filter((p) => p.feasible).length;
  console.log(
    `${PROGRAMS} programs × ${PER_PROGRAM} targets = ${PROGRAMS * PER_PROGRAM} targets on ${NODES.length} nodes, 180 nights; their plans in ${s(performance.now() - tPlans)} (${feasibleCount} feasible; the others are scheduled too, for what their windows allow)`,
  );
  const highs = (await loadHighs()) as unknown as HighsLike;

  console.log('\nEvery program awarded (the oversubscribed scenario):');
  // 1. Plan build: sky windows and scheduling, per node.
  const t0 = performance.now();
  const built = byNode.map((list, k) => {
    const windows = computeSkyWindows({
      site: NODES[k].site,
      limits: { altitudeLimitDeg: NODES[k].node.altitudeLimitDeg, moonSeparationMinDeg: 30 },
      campaign: CAMPAIGN,
      targets: list.map((t) => ({ raDeg: t.raDeg, decDeg: t.decDeg })),
    });
    const darkHours = windows.nights.reduce((sum, n) => sum + n.darkHours, 0);
    const asked = plans[k].reduce((sum, p) => sum + planNodeHours(p), 0);
    const scale = Math.min(1, (1.05 * darkHours) / asked);
    return scheduleNode(k, list, plans[k], windows, new Map(list.map((_, i) => [i, planNodeHours(plans[k][i]) * scale])));
  });
  const buildMs = performance.now() - t0;
  for (const [k, b] of built.entries()) {
    const asked = plans[k].reduce((sum, p) => sum + planNodeHours(p), 0);
    console.log(
      `${describeNode(k, b)} (plans ask ${asked.toFixed(0)} node-hours: awards scaled by ${(b.awardedHours / asked).toFixed(3)})`,
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
  const t2 = performance.now();
  const share = await valueAgainstBound(built, highs);
  console.log(
    `3. value as a share of the HiGHS upper bound: ${share.toFixed(1)} % (bounds in ${s(performance.now() - t2)}); target ≥ 90 %`,
  );

  // 4. Injection–recovery for every target.
  const y = yieldOf(built, plans);
  console.log(
    `4. injection–recovery, ${TRIALS} trials for each of the ${y.targets} targets: ${s(y.ms)} (${(y.ms / y.targets).toFixed(1)} ms per target); ` +
      `mean recovery ${pct(y.mean)} over the ${y.withVisits} targets with visits; target ≤ 60 s`,
  );

  // The campaign whose awards fit.
  console.log('\nAwards that fit (the best programs, whole plans, within 95 % of each node’s dark hours):');
  const t4 = performance.now();
  const fitting = built.map((b, k) => {
    const list = byNode[k];
    const byProgram = new Map<number, number[]>();
    list.forEach((t, i) => byProgram.set(t.program, [...(byProgram.get(t.program) ?? []), i]));
    const awards = new Map<number, number>();
    let used = 0;
    for (const program of [...byProgram.keys()].sort((a, b) => a - b)) {
      const members = byProgram.get(program)!.filter((i) => plans[k][i].feasible);
      const hours = members.reduce((sum, i) => sum + planNodeHours(plans[k][i]), 0);
      if (used + hours > 0.95 * b.darkHours) continue;
      used += hours;
      for (const i of members) awards.set(i, planNodeHours(plans[k][i]));
    }
    return scheduleNode(k, list, plans[k], b.windows, awards);
  });
  const fitMs = performance.now() - t4;
  for (const [k, b] of fitting.entries()) {
    const programs = new Set(b.awarded.map((a) => a.t.program)).size;
    console.log(`${describeNode(k, b)}, ${programs} programs`);
  }
  console.log(`  scheduling (sky windows from above): ${s(fitMs)}`);
  const fitShare = await valueAgainstBound(fitting, highs);
  console.log(`  value as a share of the HiGHS upper bound: ${fitShare.toFixed(1)} %`);
  const fy = yieldOf(fitting, plans);
  console.log(
    `  injection–recovery, ${TRIALS} trials for each of the ${fy.targets} awarded targets: ${s(fy.ms)} (${(fy.ms / fy.targets).toFixed(1)} ms per target); ` +
      `recovery mean ${pct(fy.mean)}, median ${pct(fy.median)}, ${fy.atLeast80} of ${fy.withVisits} targets at 80 % or more (their plans ask 90 %)`,
  );
  console.log(
    `  the ${fy.whole} targets given every visit night they asked for (weather allowance included): mean recovery ${pct(fy.wholeMean)}; ` +
      'the others share a field with their program’s other stars and its hours in the sky run out',
  );
}
