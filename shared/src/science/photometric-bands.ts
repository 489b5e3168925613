/**
 * Photometric bands of the nodes: photon zero points, atmospheric extinction, and the
 * colour terms that move a target's magnitude from the band it was catalogued in to the
 * node's band.
 */
import { type NodeBand, NODE_BANDS } from '../facility/facility-types';
import { type ResolvedColour, requireSequence, redden } from './colour-sequence';
import { requireFinite, requireOneOf } from './science-input-error';

/** Planck constant × speed of light, erg·Å (exact SI values h and c). */
const HC_ERG_ANGSTROM = 6.62607015e-27 * 2.99792458e18;

/** One band's zero point: the photon flux of a magnitude-0 (Vega) star above the atmosphere. */
export interface BandZeroPoint {
  band: NodeBand;
  /** Effective wavelength, µm. */
  lambdaEffMicron: number;
  /** Band width (FWHM), µm. */
  widthMicron: number;
  /** f_λ of a magnitude-0 star, erg cm⁻² s⁻¹ Å⁻¹. */
  fLambdaZero: number;
  /** Photons s⁻¹ m⁻² of a magnitude-0 star: f_λ·Δλ·λ_eff/(hc) [derived]. */
  photonsPerSecondPerM2: number;
  source: string;
}

function zeroPoint(band: NodeBand, lambdaEffMicron: number, widthMicron: number, fLambdaZero: number, source: string): BandZeroPoint {
  const lambdaA = lambdaEffMicron * 1e4;
  const widthA = widthMicron * 1e4;
  const perCm2 = (fLambdaZero * widthA * lambdaA) / HC_ERG_ANGSTROM;
  return { band, lambdaEffMicron, widthMicron, fLambdaZero, photonsPerSecondPerM2: perCm2 * 1e4, source };
}

// All values from memory: references confirmed, table values not reached (docs/science.md
// "Checked values"). The photon flux is derived here.
const BESSELL =
  'λ_eff and f_λ zero points: Bessell, Castelli & Plez (1998), A&A 333, 231, Table A2; FWHM: the commonly tabulated Johnson–Cousins widths, Bessell (1990), PASP 102, 1181; photon flux f_λ·Δλ·λ_eff/(hc)';

/**
 * Photon zero points per band. B, V, R (Cousins), I (Cousins): see {@link BESSELL}.
 * Gaia G: λ0 = 0.673 µm and FWHM 0.440 µm from Jordi et al. (2010), A&A 523, A48 (from
 * memory); f_λ at 0.673 µm interpolated linearly between the R and I zero points above
 * [derived]. A wide band treated as a box: good to ≈ 25 % (0.25 mag) in photons.
 */
export const BAND_ZERO_POINTS: Readonly<Record<NodeBand, BandZeroPoint>> = {
  B: zeroPoint('B', 0.438, 0.094, 632.0e-11, BESSELL),
  V: zeroPoint('V', 0.545, 0.088, 363.1e-11, BESSELL),
  R: zeroPoint('R', 0.641, 0.138, 217.7e-11, BESSELL),
  I: zeroPoint('I', 0.798, 0.149, 112.6e-11, BESSELL),
  G: zeroPoint(
    'G',
    0.673,
    0.44,
    217.7e-11 + ((0.673 - 0.641) / (0.798 - 0.641)) * (112.6e-11 - 217.7e-11),
    // λ0, FWHM and f_λ from memory (references confirmed); the interpolation is derived here.
    'Jordi et al. (2010), A&A 523, A48 (λ0, FWHM); f_λ interpolated from Bessell, Castelli & Plez (1998), A&A 333, 231, Table A2',
  ),
};

/**
 * Typical atmospheric extinction at a good site, mag per airmass: B 0.25, V 0.15, R 0.10,
 * I 0.07, G 0.12 (common practice, no source; a node may override it).
 */
export const DEFAULT_EXTINCTION_MAG_PER_AIRMASS: Readonly<Record<NodeBand, number>> = {
  B: 0.25,
  V: 0.15,
  R: 0.1,
  I: 0.07,
  G: 0.12,
};
// Common practice, no single source.
export const EXTINCTION_SOURCE =
  'typical extinction at a good site (standard observing practice; see Methods: Per-visit precision of a node)';

/**
 * Colour terms, band − V, as functions of the observed colours:
 * - B − V: the observed B−V itself;
 * - G − V = −0.02704 + 0.01424x − 0.2156x² + 0.01426x³,
 * - G − Rc = −0.02275 + 0.3961x − 0.1243x² − 0.01396x³ + 0.003775x⁴,
 * - G − Ic = 0.01753 + 0.76x − 0.0991x², with x = observed BP−RP:
 *   Riello et al. (2021), A&A 649, A3, Table C.2 (from memory).
 */
// Table C.2 coefficients from memory: the table numbering and ranges are confirmed, the
// coefficients not reached (docs/science.md "Checked values").
export const BAND_TRANSFORM_SOURCE =
  'B−V: the target colour; G−V, G−Rc, G−Ic polynomials in BP−RP: Riello et al. (2021), A&A 649, A3, Table C.2';

/** band − V for a star of observed colours (B−V, BP−RP). */
export function bandMinusV(band: NodeBand, observedBvMag: number, observedBpRpMag: number): number {
  const x = observedBpRpMag;
  const gMinusV = -0.02704 + 0.01424 * x - 0.2156 * x * x + 0.01426 * x * x * x;
  switch (band) {
    case 'V':
      return 0;
    case 'B':
      return observedBvMag;
    case 'G':
      return gMinusV;
    case 'R':
      return gMinusV - (-0.02275 + 0.3961 * x - 0.1243 * x * x - 0.01396 * x ** 3 + 0.003775 * x ** 4);
    case 'I':
      return gMinusV - (0.01753 + 0.76 * x - 0.0991 * x * x);
  }
}

/** A magnitude moved to another band, and how. */
export interface BandConversion {
  magnitude: number;
  band: NodeBand;
  fromMagnitude: number;
  fromBand: NodeBand;
  /** to − from, mag. */
  offsetMag: number;
  /** Observed colours used (null when no conversion was needed). */
  observedBvMag: number | null;
  observedBpRpMag: number | null;
  source: string;
}

/**
 * Moves a catalogue magnitude to the node's band. Uses the target's observed (reddened)
 * colours: its intrinsic colours from the dwarf sequence, reddened again by E(B−V).
 */
export function convertMagnitude(
  magnitude: { value: number; band: NodeBand },
  toBand: NodeBand,
  colour: ResolvedColour,
  field = 'magnitude',
): BandConversion {
  const m = requireFinite(magnitude?.value, `${field}.value`);
  const from = requireOneOf(magnitude.band, `${field}.band`, NODE_BANDS);
  const to = requireOneOf(toBand, 'node.band', NODE_BANDS);
  if (from === to) {
    return {
      magnitude: m,
      band: to,
      fromMagnitude: m,
      fromBand: from,
      offsetMag: 0,
      observedBvMag: null,
      observedBpRpMag: null,
      source: 'same band',
    };
  }
  const point = requireSequence(colour, 'colour.value');
  const e = colour.reddeningEbvMag;
  const bv = colour.observed.system === 'BV' ? colour.observed.value : redden({ value: point.bvMag, system: 'BV' }, e).value;
  const bprp = colour.observed.system === 'BPRP' ? colour.observed.value : redden({ value: point.bpRpMag, system: 'BPRP' }, e).value;
  const offset = bandMinusV(to, bv, bprp) - bandMinusV(from, bv, bprp);
  return {
    magnitude: m + offset,
    band: to,
    fromMagnitude: m,
    fromBand: from,
    offsetMag: offset,
    observedBvMag: bv,
    observedBpRpMag: bprp,
    source: BAND_TRANSFORM_SOURCE,
  };
}
