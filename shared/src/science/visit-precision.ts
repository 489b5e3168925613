/**
 * Per-visit photometric precision on a node: CCD equation, scintillation and a systematic
 * floor added in quadrature; airmass; and the exposure time that reaches a requested
 * precision without saturating.
 */
import { type NodeSpec, type SiteSpec, NODE_BANDS, SCINTILLATION_MODELS } from '../facility/facility-types';
import { between, displayNumber } from '../http/range-text';
import { BAND_ZERO_POINTS, DEFAULT_EXTINCTION_MAG_PER_AIRMASS } from './photometric-bands';
import { ScienceInputError, requireFinite, requireInRange, requireNonNegative, requireOneOf, requirePositive } from './science-input-error';

/** 2.5/ln 10: σ(mag) ≈ 1.0857·σ(flux)/flux = 1.0857/(S/N) (Howell 2006, Handbook of CCD Astronomy). */
export const MAG_PER_RELATIVE_FLUX = 2.5 / Math.LN10;

/** FWHM of a Gaussian in units of its σ: 2·sqrt(2 ln 2). */
const FWHM_PER_SIGMA = 2 * Math.sqrt(2 * Math.LN2);

/** Scale height of the atmospheric turbulence used by both scintillation formulas, m (SCIENCE.md §5). */
const SCINTILLATION_SCALE_HEIGHT_M = 8000;

/** Optional photometry settings (not part of NodeSpec), with their defaults. */
export interface PhotometryOptions {
  /**
   * Aperture radius in units of the seeing FWHM. Default 1.5: encloses 99.8 % of a Gaussian
   * PSF and tolerates seeing changes in differential photometry (common practice, no source).
   */
  apertureRadiusFwhm?: number;
  /**
   * Sky-annulus pixels per aperture pixel, nB/npix in the CCD equation. Default 10
   * (common practice, no source).
   */
  skyToApertureAreaRatio?: number;
  /** Extinction, mag per airmass; default per band ({@link DEFAULT_EXTINCTION_MAG_PER_AIRMASS}). */
  extinctionMagPerAirmass?: number;
  /** Osborn et al. (2015) empirical correction CY; default 1.5 (SCIENCE.md §5; checked, docs/science.md "Checked values"). */
  osbornCy?: number;
}

export const DEFAULT_PHOTOMETRY: Required<Omit<PhotometryOptions, 'extinctionMagPerAirmass'>> = {
  apertureRadiusFwhm: 1.5,
  skyToApertureAreaRatio: 10,
  osbornCy: 1.5,
};

// ---------------------------------------------------------------------------------------
// Airmass and scintillation.

/**
 * Relative airmass, Kasten & Young (1989), Appl. Opt. 28, 4735, eq. 3 (equation number and
 * coefficients checked against published implementations; docs/science.md "Checked values"):
 * X = 1/(sin h + 0.50572·(h + 6.07995°)^(−1.6364)), h = apparent altitude in degrees.
 * The sky windows convert an airmass limit to an altitude with this same function
 * (sky/airmass-limit.ts).
 */
export function airmassKastenYoung(altitudeDeg: number): number {
  const h = requireInRange(altitudeDeg, 'altitudeDeg', 0, 90);
  return 1 / (Math.sin((h * Math.PI) / 180) + 0.50572 * (h + 6.07995) ** -1.6364);
}

/**
 * Scintillation noise, relative flux rms, Young (1967), AJ 72, 747, in its commonly used
 * restatement (0.09 with D in cm, airmass exponent 1.75; checked against observers' use of the
 * formula, the 1967 paper's own notation not re-read — docs/science.md "Checked values"):
 * σ = 0.09·D_cm^(−2/3)·X^1.75·exp(−h/8000 m)·(2t)^(−1/2).
 */
export function scintillationYoung1967(apertureM: number, airmass: number, elevationM: number, exposureSeconds: number): number {
  const dCm = requirePositive(apertureM, 'apertureM') * 100;
  const x = requireAirmass(airmass);
  const h = requireFinite(elevationM, 'elevationM');
  const t = requirePositive(exposureSeconds, 'exposureSeconds');
  return (0.09 * dCm ** (-2 / 3) * x ** 1.75 * Math.exp(-h / SCINTILLATION_SCALE_HEIGHT_M)) / Math.sqrt(2 * t);
}

/**
 * Scintillation noise, relative flux rms, Osborn et al. (2015), MNRAS 452, 1707, eq. 7
 * (equation number, formula and CY = 1.5 checked; docs/science.md "Checked values"):
 * σ² = 10⁻⁵·CY²·D^(−4/3)·t^(−1)·X³·exp(−2h/8000 m), D in m.
 */
export function scintillationOsborn2015(
  apertureM: number,
  airmass: number,
  elevationM: number,
  exposureSeconds: number,
  cy: number = DEFAULT_PHOTOMETRY.osbornCy,
): number {
  const d = requirePositive(apertureM, 'apertureM');
  const x = requireAirmass(airmass);
  const h = requireFinite(elevationM, 'elevationM');
  const t = requirePositive(exposureSeconds, 'exposureSeconds');
  const c = requirePositive(cy, 'osbornCy');
  return Math.sqrt((1e-5 * c * c * d ** (-4 / 3) * x ** 3 * Math.exp((-2 * h) / SCINTILLATION_SCALE_HEIGHT_M)) / t);
}

function requireAirmass(airmass: number): number {
  const x = requireFinite(airmass, 'airmass');
  if (x < 0.99 || x > 40) throw new ScienceInputError('airmass', `must be ${between(0.99, 40)} (got ${displayNumber(x)})`);
  return x;
}

/**
 * Error function, Abramowitz & Stegun (1964), eq. 7.1.26 (|error| < 1.5e-7; common practice;
 * coefficients checked numerically: largest error 1.4e-7 on −5…5, docs/science.md "Checked values").
 */
export function erf(x: number): number {
  const s = x < 0 ? -1 : 1;
  const a = Math.abs(x);
  const t = 1 / (1 + 0.3275911 * a);
  const y = 1 - ((((1.061405429 * t - 1.453152027) * t + 1.421413741) * t - 0.284496736) * t + 0.254829592) * t * Math.exp(-a * a);
  return s * y;
}

// ---------------------------------------------------------------------------------------
// Validation of the facility's objects.

/** Validates a node's instrument description; each problem names `node.<field>`. */
export function validateNodeSpec(node: NodeSpec, field = 'node'): NodeSpec {
  if (typeof node !== 'object' || node === null) throw new ScienceInputError(field, 'is missing');
  const f = subField.bind(null, field);
  requirePositive(node.apertureM, f('apertureM'));
  requireInRange(node.obstructionFraction, f('obstructionFraction'), 0, 0.6);
  requireInRange(node.throughput, f('throughput'), 0, 1);
  if (node.throughput === 0) throw new ScienceInputError(f('throughput'), 'must be positive (got 0)');
  requireOneOf(node.band, f('band'), NODE_BANDS);
  requireNonNegative(node.readNoiseE, f('readNoiseE'));
  requireNonNegative(node.darkCurrentEPerS, f('darkCurrentEPerS'));
  requirePositive(node.gainEPerAdu, f('gainEPerAdu'));
  requirePositive(node.saturationE, f('saturationE'));
  requirePositive(node.pixelScaleArcsec, f('pixelScaleArcsec'));
  requirePositive(node.seeingFwhmArcsec, f('seeingFwhmArcsec'));
  requireNonNegative(node.systematicFloorMmag, f('systematicFloorMmag'));
  requireOneOf(node.scintillationModel, f('scintillationModel'), SCINTILLATION_MODELS);
  requireNonNegative(node.overheadSeconds, f('overheadSeconds'));
  requirePositive(node.minExposureSeconds, f('minExposureSeconds'));
  requirePositive(node.maxExposureSeconds, f('maxExposureSeconds'));
  if (node.maxExposureSeconds < node.minExposureSeconds) {
    throw new ScienceInputError(f('maxExposureSeconds'), `must be at least minExposureSeconds ${node.minExposureSeconds}`);
  }
  requireInRange(node.altitudeLimitDeg, f('altitudeLimitDeg'), 0, 89);
  requireInRange(node.sunAltitudeLimitDeg, f('sunAltitudeLimitDeg'), -90, 0);
  requireInRange(node.weatherLossFraction, f('weatherLossFraction'), 0, 0.99);
  requireNonNegative(node.rateMinorPerHour, f('rateMinorPerHour'));
  if (typeof node.currency !== 'string' || !/^[a-z]{3}$/.test(node.currency)) {
    throw new ScienceInputError(f('currency'), `must be a lowercase ISO 4217 code such as eur (got ${String(node.currency)})`);
  }
  return node;
}

/** Validates a site; each problem names `site.<field>`. */
export function validateSiteSpec(site: SiteSpec, field = 'site'): SiteSpec {
  if (typeof site !== 'object' || site === null) throw new ScienceInputError(field, 'is missing');
  requireInRange(site.latitudeDeg, `${field}.latitudeDeg`, -90, 90);
  requireInRange(site.longitudeDeg, `${field}.longitudeDeg`, -180, 360);
  requireInRange(site.elevationM, `${field}.elevationM`, -500, 6000);
  requireInRange(site.skyBrightnessMagPerArcsec2, `${field}.skyBrightnessMagPerArcsec2`, 10, 25);
  return site;
}

// ---------------------------------------------------------------------------------------
// The CCD equation.

/** Rates that do not depend on the exposure time: computed once per target and node. */
export interface PhotometrySetup {
  /** Star electrons per second, whole PSF, after extinction and throughput. */
  starRateE: number;
  /** Fraction of the PSF inside the aperture. */
  apertureFraction: number;
  /** Fraction of the PSF in the brightest pixel (PSF centred on a pixel). */
  peakPixelFraction: number;
  skyRateEPerPixel: number;
  darkRateEPerPixel: number;
  npix: number;
  /** npix·(1 + npix/nB): the background-noise multiplier of the CCD equation. */
  backgroundPixels: number;
  /** Per-pixel variance that does not grow with time: read noise² + digitisation. */
  fixedVariancePerPixel: number;
  apertureRadiusArcsec: number;
  effectiveAreaM2: number;
  extinctionMag: number;
  extinctionMagPerAirmass: number;
  airmass: number;
  magnitude: number;
  /** Scintillation σ·sqrt(t): both models scale as t^(−1/2). */
  scintillationTimesSqrtT: number;
  floorRelative: number;
  saturationE: number;
}

/** Magnitudes in the node's band that the noise model covers, mag. */
export const MAGNITUDE_RANGE = { min: -2, max: 25 } as const;

/** Builds the time-independent part of the per-visit noise model. */
export function photometrySetup(
  node: NodeSpec,
  site: SiteSpec,
  magnitude: number,
  airmass: number,
  options: PhotometryOptions = {},
): PhotometrySetup {
  const m = requireInRange(magnitude, 'magnitude', MAGNITUDE_RANGE.min, MAGNITUDE_RANGE.max, false, 'mag');
  const x = requireAirmass(airmass);
  const radiusFwhm = requirePositive(options.apertureRadiusFwhm ?? DEFAULT_PHOTOMETRY.apertureRadiusFwhm, 'photometry.apertureRadiusFwhm');
  const skyRatio = requirePositive(
    options.skyToApertureAreaRatio ?? DEFAULT_PHOTOMETRY.skyToApertureAreaRatio,
    'photometry.skyToApertureAreaRatio',
  );
  const k = requireNonNegative(
    options.extinctionMagPerAirmass ?? DEFAULT_EXTINCTION_MAG_PER_AIRMASS[node.band],
    'photometry.extinctionMagPerAirmass',
  );
  const cy = requirePositive(options.osbornCy ?? DEFAULT_PHOTOMETRY.osbornCy, 'photometry.osbornCy');

  const zp = BAND_ZERO_POINTS[node.band].photonsPerSecondPerM2;
  const area = (Math.PI / 4) * node.apertureM * node.apertureM * (1 - node.obstructionFraction * node.obstructionFraction);
  const extinctionMag = k * x;
  const starRateE = zp * 10 ** (-0.4 * (m + extinctionMag)) * area * node.throughput;

  const sigmaArcsec = node.seeingFwhmArcsec / FWHM_PER_SIGMA;
  const radius = radiusFwhm * node.seeingFwhmArcsec;
  // Enclosed energy of a circular Gaussian within radius r: 1 − exp(−r²/2σ²).
  const apertureFraction = 1 - Math.exp(-(radius * radius) / (2 * sigmaArcsec * sigmaArcsec));
  const ps = node.pixelScaleArcsec;
  // Central pixel of a Gaussian centred on it: [erf(p/(2√2σ))]² (common practice, no source).
  const e = erf(ps / (2 * Math.SQRT2 * sigmaArcsec));
  const peakPixelFraction = e * e;
  const npix = Math.max(1, (Math.PI * radius * radius) / (ps * ps));
  const skyRateEPerPixel = zp * 10 ** (-0.4 * site.skyBrightnessMagPerArcsec2) * area * node.throughput * ps * ps;
  // Digitisation noise: (G·σf)² with σf = 1/√12 ≈ 0.289 ADU, the rms of a uniform rounding error
  // [derived]; as in Merline & Howell (1995), Exp. Astron. 6, 163 (page not re-read).
  const digitisation = (node.gainEPerAdu * 0.289) ** 2;
  const scint =
    node.scintillationModel === 'young1967'
      ? scintillationYoung1967(node.apertureM, x, site.elevationM, 1)
      : scintillationOsborn2015(node.apertureM, x, site.elevationM, 1, cy);
  return {
    starRateE,
    apertureFraction,
    peakPixelFraction,
    skyRateEPerPixel,
    darkRateEPerPixel: node.darkCurrentEPerS,
    npix,
    backgroundPixels: npix * (1 + 1 / skyRatio),
    fixedVariancePerPixel: node.readNoiseE * node.readNoiseE + digitisation,
    apertureRadiusArcsec: radius,
    effectiveAreaM2: area,
    extinctionMag,
    extinctionMagPerAirmass: k,
    airmass: x,
    magnitude: m,
    scintillationTimesSqrtT: scint,
    floorRelative: node.systematicFloorMmag / 1000 / MAG_PER_RELATIVE_FLUX,
    saturationE: node.saturationE,
  };
}

/** Per-visit precision and its parts (relative-flux noise terms in ppm). */
export interface VisitPrecision {
  exposureSeconds: number;
  /** Total 1σ per visit, ppm of the star's flux. */
  totalPpm: number;
  /** Total 1σ per visit, mmag (σ(mag) ≈ 1.0857·σ(flux)/flux). */
  totalMmag: number;
  /** S/N of the CCD equation alone (photon, sky, dark, read). */
  ccdSnr: number;
  components: {
    photonPpm: number;
    skyPpm: number;
    darkPpm: number;
    readPpm: number;
    scintillationPpm: number;
    floorPpm: number;
  };
  starElectrons: number;
  skyElectronsPerPixel: number;
  peakPixelElectrons: number;
  saturated: boolean;
}

/**
 * Per-visit precision from the setup and an exposure time. CCD equation (Howell 2006,
 * Handbook of CCD Astronomy; Merline & Howell 1995, from memory):
 * S/N = N_star/sqrt(N_star + npix·(1 + npix/nB)·(NS + ND + NR² + (G·σf)²)); scintillation and the
 * node's systematic floor added in quadrature (SCIENCE.md §5).
 */
export function visitPrecisionAt(setup: PhotometrySetup, exposureSeconds: number): VisitPrecision {
  const t = requirePositive(exposureSeconds, 'exposureSeconds');
  const nStar = setup.starRateE * setup.apertureFraction * t;
  const sky = setup.skyRateEPerPixel * t;
  const dark = setup.darkRateEPerPixel * t;
  const bp = setup.backgroundPixels;
  const varSky = bp * sky;
  const varDark = bp * dark;
  const varRead = bp * setup.fixedVariancePerPixel;
  const ccdNoise = Math.sqrt(nStar + varSky + varDark + varRead);
  const scint = setup.scintillationTimesSqrtT / Math.sqrt(t);
  const rel = Math.sqrt((ccdNoise / nStar) ** 2 + scint * scint + setup.floorRelative * setup.floorRelative);
  const peak = setup.starRateE * setup.peakPixelFraction * t + sky + dark;
  return {
    exposureSeconds: t,
    totalPpm: rel * 1e6,
    totalMmag: rel * MAG_PER_RELATIVE_FLUX * 1000,
    ccdSnr: nStar / ccdNoise,
    components: {
      photonPpm: (Math.sqrt(nStar) / nStar) * 1e6,
      skyPpm: (Math.sqrt(varSky) / nStar) * 1e6,
      darkPpm: (Math.sqrt(varDark) / nStar) * 1e6,
      readPpm: (Math.sqrt(varRead) / nStar) * 1e6,
      scintillationPpm: scint * 1e6,
      floorPpm: setup.floorRelative * 1e6,
    },
    starElectrons: nStar,
    skyElectronsPerPixel: sky,
    peakPixelElectrons: peak,
    saturated: peak >= setup.saturationE,
  };
}

/** Relative σ only (the hot path of the exposure search). */
function relativeSigma(s: PhotometrySetup, t: number): number {
  const nStar = s.starRateE * s.apertureFraction * t;
  const v = nStar + s.backgroundPixels * ((s.skyRateEPerPixel + s.darkRateEPerPixel) * t + s.fixedVariancePerPixel);
  return Math.sqrt(v / (nStar * nStar) + (s.scintillationTimesSqrtT * s.scintillationTimesSqrtT) / t + s.floorRelative * s.floorRelative);
}

/** Per-visit precision of a star of `magnitude` (node band) at `airmass` with a given exposure. */
export function computeVisitPrecision(
  node: NodeSpec,
  site: SiteSpec,
  input: { magnitude: number; exposureSeconds: number; airmass: number },
  options: PhotometryOptions = {},
): VisitPrecision {
  validateNodeSpec(node);
  validateSiteSpec(site);
  return visitPrecisionAt(photometrySetup(node, site, input.magnitude, input.airmass, options), input.exposureSeconds);
}

/** Exposure time that gives the peak pixel `saturationE` electrons, s. */
export function saturationExposureSeconds(setup: PhotometrySetup): number {
  return setup.saturationE / (setup.starRateE * setup.peakPixelFraction + setup.skyRateEPerPixel + setup.darkRateEPerPixel);
}

export type ExposureLimit = 'targetPrecision' | 'minExposure' | 'maxExposure' | 'saturation';

/** The chosen exposure and why it is what it is. */
export interface ExposureChoice {
  exposureSeconds: number;
  precision: VisitPrecision;
  /** What fixed the exposure: the precision reached, or a limit. */
  limitedBy: ExposureLimit;
  reachesTarget: boolean;
  targetPrecisionPpm: number;
  /** Longest exposure before the peak pixel reaches saturationE, s. */
  saturationLimitSeconds: number;
  /** True when even the minimum exposure saturates (the plan then cannot be executed as is). */
  saturatesAtMinExposure: boolean;
}

/** Exposure times are rounded up to this step, s (Spincycle's choice: tidy values). */
const EXPOSURE_STEP_SECONDS = 0.1;

/**
 * Shortest exposure within [min, max] that reaches `targetPrecisionPpm` while the peak pixel
 * (Gaussian PSF of the seeing FWHM centred on a pixel, plus sky and dark) stays below the
 * node's `saturationE`. When the target cannot be reached the longest allowed exposure is
 * returned, with `reachesTarget: false`. σ(t) falls monotonically with t, so a bisection
 * in log t finds the exposure.
 */
export function chooseExposureFromSetup(
  setup: PhotometrySetup,
  node: Pick<NodeSpec, 'minExposureSeconds' | 'maxExposureSeconds'>,
  targetPrecisionPpm: number,
): ExposureChoice {
  const target = requirePositive(targetPrecisionPpm, 'targetPrecisionPpm') / 1e6;
  const tSat = saturationExposureSeconds(setup);
  const tMin = node.minExposureSeconds;
  const saturatesAtMin = tSat <= tMin;
  const limit = Math.min(node.maxExposureSeconds, tSat * (1 - 1e-9));
  const tidy = Math.floor(limit / EXPOSURE_STEP_SECONDS + 1e-9) * EXPOSURE_STEP_SECONDS;
  const tMax = limit <= tMin ? tMin : tidy >= tMin ? tidy : limit;
  const upperLimit: ExposureLimit = tSat < node.maxExposureSeconds ? 'saturation' : 'maxExposure';
  let t: number;
  let limitedBy: ExposureLimit;
  if (saturatesAtMin || relativeSigma(setup, tMin) <= target) {
    t = tMin;
    limitedBy = saturatesAtMin ? 'saturation' : 'minExposure';
  } else if (relativeSigma(setup, tMax) > target) {
    t = tMax;
    limitedBy = upperLimit;
  } else {
    let lo = Math.log(tMin);
    let hi = Math.log(tMax);
    for (let i = 0; i < 48; i++) {
      const mid = 0.5 * (lo + hi);
      if (relativeSigma(setup, Math.exp(mid)) > target) lo = mid;
      else hi = mid;
    }
    t = Math.min(tMax, Math.ceil(Math.exp(hi) / EXPOSURE_STEP_SECONDS - 1e-9) * EXPOSURE_STEP_SECONDS);
    limitedBy = 'targetPrecision';
  }
  const precision = visitPrecisionAt(setup, t);
  return {
    exposureSeconds: t,
    precision,
    limitedBy,
    reachesTarget: precision.totalPpm <= targetPrecisionPpm * (1 + 1e-9),
    targetPrecisionPpm,
    saturationLimitSeconds: tSat,
    saturatesAtMinExposure: saturatesAtMin,
  };
}

/** {@link chooseExposureFromSetup} from the node, site and star directly. */
export function chooseExposure(
  node: NodeSpec,
  site: SiteSpec,
  input: { magnitude: number; airmass: number; targetPrecisionPpm: number },
  options: PhotometryOptions = {},
): ExposureChoice {
  validateNodeSpec(node);
  validateSiteSpec(site);
  return chooseExposureFromSetup(photometrySetup(node, site, input.magnitude, input.airmass, options), node, input.targetPrecisionPpm);
}

/** `node.<k>`: the field name of one member of a validated object. */
function subField(field: string, k: string): string {
  return `${field}.${k}`;
}
