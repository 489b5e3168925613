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
 * papers do not publish (Spincycle's choice, no source).
 */
import {
  type ResolvedColour,
  type TargetColourSystem,
  TARGET_COLOUR_SYSTEMS,
  colourLabel,
  convertColour,
  resolveColour,
  DWARF_SEQUENCE_SOURCE,
} from './colour-sequence';
import { type ScienceFlag, flag, fmt } from './explained';
import { ScienceInputError, requireFinite, requireNonNegative, requireOneOf, requirePositive } from './science-input-error';
import { type RossbyNumber, type TurnoverScale, TURNOVER_SCALES, turnoverTimeForColour } from './turnover-time';

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
export const BARNES_FORM_COEFFICIENTS: Readonly<
  Record<'barnes2007' | 'mamajekHillenbrand2008' | 'angus2015', BarnesFormCoefficients>
> = {
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
    calibratedColour: { min: 0.4, max: 1.6, note: '(B−V)0 0.4–1.6 (from memory, SCIENCE.md §1)' },
    calibratedAgeMyr: { min: 100, max: 10000, note: '0.1–10 Gyr: stars on the I sequence (from memory)' },
  },
  mamajekHillenbrand2008: {
    id: 'mamajekHillenbrand2008',
    label: 'Mamajek & Hillenbrand (2008)',
    citation: 'Mamajek & Hillenbrand (2008), ApJ 687, 1264, eqs. 12–14',
    formula: 'P = a·((B−V)0 − c)^b·(t/Myr)^n',
    colourSystem: 'BV',
    calibratedColour: { min: 0.5, max: 0.9, note: '0.5 < (B−V)0 < 0.9 (SCIENCE.md §1)' },
    calibratedAgeMyr: { min: 100, max: 10000, note: '0.1–10 Gyr (from memory)' },
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
      note: 'F–K dwarfs: (B−V)0 0.45–1.40, the F5V–K7V span of the dwarf sequence above the relation offset c = 0.45 (derived)',
    },
    calibratedAgeMyr: { min: 100, max: 10000, note: '0.1–10 Gyr (from memory)' },
  },
  angus2019: {
    id: 'angus2019',
    label: 'Angus et al. (2019)',
    citation: 'Angus et al. (2019), AJ 158, 173',
    formula: 'log10 P = cA·log10(t/yr) + Σ ck·log10(BP−RP)^k',
    colourSystem: 'BPRP',
    calibratedColour: { min: 0.56, max: 2.7, note: '0.56 < (BP−RP)0 < 2.7 (SCIENCE.md §1)' },
    calibratedAgeMyr: { min: 250, max: 10000, note: 'scatter is large below 250 Myr (SCIENCE.md §1)' },
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

/** Default critical Rossby number for the weakened-braking caution (van Saders et al. 2016, Nature 529, 181). */
export const WEAKENED_BRAKING_ROSSBY = 2;
const VAN_SADERS = 'van Saders et al. (2016), Nature 529, 181';

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
  /** Critical Rossby number for the caution (default 2). */
  weakenedBrakingRossby?: number;
}

export interface PeriodPrediction {
  relation: GyroRelationId;
  relationLabel: string;
  source: string;
  periodDays: number;
  /** P·exp(−k·σ₋) … P·exp(+k·σ₊) with k = `sigma`. */
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
  flags: ScienceFlag[];
}

export const PROPAGATION_METHOD =
  'one-at-a-time first-order propagation in the logarithm of the result: each uncertain input moved by its ±1σ, the relation evaluated exactly there, increases and decreases added in quadrature (Spincycle\'s choice, no source)';

/** Period from colour and age by the chosen relation, with its range and flags. */
export function predictPeriod(input: PeriodPredictionInput): PeriodPrediction {
  const relation = requireOneOf(input?.relation, 'relation', GYRO_RELATIONS);
  const info = GYRO_RELATION_INFO[relation];
  const ageMyr = requirePositive(input.ageMyr, 'ageMyr');
  const ageSigma = input.ageUncertaintyMyr === undefined ? 0 : requireNonNegative(input.ageUncertaintyMyr, 'ageUncertaintyMyr');
  const k = input.rangeSigma === undefined ? 1 : requirePositive(input.rangeSigma, 'rangeSigma');
  const scale = requireOneOf(input.turnoverScale ?? 'noyes1984', 'turnoverScale', TURNOVER_SCALES);
  const roCrit = input.weakenedBrakingRossby === undefined ? WEAKENED_BRAKING_ROSSBY : requirePositive(input.weakenedBrakingRossby, 'weakenedBrakingRossby');

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
        flag('ageUncertaintyTruncated', 'info', `the age's −1σ (${fmt(ageMyr - ageSigma)} Myr) is cut at 10 % of the age for the period range`, "Spincycle's choice"),
      );
    }
    contributions.push(contribution('ageMyr', lnP0, evaluate({ t: ageMyr + ageSigma }), evaluate({ t: low })));
  }
  contributions.push(...coefficientContributions(relation, x, lnP0, evaluate, flags));

  const lower = quadrature(contributions.map((c) => c.lowerLn));
  const upper = quadrature(contributions.map((c) => c.upperLn));
  const periodDays = Math.exp(lnP0);

  flags.push(...calibrationFlags(relation, x, ageMyr));
  const rossby = rossbyWithFlags(colour, scale, periodDays, roCrit, flags, 'magnetic braking weakens there, so the period may be shorter than predicted');

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
  ageMyr: number;
  rangeMyr: { low: number; high: number; sigma: number };
  /** 1σ fractional uncertainty (mean of the two sides for asymmetric ranges). */
  fractionalUncertainty: number;
  uncertaintySource: string;
  contributions: UncertaintyContribution[];
  periodDays: number;
  colour: ResolvedColour;
  relationColour: RelationColour;
  rossby: GyroRossby | null;
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
  const roCrit = input.weakenedBrakingRossby === undefined ? WEAKENED_BRAKING_ROSSBY : requirePositive(input.weakenedBrakingRossby, 'weakenedBrakingRossby');

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
      flags.push(flag('periodUncertaintyNotUsed', 'info', 'Barnes (2007) eq. 16 already contains a period term; the given period uncertainty is not added', source));
    }
    // Symmetric fractional error δt/t: range t·(1 ± k·δt/t), kept non-negative.
    const contributions = [{ parameter: 'eq. 16', lowerLn: -Math.log(Math.max(1 - rel, 1e-3)), upperLn: Math.log(1 + rel) }];
    const range = { low: ageMyr * Math.max(1 - k * rel, 0), high: ageMyr * (1 + k * rel), sigma: k };
    return finishAge(relation, info, ageMyr, range, rel, source, contributions, periodDays, colour, relationColour, flags, scale, roCrit);
  }
  const contributions: UncertaintyContribution[] = [];
  if (pSigma > 0) {
    const low = Math.max(periodDays - pSigma, 0.1 * periodDays);
    contributions.push(contribution('periodDays', lnT0, evaluate({ p: periodDays + pSigma }), evaluate({ p: low })));
  }
  contributions.push(...coefficientContributions(relation, x, lnT0, evaluate, flags));
  const lower = quadrature(contributions.map((c) => c.lowerLn));
  const upper = quadrature(contributions.map((c) => c.upperLn));
  const rel = (Math.expm1(upper) - Math.expm1(-lower)) / 2;
  const range = { low: ageMyr * Math.exp(-k * lower), high: ageMyr * Math.exp(k * upper), sigma: k };
  const source = `${info.citation} coefficient uncertainties; ${PROPAGATION_METHOD}`;
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
  roCrit: number,
): AgeEstimate {
  flags.push(...calibrationFlags(relation, relationColour.value, ageMyr));
  const rossby = rossbyWithFlags(colour, scale, periodDays, roCrit, flags, 'braking weakens there, so the star may be older than this age');
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
  return { colour, relationColour: { value, system, origin: `${DWARF_SEQUENCE_SOURCE} from ${colourLabel(observed.system)} ${fmt(v)}` }, flags };
}

function calibrationFlags(relation: GyroRelationId, x: number, ageMyr: number): ScienceFlag[] {
  const info = GYRO_RELATION_INFO[relation];
  const out: ScienceFlag[] = [];
  const cr = info.calibratedColour;
  if (x < cr.min || x > cr.max) {
    out.push(flag('colourOutsideCalibration', 'caution', `${colourLabel(info.colourSystem)} ${fmt(x)} is outside the calibrated range of ${info.label}: ${cr.note}`, info.citation));
  }
  if (relation === 'angus2019' && x >= ANGUS_2019.linearBranchFromBpRp) {
    out.push(
      flag(
        'angus2019LinearBranch',
        'caution',
        'BP−RP ≥ 2.7 uses the M-dwarf linear branch, which does not join the polynomial at 2.7 and rests on few stars',
        info.citation,
      ),
    );
  }
  const ar = info.calibratedAgeMyr;
  if (ageMyr < ar.min || ageMyr > ar.max) {
    out.push(flag('ageOutsideCalibration', 'caution', `age ${fmt(ageMyr)} Myr is outside the calibrated range of ${info.label}: ${ar.note}`, info.citation));
  }
  return out;
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
        'Angus (2019) polynomial coefficients held fixed (their covariance is not published); the age exponent cA ± 0.05 is applied about the solar age',
        "Spincycle's choice, no source",
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
  roCrit: number,
  flags: ScienceFlag[],
  consequence: string,
): GyroRossby | null {
  try {
    const tau = turnoverTimeForColour(colour, scale);
    const { flags: tauFlags, ...tauRest } = tau;
    const rossby: GyroRossby = { ...tauRest, rossby: periodDays / tau.tauDays, periodDays };
    flags.push(...tauFlags);
    if (rossby.rossby > roCrit) {
      flags.push(flag('weakenedBraking', 'caution', `Ro = ${fmt(rossby.rossby)} (${tau.scaleLabel} τ) exceeds ≈ ${roCrit}: ${consequence}`, VAN_SADERS));
    }
    return rossby;
  } catch (err) {
    if (!(err instanceof ScienceInputError)) throw err;
    flags.push(flag('rossbyUnavailable', 'info', `no Rossby number: ${err.reason}`));
    return null;
  }
}
