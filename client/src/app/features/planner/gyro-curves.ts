/**
 * The curves of the planner's two gyrochronology charts, computed with the science core:
 * period against age at the star's colour (one curve per relation that covers the colour,
 * with the ±1σ band of the plan's relation), and period against colour at the star's age.
 * Pure functions: the charts only draw what these return. The proposals' cluster chart draws
 * its relations with `periodColourSeries` too.
 */
import { type ColourValue, type TargetColourSystem, colourLabel, convertColour, deredden } from '@spincycle/shared/science/colour-sequence';
import { fmt } from '@spincycle/shared/science/explained';
import {
  type GyroRelationId,
  GYRO_RELATION_INFO,
  GYRO_RELATIONS,
  SUPPORTED_COLOUR_DOMAIN,
  periodFromAge,
  predictPeriod,
} from '@spincycle/shared/science/gyrochronology';
import { isScienceInputError } from '@spincycle/shared/science/science-input-error';

/** One point of a curve: x is the age (Myr) or the colour (mag), y the period (d). */
export interface CurvePoint {
  x: number;
  y: number;
}

/** Age span of the gyrochrone chart, Myr (0.1–10 Gyr: the relations' common calibrated span). */
export const GYROCHRONE_AGE_RANGE_MYR = { min: 100, max: 10000 } as const;

/** A relation that cannot be drawn for this colour, and why. */
export interface UncoveredRelation {
  relation: GyroRelationId;
  label: string;
  reason: string;
}

/** Period against age for one relation at the star's colour. */
export interface AgeCurve {
  relation: GyroRelationId;
  label: string;
  citation: string;
  /** The relation used by the plan. */
  selected: boolean;
  points: CurvePoint[];
  /** Drawn solid inside, dashed outside. */
  calibratedAgeMyr: { min: number; max: number };
  /** The colour the relation takes at this star (its own system, intrinsic). */
  relationColour: ColourValue;
}

/** The star being planned, with its 1σ age and its plausible period range. */
export interface StarMarker {
  ageMyr: number;
  ageLowMyr: number;
  ageHighMyr: number;
  periodDays: number;
  periodLowDays: number;
  periodHighDays: number;
  /** The star's intrinsic colour in the chosen system. */
  colour: ColourValue;
}

export interface GyrochroneSeries {
  /** The star's intrinsic colour (after E(B−V)) in the chosen system. */
  colour: ColourValue;
  curves: AgeCurve[];
  uncovered: UncoveredRelation[];
  /** ±1σ of the plan's relation from its coefficients (the age is exact along the curve). */
  band: { relation: GyroRelationId; label: string; low: CurvePoint[]; high: CurvePoint[] } | null;
  star: StarMarker | null;
}

export interface GyrochroneInput {
  colour: { value: number; system: TargetColourSystem };
  reddeningEbvMag?: number;
  /** The plan's relation: drawn thicker, with its ±1σ band. */
  relation: GyroRelationId;
  star: StarMarker | null;
  /** Points per curve (default 61, log-spaced). */
  samples?: number;
}

/** `n` values from `min` to `max`, evenly spaced in log. */
export function logSpace(min: number, max: number, n: number): number[] {
  const a = Math.log(min);
  const b = Math.log(max);
  return Array.from({ length: n }, (_, i) => Math.exp(a + ((b - a) * i) / (n - 1)));
}

/**
 * Whether a relation's calibrated colour range covers an intrinsic colour, and the colour in
 * the relation's own system (through the dwarf sequence when the systems differ).
 */
export function relationCoverage(
  relation: GyroRelationId,
  intrinsic: ColourValue,
): { covered: true; relationColour: ColourValue } | { covered: false; reason: string } {
  const info = GYRO_RELATION_INFO[relation];
  let value: number;
  try {
    value = intrinsic.system === info.colourSystem ? intrinsic.value : convertColour(intrinsic.value, intrinsic.system, info.colourSystem);
  } catch (error) {
    if (!isScienceInputError(error)) throw error;
    return { covered: false, reason: error.reason };
  }
  const range = info.calibratedColour;
  if (value < range.min || value > range.max) {
    return {
      covered: false,
      reason: `(${colourLabel(info.colourSystem)})0 ${fmt(value)} is outside its calibrated ${range.min}–${range.max}`,
    };
  }
  return { covered: true, relationColour: { value, system: info.colourSystem } };
}

/** Period against age, one curve per relation that covers the star's colour. */
export function gyrochroneSeries(input: GyrochroneInput): GyrochroneSeries {
  const colour = deredden({ value: input.colour.value, system: input.colour.system }, input.reddeningEbvMag ?? 0);
  const ages = logSpace(GYROCHRONE_AGE_RANGE_MYR.min, GYROCHRONE_AGE_RANGE_MYR.max, input.samples ?? 61);
  const curves: AgeCurve[] = [];
  const uncovered: UncoveredRelation[] = [];
  let band: GyrochroneSeries['band'] = null;

  for (const relation of GYRO_RELATIONS) {
    const info = GYRO_RELATION_INFO[relation];
    const coverage = relationCoverage(relation, colour);
    if (!coverage.covered) {
      uncovered.push({ relation, label: info.label, reason: coverage.reason });
      continue;
    }
    const points: CurvePoint[] = [];
    for (const age of ages) {
      const period = scienceOrNull(() => periodFromAge(relation, coverage.relationColour.value, age));
      if (period !== null) points.push({ x: age, y: period });
    }
    curves.push({
      relation,
      label: info.label,
      citation: info.citation,
      selected: relation === input.relation,
      points,
      calibratedAgeMyr: { min: info.calibratedAgeMyr.min, max: info.calibratedAgeMyr.max },
      relationColour: coverage.relationColour,
    });
    if (relation === input.relation) {
      const low: CurvePoint[] = [];
      const high: CurvePoint[] = [];
      for (const age of ages) {
        const range = scienceOrNull(
          () => predictPeriod({ relation, colour: { value: colour.value, system: input.colour.system }, ageMyr: age }).rangeDays,
        );
        if (range) {
          low.push({ x: age, y: range.low });
          high.push({ x: age, y: range.high });
        }
      }
      band = { relation, label: info.label, low, high };
    }
  }
  return { colour, curves, uncovered, band, star: input.star };
}

/** Period against colour at one age, for one relation. */
export interface ColourCurve {
  relation: GyroRelationId;
  label: string;
  selected: boolean;
  /** x: intrinsic colour in the chosen system, mag. */
  points: CurvePoint[];
  /** False when the age is outside the relation's calibrated ages (drawn dashed). */
  ageCalibrated: boolean;
}

export interface PeriodColourSeries {
  system: TargetColourSystem;
  ageMyr: number;
  /** The chosen system's span that some relation can use. */
  domain: { min: number; max: number };
  curves: ColourCurve[];
  uncovered: UncoveredRelation[];
  star: StarMarker | null;
}

/**
 * Period against intrinsic colour at one age: each relation over the colours it is calibrated
 * for, expressed in the chosen system (converted through the dwarf sequence where needed).
 */
export function periodColourSeries(input: {
  system: TargetColourSystem;
  ageMyr: number;
  relation: GyroRelationId;
  star: StarMarker | null;
  samples?: number;
}): PeriodColourSeries {
  const dom = SUPPORTED_COLOUR_DOMAIN[input.system];
  const n = input.samples ?? 121;
  const start = dom.minExclusive ? dom.min + 1e-3 : dom.min;
  const colours = Array.from({ length: n }, (_, i) => start + ((dom.max - start) * i) / (n - 1));
  const curves: ColourCurve[] = [];
  const uncovered: UncoveredRelation[] = [];
  for (const relation of GYRO_RELATIONS) {
    const info = GYRO_RELATION_INFO[relation];
    const points: CurvePoint[] = [];
    for (const x of colours) {
      const coverage = relationCoverage(relation, { value: x, system: input.system });
      if (!coverage.covered) continue;
      const period = scienceOrNull(() => periodFromAge(relation, coverage.relationColour.value, input.ageMyr));
      if (period !== null) points.push({ x, y: period });
    }
    if (points.length < 2) {
      uncovered.push({ relation, label: info.label, reason: `no colour of the ${colourLabel(input.system)} range it is calibrated for` });
      continue;
    }
    const ages = info.calibratedAgeMyr;
    curves.push({
      relation,
      label: info.label,
      selected: relation === input.relation,
      points,
      ageCalibrated: input.ageMyr >= ages.min && input.ageMyr <= ages.max,
    });
  }
  return { system: input.system, ageMyr: input.ageMyr, domain: { min: start, max: dom.max }, curves, uncovered, star: input.star };
}

/**
 * Runs a science-core call, turning its ScienceInputError (outside a relation or the dwarf
 * sequence) and a non-finite number into null; other errors propagate.
 */
export function scienceOrNull<T>(fn: () => T): T | null {
  try {
    const value = fn();
    return typeof value === 'number' && !Number.isFinite(value) ? null : value;
  } catch (error) {
    if (isScienceInputError(error)) return null;
    throw error;
  }
}
