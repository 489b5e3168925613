/**
 * Gyrochronology: rotation period from colour and age (forward) and age from period and
 * colour (inverse), for four published relations, with an uncertainty range, calibration
 * flags and the weakened-braking caution.
 *
 * Uncertainty method (deterministic, no sampling): one-at-a-time propagation in ln P. Each
 * uncertain input (the age, and every coefficient with a quoted uncertainty) is moved by its
 * +1σ and −1σ (asymmetric where the paper quotes asymmetric errors) with the others held at
 * their central values, and the relation is evaluated exactly there. The increases of ln P
 * are added in quadrature into the upper 1σ, the decreases into the lower 1σ; a range of k σ
 * is P·exp(−k·σ₋) … P·exp(+k·σ₊). This is first-order propagation that keeps each term's
 * non-linearity and asymmetry, and ignores correlations between coefficients, which the
 * papers do not publish (Spincycle's choice, no source). Every range also carries the
 * relation's intrinsic scatter ({@link INTRINSIC_SCATTER}) as one more term, so no range has
 * zero width.
 *
 * "No number where the relation has none": outside a relation's calibrated colours, above the
 * Kraft break, where B−V no longer tracks mass, for periods below the slow-rotator sequence and
 * for ages above the age of the universe, the result carries `noResult` and a blocking flag;
 * its numbers are still computed but must not be shown. Ages outside the calibrated ages
 * (below the age of the universe) and stars that may not have converged stay cautions.
 */
import {
  type ResolvedColour,
  type TargetColourSystem,
  TARGET_COLOUR_SYSTEMS,
  colourLabel,
  convertColour,
  dwarfSequenceAt,
  DWARF_SEQUENCE,
  resolveColour,
  sequenceValue,
  DWARF_SEQUENCE_SOURCE,
} from './colour-sequence';
import { type ScienceFlag, flag, fmt } from './explained';
import { ScienceInputError, requireFinite, requireNonNegative, requireOneOf, requirePositive } from './science-input-error';
import { type RossbyNumber, type TurnoverScale, TURNOVER_SCALES, solarRossby, turnoverTimeForColour } from './turnover-time';

export const GYRO_RELATIONS = ['barnes2007', 'mamajekHillenbrand2008', 'angus2015', 'angus2019'] as const;
export type GyroRelationId = (typeof GYRO_RELATIONS)[number];

/** A coefficient with its quoted +/− 1σ uncertainties (0 when the paper fixes it). */
export interface Coefficient {
  value: number;
  plus: number;
  minus: number;
}

const coef = (value: number, plus = 0, minus = plus): Coefficient => ({ value, plus, minus });

/** Barnes-type relation `P = a·((B−V)0 − c)^b·(t/Myr)^n`. */
export interface BarnesFormCoefficients {
  a: Coefficient;
  b: Coefficient;
  c: Coefficient;
  n: Coefficient;
}

/** What the interface shows about a relation. */
export interface GyroRelationInfo {
  id: GyroRelationId;
  label: string;
  citation: string;
  formula: string;
  /** The colour the relation takes (intrinsic). */
  colourSystem: TargetColourSystem;
  /** Calibrated colour range, in `colourSystem`. */
  calibratedColour: { min: number; max: number; note: string };
  /** Calibrated age range, Myr. */
  calibratedAgeMyr: { min: number; max: number; note: string };
}

/** Coefficients of the three Barnes-type relations, SCIENCE.md §1 [paper]. */
export const BARNES_FORM_COEFFICIENTS: Readonly<Record<'barnes2007' | 'mamajekHillenbrand2008' | 'angus2015', BarnesFormCoefficients>> = {
  // Barnes (2007), ApJ 669, 1167, eqs. 1–3.
  barnes2007: { a: coef(0.7725, 0.011), b: coef(0.601, 0.024), c: coef(0.4), n: coef(0.5189, 0.007) },
  // Mamajek & Hillenbrand (2008), ApJ 687, 1264, eqs. 12–14.
  mamajekHillenbrand2008: { a: coef(0.407, 0.021), b: coef(0.325, 0.024), c: coef(0.495, 0.01), n: coef(0.566, 0.008) },
  // Angus et al. (2015), MNRAS 450, 1787, eq. 15 (asymmetric uncertainties).
  angus2015: { a: coef(0.4, 0.3, 0.05), b: coef(0.31, 0.05, 0.02), c: coef(0.45), n: coef(0.55, 0.02, 0.09) },
};

/**
 * Angus et al. (2019), AJ 158, 173, full-precision coefficients of their Table (SCIENCE.md §1):
 * log10 P = cA·log10(t/yr) + Σk ck·x^k, x = log10(BP−RP), for 0.56 < BP−RP < 2.7;
 * log10 P = cA·log10(t/yr) + b1·x + b0 for BP−RP ≥ 2.7.
 */
export const ANGUS_2019 = {
  cA: coef(0.6470950862322454, 0.05),
  c: [-4.716819674578521, 0.7161114835620975, -4.919056437046026, 28.709418579540294, -38.957586198640314],
  b1: -13.558898318835137,
  b0: 0.9359250478865809,
  /** Colour where the linear M-dwarf branch takes over. */
  linearBranchFromBpRp: 2.7,
} as const;

/**
 * Pivot of the Angus (2019) age exponent: log10 of the solar age in years (4.57 Gyr). The
 * paper's polynomial coefficients (c0 ± 0.5 …) are strongly correlated with cA and with each
 * other; without their covariance they cannot be sampled independently (c0's ±0.5 dex alone
 * would give a factor-3 range at every colour). Spincycle keeps the polynomial fixed and
 * moves cA by ±0.05 about this pivot, so the solar calibration stays fixed (Spincycle's
 * choice, no source).
 */
export const ANGUS_2019_PIVOT_LOG10_AGE_YR = Math.log10(4.57e9);

export const GYRO_RELATION_INFO: Readonly<Record<GyroRelationId, GyroRelationInfo>> = {
  barnes2007: {
    id: 'barnes2007',
    label: 'Barnes (2007)',
    citation: 'Barnes (2007), ApJ 669, 1167, eqs. 1–3',
    formula: 'P = a·((B−V)0 − c)^b·(t/Myr)^n',
    colourSystem: 'BV',
    // Colour and age limits from memory: the abstract says late F to early M stars (docs/science.md "Checked values").
    calibratedColour: { min: 0.4, max: 1.6, note: '(B−V)0 0.4–1.6' },
    calibratedAgeMyr: { min: 100, max: 10000, note: '0.1–10 Gyr: stars on the I sequence' },
  },
  mamajekHillenbrand2008: {
    id: 'mamajekHillenbrand2008',
    label: 'Mamajek & Hillenbrand (2008)',
    citation: 'Mamajek & Hillenbrand (2008), ApJ 687, 1264, eqs. 12–14',
    formula: 'P = a·((B−V)0 − c)^b·(t/Myr)^n',
    colourSystem: 'BV',
    calibratedColour: { min: 0.5, max: 0.9, note: '0.5 < (B−V)0 < 0.9' },
    // Age limits from memory.
    calibratedAgeMyr: { min: 100, max: 10000, note: '0.1–10 Gyr' },
  },
  angus2015: {
    id: 'angus2015',
    label: 'Angus et al. (2015)',
    citation: 'Angus et al. (2015), MNRAS 450, 1787, eq. 15',
    formula: 'P = a·((B−V)0 − c)^b·(t/Myr)^n',
    colourSystem: 'BV',
    calibratedColour: {
      min: 0.45,
      max: 1.4,
      // Derived here from the dwarf sequence and the relation's offset c.
      note: 'F–K dwarfs: (B−V)0 0.45–1.40, the F5V–K7V span of the dwarf sequence above the relation offset c = 0.45',
    },
    // Age limits from memory.
    calibratedAgeMyr: { min: 100, max: 10000, note: '0.1–10 Gyr' },
  },
  angus2019: {
    id: 'angus2019',
    label: 'Angus et al. (2019)',
    citation: 'Angus et al. (2019), AJ 158, 173',
    formula: 'log10 P = cA·log10(t/yr) + Σ ck·log10(BP−RP)^k',
    colourSystem: 'BPRP',
    calibratedColour: { min: 0.56, max: 2.7, note: '0.56 < (BP−RP)0 < 2.7; the M-dwarf linear branch from 2.7 rests on few stars' },
    calibratedAgeMyr: { min: 250, max: 10000, note: 'scatter is large below 250 Myr' },
  },
};

/**
 * Colours any relation (or the dwarf sequence that converts between systems) can use;
 * outside these a colour is outside all relations and is rejected.
 * B−V: above Barnes's offset c = 0.40, up to the sequence's reddest row (M5V, 1.83).
 * BP−RP: from Angus (2019)'s blue limit 0.56 to the sequence's reddest row (3.35).
 */
export const SUPPORTED_COLOUR_DOMAIN: Readonly<Record<TargetColourSystem, { min: number; max: number; minExclusive: boolean }>> = {
  BV: { min: 0.4, max: 1.83, minExclusive: true },
  BPRP: { min: 0.56, max: 3.35, minExclusive: false },
};

/** The Rossby number reported with a gyrochronology result (its τ flags are in the result's flags). */
export type GyroRossby = Omit<RossbyNumber, 'flags'>;

const VAN_SADERS = 'van Saders et al. (2016), Nature 529, 181';

/**
 * Critical Rossby number of weakened magnetic braking as a multiple of the solar Rossby number
 * on the same τ scale: van Saders et al. (2016), Nature 529, 181 find Ro_crit ≈ 2.16 on their
 * scale, on which the Sun has Ro ≈ 2.16, i.e. Ro_crit ≈ Ro☉ (the abstract confirms the Sun is
 * close to the critical transition; the value 2.16 is from memory). Stating it as a
 * multiple of Ro☉ makes the threshold mean the same on every τ scale.
 */
export const WEAKENED_BRAKING_SOLAR_MULTIPLE = 1;

/**
 * Default critical Rossby number of the weakened-braking caution on one τ scale:
 * {@link WEAKENED_BRAKING_SOLAR_MULTIPLE}·Ro☉(scale), Ro☉ = 26.09 d / τ☉ (see
 * `solarRossby`): ≈ 2.18 on the Noyes (1984) scale, 2.03 Cranmer & Saar (2011), 1.80
 * Wright et al. (2011), 2.43 Wright et al. (2018) [derived].
 */
export function weakenedBrakingRossby(scale: TurnoverScale): number {
  return WEAKENED_BRAKING_SOLAR_MULTIPLE * solarRossby(requireOneOf(scale, 'turnoverScale', TURNOVER_SCALES));
}

/**
 * Age of the universe, Myr: 13.787 Gyr, Planck Collaboration (2020), A&A 641, A6 (reference
 * checked; the value is from memory: it is not in the abstract).
 * No star is older: a relation that needs a larger age has no answer.
 */
export const AGE_OF_UNIVERSE_MYR = 13787;
const AGE_OF_UNIVERSE_SOURCE = 'Planck Collaboration (2020), A&A 641, A6';

/**
 * The Kraft break, K: stars hotter than ≈ 6200 K have thin convective envelopes and do not spin
 * down as the relations assume (Kraft (1967), ApJ 150, 551 — from memory). Teff comes from the
 * dwarf sequence: (B−V)0 0.525, (BP−RP)0 0.688 at 6200 K.
 */
export const KRAFT_BREAK_TEFF_K = 6200;
// From memory: not checked (docs/science.md "Checked values").
const KRAFT_SOURCE = 'Kraft (1967), ApJ 150, 551';

/**
 * (B−V)0 at and above which B−V no longer tracks mass, so a B−V relation cannot place the star:
 * 1.42, the M0V row of the dwarf sequence (SCIENCE.md §4). From M0V to M3V, B−V rises by 0.11
 * mag (1.42 → 1.53) while the mass falls from 0.585 to 0.36 M☉ (BP−RP 1.84 → 2.50), against
 * 0.19 mag for 0.06 M☉ from K5V to K7V: a 0.02-mag colour error spans ≈ 0.04 M☉ there, and
 * B−V relations are not calibrated on M dwarfs. The lower end of the brief's 1.4–1.5 window
 * is taken because the flattening starts at M0V [derived from the table].
 */
export const BV_MASS_TRACKING_LIMIT = 1.42;

/**
 * A measured period is below the slow-rotator sequence (fast rotator: still on the
 * saturated / C sequence of Barnes (2003), ApJ 586, 464, or a tidally locked binary) when its
 * Rossby number, expressed on the Noyes (1984) scale through Ro/Ro☉, is at or below 0.1 —
 * saturation of activity at Ro ≈ 0.1, Wright et al. (2011), ApJ 743, 48 (from memory; 0.13 on
 * their τ scale), the same value the amplitude model saturates at. Chosen rather than "shorter
 * than the relation's period at its youngest calibrated age" because that criterion would
 * turn every young but converged star into no result, whereas ages below the calibration are
 * only a caution (Spincycle's choice).
 */
export const FAST_ROTATOR_NOYES_ROSSBY = 0.1;
// Ro ≈ 0.1 from memory (0.13 on Wright's own τ scale; not checked).
const FAST_ROTATOR_SOURCE = 'Wright et al. (2011), ApJ 743, 48 (saturation at Ro ≈ 0.1); Barnes (2003), ApJ 586, 464';

/**
 * Convergence onto the slow sequence, for K and M dwarfs (Teff < 5300 K, K0V): age (Myr) below
 * which a star may still be a fast or intermediate rotator, interpolated linearly in log age
 * against Teff between these anchors and held at the coolest one. Spincycle's rule built on
 * published results: the slow (I) sequence reaches later spectral types as clusters age — G
 * and early K dwarfs by ≈ 100–150 Myr, mid-K by ≈ 300 Myr, late K by ≈ 600 Myr (Barnes (2003),
 * ApJ 586, 464; from memory, not re-read) — and the spin-down of K dwarfs stalls, longer for
 * lower masses (0.55 M☉ stars for at least 1.3 Gyr: Curtis et al. (2020), ApJ 904, 140, abstract
 * checked, docs/science.md "Checked values"), so late K dwarfs follow the relations only from
 * ≈ 1 Gyr; early M dwarfs take ≈ 2 Gyr. G dwarfs converge before every
 * relation's youngest calibrated age, which has its own caution.
 */
export const CONVERGENCE_AGE_ANCHORS: readonly { teffK: number; ageMyr: number }[] = [
  { teffK: 5300, ageMyr: 150 },
  { teffK: 4870, ageMyr: 300 },
  { teffK: 4090, ageMyr: 1000 },
  { teffK: 3430, ageMyr: 2000 },
];
// Barnes (2003) from memory, not re-read; the interpolation between the anchors is this
// product's rule (formerly "Spincycle's rule").
const CONVERGENCE_SOURCE =
  'Barnes (2003), ApJ 586, 464; Curtis et al. (2020), ApJ 904, 140; the interpolation between them is an assumption of this product (see Methods: Expected period from colour and age (gyrochronology))';

/** Convergence age (Myr) at an effective temperature, or null above 5300 K (see {@link CONVERGENCE_AGE_ANCHORS}). */
export function convergenceAgeMyr(teffK: number): number | null {
  const t = requirePositive(teffK, 'teffK');
  const a = CONVERGENCE_AGE_ANCHORS;
  if (t >= a[0].teffK) return null;
  for (let i = 0; i < a.length - 1; i++) {
    if (t >= a[i + 1].teffK) {
      const f = (a[i].teffK - t) / (a[i].teffK - a[i + 1].teffK);
      return 10 ** (Math.log10(a[i].ageMyr) + f * (Math.log10(a[i + 1].ageMyr) - Math.log10(a[i].ageMyr)));
    }
  }
  return a[a.length - 1].ageMyr;
}

/**
 * Intrinsic scatter of each relation, 1σ in ln P at fixed colour and age, added in quadrature
 * to every period range (and, divided by the age exponent, to every age range). No range has
 * zero width.
 */
export const INTRINSIC_SCATTER: Readonly<Record<GyroRelationId, { lnPeriod: number; source: string }>> = {
  // Spread of the I sequence about the relation at fixed colour, a few per cent in period;
  // Barnes (2007), ApJ 669, 1167 (from memory: value not re-read; 5 % adopted).
  barnes2007: { lnPeriod: 0.05, source: 'Barnes (2007), ApJ 669, 1167: a few per cent width of the I sequence; 5 % adopted' },
  // Mamajek & Hillenbrand (2008), ApJ 687, 1264: ≈ 0.05 dex in age for well-measured solar-type
  // stars (from memory, SCIENCE.md §1) → ln P scatter n·0.05·ln 10 = 0.566 × 0.1151 = 0.0652 [derived].
  mamajekHillenbrand2008: {
    lnPeriod: 0.566 * 0.05 * Math.LN10,
    source: 'Mamajek & Hillenbrand (2008), ApJ 687, 1264: ≈ 0.05 dex in age, × n = 0.566 in ln P',
  },
  // Angus et al. (2015), MNRAS 450, 1787 find that no single relation fits all their subsets and
  // give no single scatter value (from memory); 10 % in period adopted (Spincycle's choice).
  angus2015: {
    lnPeriod: 0.1,
    source:
      'Angus et al. (2015), MNRAS 450, 1787 give no single scatter; 10 % adopted, an assumption of this product (see Methods: The plausible period range)',
  },
  // Angus et al. (2019), AJ 158, 173: their variance model is zero for FGK dwarfs in the
  // calibrated range (read in the authors' code accompanying the paper); 5 % in period adopted for
  // the width of the slow sequence at fixed colour (from memory).
  angus2019: {
    lnPeriod: 0.05,
    source: 'Angus et al. (2019), AJ 158, 173: variance model zero for FGK dwarfs; 5 % adopted for the width of the slow sequence',
  },
};

/** Why a relation gives no number: `code` names the cause, `reason` says it in plain language with the number that triggered it. */
export interface NoResult {
  code: string;
  reason: string;
}

/** Forward relation for one colour (in the relation's own system, intrinsic) and age. */
export function periodFromAge(relation: GyroRelationId, relationColour: number, ageMyr: number): number {
  requireOneOf(relation, 'relation', GYRO_RELATIONS);
  const t = requirePositive(ageMyr, 'ageMyr');
  const x = requireFinite(relationColour, 'colour.value');
  const lnP = relation === 'angus2019' ? lnPeriodAngus2019(ANGUS_2019.cA.value, x, t) : lnPeriodBarnesForm(central(relation), x, t);
  if (!Number.isFinite(lnP)) throw outsideFormula(relation, x);
  return Math.exp(lnP);
}

/** Inverse relation: age in Myr for one colour (relation's system, intrinsic) and period. */
export function ageFromPeriod(relation: GyroRelationId, relationColour: number, periodDays: number): number {
  requireOneOf(relation, 'relation', GYRO_RELATIONS);
  const p = requirePositive(periodDays, 'periodDays');
  const x = requireFinite(relationColour, 'colour.value');
  const lnT = relation === 'angus2019' ? lnAgeAngus2019(ANGUS_2019.cA.value, x, p) : lnAgeBarnesForm(central(relation), x, p);
  if (!Number.isFinite(lnT)) throw outsideFormula(relation, x);
  return Math.exp(lnT);
}

interface Numbers {
  a: number;
  b: number;
  c: number;
  n: number;
}

function central(relation: Exclude<GyroRelationId, 'angus2019'>): Numbers {
  const k = BARNES_FORM_COEFFICIENTS[relation];
  return { a: k.a.value, b: k.b.value, c: k.c.value, n: k.n.value };
}

/** ln P of the Barnes form; NaN when x ≤ c (the formula is undefined there). */
function lnPeriodBarnesForm(k: Numbers, x: number, tMyr: number): number {
  const d = x - k.c;
  if (!(d > 0)) return NaN;
  return Math.log(k.a) + k.b * Math.log(d) + k.n * Math.log(tMyr);
}

/** ln t (Myr) of the inverted Barnes form, t = (P / (a·(x−c)^b))^(1/n). */
function lnAgeBarnesForm(k: Numbers, x: number, periodDays: number): number {
  const d = x - k.c;
  if (!(d > 0)) return NaN;
  return (Math.log(periodDays) - Math.log(k.a) - k.b * Math.log(d)) / k.n;
}

/** The colour part of Angus (2019): polynomial, or the linear branch for BP−RP ≥ 2.7. */
function angus2019ColourTerm(bpRp: number): number {
  const x = Math.log10(bpRp);
  if (bpRp >= ANGUS_2019.linearBranchFromBpRp) return ANGUS_2019.b1 * x + ANGUS_2019.b0;
  const c = ANGUS_2019.c;
  return c[0] + x * (c[1] + x * (c[2] + x * (c[3] + x * c[4])));
}

/**
 * ln P of Angus (2019) with age exponent cA applied about the solar-age pivot:
 * log10 P = cA·(L − Ls) + cA0·Ls + colour term; with cA = cA0 this is the paper's formula.
 */
function lnPeriodAngus2019(cA: number, bpRp: number, tMyr: number): number {
  if (!(bpRp > 0)) return NaN;
  const L = Math.log10(tMyr * 1e6);
  const Ls = ANGUS_2019_PIVOT_LOG10_AGE_YR;
  return (cA * (L - Ls) + ANGUS_2019.cA.value * Ls + angus2019ColourTerm(bpRp)) * Math.LN10;
}

/** ln t (Myr) of the inverted Angus (2019) relation (same pivot as the forward one). */
function lnAgeAngus2019(cA: number, bpRp: number, periodDays: number): number {
  if (!(bpRp > 0)) return NaN;
  const Ls = ANGUS_2019_PIVOT_LOG10_AGE_YR;
  const L = Ls + (Math.log10(periodDays) - ANGUS_2019.cA.value * Ls - angus2019ColourTerm(bpRp)) / cA;
  return (L - 6) * Math.LN10;
}

function outsideFormula(relation: GyroRelationId, x: number): ScienceInputError {
  const info = GYRO_RELATION_INFO[relation];
  if (relation === 'angus2019') {
    return new ScienceInputError('colour.value', `(BP−RP)0 ${fmt(x)} cannot enter ${info.label} (needs a positive colour)`);
  }
  const c = BARNES_FORM_COEFFICIENTS[relation].c.value;
  return new ScienceInputError(
    'colour.value',
    `(B−V)0 ${fmt(x)} is at or below the offset c = ${c} of ${info.label}: the relation cannot be evaluated; choose another relation`,
  );
}

/** One uncertain input's effect on the result, in natural-log units (1σ). */
export interface UncertaintyContribution {
  /** `ageMyr`, `periodDays`, or the coefficient name (`a`, `b`, `c`, `n`, `cA`). */
  parameter: string;
  /** Decrease of ln(result) at this input's 1σ (≥ 0). */
  lowerLn: number;
  /** Increase of ln(result) at this input's 1σ (≥ 0). */
  upperLn: number;
}

/** The relation's colour (intrinsic, in its own system) and where it came from. */
export interface RelationColour {
  value: number;
  system: TargetColourSystem;
  origin: string;
}

export interface PeriodPredictionInput {
  relation: GyroRelationId;
  /** Observed colour (before de-reddening). */
  colour: { value: number; system: TargetColourSystem };
  reddeningEbvMag?: number;
  ageMyr: number;
  /** 1σ age uncertainty, Myr (0 or absent: the range reflects the coefficients only). */
  ageUncertaintyMyr?: number;
  /** Width of the reported range in σ (default 1). */
  rangeSigma?: number;
  /** τ scale of the Rossby number used for the weakened-braking caution (default Noyes 1984). */
  turnoverScale?: TurnoverScale;
  /**
   * Critical Rossby number for the caution, on `turnoverScale` (default: the solar Rossby number
   * on that scale, see {@link weakenedBrakingRossby}).
   */
  weakenedBrakingRossby?: number;
}

export interface PeriodPrediction {
  relation: GyroRelationId;
  relationLabel: string;
  source: string;
  /** Central period, days. Computed always, but not to be shown when `noResult` is set. */
  periodDays: number;
  /** P·exp(−k·σ₋) … P·exp(+k·σ₊) with k = `sigma`; includes the relation's intrinsic scatter. */
  rangeDays: { low: number; high: number; sigma: number };
  /** 1σ of ln P below and above. */
  lnPeriodSigma: { lower: number; upper: number };
  contributions: UncertaintyContribution[];
  method: string;
  ageMyr: number;
  ageUncertaintyMyr: number;
  colour: ResolvedColour;
  relationColour: RelationColour;
  /** Ro of the central period; null when the colour is outside the dwarf sequence needed for τ. */
  rossby: GyroRossby | null;
  /**
   * Set when the relation has no period for this star (colour outside its calibration, above
   * the Kraft break, B−V no longer tracking mass, age above the age of the universe): callers
   * must show no number then. A blocking `noExpectedPeriod` flag says the same.
   */
  noResult: NoResult | null;
  flags: ScienceFlag[];
}

// This product's method, no published source (the `choice` tag of SCIENCE.md).
export const PROPAGATION_METHOD =
  'one-at-a-time first-order propagation in the logarithm of the result: each uncertain input moved by its ±1σ, the relation evaluated exactly there, increases and decreases added in quadrature (an assumption of this product; see Methods: The plausible period range)';

/** Period from colour and age by the chosen relation, with its range and flags. */
export function predictPeriod(input: PeriodPredictionInput): PeriodPrediction {
  const relation = requireOneOf(input?.relation, 'relation', GYRO_RELATIONS);
  const info = GYRO_RELATION_INFO[relation];
  const ageMyr = requirePositive(input.ageMyr, 'ageMyr');
  const ageSigma = input.ageUncertaintyMyr === undefined ? 0 : requireNonNegative(input.ageUncertaintyMyr, 'ageUncertaintyMyr');
  const k = input.rangeSigma === undefined ? 1 : requirePositive(input.rangeSigma, 'rangeSigma');
  const scale = requireOneOf(input.turnoverScale ?? 'noyes1984', 'turnoverScale', TURNOVER_SCALES);
  const roCrit = criticalRossby(input.weakenedBrakingRossby, scale);

  const { colour, relationColour, flags } = colourForRelation(relation, input.colour, input.reddeningEbvMag);
  const x = relationColour.value;
  const evaluate = (over: Partial<Numbers & { cA: number; t: number }>): number =>
    relation === 'angus2019'
      ? lnPeriodAngus2019(over.cA ?? ANGUS_2019.cA.value, x, over.t ?? ageMyr)
      : lnPeriodBarnesForm({ ...central(relation), ...over }, x, over.t ?? ageMyr);
  const lnP0 = evaluate({});
  if (!Number.isFinite(lnP0)) throw outsideFormula(relation, x);

  const contributions: UncertaintyContribution[] = [];
  if (ageSigma > 0) {
    let low = ageMyr - ageSigma;
    if (low < 0.1 * ageMyr) {
      low = 0.1 * ageMyr;
      flags.push(
        flag(
          'ageUncertaintyTruncated',
          'info',
          `the age's −1σ (${fmt(ageMyr - ageSigma)} Myr) is cut at 10 % of the age for the period range`,
          'an assumption of this product (see Methods: The plausible period range)',
        ),
      );
    }
    contributions.push(contribution('ageMyr', lnP0, evaluate({ t: ageMyr + ageSigma }), evaluate({ t: low })));
  }
  contributions.push(...coefficientContributions(relation, x, lnP0, evaluate, flags));
  contributions.push(scatterContribution(relation, 1));

  const lower = quadrature(contributions.map((c) => c.lowerLn));
  const upper = quadrature(contributions.map((c) => c.upperLn));
  const periodDays = Math.exp(lnP0);

  const causes = colourNoResults(relation, x, colour);
  if (ageMyr > AGE_OF_UNIVERSE_MYR) causes.push(ageBeyondUniverse(`the given age ${fmt(ageMyr, 4)} Myr`));
  flags.push(...calibrationFlags(relation, x, ageMyr, colour));
  const rossby = rossbyWithFlags(
    colour,
    scale,
    periodDays,
    roCrit,
    flags,
    'magnetic braking weakens there, so the period may be shorter than predicted',
  );
  const noResult = noResultWithFlags(causes, 'noExpectedPeriod', 'no expected period', flags);

  return {
    relation,
    relationLabel: info.label,
    source: info.citation,
    periodDays,
    rangeDays: { low: periodDays * Math.exp(-k * lower), high: periodDays * Math.exp(k * upper), sigma: k },
    lnPeriodSigma: { lower, upper },
    contributions,
    method: PROPAGATION_METHOD,
    ageMyr,
    ageUncertaintyMyr: ageSigma,
    colour,
    relationColour,
    rossby,
    noResult,
    flags,
  };
}

export interface AgeEstimateInput {
  relation: GyroRelationId;
  colour: { value: number; system: TargetColourSystem };
  reddeningEbvMag?: number;
  periodDays: number;
  /** 1σ uncertainty of the measured period, days (not used by Barnes 2007, whose eq. 16 is used instead). */
  periodUncertaintyDays?: number;
  /** Width of the reported range in σ (default 1). */
  rangeSigma?: number;
  turnoverScale?: TurnoverScale;
  weakenedBrakingRossby?: number;
}

export interface AgeEstimate {
  relation: GyroRelationId;
  relationLabel: string;
  source: string;
  /** Central age, Myr. Computed always, but not to be shown when `noResult` is set. */
  ageMyr: number;
  /** t·exp(−k·σ₋) … t·exp(+k·σ₊); includes the relation's intrinsic scatter. */
  rangeMyr: { low: number; high: number; sigma: number };
  /**
   * 1σ fractional uncertainty (mean of the two sides for asymmetric ranges). For Barnes (2007)
   * this is his eq. 16 alone, as published; the range adds the intrinsic scatter on top.
   */
  fractionalUncertainty: number;
  uncertaintySource: string;
  contributions: UncertaintyContribution[];
  periodDays: number;
  colour: ResolvedColour;
  relationColour: RelationColour;
  rossby: GyroRossby | null;
  /**
   * Set when the relation has no age for this star (colour outside its calibration, above the
   * Kraft break, B−V no longer tracking mass, a period below the slow sequence, or an age above
   * the age of the universe): callers must show no number then. A blocking `noGyroAge` flag
   * says the same.
   */
  noResult: NoResult | null;
  flags: ScienceFlag[];
}

/**
 * Age from period and colour. Barnes (2007) uses his eq. 16 for the uncertainty
 * (δt/t = 0.02·sqrt(3 + ½(ln t)² + 2·P^0.6 + (0.6/x)² + (2.4·ln x)²), x = (B−V)0 − 0.4);
 * the others propagate their coefficients and the period uncertainty one at a time in ln t.
 */
export function estimateAge(input: AgeEstimateInput): AgeEstimate {
  const relation = requireOneOf(input?.relation, 'relation', GYRO_RELATIONS);
  const info = GYRO_RELATION_INFO[relation];
  const periodDays = requirePositive(input.periodDays, 'periodDays');
  const pSigma = input.periodUncertaintyDays === undefined ? 0 : requireNonNegative(input.periodUncertaintyDays, 'periodUncertaintyDays');
  const k = input.rangeSigma === undefined ? 1 : requirePositive(input.rangeSigma, 'rangeSigma');
  const scale = requireOneOf(input.turnoverScale ?? 'noyes1984', 'turnoverScale', TURNOVER_SCALES);
  const roCrit = criticalRossby(input.weakenedBrakingRossby, scale);

  const { colour, relationColour, flags } = colourForRelation(relation, input.colour, input.reddeningEbvMag);
  const x = relationColour.value;
  const evaluate = (over: Partial<Numbers & { cA: number; p: number }>): number =>
    relation === 'angus2019'
      ? lnAgeAngus2019(over.cA ?? ANGUS_2019.cA.value, x, over.p ?? periodDays)
      : lnAgeBarnesForm({ ...central(relation), ...over }, x, over.p ?? periodDays);
  const lnT0 = evaluate({});
  if (!Number.isFinite(lnT0)) throw outsideFormula(relation, x);
  const ageMyr = Math.exp(lnT0);

  if (relation === 'barnes2007') {
    const rel = barnesAgeUncertainty(ageMyr, periodDays, x);
    const source = 'Barnes (2007), ApJ 669, 1167, eq. 16';
    if (pSigma > 0) {
      flags.push(
        flag(
          'periodUncertaintyNotUsed',
          'info',
          'Barnes (2007) eq. 16 already contains a period term; the given period uncertainty is not added',
          source,
        ),
      );
    }
    // Eq. 16's symmetric δt/t as ln-age terms (t·(1 ± δt/t) at 1σ), plus the intrinsic scatter
    // in quadrature: the range only; `fractionalUncertainty` stays eq. 16 as published.
    const contributions = [
      { parameter: 'eq. 16', lowerLn: -Math.log(Math.max(1 - rel, 1e-3)), upperLn: Math.log(1 + rel) },
      scatterContribution(relation, BARNES_FORM_COEFFICIENTS.barnes2007.n.value),
    ];
    const range = lnRange(ageMyr, contributions, k);
    return finishAge(
      relation,
      info,
      ageMyr,
      range,
      rel,
      `${source}; range adds the intrinsic scatter (${INTRINSIC_SCATTER.barnes2007.source})`,
      contributions,
      periodDays,
      colour,
      relationColour,
      flags,
      scale,
      roCrit,
    );
  }
  const contributions: UncertaintyContribution[] = [];
  if (pSigma > 0) {
    const low = Math.max(periodDays - pSigma, 0.1 * periodDays);
    contributions.push(contribution('periodDays', lnT0, evaluate({ p: periodDays + pSigma }), evaluate({ p: low })));
  }
  contributions.push(...coefficientContributions(relation, x, lnT0, evaluate, flags));
  contributions.push(
    scatterContribution(relation, relation === 'angus2019' ? ANGUS_2019.cA.value : BARNES_FORM_COEFFICIENTS[relation].n.value),
  );
  const lower = quadrature(contributions.map((c) => c.lowerLn));
  const upper = quadrature(contributions.map((c) => c.upperLn));
  const rel = (Math.expm1(upper) - Math.expm1(-lower)) / 2;
  const range = lnRange(ageMyr, contributions, k);
  const source = `${info.citation} coefficient uncertainties and intrinsic scatter (${INTRINSIC_SCATTER[relation].source}); ${PROPAGATION_METHOD}`;
  return finishAge(relation, info, ageMyr, range, rel, source, contributions, periodDays, colour, relationColour, flags, scale, roCrit);
}

function finishAge(
  relation: GyroRelationId,
  info: GyroRelationInfo,
  ageMyr: number,
  rangeMyr: AgeEstimate['rangeMyr'],
  fractionalUncertainty: number,
  uncertaintySource: string,
  contributions: UncertaintyContribution[],
  periodDays: number,
  colour: ResolvedColour,
  relationColour: RelationColour,
  flags: ScienceFlag[],
  scale: TurnoverScale,
  roCrit: { value: number; given: boolean },
): AgeEstimate {
  const causes = colourNoResults(relation, relationColour.value, colour);
  flags.push(...calibrationFlags(relation, relationColour.value, ageMyr, colour));
  const rossby = rossbyWithFlags(colour, scale, periodDays, roCrit, flags, 'braking weakens there, so the star may be older than this age');
  if (rossby) {
    const roNoyes = (rossby.rossby * solarRossby('noyes1984')) / solarRossby(scale);
    if (roNoyes <= FAST_ROTATOR_NOYES_ROSSBY) {
      const onScale = FAST_ROTATOR_NOYES_ROSSBY * (solarRossby(scale) / solarRossby('noyes1984'));
      causes.push({
        code: 'belowSlowSequence',
        reason: `period ${fmt(periodDays)} d gives Ro ${fmt(rossby.rossby)} on the ${rossby.scaleLabel} τ scale, at or below the saturation value ≈ ${fmt(onScale, 2)} there (Ro 0.1 on the Noyes (1984) scale): a fast rotator below the slow-rotator sequence (young, or a tidally locked binary), where period does not measure age`,
        source: FAST_ROTATOR_SOURCE,
      });
    }
  }
  if (ageMyr > AGE_OF_UNIVERSE_MYR) causes.push(ageBeyondUniverse(`the relation's age ${fmt(ageMyr, 4)} Myr`));
  const noResult = noResultWithFlags(causes, 'noGyroAge', 'no gyrochronological age', flags);
  return {
    relation,
    relationLabel: info.label,
    source: info.citation,
    ageMyr,
    rangeMyr,
    fractionalUncertainty,
    uncertaintySource,
    contributions,
    periodDays,
    colour,
    relationColour,
    rossby,
    noResult,
    flags,
  };
}

/**
 * Barnes (2007), ApJ 669, 1167, eq. 16: fractional age error
 * δt/t = 0.02·sqrt(3 + ½(ln t)² + 2·P^0.6 + (0.6/x)² + (2.4·ln x)²), t in Myr, P in days,
 * x = (B−V)0 − 0.4.
 */
export function barnesAgeUncertainty(ageMyr: number, periodDays: number, bvMag: number): number {
  const t = requirePositive(ageMyr, 'ageMyr');
  const p = requirePositive(periodDays, 'periodDays');
  const x = requireFinite(bvMag, 'colour.value') - 0.4;
  if (!(x > 0)) throw outsideFormula('barnes2007', bvMag);
  const lt = Math.log(t);
  const lx = Math.log(x);
  return 0.02 * Math.sqrt(3 + 0.5 * lt * lt + 2 * p ** 0.6 + (0.6 / x) ** 2 + (2.4 * lx) ** 2);
}

/** De-reddens, checks the supported domain, and converts to the relation's colour system. */
function colourForRelation(
  relation: GyroRelationId,
  observed: { value: number; system: TargetColourSystem },
  reddeningEbvMag: number | undefined,
): { colour: ResolvedColour; relationColour: RelationColour; flags: ScienceFlag[] } {
  requireOneOf(observed?.system, 'colour.system', TARGET_COLOUR_SYSTEMS);
  const colour = resolveColour(observed, reddeningEbvMag);
  const flags: ScienceFlag[] = [];
  const dom = SUPPORTED_COLOUR_DOMAIN[observed.system];
  const v = colour.intrinsic.value;
  if ((dom.minExclusive ? v <= dom.min : v < dom.min) || v > dom.max) {
    const redd = colour.reddeningEbvMag > 0 ? ` after removing E(B−V) = ${colour.reddeningEbvMag}` : '';
    throw new ScienceInputError(
      'colour.value',
      `${colourLabel(observed.system)} ${fmt(v)}${redd} is outside all supported relations (${dom.minExclusive ? '>' : '≥'} ${dom.min} and ≤ ${dom.max})`,
    );
  }
  const system = GYRO_RELATION_INFO[relation].colourSystem;
  if (system === observed.system) {
    return { colour, relationColour: { value: v, system, origin: `the target's intrinsic ${colourLabel(system)}` }, flags };
  }
  const value = convertColour(v, observed.system, system, 'colour.value');
  flags.push(
    flag(
      'colourConverted',
      'info',
      `${GYRO_RELATION_INFO[relation].label} takes ${colourLabel(system)}: ${colourLabel(observed.system)} ${fmt(v)} → ${colourLabel(system)} ${fmt(value)} through the dwarf sequence`,
      DWARF_SEQUENCE_SOURCE,
    ),
  );
  return {
    colour,
    relationColour: { value, system, origin: `${DWARF_SEQUENCE_SOURCE} from ${colourLabel(observed.system)} ${fmt(v)}` },
    flags,
  };
}

/** A cause of "no result", before it becomes a flag. */
interface NoResultCause extends NoResult {
  source: string;
}

/**
 * Colour causes of "no result" (Spincycle's policy: outside a relation's calibrated colours the
 * relation gives no number, rather than an extrapolated one with a caution):
 * - outside the relation's `calibratedColour` (for Angus 2019 including its M-dwarf linear
 *   branch from BP−RP 2.7, outside the 0.56–2.7 polynomial it calibrated);
 * - hotter than the Kraft break ({@link KRAFT_BREAK_TEFF_K});
 * - a B−V relation at (B−V)0 ≥ {@link BV_MASS_TRACKING_LIMIT}, where B−V no longer tracks mass.
 */
function colourNoResults(relation: GyroRelationId, x: number, colour: ResolvedColour): NoResultCause[] {
  const info = GYRO_RELATION_INFO[relation];
  const out: NoResultCause[] = [];
  const cr = info.calibratedColour;
  const label = `${colourLabel(info.colourSystem)} ${fmt(x)}`;
  if (relation === 'angus2019' && x >= ANGUS_2019.linearBranchFromBpRp) {
    out.push({
      code: 'angus2019LinearBranch',
      reason: `${label} falls on the M-dwarf linear branch of ${info.label} (BP−RP ≥ 2.7), outside its calibrated polynomial (${cr.note}); the branch does not join the polynomial at 2.7`,
      source: info.citation,
    });
  } else if (x < cr.min || x > cr.max) {
    out.push({
      code: 'colourOutsideCalibration',
      reason: `${label} is outside the calibrated range of ${info.label}: ${cr.note}`,
      source: info.citation,
    });
  }
  const teff = teffOf(colour);
  if (teff === 'hotter' || (typeof teff === 'number' && teff > KRAFT_BREAK_TEFF_K)) {
    const t =
      teff === 'hotter'
        ? `hotter than the dwarf sequence's first row (${DWARF_HOTTEST_TEFF_K} K)`
        : `Teff ≈ ${fmt(teff, 4)} K on the dwarf sequence`;
    out.push({
      code: 'aboveKraftBreak',
      reason: `${colourLabel(colour.intrinsic.system)} ${fmt(colour.intrinsic.value)} is ${t}, above the Kraft break ≈ ${KRAFT_BREAK_TEFF_K} K: such stars have thin convective envelopes and do not spin down as gyrochronology assumes`,
      source: `${KRAFT_SOURCE}; Teff: ${DWARF_SEQUENCE_SOURCE}`,
    });
  }
  if (info.colourSystem === 'BV' && x >= BV_MASS_TRACKING_LIMIT) {
    out.push({
      code: 'bvDoesNotTrackMass',
      reason: `(B−V)0 ${fmt(x)} is at or above ${BV_MASS_TRACKING_LIMIT} (M0V), where B−V stays nearly flat (1.42–1.53 from M0V to M3V) while the mass falls from 0.585 to 0.36 M☉: ${info.label} cannot place the star; use a BP−RP relation`,
      source: DWARF_SEQUENCE_SOURCE,
    });
  }
  return out;
}

const DWARF_HOTTEST_TEFF_K = DWARF_SEQUENCE[0].teffK;

/** Teff of the target on the dwarf sequence; 'hotter' when bluer than its first row, null when redder than its last. */
function teffOf(colour: ResolvedColour): number | 'hotter' | null {
  if (colour.sequence) return colour.sequence.teffK;
  const hot = sequenceValue(dwarfSequenceAt('teffK', DWARF_HOTTEST_TEFF_K), colour.intrinsic.system);
  return colour.intrinsic.value < hot ? 'hotter' : null;
}

function ageBeyondUniverse(what: string): NoResultCause {
  return {
    code: 'ageBeyondUniverse',
    reason: `${what} exceeds the age of the universe, ${fmt(AGE_OF_UNIVERSE_MYR, 5)} Myr`,
    source: AGE_OF_UNIVERSE_SOURCE,
  };
}

/** One blocking flag per cause; the first cause becomes the result's `noResult`. */
function noResultWithFlags(causes: NoResultCause[], flagCode: string, what: string, flags: ScienceFlag[]): NoResult | null {
  for (const c of causes) flags.push(flag(flagCode, 'blocking', `${what}: ${c.reason}`, c.source));
  return causes.length === 0 ? null : { code: causes[0].code, reason: causes[0].reason };
}

/**
 * Cautions that keep the number: an age outside the calibrated ages (but not above the age of
 * the universe, which is a no-result cause), and a K or M dwarf younger than its convergence
 * age ({@link convergenceAgeMyr}).
 */
function calibrationFlags(relation: GyroRelationId, x: number, ageMyr: number, colour: ResolvedColour): ScienceFlag[] {
  const info = GYRO_RELATION_INFO[relation];
  const out: ScienceFlag[] = [];
  const ar = info.calibratedAgeMyr;
  if ((ageMyr < ar.min || ageMyr > ar.max) && ageMyr <= AGE_OF_UNIVERSE_MYR) {
    out.push(
      flag(
        'ageOutsideCalibration',
        'caution',
        `age ${fmt(ageMyr)} Myr is outside the calibrated range of ${info.label}: ${ar.note}`,
        info.citation,
      ),
    );
  }
  const teff = teffOf(colour);
  const tConv = typeof teff === 'number' ? convergenceAgeMyr(teff) : null;
  if (typeof teff === 'number' && tConv !== null && ageMyr < tConv) {
    out.push(
      flag(
        'mayNotHaveConverged',
        'caution',
        `age ${fmt(ageMyr)} Myr is below ≈ ${fmt(tConv, 2)} Myr, when a dwarf of Teff ≈ ${fmt(teff, 4)} K joins the slow-rotator sequence: it may still rotate faster than ${info.label} gives`,
        CONVERGENCE_SOURCE,
      ),
    );
  }
  return out;
}

/** The intrinsic-scatter term in ln(result): σ_lnP for periods, σ_lnP / exponent for ages. */
function scatterContribution(relation: GyroRelationId, ageExponent: number): UncertaintyContribution {
  const s = INTRINSIC_SCATTER[relation].lnPeriod / ageExponent;
  return { parameter: 'intrinsicScatter', lowerLn: s, upperLn: s };
}

/** t·exp(∓k·σ) from contributions added in quadrature. */
function lnRange(value: number, contributions: UncertaintyContribution[], k: number): { low: number; high: number; sigma: number } {
  const lower = quadrature(contributions.map((c) => c.lowerLn));
  const upper = quadrature(contributions.map((c) => c.upperLn));
  return { low: value * Math.exp(-k * lower), high: value * Math.exp(k * upper), sigma: k };
}

/** The caller's critical Rossby number, or the solar value on the scale in use. */
function criticalRossby(given: number | undefined, scale: TurnoverScale): { value: number; given: boolean } {
  if (given === undefined) return { value: weakenedBrakingRossby(scale), given: false };
  return { value: requirePositive(given, 'weakenedBrakingRossby'), given: true };
}

/**
 * Contributions of the relation's coefficients. `evaluate` returns ln(result) with some
 * coefficients replaced. Where a shifted offset c reaches the colour (x − c ≤ 0), the
 * derivative is used instead of the exact evaluation.
 */
function coefficientContributions(
  relation: GyroRelationId,
  x: number,
  ln0: number,
  evaluate: (over: Partial<Numbers & { cA: number }>) => number,
  flags: ScienceFlag[],
): UncertaintyContribution[] {
  if (relation === 'angus2019') {
    const cA = ANGUS_2019.cA;
    flags.push(
      flag(
        'angus2019CoefficientsHeld',
        'info',
        `the coefficients of the Angus et al. (2019) colour polynomial are held fixed (their covariance is not published); only the age exponent (cA) is varied, by ±${cA.plus}, about the solar age`,
        // This product's choice, no published source.
        'an assumption of this product (see Methods: The plausible period range)',
      ),
    );
    return [contribution('cA', ln0, evaluate({ cA: cA.value + cA.plus }), evaluate({ cA: cA.value - cA.minus }))];
  }
  const k = BARNES_FORM_COEFFICIENTS[relation];
  const out: UncertaintyContribution[] = [];
  for (const name of ['a', 'b', 'c', 'n'] as const) {
    const q = k[name];
    if (q.plus === 0 && q.minus === 0) continue;
    let up = evaluate({ [name]: q.value + q.plus });
    let down = evaluate({ [name]: q.value - q.minus });
    if (name === 'c' && !Number.isFinite(up)) {
      // d ln(result)/dc at the central value: the forward ln P has −b/(x−c); the inverse the
      // opposite sign over n. Infer the slope from a tiny exact step instead of casework.
      const h = 1e-6 * (x - q.value);
      const slope = (evaluate({ c: q.value + h }) - ln0) / h;
      up = ln0 + slope * q.plus;
      if (!Number.isFinite(down)) down = ln0 - slope * q.minus;
    }
    out.push(contribution(name, ln0, up, down));
  }
  return out;
}

function contribution(parameter: string, ln0: number, atPlus: number, atMinus: number): UncertaintyContribution {
  const d1 = atPlus - ln0;
  const d2 = atMinus - ln0;
  return {
    parameter,
    lowerLn: Math.max(0, -d1, -d2),
    upperLn: Math.max(0, d1, d2),
  };
}

function quadrature(values: number[]): number {
  let s = 0;
  for (const v of values) s += v * v;
  return Math.sqrt(s);
}

/**
 * The Rossby number of a star at a period on a τ scale, with its flags: the τ scale's own, and
 * van Saders et al. (2016)'s weakened braking past `roCrit` (`consequence` says what it means
 * for the caller's result). A colour outside the τ scale gives no Rossby number, and says why.
 */
function rossbyWithFlags(
  colour: ResolvedColour,
  scale: TurnoverScale,
  periodDays: number,
  roCrit: { value: number; given: boolean },
  flags: ScienceFlag[],
  consequence: string,
): GyroRossby | null {
  try {
    const tau = turnoverTimeForColour(colour, scale);
    // Fields copied by name: an object rest/spread here was a measurable share of plan time.
    const rossby: GyroRossby = {
      tauDays: tau.tauDays,
      scale: tau.scale,
      scaleLabel: tau.scaleLabel,
      source: tau.source,
      inputQuantity: tau.inputQuantity,
      inputValue: tau.inputValue,
      inputOrigin: tau.inputOrigin,
      rossby: periodDays / tau.tauDays,
      periodDays,
    };
    for (const f of tau.flags) flags.push(f);
    if (rossby.rossby > roCrit.value) {
      const what = roCrit.given
        ? `the given ${fmt(roCrit.value)} on the ${tau.scaleLabel} τ scale`
        : `≈ ${fmt(roCrit.value)} on the ${tau.scaleLabel} τ scale (≈ the solar value)`;
      flags.push(flag('weakenedBraking', 'caution', `Ro ${fmt(rossby.rossby)} exceeds ${what}: ${consequence}`, VAN_SADERS));
    }
    return rossby;
  } catch (err) {
    if (!(err instanceof ScienceInputError)) throw err;
    flags.push(flag('rossbyUnavailable', 'info', `no Rossby number: ${err.reason}`));
    return null;
  }
}
