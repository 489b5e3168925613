/**
 * The injection–recovery check of target plans (shared/src/science/target-plan-recovery.spec.ts)
 * with an outside analysis: the same simulated campaigns, analysed with astropy's LombScargle
 * (Debian's python3-astropy, run in this test) over the plan's search band, with astropy's own
 * Baluev false-alarm probability. The recovered fraction must match the plan's stated
 * completeness within Monte-Carlo error, as it does with the product's periodogram.
 */
import { TYPICAL_NODE, TYPICAL_SITE } from '../../shared/src/cli/typical-node';
import { simulatePlanCampaign } from '../../shared/src/science/campaign-simulation';
import { seededRandom } from '../../shared/src/science/seeded-random';
import { type TargetPlanTarget, computeTargetPlan } from '../../shared/src/science/target-plan';
import { requireAstropy, runAstropyOracle } from './astropy-oracle';

const ORACLE = `
import json, sys
import numpy as np
from astropy.timeseries import LombScargle
req = json.load(sys.stdin)
out = []
for c in req["cases"]:
    t, y, dy = np.array(c["t"]), np.array(c["y"]), np.array(c["dy"])
    ls = LombScargle(t, y, dy)
    f, p = ls.autopower(minimum_frequency=c["fmin"], maximum_frequency=c["fmax"], samples_per_peak=10)
    k = int(np.argmax(p))
    fap = float(ls.false_alarm_probability(p[k], method="baluev", minimum_frequency=c["fmin"], maximum_frequency=c["fmax"]))
    out.append({"f": float(f[k]), "fap": fap})
print(json.dumps(out))
`;

const TRIALS = 300;

const CASES: TargetPlanTarget[] = [
  {
    name: 'K, 0.65 Gyr',
    colour: { value: 1.2, system: 'BPRP' },
    ageMyr: 650,
    ageUncertaintyMyr: 78,
    magnitude: { value: 13.1, band: 'V' },
  },
  { name: 'G, 0.3 Gyr', colour: { value: 0.82, system: 'BPRP' }, ageMyr: 300, ageUncertaintyMyr: 36, magnitude: { value: 12, band: 'V' } },
  {
    name: 'early M, 3 Gyr',
    colour: { value: 2.0, system: 'BPRP' },
    ageMyr: 3000,
    ageUncertaintyMyr: 360,
    magnitude: { value: 13.5, band: 'V' },
  },
];

describe('plans keep their promise when astropy analyses the simulated campaigns', () => {
  beforeAll(() => {
    requireAstropy();
  });

  it.each(CASES.map((t) => [t.name, t] as const))(
    '%s: astropy LombScargle recovers the period at the stated completeness (astropy 5.2, run in this test)',
    (_n, target) => {
      const plan = computeTargetPlan(target, TYPICAL_NODE, TYPICAL_SITE);
      expect(plan.feasible).toBe(true);
      const rng = seededRandom(314159);
      const sims = Array.from({ length: TRIALS }, () => simulatePlanCampaign(plan, rng));
      const cases = sims.map((s) => {
        const lc = plan.analysis.series === 'nightlyMeans' ? s.nightlyMeans : s.visits;
        return {
          t: Array.from(lc.timeDays),
          y: Array.from(lc.values),
          dy: Array.from(lc.uncertainties ?? []),
          fmin: plan.analysis.minFrequencyPerDay,
          fmax: plan.analysis.maxFrequencyPerDay,
        };
      });
      const answers = runAstropyOracle<Array<{ f: number; fap: number }>>({ cases }, ['-c', ORACLE]);
      let hits = 0;
      answers.forEach((a, i) => {
        const t = cases[i].t;
        const tolerance = 0.5 / (t[t.length - 1] - t[0]);
        if (Math.abs(a.f - 1 / sims[i].injected.periodDays) <= tolerance && a.fap <= plan.analysis.falseAlarmProbability) hits++;
      });
      const stated = plan.quantities.completeness.value;
      const sigma = Math.sqrt((stated * (1 - stated)) / TRIALS);
      // Never below the promise beyond 3σ of Monte-Carlo error (common practice, no source).
      expect(hits / TRIALS).toBeGreaterThanOrEqual(stated - 3 * sigma);
      expect(hits / TRIALS).toBeLessThanOrEqual(Math.min(1, stated + 4 * sigma + 0.02));
    },
  );
});
