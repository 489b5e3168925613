/**
 * The age a measured period implies through the target's gyrochronology relation, with its
 * cautions, and the period a target without a plan is expected to have.
 *
 * Cautions from `estimateAge` (gyrochronology.ts): outside the relation's calibrated colours,
 * above the Kraft break, B−V no longer tracking mass, below the slow-rotator sequence
 * (saturated fast rotator, Ro ≤ 0.1 on the Noyes scale), weakened braking (van Saders et al.
 * 2016), an age outside the calibrated ages, a K or M dwarf that may not have converged. Added
 * here: a fully convective star, and a period that is only tentative or may be an alias.
 */
import type { ExpectedPeriod, ImpliedAge, RotationVerdict } from '../../photometry/photometry';
import type { TargetColourSystem } from '../colour-sequence';
import { type ScienceFlag, flag, fmt } from '../explained';
import { type GyroRelationId, GYRO_RELATION_INFO, estimateAge, predictPeriod } from '../gyrochronology';
import { isScienceInputError } from '../science-input-error';

/** The star as the age needs it. */
export interface StarForAge {
  colour: { value: number; system: TargetColourSystem };
  reddeningEbvMag?: number | null;
  relation: GyroRelationId;
}

/**
 * Mass (M☉) at and below which a dwarf is fully convective: ≈ 0.35 M☉, Chabrier & Baraffe
 * (1997), A&A 327, 1039 (from memory). Such stars keep spinning fast for billions of years and
 * then spin down abruptly; the relations were not calibrated on them.
 */
export const FULLY_CONVECTIVE_MASS_SOLAR = 0.35;
const FULLY_CONVECTIVE_SOURCE =
  'Chabrier & Baraffe (1997), A&A 327, 1039 (from memory); dwarf sequence: Pecaut & Mamajek (2013), ApJS 208, 9';

/** The implied age (null when the verdict is not_detected or there is no star). */
export function impliedAge(
  star: StarForAge | null,
  periodDays: number,
  periodUncertaintyDays: number | null,
  verdict: RotationVerdict,
  aliasFlagged: boolean,
): ImpliedAge | null {
  if (!star || verdict === 'not_detected') return null;
  const info = GYRO_RELATION_INFO[star.relation];
  const base = { relation: star.relation, relationLabel: info?.label ?? String(star.relation), source: info?.citation ?? '' };
  const extra: ScienceFlag[] = [];
  if (verdict === 'tentative') {
    extra.push(flag('tentativePeriod', 'caution', 'the period is only tentative, so is the age'));
  }
  if (aliasFlagged) {
    extra.push(flag('possibleAlias', 'caution', 'the period may be an alias of another; the age would change with it'));
  }
  try {
    const a = estimateAge({
      relation: star.relation,
      colour: star.colour,
      reddeningEbvMag: star.reddeningEbvMag ?? undefined,
      periodDays,
      periodUncertaintyDays: periodUncertaintyDays ?? undefined,
    });
    const flags = [...a.flags, ...extra];
    const mass = a.colour.sequence?.massSolar;
    if (mass !== undefined && mass <= FULLY_CONVECTIVE_MASS_SOLAR) {
      flags.push(
        flag(
          'fullyConvective',
          'caution',
          `mass ≈ ${fmt(mass, 2)} M☉ on the dwarf sequence, at or below ≈ ${FULLY_CONVECTIVE_MASS_SOLAR} M☉: a fully convective star, whose spin-down the relations were not calibrated on; the age may be far off`,
          FULLY_CONVECTIVE_SOURCE,
        ),
      );
    } else if (mass === undefined && star.colour.system === 'BPRP' && a.colour.intrinsic.value > 3.35) {
      flags.push(
        flag('fullyConvective', 'caution', 'redder than the dwarf sequence (M5V): a fully convective star', FULLY_CONVECTIVE_SOURCE),
      );
    }
    if (a.noResult) return { ...base, ageMyr: null, lowMyr: null, highMyr: null, flags };
    return { ...base, ageMyr: a.ageMyr, lowMyr: a.rangeMyr.low, highMyr: a.rangeMyr.high, flags };
  } catch (err) {
    if (!isScienceInputError(err)) throw err;
    return {
      ...base,
      ageMyr: null,
      lowMyr: null,
      highMyr: null,
      flags: [flag('noGyroAge', 'blocking', `no gyrochronological age: ${err.reason}`, info?.citation), ...extra],
    };
  }
}

/**
 * The expected period of a target without a plan, through the relation at the given age
 * (range at 1σ, as the plans use by default); null when the relation has no period for it.
 */
export function expectedPeriodFor(star: StarForAge, ageMyr: number, ageUncertaintyMyr: number | null): ExpectedPeriod | null {
  try {
    const p = predictPeriod({
      relation: star.relation,
      colour: star.colour,
      reddeningEbvMag: star.reddeningEbvMag ?? undefined,
      ageMyr,
      ageUncertaintyMyr: ageUncertaintyMyr ?? undefined,
      rangeSigma: 1,
    });
    if (p.noResult) return null;
    return {
      periodDays: p.periodDays,
      lowDays: p.rangeDays.low,
      highDays: p.rangeDays.high,
      from: `${p.relationLabel} at ${fmt(ageMyr, 4)} Myr${ageUncertaintyMyr ? ` ± ${fmt(ageUncertaintyMyr, 3)}` : ''}`,
    };
  } catch (err) {
    if (isScienceInputError(err)) return null;
    throw err;
  }
}
