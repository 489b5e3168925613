/**
 * Checks the input of `computeSkyWindows` and resolves defaults. Every refusal is a
 * `SkyInputError` naming the field (`site.timeZone`, `targets[3].decDeg`, …); nothing invalid
 * reaches the arithmetic, so no NaN can come out of bad input.
 */
import { InverseRefraction } from 'astronomy-engine';
import { altitudeForAirmassDeg } from './airmass-limit';
import { assertTimeZone, parseNightDate } from './local-nights';
import { SkyInputError, describeValue, requireFiniteInRange } from './sky-input-error';
import { displayNumber } from '../http/range-text';
import type { RefractionMode, ResolvedSkyLimits, SkyLimits, SkySite, SkyTarget, SkyWindowsInput } from './sky-types';

/** Longest campaign accepted, nights (three years). */
export const MAX_CAMPAIGN_NIGHTS = 1100;
/** Most targets accepted in one call. */
export const MAX_TARGETS = 100_000;
/** Default Sun altitude limit: astronomical darkness. */
export const DEFAULT_SUN_ALTITUDE_LIMIT_DEG = -18;

const REFRACTION_MODES: readonly RefractionMode[] = ['normal', 'none'];

function requireObject(value: unknown, field: string): Record<string, unknown> {
  if (typeof value !== 'object' || value === null || Array.isArray(value)) {
    throw new SkyInputError(field, `must be an object, got ${describeValue(value)}`);
  }
  return value as Record<string, unknown>;
}

function optionalInRange(value: unknown, field: string, min: number, max: number): number | undefined {
  return value === undefined ? undefined : requireFiniteInRange(value, field, min, max);
}

/** Validates a site (latitude, longitude east-positive, elevation, IANA time zone). */
export function validateSite(site: unknown, field = 'site'): SkySite {
  const s = requireObject(site, field);
  return {
    latitudeDeg: requireFiniteInRange(s['latitudeDeg'], `${field}.latitudeDeg`, -90, 90, '°'),
    longitudeDeg: requireFiniteInRange(s['longitudeDeg'], `${field}.longitudeDeg`, -180, 180, '°'),
    elevationM: requireFiniteInRange(s['elevationM'], `${field}.elevationM`, -500, 9000, 'm'),
    timeZone: assertTimeZone(s['timeZone'], `${field}.timeZone`),
  };
}

/** Validates limits and resolves defaults and the airmass → altitude conversion. */
export function resolveLimits(limits: unknown, field = 'limits'): ResolvedSkyLimits {
  const l = requireObject(limits, field) as SkyLimits;
  const refraction = l.refraction ?? 'normal';
  if (!REFRACTION_MODES.includes(refraction)) {
    throw new SkyInputError(`${field}.refraction`, `must be "normal" or "none", got ${describeValue(refraction)}`);
  }
  let altitudeLimitDeg: number;
  if (l.altitudeLimitDeg !== undefined && l.airmassLimit !== undefined) {
    throw new SkyInputError(`${field}.airmassLimit`, 'give either altitudeLimitDeg or airmassLimit, not both');
  } else if (l.altitudeLimitDeg !== undefined) {
    altitudeLimitDeg = requireFiniteInRange(l.altitudeLimitDeg, `${field}.altitudeLimitDeg`, -10, 89, '°');
  } else if (l.airmassLimit !== undefined) {
    altitudeLimitDeg = altitudeForAirmassDeg(l.airmassLimit as number, `${field}.airmassLimit`);
  } else {
    throw new SkyInputError(`${field}.altitudeLimitDeg`, 'is required (or give airmassLimit)');
  }
  const geometricAltitudeLimitDeg =
    refraction === 'normal' ? altitudeLimitDeg + InverseRefraction('normal', altitudeLimitDeg) : altitudeLimitDeg;
  return {
    altitudeLimitDeg,
    geometricAltitudeLimitDeg,
    sunAltitudeLimitDeg: optionalInRange(l.sunAltitudeLimitDeg, `${field}.sunAltitudeLimitDeg`, -30, 0) ?? DEFAULT_SUN_ALTITUDE_LIMIT_DEG,
    moonSeparationMinDeg: optionalInRange(l.moonSeparationMinDeg, `${field}.moonSeparationMinDeg`, 0, 180) ?? null,
    minUsableHours: optionalInRange(l.minUsableHours, `${field}.minUsableHours`, 0, 24) ?? 0,
    refraction,
  };
}

/** Validates the campaign and returns its first and last night as day numbers. */
export function validateCampaign(campaign: unknown, field = 'campaign'): { firstDay: number; lastDay: number } {
  const c = requireObject(campaign, field);
  const firstDay = parseNightDate(c['firstNight'], `${field}.firstNight`);
  const lastDay = parseNightDate(c['lastNight'], `${field}.lastNight`);
  if (lastDay < firstDay) {
    throw new SkyInputError(`${field}.lastNight`, `must not be before ${field}.firstNight (${String(c['firstNight'])})`);
  }
  if (lastDay - firstDay + 1 > MAX_CAMPAIGN_NIGHTS) {
    throw new SkyInputError(`${field}.lastNight`, `the campaign may span at most ${MAX_CAMPAIGN_NIGHTS} nights`);
  }
  return { firstDay, lastDay };
}

/** Validates one target. */
export function validateTarget(target: unknown, field: string): SkyTarget {
  const t = requireObject(target, field);
  const raDeg = t['raDeg'];
  if (typeof raDeg !== 'number' || !Number.isFinite(raDeg)) {
    throw new SkyInputError(`${field}.raDeg`, `must be a finite number, got ${describeValue(raDeg)}`);
  }
  if (raDeg < 0 || raDeg >= 360)
    throw new SkyInputError(`${field}.raDeg`, `must be from 0° up to, not including, 360°, got ${displayNumber(raDeg)}`);
  const decDeg = requireFiniteInRange(t['decDeg'], `${field}.decDeg`, -90, 90, '°');
  const name = t['name'];
  if (name !== undefined && typeof name !== 'string') {
    throw new SkyInputError(`${field}.name`, `must be a string, got ${describeValue(name)}`);
  }
  const out: SkyTarget = { raDeg, decDeg };
  if (name !== undefined) out.name = name;
  const pmRa = optionalInRange(t['pmRaCosDecMasPerYr'], `${field}.pmRaCosDecMasPerYr`, -20_000, 20_000);
  const pmDec = optionalInRange(t['pmDecMasPerYr'], `${field}.pmDecMasPerYr`, -20_000, 20_000);
  const epochYear = optionalInRange(t['epochYear'], `${field}.epochYear`, 1900, 2100);
  if (pmRa !== undefined) out.pmRaCosDecMasPerYr = pmRa;
  if (pmDec !== undefined) out.pmDecMasPerYr = pmDec;
  if (epochYear !== undefined) out.epochYear = epochYear;
  return out;
}

/** Validates the whole input of `computeSkyWindows`. */
export function validateSkyWindowsInput(input: unknown): {
  site: SkySite;
  limits: ResolvedSkyLimits;
  firstDay: number;
  lastDay: number;
  targets: SkyTarget[];
} {
  const i = requireObject(input, 'input') as unknown as SkyWindowsInput;
  const site = validateSite(i.site);
  const limits = resolveLimits(i.limits);
  const { firstDay, lastDay } = validateCampaign(i.campaign);
  if (!Array.isArray(i.targets)) throw new SkyInputError('targets', `must be an array, got ${describeValue(i.targets)}`);
  if (i.targets.length > MAX_TARGETS) throw new SkyInputError('targets', `at most ${MAX_TARGETS} targets per call`);
  const targets = i.targets.map((t, index) => validateTarget(t, `targets[${index}]`));
  return { site, limits, firstDay, lastDay, targets };
}
