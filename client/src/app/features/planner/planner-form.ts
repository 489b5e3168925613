/**
 * The target planner's form: typed controls with defaults that give a real plan on first
 * load, the translation of the form's value into the science core's input, and the mapping of
 * the core's `ScienceInputError.field` back to the control that shows it. Range checks are
 * the science core's (one validation source); the form only checks that required numbers are
 * there, and the completeness range, which the form shows in percent where the core speaks in
 * fractions (its message would read "within [0.5, 0.99]" under a field asking for 50–99).
 */
import { FormControl, FormGroup } from '@angular/forms';
import type { NodeBand } from '@spincycle/shared/facility/facility-types';
import type { TargetColourSystem } from '@spincycle/shared/science/colour-sequence';
import type { GyroRelationId } from '@spincycle/shared/science/gyrochronology';
import { COMPLETENESS_RANGE, DEFAULT_COMPLETENESS } from '@spincycle/shared/proposals/proposal-schemas';
import type { TargetPlanOptions, TargetPlanTarget } from '@spincycle/shared/science/target-plan';

export type ExposureMode = 'auto' | 'fixed';
/** A relation, or the core's default for the colour system. */
export type RelationChoice = GyroRelationId | 'default';

/**
 * Defaults: a K dwarf (BP−RP 1.10, about K2V) of an 800 ± 100 Myr cluster at G = 11.5, the
 * kind of star a gyrochronology campaign calibrates on; FAP 1 % and 90 % completeness (the
 * core's defaults).
 */
export const PLANNER_DEFAULTS = {
  starName: 'Star A-17',
  colourSystem: 'BPRP' as TargetColourSystem,
  colourValue: 1.1,
  ageMyr: 800,
  ageUncertaintyMyr: 100,
  magnitude: 11.5,
  band: 'G' as NodeBand,
  exposureSeconds: 30,
  falseAlarmProbability: 0.01,
  completenessPercent: Math.round(DEFAULT_COMPLETENESS * 100),
} as const;

/** The completeness field's range, percent (a proposal's range: 50–99 %). */
export const COMPLETENESS_PERCENT_RANGE = {
  min: Math.round(COMPLETENESS_RANGE.min * 100),
  max: Math.round(COMPLETENESS_RANGE.max * 100),
} as const;

const COMPLETENESS_MESSAGE = `Enter a completeness between ${COMPLETENESS_PERCENT_RANGE.min} % and ${COMPLETENESS_PERCENT_RANGE.max} %`;

/** Debounce of the live recomputation, ms. */
export const RECOMPUTE_DEBOUNCE_MS = 150;

export function createPlannerForm() {
  const d = PLANNER_DEFAULTS;
  return new FormGroup({
    starName: new FormControl(d.starName, { nonNullable: true }),
    colourSystem: new FormControl<TargetColourSystem>(d.colourSystem, { nonNullable: true }),
    colourValue: new FormControl<number | null>(d.colourValue),
    reddeningEbv: new FormControl<number | null>(null),
    ageMyr: new FormControl<number | null>(d.ageMyr),
    ageUncertaintyMyr: new FormControl<number | null>(d.ageUncertaintyMyr),
    magnitude: new FormControl<number | null>(d.magnitude),
    band: new FormControl<NodeBand>(d.band, { nonNullable: true }),
    /** The proposer's expected period, days (optional; needed where no relation gives one). */
    periodDays: new FormControl<number | null>(null),
    periodUncertaintyDays: new FormControl<number | null>(null),
    nodeId: new FormControl<number | null>(null),
    exposureMode: new FormControl<ExposureMode>('auto', { nonNullable: true }),
    exposureSeconds: new FormControl<number | null>(d.exposureSeconds),
    relation: new FormControl<RelationChoice>('default', { nonNullable: true }),
    falseAlarmProbability: new FormControl<number | null>(d.falseAlarmProbability),
    /** Probability that the plan recovers the period, percent (the core takes the fraction). */
    completenessPercent: new FormControl<number | null>(d.completenessPercent),
    ra: new FormControl('', { nonNullable: true }),
    dec: new FormControl('', { nonNullable: true }),
    cycleId: new FormControl<number | null>(null),
    compareNodeIds: new FormControl<number[]>([], { nonNullable: true }),
  });
}

export type PlannerForm = ReturnType<typeof createPlannerForm>;
export type PlannerValue = ReturnType<PlannerForm['getRawValue']>;
export type PlannerField = keyof PlannerValue;
/** A message per field, shown under it. */
export type FieldErrors = Partial<Record<PlannerField, string>>;

const REQUIRED: readonly [PlannerField, string][] = [
  ['colourValue', 'Enter the colour index'],
  ['ageMyr', 'Enter the age'],
  ['magnitude', 'Enter the magnitude'],
  ['falseAlarmProbability', 'Enter the false-alarm probability'],
  ['completenessPercent', COMPLETENESS_MESSAGE],
];

/**
 * Required numbers that are missing (an empty number field reads as null), and a completeness
 * outside 50–99 %.
 */
export function missingFields(value: PlannerValue): FieldErrors {
  const errors: FieldErrors = {};
  for (const [field, message] of REQUIRED) if (value[field] === null) errors[field] = message;
  if (value.exposureMode === 'fixed' && value.exposureSeconds === null) errors.exposureSeconds = 'Enter the exposure or choose automatic';
  const c = value.completenessPercent;
  if (c !== null && !(Number.isFinite(c) && c >= COMPLETENESS_PERCENT_RANGE.min && c <= COMPLETENESS_PERCENT_RANGE.max)) {
    errors.completenessPercent = `${COMPLETENESS_MESSAGE} (got ${c} %)`;
  }
  if (value.periodDays === null && value.periodUncertaintyDays !== null)
    errors.periodDays = 'Enter the period as well, or clear its uncertainty';
  return errors;
}

/** The science core's target and options from the form (call after `missingFields` is empty). */
export function toPlanInput(value: PlannerValue): { target: TargetPlanTarget; options: TargetPlanOptions } {
  const target: TargetPlanTarget = {
    name: value.starName.trim() || undefined,
    colour: { value: value.colourValue ?? Number.NaN, system: value.colourSystem },
    ageMyr: value.ageMyr ?? Number.NaN,
    magnitude: { value: value.magnitude ?? Number.NaN, band: value.band },
  };
  if (value.reddeningEbv !== null) target.reddeningEbvMag = value.reddeningEbv;
  if (value.ageUncertaintyMyr !== null) target.ageUncertaintyMyr = value.ageUncertaintyMyr;
  if (value.periodDays !== null) target.periodDays = value.periodDays;
  if (value.periodUncertaintyDays !== null) target.periodUncertaintyDays = value.periodUncertaintyDays;
  const options: TargetPlanOptions = {
    falseAlarmProbability: value.falseAlarmProbability ?? Number.NaN,
    completeness: (value.completenessPercent ?? Number.NaN) / 100,
  };
  if (value.relation !== 'default') options.relation = value.relation;
  if (value.exposureMode === 'fixed') options.exposureSeconds = value.exposureSeconds ?? Number.NaN;
  return { target, options };
}

const SCIENCE_FIELDS: readonly [RegExp, PlannerField][] = [
  [/^target\.colour\.system$/, 'colourSystem'],
  [/^target\.colour(\.|$)/, 'colourValue'],
  [/^target\.reddeningEbvMag$/, 'reddeningEbv'],
  [/^target\.ageMyr$/, 'ageMyr'],
  [/^target\.ageUncertaintyMyr$/, 'ageUncertaintyMyr'],
  [/^target\.magnitude(\.|$)/, 'magnitude'],
  [/^target\.periodDays$/, 'periodDays'],
  [/^target\.periodUncertaintyDays$/, 'periodUncertaintyDays'],
  [/^options\.exposureSeconds$/, 'exposureSeconds'],
  [/^options\.falseAlarmProbability$/, 'falseAlarmProbability'],
  [/^options\.completeness$/, 'completenessPercent'],
  [/^options\.relation$/, 'relation'],
  [/^(node|site)(\.|$)/, 'nodeId'],
];

/** The control that shows a `ScienceInputError` naming `field`, or null for a form-level message. */
export function controlForScienceField(field: string): PlannerField | null {
  for (const [pattern, control] of SCIENCE_FIELDS) if (pattern.test(field)) return control;
  return null;
}

/** The control that shows a field error of POST /api/sky-windows (`targets.0.dec`, `cycleId`...). */
export function controlForSkyField(field: string): PlannerField | null {
  const target = /^targets\.\d+\.(ra|dec)/.exec(field);
  if (target) return target[1] as 'ra' | 'dec';
  if (field === 'cycleId') return 'cycleId';
  if (field.startsWith('nodeIds')) return 'compareNodeIds';
  return null;
}

/** `must be positive (got -5)` → `Must be positive (got -5).` */
export function sentence(reason: string): string {
  const s = reason.trim();
  if (!s) return s;
  const capital = s[0].toUpperCase() + s.slice(1);
  return /[.!?]$/.test(capital) ? capital : `${capital}.`;
}
