/**
 * A warning, not an error, when a target's colour is implausible for the colour system it is
 * given in: the usual mix-up is a Gaia BP−RP typed as B−V (or the other way round), which the
 * schema cannot refuse because both are valid numbers. The plausible span of each system is the
 * science core's dwarf colour sequence (F5V–M5V, Pecaut & Mamajek 2013, in
 * `science/colour-sequence.ts`), moved redward by the target's reddening.
 */
import {
  colourLabel,
  DWARF_SEQUENCE,
  MAX_REDDENING_EBV_MAG,
  REDDENING_RATIOS,
  sequenceRange,
  type TargetColourSystem,
} from '../science/colour-sequence';
import { between, displayNumber } from '../http/range-text';

const OTHER_SYSTEM: Readonly<Record<TargetColourSystem, TargetColourSystem>> = { BPRP: 'BV', BV: 'BPRP' };

/** Spectral types at the two ends of the dwarf sequence ("F5V", "M5V"). */
const FIRST_TYPE = DWARF_SEQUENCE[0].spectralType;
const LAST_TYPE = DWARF_SEQUENCE[DWARF_SEQUENCE.length - 1].spectralType;

/** The observed colours of F5V–M5V dwarfs in one system, after `ebv` of reddening, mag. */
export function plausibleColourRange(system: TargetColourSystem, ebv: number | null = null): { min: number; max: number } {
  const { min, max } = sequenceRange(system);
  const e = ebv !== null && Number.isFinite(ebv) && ebv >= 0 && ebv <= MAX_REDDENING_EBV_MAG ? ebv : 0;
  const shift = REDDENING_RATIOS[system].ratio * e;
  return { min: min + shift, max: max + shift };
}

const round2 = (v: number) => Math.round(v * 100) / 100;

function inRange(value: number, r: { min: number; max: number }): boolean {
  return value >= r.min && value <= r.max;
}

/**
 * The warning to show beside a colour that lies outside the F5V–M5V dwarf sequence of its
 * system (null when plausible, empty or not a number). When the value is plausible in the other
 * system, the warning says so: "check the colour system".
 */
export function colourPlausibilityWarning(
  colour: number | null | undefined,
  system: TargetColourSystem,
  ebv: number | null = null,
): string | null {
  if (colour === null || colour === undefined || !Number.isFinite(colour)) return null;
  const range = plausibleColourRange(system, ebv);
  if (inRange(colour, range)) return null;
  const other = OTHER_SYSTEM[system];
  const label = colourLabel(system);
  const reddened = ebv ? ` with E(B−V) = ${displayNumber(ebv)}` : '';
  const where = `A ${label} of ${displayNumber(colour)} mag is outside the ${FIRST_TYPE}–${LAST_TYPE} dwarfs (${between(round2(range.min), round2(range.max), 'mag')}${reddened})`;
  if (inRange(colour, plausibleColourRange(other, ebv))) return `${where}, but a plausible ${colourLabel(other)}: check the colour system.`;
  return `${where}: check the value.`;
}
