/**
 * Convective turnover time τc and Rossby number Ro = P/τc on four published scales.
 * Every result names its scale: Rossby numbers from different scales differ by factors of
 * order 1 and must never be compared across scales.
 */
import {
  type ColourSystem,
  type ResolvedColour,
  colourLabel,
  dwarfSequenceAt,
  requireSequence,
  resolveColour,
  sequenceValue,
  DWARF_SEQUENCE_SOURCE,
} from './colour-sequence';
import { type ScienceFlag, flag, fmt } from './explained';
import { ScienceInputError, requireFinite, requireOneOf, requirePositive } from './science-input-error';

export const TURNOVER_SCALES = ['noyes1984', 'cranmerSaar2011', 'wright2011', 'wright2018'] as const;
export type TurnoverScale = (typeof TURNOVER_SCALES)[number];

/** What each scale needs, its validity range, and its citation. */
export interface TurnoverScaleInfo {
  id: TurnoverScale;
  label: string;
  citation: string;
  /** The stellar quantity the formula takes. */
  input: 'bvMag' | 'teffK' | 'massSolar' | 'vKsMag';
  /** Range of that quantity over which the formula was calibrated. */
  valid: { min: number; max: number; note: string };
}

export const TURNOVER_SCALE_INFO: Readonly<Record<TurnoverScale, TurnoverScaleInfo>> = {
  noyes1984: {
    id: 'noyes1984',
    label: 'Noyes et al. (1984)',
    // Equation number and validity range from memory, not checked (docs/science.md "Checked
    // values"): the shown citation has no equation number.
    citation: 'Noyes et al. (1984), ApJ 279, 763',
    input: 'bvMag',
    valid: { min: 0.4, max: 1.4, note: 'B−V 0.4–1.4' },
  },
  cranmerSaar2011: {
    id: 'cranmerSaar2011',
    label: 'Cranmer & Saar (2011)',
    citation: 'Cranmer & Saar (2011), ApJ 741, 54, eq. 36',
    input: 'teffK',
    valid: { min: 3300, max: 7000, note: 'Teff 3300–7000 K' },
  },
  wright2011: {
    id: 'wright2011',
    label: 'Wright et al. (2011)',
    citation: 'Wright et al. (2011), ApJ 743, 48, eq. 11',
    input: 'massSolar',
    // Mass range of the fit from memory, not checked.
    valid: { min: 0.09, max: 1.36, note: 'mass 0.09–1.36 M☉' },
  },
  wright2018: {
    id: 'wright2018',
    label: 'Wright et al. (2018)',
    citation: 'Wright et al. (2018), MNRAS 479, 2351, eq. 5',
    input: 'vKsMag',
    valid: { min: 1.1, max: 7.0, note: 'V−Ks 1.1–7.0' },
  },
};

/**
 * Noyes et al. (1984), ApJ 279, 763, eq. 4 (equation number from memory): with x = 1 − (B−V),
 * log10 τ = 1.362 − 0.166x + 0.025x² − 5.323x³ for x > 0, and 1.362 − 0.14x for x ≤ 0 (days).
 */
export function turnoverTimeNoyes1984(bvMag: number, field = 'bvMag'): number {
  const bv = requirePositive(bvMag, field);
  const x = 1 - bv;
  const logTau = x > 0 ? 1.362 - 0.166 * x + 0.025 * x * x - 5.323 * x * x * x : 1.362 - 0.14 * x;
  return 10 ** logTau;
}

/**
 * Cranmer & Saar (2011), ApJ 741, 54, eq. 36:
 * τ = 314.24·exp(−Teff/1952.5 − (Teff/6250)^18) + 0.002 days.
 */
export function turnoverTimeCranmerSaar2011(teffK: number, field = 'teffK'): number {
  const t = requirePositive(teffK, field);
  return 314.24 * Math.exp(-t / 1952.5 - (t / 6250) ** 18) + 0.002;
}

/** Wright et al. (2011), ApJ 743, 48, eq. 11: log10 τ = 1.16 − 1.49·log10 M − 0.54·(log10 M)² days. */
export function turnoverTimeWright2011(massSolar: number, field = 'massSolar'): number {
  const lm = Math.log10(requirePositive(massSolar, field));
  return 10 ** (1.16 - 1.49 * lm - 0.54 * lm * lm);
}

/** Wright et al. (2018), MNRAS 479, 2351, eq. 5: log10 τ = 0.64 + 0.25·(V−Ks) days. */
export function turnoverTimeWright2018(vKsMag: number, field = 'vKsMag'): number {
  const vk = requirePositive(vKsMag, field);
  return 10 ** (0.64 + 0.25 * vk);
}

/** τc on one scale, with the stellar quantity it used. */
export interface TurnoverTime {
  tauDays: number;
  scale: TurnoverScale;
  scaleLabel: string;
  source: string;
  /** The quantity the formula took and its value (e.g. B−V 0.65, or Teff 5772 K). */
  inputQuantity: TurnoverScaleInfo['input'];
  inputValue: number;
  /** How the input was obtained: the target's own colour, or the dwarf sequence. */
  inputOrigin: string;
  flags: ScienceFlag[];
}

/**
 * τc for a target colour on the chosen scale. Noyes takes (B−V)0 directly when the colour is
 * given in B−V; otherwise the quantity comes from the dwarf sequence (Pecaut & Mamajek 2013),
 * which then must contain the colour (ScienceInputError otherwise).
 */
export function turnoverTimeForColour(colour: ResolvedColour, scale: TurnoverScale, field = 'colour.value'): TurnoverTime {
  requireOneOf(scale, 'turnoverScale', TURNOVER_SCALES);
  const info = TURNOVER_SCALE_INFO[scale];
  const direct: Partial<Record<TurnoverScaleInfo['input'], ColourSystem>> = { bvMag: 'BV', vKsMag: 'VKs' };
  let value: number;
  let origin: string;
  if (direct[info.input] === colour.intrinsic.system) {
    value = colour.intrinsic.value;
    origin = `the target's intrinsic ${colourLabel(colour.intrinsic.system)}`;
  } else {
    const point = requireSequence(colour, field);
    value = point[info.input];
    origin = `${DWARF_SEQUENCE_SOURCE} at ${colourLabel(colour.intrinsic.system)} ${fmt(colour.intrinsic.value)}`;
  }
  const tauDays = turnoverTimeOf(scale, value);
  const flags: ScienceFlag[] = [];
  if (value < info.valid.min || value > info.valid.max) {
    flags.push(
      flag(
        'turnoverOutsideCalibration',
        'caution',
        `${info.label} τc is extrapolated: ${inputLabel(info.input)} ${fmt(value)} is outside ${info.valid.note}`,
        info.citation,
      ),
    );
  }
  return {
    tauDays,
    scale,
    scaleLabel: info.label,
    source: info.citation,
    inputQuantity: info.input,
    inputValue: value,
    inputOrigin: origin,
    flags,
  };
}

/** τc from the scale's own input quantity. */
export function turnoverTimeOf(scale: TurnoverScale, value: number): number {
  switch (scale) {
    case 'noyes1984':
      return turnoverTimeNoyes1984(value);
    case 'cranmerSaar2011':
      return turnoverTimeCranmerSaar2011(value);
    case 'wright2011':
      return turnoverTimeWright2011(value);
    case 'wright2018':
      return turnoverTimeWright2018(value);
  }
}

/** A Rossby number and the τ scale it is on. */
export interface RossbyNumber extends TurnoverTime {
  rossby: number;
  periodDays: number;
}

/** Ro = P/τc (Noyes et al. 1984 definition), on the chosen τ scale. */
export function rossbyNumber(
  input: { periodDays: number; colour: { value: number; system: ColourSystem }; reddeningEbvMag?: number },
  scale: TurnoverScale = 'noyes1984',
): RossbyNumber {
  const periodDays = requirePositive(input.periodDays, 'periodDays');
  const tau = turnoverTimeForColour(resolveColour(input.colour, input.reddeningEbvMag), scale);
  return { ...tau, rossby: periodDays / tau.tauDays, periodDays };
}

function inputLabel(q: TurnoverScaleInfo['input']): string {
  return { bvMag: 'B−V', teffK: 'Teff', massSolar: 'mass', vKsMag: 'V−Ks' }[q];
}

/**
 * The Sun's inputs to each τ scale: B−V 0.65 and V−Ks 1.56 (the G2V row of the dwarf sequence,
 * Pecaut & Mamajek (2013), ApJS 208, 9, Table 5: 0.650 and 1.564, the latter rounded), Teff
 * 5772 K (nominal solar value, Prša et al. (2016), AJ 152, 41 — from memory), mass 1 M☉.
 */
export const SOLAR_TURNOVER_INPUTS: Readonly<Record<TurnoverScaleInfo['input'], number>> = {
  bvMag: 0.65,
  teffK: 5772,
  massSolar: 1,
  vKsMag: 1.56,
};

/**
 * Solar rotation period used for the solar Rossby number, days: 26.09 d, Barnes (2007)'s solar
 * calibration (ApJ 669, 1167; SCIENCE.md §8 #1), the same value that gives the amplitude
 * model's solar anchor Ro ≈ 2.18 on the Noyes scale (SCIENCE.md §3). The sidereal equatorial
 * period 25.4 d would lower every Ro☉ by 2.6 %; ratios Ro/Ro☉ do not depend on this choice.
 */
export const SOLAR_ROTATION_PERIOD_DAYS = 26.09;

/** τc of the Sun on one scale, days (the scale's formula at {@link SOLAR_TURNOVER_INPUTS}). */
export function solarTurnoverTime(scale: TurnoverScale): number {
  requireOneOf(scale, 'turnoverScale', TURNOVER_SCALES);
  return turnoverTimeOf(scale, SOLAR_TURNOVER_INPUTS[TURNOVER_SCALE_INFO[scale].input]);
}

/**
 * The Sun's Rossby number on one τ scale, Ro☉ = 26.09 d / τ☉ [derived]: ≈ 2.18 (Noyes 1984),
 * 2.03 (Cranmer & Saar 2011), 1.81 (Wright et al. 2011), 2.43 (Wright et al. 2018). Rossby
 * numbers on different scales are comparable only as Ro/Ro☉ on the same scale.
 */
export function solarRossby(scale: TurnoverScale): number {
  return SOLAR_ROTATION_PERIOD_DAYS / solarTurnoverTime(scale);
}

/**
 * Effective temperature below which a dwarf is treated as an M dwarf, K: 3900 K, between the
 * K7V (4090 K) and M0V (3850 K) rows of the dwarf sequence (the K/M boundary; common practice,
 * no source).
 */
export const M_DWARF_TEFF_K = 3900;

/**
 * The τ scale best calibrated for a target: Wright et al. (2018), calibrated on V−Ks 1.1–7.0,
 * for M dwarfs (Teff < 3900 K on the dwarf sequence: (B−V)0 ≥ 1.40, (BP−RP)0 ≥ 1.81,
 * (V−Ks)0 ≥ 3.59); Noyes et al. (1984), calibrated on F–K stars, otherwise. Colours redder
 * than the sequence's last row count as M dwarfs, bluer than its first row as not.
 */
export function defaultTurnoverScaleFor(colour: ResolvedColour): { scale: TurnoverScale; why: string } {
  const system = colour?.intrinsic?.system;
  if (system !== 'BV' && system !== 'BPRP' && system !== 'VKs') {
    throw new ScienceInputError('colour.system', `must be one of BV, BPRP, VKs (got ${String(system)})`);
  }
  const threshold = sequenceValue(dwarfSequenceAt('teffK', M_DWARF_TEFF_K), system);
  const value = requireFinite(colour.intrinsic.value, 'colour.value');
  const label = `${colourLabel(system)} ${fmt(value)}`;
  if (value >= threshold) {
    return {
      scale: 'wright2018',
      why: `${label} is an M dwarf (Teff < ${M_DWARF_TEFF_K} K on the dwarf sequence): Noyes et al. (1984) τ is calibrated on F–K stars; M dwarfs use Wright et al. (2018), calibrated to V−Ks 7.0`,
    };
  }
  return {
    scale: 'noyes1984',
    why: `${label} is an F–K dwarf (Teff ≥ ${M_DWARF_TEFF_K} K on the dwarf sequence): Noyes et al. (1984) τ, calibrated on F–K stars, the default for B−V inputs`,
  };
}
