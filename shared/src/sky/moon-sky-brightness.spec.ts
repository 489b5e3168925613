/**
 * Identities and monotonicity of the moonlit sky brightness model (Krisciunas & Schaefer 1991,
 * PASP 103, 1033, as written in SCIENCE.md §6b [memory: verify]). Numerical values against an
 * independent implementation are in test/reference/moon-sky-brightness.spec.ts.
 */
import fc from 'fast-check';
import { ScienceInputError } from '../science/science-input-error';
import {
  type MoonSkyGeometry,
  darkSkyAtZenithDistance,
  ks91Airmass,
  ks91MoonIlluminance,
  ks91ScatteringFunction,
  moonPhaseAngleDegFromIlluminatedFraction,
  moonSkyBrightnessNanolamberts,
  nanolambertsToVMagPerArcsec2,
  nightlySkyBrightness,
  skyBrightnessMagPerArcsec2,
  vMagPerArcsec2ToNanolamberts,
} from './moon-sky-brightness';
import type { TargetWindows } from './sky-types';
import { syntheticMoonWindows, type SyntheticMoonNight } from './testing/synthetic-windows';

/** 0.4·ln 10: 10^(−0.4·m) = exp(−A·m) (exact identity). */
const A = 0.4 * Math.LN10;

const base: MoonSkyGeometry = {
  moonPhaseAngleDeg: 0,
  moonTargetSeparationDeg: 45,
  moonZenithDeg: 30,
  targetZenithDeg: 30,
  extinctionMagPerAirmass: 0.172,
};
const moon = (over: Partial<MoonSkyGeometry>) => moonSkyBrightnessNanolamberts({ ...base, ...over });

const angle = (min: number, max: number) => fc.double({ min, max, noNaN: true });
const geometry = fc.record({
  moonPhaseAngleDeg: angle(0, 180),
  moonTargetSeparationDeg: angle(0, 180),
  moonZenithDeg: angle(0, 90),
  targetZenithDeg: angle(0, 90),
  extinctionMagPerAirmass: angle(0.01, 1),
});
/**
 * a < b, both in [min, max], at least `gap` apart: near Z = 0 the airmass changes only as Z²,
 * so two zenith distances closer than ≈ 0.5° can round to the same brightness.
 */
const orderedPair = (min: number, max: number, gap = 0.5) =>
  fc
    .tuple(angle(min, max), angle(min, max))
    .filter(([a, b]) => Math.abs(a - b) >= gap)
    .map(([a, b]): readonly [number, number] => (a < b ? [a, b] : [b, a]));

describe('ks91Airmass', () => {
  it('at zenith distance 0 gives X = 1 (derived from X(Z) = (1 − 0.96·sin²Z)^(−1/2), SCIENCE.md §6b)', () => {
    expect(ks91Airmass(0)).toBe(1);
  });

  it('at 60° gives 1/√0.28 = 1.889822 and at 90° gives 1/√0.04 = 5 (derived from the KS91 X(Z))', () => {
    expect(ks91Airmass(60)).toBeCloseTo(1.889822365, 8);
    expect(ks91Airmass(90)).toBeCloseTo(5, 12);
  });

  it('refuses zenith distances outside [0, 90], naming the field', () => {
    expect(() => ks91Airmass(90.5)).toThrow('zenithDeg');
    expect(() => ks91Airmass(Number.NaN)).toThrow(ScienceInputError);
  });
});

describe('surface brightness conversions', () => {
  it('V = 21.9 mag/arcsec² is 59.22 nL (derived from B = 34.08·exp(20.7233 − 0.92104·V), SCIENCE.md §6b)', () => {
    expect(vMagPerArcsec2ToNanolamberts(21.9)).toBeCloseTo(59.2185, 3);
    expect(nanolambertsToVMagPerArcsec2(59.2185)).toBeCloseTo(21.9, 4);
  });

  // The value or formula under test is recalled, not re-read (docs/science.md "Checked values").
  it("KS91's dark zenith sky 79.0 nL is V = 21.587 (derived from the conversion formula)", () => {
    expect(nanolambertsToVMagPerArcsec2(79.0)).toBeCloseTo(21.587, 3);
  });

  it('one magnitude brighter multiplies nL by exp(0.92104) ≈ 2.512 (derived from the conversion formula)', () => {
    expect(vMagPerArcsec2ToNanolamberts(20) / vMagPerArcsec2ToNanolamberts(21)).toBeCloseTo(Math.exp(0.92104), 10);
  });

  it('round-trips V → nL → V for any V in [5, 30] (property; inverse formulas of SCIENCE.md §6b)', () => {
    fc.assert(
      fc.property(angle(5, 30), (v) => {
        expect(nanolambertsToVMagPerArcsec2(vMagPerArcsec2ToNanolamberts(v))).toBeCloseTo(v, 10);
      }),
    );
  });

  it('refuses zero, negative and NaN brightness, naming the field', () => {
    expect(() => nanolambertsToVMagPerArcsec2(0)).toThrow('nanolamberts');
    expect(() => nanolambertsToVMagPerArcsec2(-3)).toThrow(ScienceInputError);
    expect(() => vMagPerArcsec2ToNanolamberts(Number.NaN)).toThrow('vMagPerArcsec2');
  });
});

describe('moonPhaseAngleDegFromIlluminatedFraction', () => {
  it('gives 0° at full, 60° at f = 0.75, 90° at quarter, 180° at new (derived from α = acos(2f − 1))', () => {
    expect(moonPhaseAngleDegFromIlluminatedFraction(1)).toBe(0);
    expect(moonPhaseAngleDegFromIlluminatedFraction(0.75)).toBeCloseTo(60, 10);
    expect(moonPhaseAngleDegFromIlluminatedFraction(0.5)).toBeCloseTo(90, 10);
    expect(moonPhaseAngleDegFromIlluminatedFraction(0)).toBeCloseTo(180, 10);
  });

  // The value or formula under test is recalled, not re-read (docs/science.md "Checked values").
  it('inverts f = (1 + cos α)/2 (property; Meeus 1991 illuminated fraction)', () => {
    fc.assert(
      fc.property(angle(0, 180), (alpha) => {
        const f = (1 + Math.cos((alpha * Math.PI) / 180)) / 2;
        expect(moonPhaseAngleDegFromIlluminatedFraction(f)).toBeCloseTo(alpha, 5);
      }),
    );
  });

  it('refuses fractions outside [0, 1], naming the field', () => {
    expect(() => moonPhaseAngleDegFromIlluminatedFraction(1.01)).toThrow('moonIlluminatedFraction');
  });
});

describe('moonSkyBrightnessNanolamberts', () => {
  it('adds nothing when the Moon is below the horizon (Z_m > 90°; SCIENCE.md §6b)', () => {
    for (const zm of [90.001, 100, 135, 180]) expect(moon({ moonZenithDeg: zm, moonTargetSeparationDeg: 5 })).toBe(0);
    expect(moon({ moonZenithDeg: 90 })).toBeGreaterThan(0);
  });

  it('adds nothing without an atmosphere, k = 0 (derived: the factor 1 − 10^(−0.4·k·X) vanishes)', () => {
    expect(moon({ extinctionMagPerAirmass: 0 })).toBe(0);
  });

  it('is the product of f(ρ), I* and the two extinction factors (SCIENCE.md §6b, evaluated piece by piece)', () => {
    const xm = 1 / Math.sqrt(1 - 0.96 * 0.25); // X(30°)
    const expected = ks91ScatteringFunction(45) * ks91MoonIlluminance(0) * 10 ** (-0.4 * 0.172 * xm) * (1 - 10 ** (-0.4 * 0.172 * xm));
    expect(moon({})).toBeCloseTo(expected, 6);
  });

  it('is brighter at full Moon than at quarter, and at quarter than at a thin crescent (KS91 I*(α) falls with |α|)', () => {
    const full = moon({ moonPhaseAngleDeg: 0 });
    const quarter = moon({ moonPhaseAngleDeg: 90 });
    const crescent = moon({ moonPhaseAngleDeg: 150 });
    expect(full).toBeGreaterThan(quarter);
    expect(quarter).toBeGreaterThan(crescent);
    // I*(0)/I*(90) = 10^(0.4·(0.026·90 + 4e-9·90⁴)) = 10^(0.4·2.36624) ≈ 8.84 (derived here from I*).
    expect(full / quarter).toBeCloseTo(10 ** (0.4 * (0.026 * 90 + 4e-9 * 90 ** 4)), 8);
  });

  it('is brighter at small Moon–target separations than at large ones (KS91 f(ρ))', () => {
    expect(moon({ moonTargetSeparationDeg: 10 })).toBeGreaterThan(moon({ moonTargetSeparationDeg: 30 }));
    expect(moon({ moonTargetSeparationDeg: 30 })).toBeGreaterThan(moon({ moonTargetSeparationDeg: 90 }));
  });

  it('falls monotonically with phase angle (property; KS91 I*(α))', () => {
    fc.assert(
      fc.property(geometry, orderedPair(0, 180), (g, [a1, a2]) => {
        expect(moonSkyBrightnessNanolamberts({ ...g, moonPhaseAngleDeg: a1 })).toBeGreaterThan(
          moonSkyBrightnessNanolamberts({ ...g, moonPhaseAngleDeg: a2 }),
        );
      }),
    );
  });

  it('falls monotonically with separation on [0°, 90°] (property; KS91 f(ρ): both terms fall there)', () => {
    fc.assert(
      fc.property(geometry, orderedPair(0, 90), (g, [r1, r2]) => {
        expect(moonSkyBrightnessNanolamberts({ ...g, moonTargetSeparationDeg: r1 })).toBeGreaterThan(
          moonSkyBrightnessNanolamberts({ ...g, moonTargetSeparationDeg: r2 }),
        );
      }),
    );
  });

  it('rises again past ≈ 92° towards 180° (derived: the Rayleigh term 1.06 + cos²ρ is symmetric about 90°)', () => {
    expect(ks91ScatteringFunction(180)).toBeGreaterThan(ks91ScatteringFunction(120));
    expect(ks91ScatteringFunction(120)).toBeGreaterThan(ks91ScatteringFunction(95));
    expect(ks91ScatteringFunction(95)).toBeGreaterThan(ks91ScatteringFunction(92));
  });

  it('falls monotonically as the Moon sinks, Z_m in [0°, 90°] (property; KS91 factor 10^(−0.4·k·X(Z_m)))', () => {
    fc.assert(
      fc.property(geometry, orderedPair(0, 90), (g, [z1, z2]) => {
        expect(moonSkyBrightnessNanolamberts({ ...g, moonZenithDeg: z1 })).toBeGreaterThan(
          moonSkyBrightnessNanolamberts({ ...g, moonZenithDeg: z2 }),
        );
      }),
    );
  });

  it('rises monotonically as the target sinks, Z in [0°, 90°] (property; KS91 factor 1 − 10^(−0.4·k·X(Z)))', () => {
    fc.assert(
      fc.property(geometry, orderedPair(0, 90), (g, [z1, z2]) => {
        expect(moonSkyBrightnessNanolamberts({ ...g, targetZenithDeg: z1 })).toBeLessThan(
          moonSkyBrightnessNanolamberts({ ...g, targetZenithDeg: z2 }),
        );
      }),
    );
  });

  it('rises with k while 0.4·ln10·k·X(Z) < ln((X(Z) + X(Z_m))/X(Z_m)) and falls beyond (property; derived from d/dk of the KS91 formula)', () => {
    fc.assert(
      fc.property(geometry, orderedPair(0, 1, 0.005), (g, [k1, k2]) => {
        const x = ks91Airmass(g.targetZenithDeg);
        const xm = ks91Airmass(g.moonZenithDeg);
        const kTurn = Math.log((x + xm) / xm) / (A * x);
        const b1 = moonSkyBrightnessNanolamberts({ ...g, extinctionMagPerAirmass: k1 });
        const b2 = moonSkyBrightnessNanolamberts({ ...g, extinctionMagPerAirmass: k2 });
        if (k2 < kTurn * (1 - 1e-6)) expect(b2).toBeGreaterThan(b1);
        else if (k1 > kTurn * (1 + 1e-6)) expect(b2).toBeLessThan(b1);
      }),
    );
  });

  it('refuses out-of-range geometry, naming the field', () => {
    expect(() => moon({ moonPhaseAngleDeg: -1 })).toThrow('moonPhaseAngleDeg');
    expect(() => moon({ moonTargetSeparationDeg: 181 })).toThrow('moonTargetSeparationDeg');
    expect(() => moon({ moonZenithDeg: 181 })).toThrow('moonZenithDeg');
    expect(() => moon({ targetZenithDeg: 91 })).toThrow('targetZenithDeg');
    expect(() => moon({ extinctionMagPerAirmass: Number.NaN })).toThrow('extinctionMagPerAirmass');
    expect(() => moon({ extinctionMagPerAirmass: -0.1 })).toThrow(ScienceInputError);
  });
});

describe('darkSkyAtZenithDistance', () => {
  it('at the zenith returns the zenith value (derived: X(0) = 1 makes both factors 1)', () => {
    expect(darkSkyAtZenithDistance(21.5, 0, 0.15)).toBeCloseTo(21.5, 12);
  });

  it('at Z = 60°, k = 0.15 gives 21.5 + k·(X − 1) − 2.5·log₁₀X = 20.94242 (derived from B_dark·10^(−0.4·k·(X−1))·X, SCIENCE.md §6b)', () => {
    expect(darkSkyAtZenithDistance(21.5, 60, 0.15)).toBeCloseTo(20.942421, 5);
  });

  it('brightens monotonically towards the horizon for k ≤ 0.217 (property; derived: d/dX[X·10^(−0.4·k·(X−1))] > 0 while X < 1/(0.4·ln10·k))', () => {
    fc.assert(
      fc.property(angle(15, 24), angle(0, 0.217), orderedPair(0, 90), (v, k, [z1, z2]) => {
        expect(darkSkyAtZenithDistance(v, z2, k)).toBeLessThan(darkSkyAtZenithDistance(v, z1, k));
      }),
    );
  });

  it('refuses a dark sky outside [10, 25] mag/arcsec², naming the field', () => {
    expect(() => darkSkyAtZenithDistance(26, 0, 0.15)).toThrow('darkSkyZenithMagPerArcsec2');
  });
});

describe('skyBrightnessMagPerArcsec2', () => {
  const dark = 21.5;

  it('with the Moon below the horizon equals the dark sky at the target’s zenith distance (SCIENCE.md §6b: Moon below the horizon contributes nothing)', () => {
    const s = skyBrightnessMagPerArcsec2({
      ...base,
      moonZenithDeg: 120,
      targetZenithDeg: 60,
      extinctionMagPerAirmass: 0.15,
      darkSkyZenithMagPerArcsec2: dark,
    });
    expect(s).toBeCloseTo(20.942421, 5);
  });

  it('adds dark and Moon in nanolamberts (derived from the conversion formula)', () => {
    const g = { ...base, darkSkyZenithMagPerArcsec2: dark };
    const nl =
      vMagPerArcsec2ToNanolamberts(darkSkyAtZenithDistance(dark, g.targetZenithDeg, g.extinctionMagPerAirmass)) +
      moonSkyBrightnessNanolamberts(g);
    expect(skyBrightnessMagPerArcsec2(g)).toBeCloseTo(nanolambertsToVMagPerArcsec2(nl), 10);
  });

  it('is never darker than the dark sky alone, and brighter with any Moon above the horizon (property; sum of positive terms)', () => {
    fc.assert(
      fc.property(geometry, angle(17, 23), (g, v) => {
        const s = skyBrightnessMagPerArcsec2({ ...g, darkSkyZenithMagPerArcsec2: v });
        expect(s).toBeLessThan(darkSkyAtZenithDistance(v, g.targetZenithDeg, g.extinctionMagPerAirmass));
      }),
    );
  });

  it('full Moon 45° away makes the sky several magnitudes brighter than dark (KS91 model; derived: > 2.5 mag for a 21.5 sky)', () => {
    const s = skyBrightnessMagPerArcsec2({ ...base, darkSkyZenithMagPerArcsec2: dark });
    expect(s).toBeLessThan(dark - 2.5);
    expect(s).toBeGreaterThan(15);
  });
});

// ---------------------------------------------------------------------------------------

/** A TargetWindows built by hand: only the arrays nightlySkyBrightness reads are meaningful. */
const handWindows = (nights: SyntheticMoonNight[]): TargetWindows => syntheticMoonWindows(nights, { name: 'hand-built' });

describe('nightlySkyBrightness', () => {
  const dark = 21.5;
  const k = 0.15;
  // Dark sky at Z = 60°, k = 0.15: 20.942421 (derived here from the KS91 dark-sky formula, as above).
  const dark60 = 20.942421;
  const fullMoonNight = { hours: 5, alt: 60, moonAlt: 50, sep: 30, light: 1 };
  const quarterMoonNight = { hours: 4, alt: 60, moonAlt: 40, sep: 60, light: 0.5 };
  const windows = handWindows([
    { hours: 6, alt: 90, moonAlt: -20, sep: 100, light: 0.1 }, // Moon down, target at zenith → 21.5
    { hours: 0, alt: 70, moonAlt: 60, sep: 20, light: 1 }, // not usable → NaN
    fullMoonNight,
    { hours: 3, alt: 30, moonAlt: -5, sep: 150, light: 0.9 }, // Moon down → dark sky at Z = 60°
    quarterMoonNight,
    { hours: 2, alt: 90, moonAlt: -40, sep: 90, light: 0.02 }, // Moon down, zenith → 21.5
    { hours: 0, alt: Number.NaN, moonAlt: Number.NaN, sep: Number.NaN, light: Number.NaN }, // not usable, never read
  ]);

  it('gives NaN on unusable nights and the dark sky where the Moon is down (SCIENCE.md §6b, derived)', () => {
    const r = nightlySkyBrightness(windows, dark, k);
    expect(r.usableNights).toBe(5);
    expect(Number.isNaN(r.byNight[1])).toBe(true);
    expect(Number.isNaN(r.byNight[6])).toBe(true);
    expect(r.byNight[0]).toBeCloseTo(dark, 10);
    expect(r.byNight[5]).toBeCloseTo(dark, 10);
    expect(r.byNight[3]).toBeCloseTo(dark60, 5);
  });

  it('moonlit nights equal skyBrightnessMagPerArcsec2 with α = acos(2f − 1), Z = 90° − altitude, Z_m = 90° − Moon altitude', () => {
    const r = nightlySkyBrightness(windows, dark, k);
    const one = (x: typeof fullMoonNight) =>
      skyBrightnessMagPerArcsec2({
        darkSkyZenithMagPerArcsec2: dark,
        extinctionMagPerAirmass: k,
        moonPhaseAngleDeg: moonPhaseAngleDegFromIlluminatedFraction(x.light),
        moonTargetSeparationDeg: x.sep,
        moonZenithDeg: 90 - x.moonAlt,
        targetZenithDeg: 90 - x.alt,
      });
    expect(r.byNight[2]).toBeCloseTo(one(fullMoonNight), 10);
    expect(r.byNight[4]).toBeCloseTo(one(quarterMoonNight), 10);
  });

  it('median is the middle usable night (dark sky at Z = 60°, 20.942421: derived) and worst the full-Moon night', () => {
    // Usable values sorted: full < quarter < 20.942421 (Moon down, Z = 60°) < 21.5 = 21.5.
    const r = nightlySkyBrightness(windows, dark, k);
    expect(r.byNight[2]).toBeLessThan(r.byNight[4]);
    expect(r.byNight[4]).toBeLessThan(dark60);
    expect(r.medianMagPerArcsec2).toBeCloseTo(dark60, 5);
    expect(r.worstMagPerArcsec2).toBe(r.byNight[2]);
    expect(r.worstMagPerArcsec2).toBeLessThan(19);
    expect(r.darkestMagPerArcsec2).toBeCloseTo(dark, 10);
  });

  it('median of an even number of usable nights is the mean of the middle two (Spincycle’s convention)', () => {
    const even = handWindows([
      { hours: 1, alt: 90, moonAlt: -10, sep: 90, light: 0 }, // 21.5
      { hours: 1, alt: 30, moonAlt: -10, sep: 90, light: 0 }, // 20.942421
      fullMoonNight,
      { hours: 1, alt: 90, moonAlt: -10, sep: 90, light: 0 }, // 21.5
    ]);
    expect(nightlySkyBrightness(even, dark, k).medianMagPerArcsec2).toBeCloseTo((dark60 + dark) / 2, 5);
  });

  it('raises a target below the floor to it: at the horizon by default, at minTargetAltitudeDeg when given (derived)', () => {
    const low = handWindows([{ hours: 1, alt: -12, moonAlt: -10, sep: 90, light: 0 }]);
    expect(nightlySkyBrightness(low, dark, k).byNight[0]).toBeCloseTo(darkSkyAtZenithDistance(dark, 90, k), 10);
    expect(nightlySkyBrightness(low, dark, k, { minTargetAltitudeDeg: 30 }).byNight[0]).toBeCloseTo(dark60, 5);
  });

  it('with no usable night returns the dark zenith sky for median, worst and darkest and 0 nights', () => {
    const none = handWindows([
      { hours: 0, alt: 50, moonAlt: 50, sep: 10, light: 1 },
      { hours: 0, alt: 50, moonAlt: 50, sep: 10, light: 1 },
    ]);
    const r = nightlySkyBrightness(none, dark, k);
    expect(r).toMatchObject({ medianMagPerArcsec2: dark, worstMagPerArcsec2: dark, darkestMagPerArcsec2: dark, usableNights: 0 });
    expect(Array.from(r.byNight).every(Number.isNaN)).toBe(true);
  });

  it('refuses a bad value on a usable night and mismatched arrays, naming the field and night', () => {
    const bad = handWindows([
      { hours: 0, alt: 50, moonAlt: 50, sep: 10, light: 1 },
      { hours: 2, alt: 50, moonAlt: 50, sep: Number.NaN, light: 1 },
    ]);
    expect(() => nightlySkyBrightness(bad, dark, k)).toThrow('windows.moonSeparationDegByNight[1]');
    const short = { ...windows, moonIlluminationByNight: new Float64Array(2) };
    expect(() => nightlySkyBrightness(short, dark, k)).toThrow('windows.moonIlluminationByNight');
    expect(() => nightlySkyBrightness(windows, 9, k)).toThrow('darkSkyZenithMagPerArcsec2');
    expect(() => nightlySkyBrightness(windows, dark, 2)).toThrow('extinctionMagPerAirmass');
  });
});
