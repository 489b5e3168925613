/**
 * Moonlit sky brightness (shared/src/sky/moon-sky-brightness.ts) against values worked out
 * independently:
 * 1. An independent implementation in plain Python (/usr/bin/python3, standard library only),
 *    written below from the formulas of Krisciunas & Schaefer (1991), PASP 103, 1033 as given in
 *    SCIENCE.md §6b [memory: verify] — powers of ten as written, not the exp/expm1 forms of the
 *    TypeScript — for single geometries and for a campaign of nights (median with Python's
 *    `statistics.median`). Agreement checks the code against the formulas, not the formulas
 *    against the sky: they stay [memory: verify].
 * 2. The nL ↔ mag/arcsec² conversion at two points, derived here from the conversion formula.
 * 3. One order-of-magnitude check on the sky itself, from memory, with a loose tolerance.
 */
import {
  moonSkyBrightnessNanolamberts,
  nanolambertsToVMagPerArcsec2,
  nightlySkyBrightness,
  skyBrightnessMagPerArcsec2,
  vMagPerArcsec2ToNanolamberts,
  type SkyBrightnessInput,
} from '../../shared/src/sky/moon-sky-brightness';
import type { TargetWindows } from '../../shared/src/sky/sky-types';
import { syntheticMoonWindows, type SyntheticMoonNight } from '../../shared/src/sky/testing/synthetic-windows';
import { PYTHON, runAstropyOracle } from './astropy-oracle';

/** Krisciunas & Schaefer (1991), PASP 103, 1033, as written in SCIENCE.md §6b [memory: verify]. */
const PYTHON_KS91 = String.raw`
import json, math, statistics, sys

def X(z_deg):
    # X(Z) = (1 - 0.96 sin^2 Z)^(-1/2)
    return (1.0 - 0.96 * math.sin(math.radians(z_deg)) ** 2) ** -0.5

def f_rho(rho):
    # f(rho) = 10^5.36 (1.06 + cos^2 rho) + 10^(6.15 - rho/40)
    return 10 ** 5.36 * (1.06 + math.cos(math.radians(rho)) ** 2) + 10 ** (6.15 - rho / 40.0)

def i_star(alpha):
    # I* = 10^(-0.4 (3.84 + 0.026 |alpha| + 4e-9 alpha^4))
    return 10 ** (-0.4 * (3.84 + 0.026 * abs(alpha) + 4e-9 * alpha ** 4))

def b_moon(alpha, rho, zm, z, k):
    if zm > 90:
        return 0.0
    return f_rho(rho) * i_star(alpha) * 10 ** (-0.4 * k * X(zm)) * (1 - 10 ** (-0.4 * k * X(z)))

def nl(v):
    return 34.08 * math.exp(20.7233 - 0.92104 * v)

def mag(b):
    return (20.7233 - math.log(b / 34.08)) / 0.92104

def b_dark(v_zen, z, k):
    x = X(z)
    return nl(v_zen) * 10 ** (-0.4 * k * (x - 1)) * x

def sky(c):
    return mag(b_dark(c['dark'], c['z'], c['k']) + b_moon(c['alpha'], c['rho'], c['zm'], c['z'], c['k']))

req = json.load(sys.stdin)
out = {'cases': [], 'campaign': None}
for c in req['cases']:
    out['cases'].append({'moonNl': b_moon(c['alpha'], c['rho'], c['zm'], c['z'], c['k']), 'skyMag': sky(c)})
camp = req['campaign']
values = []
by_night = []
for night in camp['nights']:
    if not night['hours'] > 0:
        by_night.append(None)
        continue
    alpha = math.degrees(math.acos(2 * night['light'] - 1))
    v = sky({'dark': camp['dark'], 'k': camp['k'], 'alpha': alpha, 'rho': night['sep'],
             'zm': 90 - night['moonAlt'], 'z': 90 - night['alt']})
    by_night.append(v)
    values.append(v)
out['campaign'] = {'byNight': by_night, 'median': statistics.median(values), 'worst': min(values), 'darkest': max(values)}
print(json.dumps(out))
`;

interface Case {
  dark: number;
  alpha: number;
  rho: number;
  zm: number;
  z: number;
  k: number;
}
type Night = SyntheticMoonNight;
interface Answer {
  cases: Array<{ moonNl: number; skyMag: number }>;
  campaign: { byNight: Array<number | null>; median: number; worst: number; darkest: number };
}

const CASES: Case[] = [
  { dark: 21.587, alpha: 0, rho: 45, zm: 30, z: 30, k: 0.172 },
  { dark: 21.587, alpha: 0, rho: 5, zm: 10, z: 15, k: 0.172 },
  { dark: 21.0, alpha: 30, rho: 120, zm: 60, z: 70, k: 0.25 },
  { dark: 21.5, alpha: 90, rho: 60, zm: 45, z: 0, k: 0.15 },
  { dark: 20.5, alpha: 150, rho: 170, zm: 89, z: 89, k: 0.1 },
  { dark: 19.8, alpha: 60, rho: 25, zm: 0, z: 40, k: 0.3 },
  { dark: 21.9, alpha: 10, rho: 90, zm: 91, z: 50, k: 0.172 }, // Moon just below the horizon
  { dark: 22.0, alpha: 179, rho: 0.5, zm: 70, z: 72, k: 0.6 },
];

/** A campaign of nights of one target: usable and unusable, Moon up and down, all phases. */
function campaignNights(): Night[] {
  const nights: Night[] = [];
  for (let i = 0; i < 61; i++) {
    const phase = (2 * Math.PI * i) / 29.53;
    nights.push({
      hours: i % 7 === 3 ? 0 : 1 + (i % 5),
      alt: 25 + 60 * Math.abs(Math.sin(0.37 * i)),
      moonAlt: 70 * Math.sin(0.9 * i + 0.4),
      sep: 3 + 170 * Math.abs(Math.sin(0.23 * i + 1)),
      light: (1 - Math.cos(phase)) / 2,
    });
  }
  return nights;
}

const toWindows = (nights: Night[]): TargetWindows =>
  syntheticMoonWindows(nights, { name: 'reference', nightDates: nights.map((_, i) => `night-${i}`) });

const toInput = (c: Case): SkyBrightnessInput => ({
  darkSkyZenithMagPerArcsec2: c.dark,
  moonPhaseAngleDeg: c.alpha,
  moonTargetSeparationDeg: c.rho,
  moonZenithDeg: c.zm,
  targetZenithDeg: c.z,
  extinctionMagPerAirmass: c.k,
});

describe('moonlit sky brightness against an independent Python implementation of KS91 (SCIENCE.md §6b [memory: verify])', () => {
  const campaign = { dark: 21.3, k: 0.14, nights: campaignNights() };
  let answer: Answer;

  beforeAll(() => {
    answer = runAstropyOracle<Answer>({ cases: CASES, campaign }, ['-c', PYTHON_KS91]);
  });

  it(`${PYTHON} answers every case`, () => {
    expect(answer.cases).toHaveLength(CASES.length);
  });

  it.each(CASES.map((c, i) => [i, c] as const))(
    'case %i: B_moon in nL agrees to 1e-9 relative (Python, from the KS91 formulas)',
    (i, c) => {
      const expected = answer.cases[i].moonNl;
      const got = moonSkyBrightnessNanolamberts(toInput(c));
      if (expected === 0) expect(got).toBe(0);
      else expect(Math.abs(got / expected - 1)).toBeLessThan(1e-9);
    },
  );

  it.each(CASES.map((c, i) => [i, c] as const))(
    'case %i: total sky agrees to 1e-9 mag/arcsec² (Python, from the KS91 formulas)',
    (i, c) => {
      expect(Math.abs(skyBrightnessMagPerArcsec2(toInput(c)) - answer.cases[i].skyMag)).toBeLessThan(1e-9);
    },
  );

  it('a 61-night campaign: every night, median, worst and darkest agree (Python, KS91 formulas, statistics.median)', () => {
    const r = nightlySkyBrightness(toWindows(campaign.nights), campaign.dark, campaign.k);
    const expected = answer.campaign;
    expect(r.usableNights).toBe(expected.byNight.filter((v) => v !== null).length);
    expected.byNight.forEach((v, i) => {
      if (v === null) expect(Number.isNaN(r.byNight[i])).toBe(true);
      else expect(Math.abs(r.byNight[i] - v)).toBeLessThan(1e-9);
    });
    expect(Math.abs(r.medianMagPerArcsec2 - expected.median)).toBeLessThan(1e-9);
    expect(Math.abs(r.worstMagPerArcsec2 - expected.worst)).toBeLessThan(1e-9);
    expect(Math.abs(r.darkestMagPerArcsec2 - expected.darkest)).toBeLessThan(1e-9);
    // The campaign spans the lunar cycle: the spread between worst and darkest is large.
    expect(expected.darkest - expected.worst).toBeGreaterThan(2);
  });
});

describe('conversion nL ↔ V mag/arcsec² (derived here from B = 34.08·exp(20.7233 − 0.92104·V), SCIENCE.md §6b)', () => {
  it('V = 21.9 dark sky is 59.22 nL (derived here; 34.08·10⁹·10^(−0.4·21.9) = 59.2)', () => {
    expect(vMagPerArcsec2ToNanolamberts(21.9)).toBeCloseTo(59.22, 2);
  });

  it("79.0 nL, KS91's dark zenith sky for their site (from memory), is V = 21.587 (derived here)", () => {
    expect(nanolambertsToVMagPerArcsec2(79.0)).toBeCloseTo(21.587, 3);
  });
});

describe('order of magnitude of the moonlit sky (from memory, loose tolerance)', () => {
  it('full Moon 20–45° from the target, Moon and target high, k = 0.172, dark 21.587: V ≈ 17–18 mag/arcsec² (from memory: the full-Moon sky KS91 report; ± 0.5 mag)', () => {
    for (const rho of [20, 30, 45]) {
      const v = skyBrightnessMagPerArcsec2({
        darkSkyZenithMagPerArcsec2: 21.587,
        moonPhaseAngleDeg: 0,
        moonTargetSeparationDeg: rho,
        moonZenithDeg: 30,
        targetZenithDeg: 30,
        extinctionMagPerAirmass: 0.172,
      });
      expect(v).toBeGreaterThan(16.5);
      expect(v).toBeLessThan(18.5);
    }
  });
});
