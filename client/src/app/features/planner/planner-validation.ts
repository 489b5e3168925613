/**
 * Every bad field of the planner at once, in the user's own numbers. The science core stops at
 * the first bad input and speaks of converted values (a de-reddened colour, a magnitude moved
 * to the node's band); the form checks each field against the same ranges beforehand (the
 * core's constants, so the ranges stay one source) and says what the user typed, with one range
 * notation throughout: "between −2 and 25 mag".
 */
import type { TelescopeNode } from '@spincycle/shared/facility/facility-types';
import { colourLabel, MAX_REDDENING_EBV_MAG, REDDENING_RATIOS, type TargetColourSystem } from '@spincycle/shared/science/colour-sequence';
import { SUPPORTED_COLOUR_DOMAIN } from '@spincycle/shared/science/gyrochronology';
import { parseDec, parseRa } from '@spincycle/shared/sky/ra-dec-parser';
import { SkyInputError } from '@spincycle/shared/sky/sky-input-error';
import { between, displayNumber as rangeNumber } from '@spincycle/shared/http/range-text';
import { colourPlausibilityWarning } from '@spincycle/shared/proposals/colour-plausibility';
import { plainSentence } from '../../ui/text/plan-wording';
import { COMPLETENESS_PERCENT_RANGE, type FieldErrors, type PlannerField, type PlannerValue } from './planner-form';

/** Ranges of the science core (visit-precision.ts, target-plan.ts), in the form's units. */
export const MAGNITUDE_RANGE = { min: -2, max: 25 } as const;
export const PERIOD_RANGE_DAYS = { min: 0.05, max: 1000 } as const;
export const PERIOD_UNCERTAINTY_RANGE_DAYS = { min: 0, max: 1000 } as const;
export const FALSE_ALARM_RANGE = { min: 0, max: 0.5 } as const;

/** The product's one number and range notation (shared with the server's messages). */
export { between, displayNumber as rangeNumber } from '@spincycle/shared/http/range-text';

/** The range of an observed colour that the relations accept, after the typed E(B−V). */
export function observedColourRange(system: TargetColourSystem, ebv: number): { min: number; max: number; minExclusive: boolean } {
  const d = SUPPORTED_COLOUR_DOMAIN[system];
  const shift = REDDENING_RATIOS[system].ratio * ebv;
  return { min: d.min + shift, max: d.max + shift, minExclusive: d.minExclusive };
}

function inColourRange(value: number, system: TargetColourSystem, ebv: number): boolean {
  const r = observedColourRange(system, ebv);
  return (r.minExclusive ? value > r.min : value >= r.min) && value <= r.max;
}

const OTHER_SYSTEM: Readonly<Record<TargetColourSystem, TargetColourSystem>> = { BPRP: 'BV', BV: 'BPRP' };

/** The E(B−V) the colour checks use: the typed one when it is valid, else none. */
function usableReddening(value: PlannerValue): number {
  const e = value.reddeningEbv;
  return e !== null && Number.isFinite(e) && e >= 0 && e <= MAX_REDDENING_EBV_MAG ? e : 0;
}

/**
 * A warning next to the colour system when the typed colour is implausible for it (outside the
 * F5V–M5V dwarf sequence of that system, after the typed reddening): the same check and words
 * as the target dialog and the CSV upload (shared/src/proposals/colour-plausibility.ts). Null
 * otherwise.
 */
export function colourSystemWarning(value: PlannerValue): string | null {
  const v = value.colourValue;
  const ebv = usableReddening(value);
  // A colour no relation takes in either system gets its error under the field; said once.
  if (
    v !== null &&
    Number.isFinite(v) &&
    !inColourRange(v, value.colourSystem, ebv) &&
    !inColourRange(v, OTHER_SYSTEM[value.colourSystem], ebv)
  )
    return null;
  return colourPlausibilityWarning(v, value.colourSystem, ebv);
}

/** Every bad field of the star, node and detection inputs, in the user's own numbers. */
export function validatePlannerValue(
  value: PlannerValue,
  node: Pick<TelescopeNode, 'code' | 'minExposureSeconds' | 'maxExposureSeconds'> | null,
): FieldErrors {
  const errors: FieldErrors = {};
  const typed = (v: number) => ` (you typed ${String(v)})`;
  const set = (field: PlannerField, message: string) => {
    errors[field] = message;
  };

  // Colour, in the chosen system, after the typed reddening.
  const c = value.colourValue;
  const system = value.colourSystem;
  const label = colourLabel(system);
  if (c === null) set('colourValue', `Enter the ${label} colour.`);
  else {
    const ebv = usableReddening(value);
    const r = observedColourRange(system, ebv);
    if (!Number.isFinite(c) || !inColourRange(c, system, ebv)) {
      const reddened = ebv > 0 ? ` with E(B−V) = ${rangeNumber(ebv)}` : '';
      const edge = r.minExclusive && c === r.min ? `, ${rangeNumber(r.min)} itself excluded` : '';
      // A value of the other system is said once, beside the system toggle (colourSystemWarning).
      set(
        'colourValue',
        `Enter a ${label} colour ${between(Math.round(r.min * 100) / 100, Math.round(r.max * 100) / 100, 'mag')}${reddened}${edge}${typed(c)}.`,
      );
    }
  }

  const e = value.reddeningEbv;
  if (e !== null && !(Number.isFinite(e) && e >= 0 && e <= MAX_REDDENING_EBV_MAG)) {
    set('reddeningEbv', `Enter an E(B−V) ${between(0, MAX_REDDENING_EBV_MAG, 'mag')}, or leave it empty${typed(e)}.`);
  }

  const age = value.ageMyr;
  if (age === null) set('ageMyr', 'Enter the age.');
  else if (!(Number.isFinite(age) && age > 0)) set('ageMyr', `Enter an age above 0 Myr${typed(age)}.`);

  const ageSigma = value.ageUncertaintyMyr;
  if (ageSigma !== null && !(Number.isFinite(ageSigma) && ageSigma >= 0)) {
    set('ageUncertaintyMyr', `Enter an age uncertainty of 0 Myr or more, or leave it empty${typed(ageSigma)}.`);
  }

  const m = value.magnitude;
  if (m === null) set('magnitude', 'Enter the magnitude.');
  else if (!(Number.isFinite(m) && m >= MAGNITUDE_RANGE.min && m <= MAGNITUDE_RANGE.max)) {
    set('magnitude', `Enter a magnitude ${between(MAGNITUDE_RANGE.min, MAGNITUDE_RANGE.max, 'mag')}${typed(m)}.`);
  }

  const p = value.periodDays;
  const ps = value.periodUncertaintyDays;
  if (p !== null && !(Number.isFinite(p) && p >= PERIOD_RANGE_DAYS.min && p <= PERIOD_RANGE_DAYS.max)) {
    set('periodDays', `Enter a period ${between(PERIOD_RANGE_DAYS.min, PERIOD_RANGE_DAYS.max, 'd')}${typed(p)}.`);
  } else if (p === null && ps !== null) set('periodDays', 'Enter the period as well, or clear its uncertainty.');
  if (ps !== null && !(Number.isFinite(ps) && ps >= PERIOD_UNCERTAINTY_RANGE_DAYS.min && ps <= PERIOD_UNCERTAINTY_RANGE_DAYS.max)) {
    set(
      'periodUncertaintyDays',
      `Enter a period uncertainty ${between(PERIOD_UNCERTAINTY_RANGE_DAYS.min, PERIOD_UNCERTAINTY_RANGE_DAYS.max, 'd')}${typed(ps)}.`,
    );
  }

  if (value.exposureMode === 'fixed') {
    const t = value.exposureSeconds;
    if (t === null) set('exposureSeconds', 'Enter the exposure, or choose automatic.');
    else if (node && !(Number.isFinite(t) && t >= node.minExposureSeconds && t <= node.maxExposureSeconds)) {
      set(
        'exposureSeconds',
        `Enter an exposure ${between(node.minExposureSeconds, node.maxExposureSeconds, 's')} on ${node.code}${typed(t)}.`,
      );
    }
  }

  const fap = value.falseAlarmProbability;
  if (fap === null) set('falseAlarmProbability', 'Enter the false-alarm probability.');
  else if (!(Number.isFinite(fap) && fap > FALSE_ALARM_RANGE.min && fap < FALSE_ALARM_RANGE.max)) {
    set(
      'falseAlarmProbability',
      `Enter a false-alarm probability ${between(FALSE_ALARM_RANGE.min, FALSE_ALARM_RANGE.max)}, both excluded${typed(fap)}.`,
    );
  }

  const pc = value.completenessPercent;
  const { min, max } = COMPLETENESS_PERCENT_RANGE;
  if (pc === null) set('completenessPercent', `Enter a completeness ${between(min, max, '%')}.`);
  else if (!(Number.isFinite(pc) && pc >= min && pc <= max))
    set('completenessPercent', `Enter a completeness ${between(min, max, '%')}${typed(pc)}.`);
  return errors;
}

/**
 * The right ascension and declination, each checked on its own so that both errors show at
 * once; range errors said with the planner's range notation and the text the user typed.
 */
export function validateRaDec(raText: string, decText: string): FieldErrors {
  const errors: FieldErrors = {};
  const ra = raText.trim();
  const dec = decText.trim();
  if (!ra && !dec) return errors;
  if (!ra) errors.ra = 'Enter the right ascension as well.';
  if (!dec) errors.dec = 'Enter the declination as well.';
  if (ra) {
    try {
      parseRa(ra);
    } catch (error) {
      if (!(error instanceof SkyInputError)) throw error;
      errors.ra = /must be below (24 h|360°)|cannot be negative/.test(error.reason)
        ? `Enter a right ascension ${between(0, 24, 'h')} (or ${between(0, 360, '°')}) (you typed ${ra}).`
        : plainSentence(error.reason);
    }
  }
  if (dec) {
    try {
      parseDec(dec);
    } catch (error) {
      if (!(error instanceof SkyInputError)) throw error;
      errors.dec = /must be (within|between)/.test(error.reason)
        ? `Enter a declination ${between(-90, 90, '°')} (you typed ${dec}).`
        : plainSentence(error.reason);
    }
  }
  return errors;
}

/**
 * A science-core error on a field the form's checks let through, said plainly: "must be between
 * 2 and 300 (got 1000)" becomes "Enter a value between 2 and 300 (after conversion: 1000)." so
 * the converted number is never presented as what the user typed.
 */
export function scienceErrorMessage(reason: string): string {
  const range = /must be between ([−-]?[\d.e+]+)°? and ([−-]?[\d.e+]+)°?[^(]*\(got ([^)]+)\)/.exec(reason);
  const num = (text: string) => Number(text.replace('−', '-'));
  if (range) return `Enter a value ${between(num(range[1]), num(range[2]))}; after conversion the plan got ${range[3]}.`;
  return plainSentence(reason);
}
