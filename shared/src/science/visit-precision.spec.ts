import fc from 'fast-check';
import type { NodeSpec, SiteSpec } from '../facility/facility-types';
import {
  airmassKastenYoung,
  chooseExposure,
  computeVisitPrecision,
  erf,
  photometrySetup,
  saturationExposureSeconds,
  scintillationOsborn2015,
  scintillationYoung1967,
  validateNodeSpec,
} from './visit-precision';
import { TYPICAL_NODE, TYPICAL_SITE } from '../cli/typical-node';

// The command line's typical 0.5 m node (illustrative values).
const NODE: NodeSpec = TYPICAL_NODE;
const SITE: SiteSpec = TYPICAL_SITE;

describe('airmassKastenYoung', () => {
  // The value or formula under test is recalled, not re-read (docs/science.md "Checked values").
  it('is 1.9943 at 30° and 0.9997 at 90° (SCIENCE.md §8 #9, [derived] from Kasten & Young 1989)', () => {
    expect(airmassKastenYoung(30)).toBeCloseTo(1.9943, 4);
    expect(airmassKastenYoung(90)).toBeCloseTo(0.9997, 4);
  });
  it('rejects altitudes outside 0–90° and NaN', () => {
    expect(() => airmassKastenYoung(-1)).toThrow('altitudeDeg: must be between 0 and 90 (got −1)');
    expect(() => airmassKastenYoung(Number.NaN)).toThrow(/altitudeDeg/);
  });
});

describe('scintillation', () => {
  // The value or formula under test is recalled, not re-read (docs/science.md "Checked values").
  it('Young: 0.70 ppt for D 0.4 m, X 1, h 0 m, 60 s (SCIENCE.md §8 #10, [derived] from Young 1967)', () => {
    expect(scintillationYoung1967(0.4, 1, 0, 60) * 1e3).toBeCloseTo(0.7, 2);
  });
  // The value or formula under test is recalled, not re-read (docs/science.md "Checked values").
  it('Osborn: σ² = 1e-5·CY²·D^(−4/3)/t·X³·e^(−2h/8000) [derived value]', () => {
    const expected = Math.sqrt((1e-5 * 2.25 * 0.4 ** (-4 / 3)) / 60);
    expect(scintillationOsborn2015(0.4, 1, 0, 60)).toBeCloseTo(expected, 12);
    expect(scintillationOsborn2015(0.4, 2, 0, 60) / scintillationOsborn2015(0.4, 1, 0, 60)).toBeCloseTo(2 ** 1.5, 12);
  });
  it('falls with elevation and aperture', () => {
    expect(scintillationYoung1967(0.4, 1, 2000, 60)).toBeLessThan(scintillationYoung1967(0.4, 1, 0, 60));
    expect(scintillationYoung1967(1, 1, 0, 60)).toBeLessThan(scintillationYoung1967(0.4, 1, 0, 60));
  });
});

describe('erf', () => {
  it('matches known values to 1.5e-7 (Abramowitz & Stegun 7.1.26)', () => {
    expect(erf(0)).toBeCloseTo(0, 7);
    expect(erf(0.5)).toBeCloseTo(0.5204998778, 6);
    expect(erf(-1)).toBeCloseTo(-0.8427007929, 6);
  });
});

describe('computeVisitPrecision', () => {
  it('adds photon, sky, read, scintillation and the floor in quadrature', () => {
    const p = computeVisitPrecision(NODE, SITE, { magnitude: 12, exposureSeconds: 60, airmass: 1.2 });
    const c = p.components;
    const q = Math.sqrt(c.photonPpm ** 2 + c.skyPpm ** 2 + c.darkPpm ** 2 + c.readPpm ** 2 + c.scintillationPpm ** 2 + c.floorPpm ** 2);
    expect(p.totalPpm).toBeCloseTo(q, 6);
    expect(c.floorPpm).toBeCloseTo(1e6 / 1085.7, 0);
    expect(p.totalMmag).toBeCloseTo((1.0857 * p.totalPpm) / 1000, 3);
  });

  it('improves with aperture (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.1, max: 2, noNaN: true }),
        fc.double({ min: 1.01, max: 3, noNaN: true }),
        fc.double({ min: 5, max: 18, noNaN: true }),
        fc.double({ min: 1, max: 300, noNaN: true }),
        (d, factor, mag, t) => {
          const small = computeVisitPrecision({ ...NODE, apertureM: d }, SITE, { magnitude: mag, exposureSeconds: t, airmass: 1.3 });
          const big = computeVisitPrecision({ ...NODE, apertureM: d * factor }, SITE, { magnitude: mag, exposureSeconds: t, airmass: 1.3 });
          expect(big.totalPpm).toBeLessThan(small.totalPpm);
        },
      ),
    );
  });

  it('improves with exposure below saturation (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 8, max: 18, noNaN: true }),
        fc.double({ min: 1, max: 100, noNaN: true }),
        fc.double({ min: 1.01, max: 3, noNaN: true }),
        (mag, t, f) => {
          const setup = photometrySetup(NODE, SITE, mag, 1.3);
          const tSat = saturationExposureSeconds(setup);
          fc.pre(t * f < tSat);
          const a = computeVisitPrecision(NODE, SITE, { magnitude: mag, exposureSeconds: t, airmass: 1.3 });
          const b = computeVisitPrecision(NODE, SITE, { magnitude: mag, exposureSeconds: t * f, airmass: 1.3 });
          expect(b.totalPpm).toBeLessThan(a.totalPpm);
          expect(b.saturated).toBe(false);
        },
      ),
    );
  });

  it('rejects a bad node or site naming the field', () => {
    expect(() => computeVisitPrecision({ ...NODE, apertureM: -1 }, SITE, { magnitude: 12, exposureSeconds: 60, airmass: 1 })).toThrow(
      /node.apertureM: must be positive/,
    );
    expect(() => computeVisitPrecision({ ...NODE, band: 'K' as never }, SITE, { magnitude: 12, exposureSeconds: 60, airmass: 1 })).toThrow(
      /node.band/,
    );
    expect(() =>
      computeVisitPrecision(NODE, { ...SITE, elevationM: Number.NaN }, { magnitude: 12, exposureSeconds: 60, airmass: 1 }),
    ).toThrow(/site.elevationM/);
    expect(() => computeVisitPrecision(NODE, SITE, { magnitude: 12, exposureSeconds: 0, airmass: 1 })).toThrow(
      /exposureSeconds: must be positive/,
    );
    expect(() => computeVisitPrecision(NODE, SITE, { magnitude: 12, exposureSeconds: 10, airmass: 0.5 })).toThrow(/airmass/);
    expect(() => validateNodeSpec({ ...NODE, maxExposureSeconds: 1 })).toThrow(/node.maxExposureSeconds/);
    expect(() => validateNodeSpec({ ...NODE, currency: 'EUR' })).toThrow(/node.currency/);
  });
});

describe('chooseExposure', () => {
  it('finds the shortest exposure reaching the goal, on a 0.1 s step', () => {
    const c = chooseExposure(NODE, SITE, { magnitude: 13, airmass: 1.3, targetPrecisionPpm: 3000 });
    expect(c.limitedBy).toBe('targetPrecision');
    expect(c.reachesTarget).toBe(true);
    expect(c.precision.totalPpm).toBeLessThanOrEqual(3000);
    const shorter = computeVisitPrecision(NODE, SITE, { magnitude: 13, exposureSeconds: c.exposureSeconds - 0.1, airmass: 1.3 });
    expect(shorter.totalPpm).toBeGreaterThan(3000);
    expect(Math.abs(c.exposureSeconds * 10 - Math.round(c.exposureSeconds * 10))).toBeLessThan(1e-9);
  });

  it('never saturates: the peak pixel stays below saturationE (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 4, max: 18, noNaN: true }), fc.double({ min: 300, max: 20000, noNaN: true }), (mag, goal) => {
        const c = chooseExposure(NODE, SITE, { magnitude: mag, airmass: 1.2, targetPrecisionPpm: goal });
        if (!c.saturatesAtMinExposure) expect(c.precision.peakPixelElectrons).toBeLessThan(NODE.saturationE);
        expect(c.exposureSeconds).toBeGreaterThanOrEqual(NODE.minExposureSeconds);
        expect(c.exposureSeconds).toBeLessThanOrEqual(NODE.maxExposureSeconds);
        expect(Number.isFinite(c.precision.totalPpm)).toBe(true);
      }),
    );
  });

  it('reports the limit when the goal cannot be reached', () => {
    const faint = chooseExposure(NODE, SITE, { magnitude: 19, airmass: 1.2, targetPrecisionPpm: 1000 });
    expect(faint).toMatchObject({ limitedBy: 'maxExposure', reachesTarget: false, exposureSeconds: 300 });
    const bright = chooseExposure(NODE, SITE, { magnitude: 10, airmass: 1.2, targetPrecisionPpm: 500 });
    expect(bright.limitedBy).toBe('saturation');
    expect(bright.exposureSeconds).toBeLessThan(bright.saturationLimitSeconds);
    const tooBright = chooseExposure(NODE, SITE, { magnitude: 2, airmass: 1.2, targetPrecisionPpm: 500 });
    expect(tooBright.saturatesAtMinExposure).toBe(true);
  });

  it('rejects a non-positive precision goal', () => {
    expect(() => chooseExposure(NODE, SITE, { magnitude: 12, airmass: 1.2, targetPrecisionPpm: 0 })).toThrow(/targetPrecisionPpm/);
  });
});
