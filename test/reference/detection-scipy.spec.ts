/**
 * Detection probabilities of the plan against scipy (Debian's python3-scipy, run in this
 * test): Marcum Q1(a, b) = scipy.stats.ncx2.sf(b², 2, a²), and the finite-N detection
 * probability P(Z > Z0) = scipy.stats.ncf.sf((m/2)·Z0/(1 − Z0), 2, m, λ), m = N − 3 (the
 * sinusoid's χ² over the residual's, each over its degrees of freedom).
 */
import { type DetectionThreshold, detectionProbability, marcumQ1, noncentralityForCompleteness } from '../../shared/src/science/detection';
import { runAstropyOracle } from './astropy-oracle';

const ORACLE = `
import json, sys
from scipy.stats import ncx2, ncf
req = json.load(sys.stdin)
print(json.dumps({
  "marcum": [float(ncx2.sf(b * b, 2, a * a)) for a, b in req["marcum"]],
  "finite": [float(ncf.sf(0.5 * m * z / (1 - z), 2, m, lam)) for lam, z, m in req["finite"]],
}))
`;

describe('detection probability against scipy.stats (run in this test)', () => {
  const marcum: Array<[number, number]> = [
    [0.5, 0.1],
    [1, 1],
    [2, 3],
    [3, 5],
    [5, 4],
    [6, 4.2],
    [10, 9],
    [30, 31],
    [40, 45],
  ];
  const finite: Array<[number, number, number]> = [
    [10, 0.3, 12],
    [30, 0.35, 17],
    [40, 0.2, 37],
    [25, 0.05, 200],
    [60, 0.6, 8],
    [5, 0.01, 1000],
  ];
  let answer: { marcum: number[]; finite: number[] };
  beforeAll(() => {
    answer = runAstropyOracle({ marcum, finite }, ['-c', ORACLE]);
  });

  it.each(marcum.map((m, i) => [m[0], m[1], i] as const))('Marcum Q1(%p, %p) equals scipy ncx2.sf to 1e-10 relative', (a, b, i) => {
    expect(Math.abs(marcumQ1(a, b) / answer.marcum[i] - 1)).toBeLessThan(1e-10);
  });

  it.each(finite.map((f, i) => [f[0], f[1], f[2], i] as const))(
    'P(Z > Z0) at λ %p, Z0 %p, m %p equals scipy ncf.sf to 1e-9',
    (lam, z, m, i) => {
      const th: DetectionThreshold = { power: z, points: m + 3, effectiveFrequencies: 1, falseAlarmProbability: 0.01 };
      expect(detectionProbability(lam, th)).toBeCloseTo(answer.finite[i], 9);
    },
  );

  it('the inverse lands on scipy too: ncf.sf at the λ for 90 % is 0.9', () => {
    const th: DetectionThreshold = { power: 0.35, points: 20, effectiveFrequencies: 1, falseAlarmProbability: 0.01 };
    const lam = noncentralityForCompleteness(0.9, th);
    const back = runAstropyOracle<{ marcum: number[]; finite: number[] }>({ marcum: [], finite: [[lam, 0.35, 17]] }, ['-c', ORACLE]);
    expect(back.finite[0]).toBeCloseTo(0.9, 8);
  });
});
