/**
 * Injection and recovery: the campaigns that plans prescribe are simulated (the plan's nights
 * and visits, its per-visit noise, the systematic floor as one offset per night, a sinusoid of
 * the plan's amplitude at the expected period with a random phase) and analysed with the
 * product's own Lomb–Scargle over the plan's stated band, at the plan's false-alarm level.
 * The recovered fraction must match the completeness the plan states, within Monte-Carlo
 * error. Seeded: the same numbers on every run. An outside check of the same simulation with
 * astropy's LombScargle is in test/reference/plan-recovery-astropy.spec.ts.
 */
import type { NodeSpec } from '../facility/facility-types';
import { TYPICAL_NODE, TYPICAL_SITE } from '../cli/typical-node';
import { analysePlanCampaign, recoveryFraction, simulatePlanCampaign } from './campaign-simulation';
import { seededRandom } from './seeded-random';
import { type TargetPlanTarget, computeTargetPlan } from './target-plan';

const star = (name: string, value: number, system: 'BV' | 'BPRP', ageMyr: number, mag: number): TargetPlanTarget => ({
  name,
  colour: { value, system },
  ageMyr,
  ageUncertaintyMyr: 0.12 * ageMyr,
  magnitude: { value: mag, band: 'V' },
});

/** A node with differential photometry good to 0.4 mmag a night (for the old, low-amplitude stars). */
const STEADY_NODE: NodeSpec = { ...TYPICAL_NODE, systematicFloorMmag: 0.4 };

const CASES: Array<{ target: TargetPlanTarget; node: NodeSpec }> = [
  { target: star('late F, 0.3 Gyr', 0.75, 'BPRP', 300, 11), node: TYPICAL_NODE },
  { target: star('G, 0.3 Gyr', 0.82, 'BPRP', 300, 12), node: TYPICAL_NODE },
  { target: star('G, 2 Gyr', 0.65, 'BV', 2000, 11), node: STEADY_NODE },
  { target: star('K, 0.65 Gyr', 1.2, 'BPRP', 650, 13.1), node: TYPICAL_NODE },
  { target: star('K, 1 Gyr', 1.1, 'BPRP', 1000, 12), node: TYPICAL_NODE },
  { target: star('K, 5 Gyr', 1.43, 'BPRP', 5000, 12), node: STEADY_NODE },
  { target: star('early M, 3 Gyr', 2.0, 'BPRP', 3000, 13.5), node: TYPICAL_NODE },
];

const TRIALS = 400;

describe('target plans keep their promise (injection–recovery, product Lomb–Scargle)', () => {
  it.each(CASES.map((c) => [c.target.name, c] as const))(
    '%s: the recovered fraction matches the stated completeness',
    (_name, { target, node }) => {
      const plan = computeTargetPlan(target, node, TYPICAL_SITE);
      expect(plan.feasible).toBe(true);
      const stated = plan.quantities.completeness.value;
      expect(stated).toBeGreaterThanOrEqual(0.9 - 1e-9);
      const recovered = recoveryFraction(plan, seededRandom(20261202), TRIALS);
      const mcSigma = Math.sqrt((stated * (1 - stated)) / TRIALS);
      // The promise: never below the stated completeness beyond 3σ of Monte-Carlo error
      // (common practice, no source) — e.g. ≥ 0.86 for a 90 % plan with 400 trials…
      expect(recovered).toBeGreaterThanOrEqual(stated - 3 * mcSigma);
      // …and not bought with far more visits than needed: the Baluev false-alarm level is an
      // upper bound, so recovery runs a little above the statement, never far.
      expect(recovered).toBeLessThanOrEqual(Math.min(1, stated + 4 * mcSigma + 0.02));
    },
  );

  it('a 50 % plan recovers about half, a 99 % plan nearly all (the price of certainty is real)', () => {
    const target = CASES[3].target;
    const half = computeTargetPlan(target, TYPICAL_NODE, TYPICAL_SITE, { completeness: 0.5 });
    const sure = computeTargetPlan(target, TYPICAL_NODE, TYPICAL_SITE, { completeness: 0.99 });
    expect(half.quantities.visits.value).toBeLessThan(sure.quantities.visits.value);
    const rHalf = recoveryFraction(half, seededRandom(11), TRIALS);
    const rSure = recoveryFraction(sure, seededRandom(12), TRIALS);
    expect(rHalf).toBeGreaterThanOrEqual(half.quantities.completeness.value - 3 * Math.sqrt(0.25 / TRIALS));
    expect(rHalf).toBeLessThan(0.8);
    expect(rSure).toBeGreaterThanOrEqual(0.97);
  });

  it('sizing for the mean power (the old rule: N = 4σ²·z0/A²) recovers only about half (why completeness matters)', () => {
    const plan = computeTargetPlan(CASES[3].target, TYPICAL_NODE, TYPICAL_SITE);
    const q = plan.quantities;
    // Same nights, but only the nights at which the mean power sits at the threshold.
    const z0 = (0.5 * (q.visitNights.value - 3) * q.detectionThresholdPower.value) / (1 - q.detectionThresholdPower.value);
    const nightsAtMean = Math.ceil((4 * q.nightlyPrecisionPpm.value ** 2 * z0) / q.semiAmplitudePpm.value ** 2);
    const thin = {
      ...plan,
      quantities: {
        ...q,
        visitNights: { ...q.visitNights, value: nightsAtMean },
        baselineDays: { ...q.baselineDays, value: nightsAtMean - 1 },
      },
    };
    const r = recoveryFraction(thin, seededRandom(5), TRIALS);
    expect(r).toBeLessThan(0.75);
  });

  it('a campaign without the signal is "recovered" no more often than the false-alarm level allows', () => {
    const plan = computeTargetPlan(CASES[4].target, TYPICAL_NODE, TYPICAL_SITE);
    const rng = seededRandom(99);
    let falseHits = 0;
    for (let i = 0; i < TRIALS; i++) {
      const res = analysePlanCampaign(plan, simulatePlanCampaign(plan, rng, { semiAmplitudePpm: 0 }));
      if (res.falseAlarmProbability <= plan.analysis.falseAlarmProbability) falseHits++;
    }
    // FAP 1 %: at most 1 % + 3σ of 400 trials detect anything at all.
    expect(falseHits / TRIALS).toBeLessThanOrEqual(0.01 + 3 * Math.sqrt((0.01 * 0.99) / TRIALS));
  });
});
