/**
 * Spot-modulation amplitude from the Rossby number, and conversions between amplitude
 * measures and units.
 *
 * No published closed-form amplitude–Ro fit is adopted (SCIENCE.md §3). Spincycle's default
 * is a two-part power law anchored to published values, its coefficients configurable:
 * - saturated: Ro ≤ Ro_sat → R_per = R_sat (22 700 ppm: the 95th percentile of R_per among
 *   stars with detected periods, McQuillan, Mazeh & Aigrain (2014), ApJS 211, 24);
 * - otherwise R_per = R_anchor·(Ro/Ro_anchor)^(−k), anchored on the solar rotational
 *   variability 0.68 mmag ≈ 630 ppm (Nèmec et al. (2020), A&A 638, A56) at the solar Noyes
 *   Ro ≈ 2.18; k = ln(R_sat/R_anchor)/ln(Ro_anchor/Ro_sat) joins the two parts
 *   (1.163 for the defaults) [derived].
 */
import { requireFinite, requireNonNegative, requireOneOf, requirePositive, ScienceInputError } from './science-input-error';
import { type TurnoverScale, TURNOVER_SCALE_INFO, TURNOVER_SCALES, solarRossby } from './turnover-time';

/** Coefficients of the two-part amplitude model. */
export interface AmplitudeModelCoefficients {
  /** Rossby number at and below which activity is saturated. */
  saturationRossby: number;
  /** R_per in the saturated regime, ppm. */
  saturatedRperPpm: number;
  /** R_per at the anchor, ppm. */
  anchorRperPpm: number;
  /** Rossby number of the anchor. */
  anchorRossby: number;
}

/** SCIENCE.md §3 defaults. */
export const DEFAULT_AMPLITUDE_MODEL: Readonly<AmplitudeModelCoefficients> = {
  saturationRossby: 0.1,
  saturatedRperPpm: 22700,
  anchorRperPpm: 630,
  anchorRossby: 2.18,
};

// This product's model (formerly "Spincycle's two-part model"), built on two published anchors.
export const AMPLITUDE_MODEL_SOURCE =
  'a two-part model, an assumption of this product (see Methods: Spot amplitude): saturated level from McQuillan, Mazeh & Aigrain (2014), ApJS 211, 24; solar anchor from Nèmec et al. (2020), A&A 638, A56; exponent derived by joining the two';

/** Validates a (partial) set of coefficients, filling the defaults. */
export function amplitudeModel(overrides: Partial<AmplitudeModelCoefficients> = {}): AmplitudeModelCoefficients {
  const m = { ...DEFAULT_AMPLITUDE_MODEL, ...stripUndefined(overrides) };
  requirePositive(m.saturationRossby, 'amplitudeModel.saturationRossby');
  requirePositive(m.saturatedRperPpm, 'amplitudeModel.saturatedRperPpm');
  requirePositive(m.anchorRperPpm, 'amplitudeModel.anchorRperPpm');
  requirePositive(m.anchorRossby, 'amplitudeModel.anchorRossby');
  if (m.anchorRossby <= m.saturationRossby) {
    throw new ScienceInputError('amplitudeModel.anchorRossby', `must exceed the saturation Rossby number ${m.saturationRossby}`);
  }
  if (m.anchorRperPpm >= m.saturatedRperPpm) {
    throw new ScienceInputError('amplitudeModel.anchorRperPpm', `must be below the saturated R_per ${m.saturatedRperPpm} ppm`);
  }
  VALIDATED.add(m);
  return m;
}

/** Models returned by {@link amplitudeModel}: already complete and checked. */
const VALIDATED = new WeakSet<object>([DEFAULT_AMPLITUDE_MODEL]);

/** Exponent k of the unsaturated power law, derived by joining the two anchors. */
export function amplitudeExponent(model: AmplitudeModelCoefficients = DEFAULT_AMPLITUDE_MODEL): number {
  return Math.log(model.saturatedRperPpm / model.anchorRperPpm) / Math.log(model.anchorRossby / model.saturationRossby);
}

/** Expected R_per (ppm) at a Rossby number, with the regime that set it. */
export interface SpotAmplitude {
  rperPpm: number;
  regime: 'saturated' | 'unsaturated';
  exponent: number;
  model: AmplitudeModelCoefficients;
}

/**
 * R_per (5–95 % range of the light curve, ppm) from Ro by the two-part model. `model` may be
 * partial (missing coefficients take the defaults); a complete, already validated model (from
 * {@link amplitudeModel}) is used as is.
 */
export function spotAmplitude(rossby: number, model: Partial<AmplitudeModelCoefficients> = {}): SpotAmplitude {
  const ro = requirePositive(rossby, 'rossby');
  const m = VALIDATED.has(model) ? (model as AmplitudeModelCoefficients) : amplitudeModel(model);
  return spotAmplitudeOf(ro, m);
}

function spotAmplitudeOf(ro: number, model: AmplitudeModelCoefficients): SpotAmplitude {
  const exponent = amplitudeExponent(model);
  if (ro <= model.saturationRossby) return { rperPpm: model.saturatedRperPpm, regime: 'saturated', exponent, model };
  return { rperPpm: model.anchorRperPpm * (ro / model.anchorRossby) ** -exponent, regime: 'unsaturated', exponent, model };
}

/**
 * The τ scale the amplitude model's anchors are stated on: the saturation at Ro ≤ 0.1 and the
 * solar anchor at Ro ≈ 2.18 are Noyes et al. (1984), ApJ 279, 763 Rossby numbers (SCIENCE.md §3).
 */
export const AMPLITUDE_ANCHOR_SCALE: TurnoverScale = 'noyes1984';

/**
 * A Rossby number on any τ scale expressed on the amplitude model's (Noyes 1984) scale through
 * the solar Rossby number of each: Ro·(Ro☉,Noyes / Ro☉,scale), i.e. the same Ro/Ro☉ [derived].
 * Pass the result to {@link spotAmplitude}: the model's anchors hold on the Noyes scale only,
 * and a raw Ro from another scale would move the amplitude by the ratio of the scales' τ.
 */
export function amplitudeRossby(rossby: number, scale: TurnoverScale): number {
  const ro = requirePositive(rossby, 'rossby');
  requireOneOf(scale, 'turnoverScale', TURNOVER_SCALES);
  return (ro * solarRossby(AMPLITUDE_ANCHOR_SCALE)) / solarRossby(scale);
}

/** One line for the interface: how {@link amplitudeRossby} rescaled a Rossby number. */
export function amplitudeRossbyWhy(scale: TurnoverScale): string {
  if (scale === AMPLITUDE_ANCHOR_SCALE) return `Ro on the ${TURNOVER_SCALE_INFO[scale].label} scale, the amplitude anchors' own`;
  return `Ro on the ${TURNOVER_SCALE_INFO[scale].label} scale × Ro☉ ${fmtRo(solarRossby(AMPLITUDE_ANCHOR_SCALE))} (${TURNOVER_SCALE_INFO[AMPLITUDE_ANCHOR_SCALE].label}) / Ro☉ ${fmtRo(solarRossby(scale))} (${TURNOVER_SCALE_INFO[scale].label}): the same Ro/Ro☉ on the anchors' scale`;
}

function fmtRo(v: number): string {
  return v.toFixed(2);
}

// ---------------------------------------------------------------------------------------
// Units and measures.

/**
 * ppm per mmag: a star 1 mmag fainter delivers 1 − 10^(−0.0004) = 920.6 ppm less flux
 * [derived, SCIENCE.md §3]; used as a linear small-signal factor.
 */
export const PPM_PER_MMAG = 1e6 * (1 - 10 ** -0.0004);

/**
 * R_per (5–95 % range) of a sinusoid of semi-amplitude A: the 5th and 95th percentiles of
 * A·sin are ∓A·sin(0.45π), so R_per = 2·sin(0.45π)·A = 1.975·A [derived].
 */
export const RPER_PER_SEMI_AMPLITUDE = 2 * Math.sin(0.45 * Math.PI);

export const AMPLITUDE_MEASURES = ['semiAmplitude', 'peakToPeak', 'rper', 'rms'] as const;
/** How an amplitude is measured: semi-amplitude A, peak-to-peak 2A, R_per 1.975A, rms A/√2. */
export type AmplitudeMeasure = (typeof AMPLITUDE_MEASURES)[number];

export const AMPLITUDE_UNITS = ['ppm', 'mmag', 'fraction'] as const;
export type AmplitudeUnit = (typeof AMPLITUDE_UNITS)[number];

const PER_SEMI_AMPLITUDE: Record<AmplitudeMeasure, number> = {
  semiAmplitude: 1,
  peakToPeak: 2,
  rper: RPER_PER_SEMI_AMPLITUDE,
  rms: Math.SQRT1_2,
};

const PPM_PER_UNIT: Record<AmplitudeUnit, number> = { ppm: 1, mmag: PPM_PER_MMAG, fraction: 1e6 };

/** mmag → ppm (small-signal, 920.6 ppm per mmag). */
export function mmagToPpm(mmag: number): number {
  return requireFinite(mmag, 'mmag') * PPM_PER_MMAG;
}

/** ppm → mmag (small-signal). */
export function ppmToMmag(ppm: number): number {
  return requireFinite(ppm, 'ppm') / PPM_PER_MMAG;
}

/**
 * Converts an amplitude between measures (semi-amplitude, peak-to-peak, R_per, rms of a
 * sinusoid) and units (ppm, mmag, fraction).
 */
export function convertAmplitude(
  value: number,
  from: { measure: AmplitudeMeasure; unit: AmplitudeUnit },
  to: { measure: AmplitudeMeasure; unit: AmplitudeUnit },
): number {
  const v = requireNonNegative(value, 'amplitude');
  const fm = requireOneOf(from.measure, 'from.measure', AMPLITUDE_MEASURES);
  const fu = requireOneOf(from.unit, 'from.unit', AMPLITUDE_UNITS);
  const tm = requireOneOf(to.measure, 'to.measure', AMPLITUDE_MEASURES);
  const tu = requireOneOf(to.unit, 'to.unit', AMPLITUDE_UNITS);
  const semiPpm = (v * PPM_PER_UNIT[fu]) / PER_SEMI_AMPLITUDE[fm];
  return (semiPpm * PER_SEMI_AMPLITUDE[tm]) / PPM_PER_UNIT[tu];
}

function stripUndefined<T extends object>(o: T): Partial<T> {
  const out: Partial<T> = {};
  for (const k in o) if (o[k] !== undefined) out[k] = o[k];
  return out;
}
