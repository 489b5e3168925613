/**
 * The target planner's form: typed controls with defaults that give a real plan on first
 * load, the translation of the form's value into the science core's input, and the mapping of
 * the core's `ScienceInputError.field` back to the control that shows it. Range checks are
 * the science core's (one validation source); the form only checks that required numbers are
 * there.
 */
import { FormControl, FormGroup } from '@angular/forms';
import type { NodeBand } from '@spincycle/shared/facility/facility-types';
import type { TargetColourSystem } from '@spincycle/shared/science/colour-sequence';
import type { GyroRelationId } from '@spincycle/shared/science/gyrochronology';
import type { TargetPlanOptions, TargetPlanTarget } from '@spincycle/shared/science/target-plan';

export type ExposureMode = 'auto' | 'fixed';
/** A relation, or the core's default for the colour system. */
export type RelationChoice = GyroRelationId | 'default';

/**
 * Defaults: a K dwarf (BP−RP 1.10, about K2V) of an 800 ± 100 Myr cluster at G = 11.5, the
 * kind of star a gyrochronology campaign calibrates on; FAP 1 % (the core's default).
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
} as const;

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
    nodeId: new FormControl<number | null>(null),
    exposureMode: new FormControl<ExposureMode>('auto', { nonNullable: true }),
    exposureSeconds: new FormControl<number | null>(d.exposureSeconds),
    relation: new FormControl<RelationChoice>('default', { nonNullable: true }),
    falseAlarmProbability: new FormControl<number | null>(d.falseAlarmProbability),
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
];

/** Required numbers that are missing (an empty number field reads as null). */
export function missingFields(value: PlannerValue): FieldErrors {
  const errors: FieldErrors = {};
  for (const [field, message] of REQUIRED) if (value[field] === null) errors[field] = message;
  if (value.exposureMode === 'fixed' && value.exposureSeconds === null) errors.exposureSeconds = 'Enter the exposure or choose automatic';
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
  const options: TargetPlanOptions = { falseAlarmProbability: value.falseAlarmProbability ?? Number.NaN };
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
  [/^options\.exposureSeconds$/, 'exposureSeconds'],
  [/^options\.falseAlarmProbability$/, 'falseAlarmProbability'],
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
