/**
 * Colour sequence of main-sequence dwarfs: converts between B−V, BP−RP, V−Ks, Teff, mass
 * and Mv by linear interpolation in the dwarf table of SCIENCE.md §4, and removes
 * interstellar reddening.
 *
 * Table: Pecaut & Mamajek (2013), ApJS 208, 9, Table 5 (updated table v2024.05.15 by its
 * author), rows F5V–M5V as copied into SCIENCE.md §4 [paper].
 */
import { between, displayNumber } from '../http/range-text';
import { ScienceInputError, requireFinite, requireNonNegative } from './science-input-error';

/** Colour systems a target's colour may be given in. */
export const TARGET_COLOUR_SYSTEMS = ['BV', 'BPRP'] as const;
export type TargetColourSystem = (typeof TARGET_COLOUR_SYSTEMS)[number];

/** Colour systems the sequence converts between (V−Ks is used by the Wright 2018 τ scale). */
export const COLOUR_SYSTEMS = ['BV', 'BPRP', 'VKs'] as const;
export type ColourSystem = (typeof COLOUR_SYSTEMS)[number];

/** A colour index in magnitudes and the system it is measured in. */
export interface ColourValue {
  value: number;
  system: ColourSystem;
}

/** Quantities the dwarf sequence can be entered by. */
export type SequenceQuantity = ColourSystem | 'teffK' | 'massSolar' | 'absMagV';

/** One interpolated point of the dwarf sequence. */
export interface DwarfSequencePoint {
  bvMag: number;
  bpRpMag: number;
  vKsMag: number;
  teffK: number;
  massSolar: number;
  /** Absolute V magnitude Mv. */
  absMagV: number;
  /** Spectral type of the nearest table row (for display). */
  nearestSpectralType: string;
}

interface SequenceRow {
  spectralType: string;
  teffK: number;
  bvMag: number;
  bpRpMag: number;
  vKsMag: number;
  absMagV: number;
  massSolar: number;
}

/** Pecaut & Mamajek (2013), ApJS 208, 9, Table 5 (v2024.05.15), as in SCIENCE.md §4 [paper]. */
export const DWARF_SEQUENCE: readonly SequenceRow[] = [
  row('F5V', 6550, 0.44, 0.587, 1.079, 3.37, 1.32),
  row('F8V', 6180, 0.53, 0.694, 1.29, 4.05, 1.16),
  row('G0V', 5930, 0.595, 0.784, 1.437, 4.48, 1.07),
  row('G2V', 5770, 0.65, 0.823, 1.564, 4.8, 1.0),
  row('G5V', 5660, 0.68, 0.85, 1.635, 4.98, 0.98),
  row('G8V', 5480, 0.73, 0.9, 1.768, 5.3, 0.93),
  row('K0V', 5290, 0.816, 0.983, 1.953, 5.78, 0.86),
  row('K2V', 5100, 0.884, 1.1, 2.13, 6.07, 0.82),
  row('K3V', 4870, 0.99, 1.19, 2.35, 6.53, 0.76),
  row('K4V', 4600, 1.09, 1.34, 2.7, 6.99, 0.72),
  row('K5V', 4440, 1.15, 1.43, 2.88, 7.28, 0.7),
  row('K7V', 4090, 1.34, 1.7, 3.35, 8.2, 0.64),
  row('M0V', 3850, 1.42, 1.84, 3.65, 8.8, 0.585),
  row('M1V', 3660, 1.485, 2.09, 4.0, 9.64, 0.51),
  row('M2V', 3560, 1.505, 2.23, 4.23, 10.21, 0.45),
  row('M3V', 3430, 1.53, 2.5, 4.6, 11.15, 0.36),
  row('M4V', 3210, 1.65, 2.94, 5.25, 12.61, 0.24),
  row('M5V', 3060, 1.83, 3.35, 5.95, 14.15, 0.155),
];

export const DWARF_SEQUENCE_SOURCE = 'Pecaut & Mamajek (2013), ApJS 208, 9, Table 5 (v2024.05.15), linear interpolation';

function row(
  spectralType: string,
  teffK: number,
  bvMag: number,
  bpRpMag: number,
  vKsMag: number,
  absMagV: number,
  massSolar: number,
): SequenceRow {
  return { spectralType, teffK, bvMag, bpRpMag, vKsMag, absMagV, massSolar };
}

const COLUMN: Record<SequenceQuantity, keyof Omit<SequenceRow, 'spectralType'>> = {
  BV: 'bvMag',
  BPRP: 'bpRpMag',
  VKs: 'vKsMag',
  teffK: 'teffK',
  massSolar: 'massSolar',
  absMagV: 'absMagV',
};

/** Unit of each quantity, for messages. */
const UNIT: Record<SequenceQuantity, string> = { BV: 'mag', BPRP: 'mag', VKs: 'mag', teffK: 'K', massSolar: 'M☉', absMagV: 'mag' };

const LABEL: Record<SequenceQuantity, string> = {
  BV: 'B−V',
  BPRP: 'BP−RP',
  VKs: 'V−Ks',
  teffK: 'Teff',
  massSolar: 'mass',
  absMagV: 'Mv',
};

/** Human label of a colour system (`B−V`, `BP−RP`, `V−Ks`). */
export function colourLabel(system: SequenceQuantity): string {
  return LABEL[system];
}

/** The table's span of one quantity, `[min, max]`. */
export function sequenceRange(quantity: SequenceQuantity): { min: number; max: number } {
  const col = COLUMN[quantity];
  const a = DWARF_SEQUENCE[0][col];
  const b = DWARF_SEQUENCE[DWARF_SEQUENCE.length - 1][col];
  return { min: Math.min(a, b), max: Math.max(a, b) };
}

/**
 * Interpolates every column of the dwarf sequence at one value of `quantity` (every column
 * of the table is strictly monotonic, so any of them can enter it).
 * Throws {@link ScienceInputError} naming `field` outside the table's span: the sequence is
 * not extrapolated.
 */
export function dwarfSequenceAt(quantity: SequenceQuantity, value: number, field = 'value'): DwarfSequencePoint {
  requireFinite(value, field);
  const col = COLUMN[quantity];
  const rows = DWARF_SEQUENCE;
  const n = rows.length;
  const increasing = rows[n - 1][col] > rows[0][col];
  const { min, max } = sequenceRange(quantity);
  if (value < min || value > max) {
    throw new ScienceInputError(
      field,
      `${LABEL[quantity]} ${displayNumber(value)} is outside the dwarf colour sequence (${between(min, max, UNIT[quantity])}, ${rows[0].spectralType}–${rows[n - 1].spectralType}; Pecaut & Mamajek 2013)`,
    );
  }
  // Segment i..i+1 that brackets the value (tables are short: a linear scan is fastest).
  let i = 0;
  while (i < n - 2 && (increasing ? value > rows[i + 1][col] : value < rows[i + 1][col])) i++;
  const a = rows[i];
  const b = rows[i + 1];
  const f = (value - a[col]) / (b[col] - a[col]);
  // The quantity given is returned as given; the others are interpolated (no closure here: the
  // runtime's loader names each closure it creates, a cost on this hot path).
  return {
    bvMag: col === 'bvMag' ? value : a.bvMag + f * (b.bvMag - a.bvMag),
    bpRpMag: col === 'bpRpMag' ? value : a.bpRpMag + f * (b.bpRpMag - a.bpRpMag),
    vKsMag: col === 'vKsMag' ? value : a.vKsMag + f * (b.vKsMag - a.vKsMag),
    teffK: col === 'teffK' ? value : a.teffK + f * (b.teffK - a.teffK),
    massSolar: col === 'massSolar' ? value : a.massSolar + f * (b.massSolar - a.massSolar),
    absMagV: col === 'absMagV' ? value : a.absMagV + f * (b.absMagV - a.absMagV),
    nearestSpectralType: f < 0.5 ? a.spectralType : b.spectralType,
  };
}

/** Reads one quantity from a sequence point. */
export function sequenceValue(point: DwarfSequencePoint, quantity: SequenceQuantity): number {
  return point[COLUMN[quantity]];
}

/** Converts a dwarf's intrinsic colour from one system to another through the sequence. */
export function convertColour(value: number, from: ColourSystem, to: ColourSystem, field = 'colour.value'): number {
  if (from === to) return requireFinite(value, field);
  return sequenceValue(dwarfSequenceAt(from, value, field), to);
}

/**
 * Colour excess per unit E(B−V), for a diffuse-ISM extinction law with R_V = 3.1.
 * - BP−RP: E(BP−RP)/E(B−V) = 1.339, Casagrande & VandenBerg (2018), MNRAS 479, L102,
 *   Table 2 (R_BP = 3.374, R_RP = 2.035) — from memory.
 * - V−Ks: E(V−Ks)/E(B−V) = R_V·(1 − A_K/A_V) = 3.1 × (1 − 0.114) = 2.747, with A_K/A_V = 0.114
 *   from Cardelli, Clayton & Mathis (1989), ApJ 345, 245, Table 3 — from memory (the ratio
 *   itself derived).
 */
export const REDDENING_RATIOS: Readonly<Record<ColourSystem, { ratio: number; source: string }>> = {
  BV: { ratio: 1, source: 'definition of E(B−V)' },
  // Both ratios from memory (docs/science.md "Checked values": paper confirmed, values not reached).
  BPRP: { ratio: 1.339, source: 'Casagrande & VandenBerg (2018), MNRAS 479, L102, Table 2' },
  VKs: {
    ratio: 3.1 * (1 - 0.114),
    source: 'Cardelli, Clayton & Mathis (1989), ApJ 345, 245, Table 3, A_K/A_V = 0.114 with R_V = 3.1',
  },
};

/** Largest E(B−V) accepted, mag: beyond it the target is not a plausible field dwarf for this tool. */
export const MAX_REDDENING_EBV_MAG = 3;

/** Validates E(B−V) (absent means 0). */
export function validateReddening(ebvMag: number | undefined, field = 'reddeningEbvMag'): number {
  if (ebvMag === undefined) return 0;
  const v = requireNonNegative(ebvMag, field);
  if (v > MAX_REDDENING_EBV_MAG) throw new ScienceInputError(field, `must be at most ${MAX_REDDENING_EBV_MAG} mag (got ${v})`);
  return v;
}

/** Removes reddening: intrinsic colour = observed − E(system), with E(system) = ratio·E(B−V). */
export function deredden(colour: ColourValue, ebvMag: number, field = 'reddeningEbvMag'): ColourValue {
  const e = validateReddening(ebvMag, field);
  return { value: colour.value - REDDENING_RATIOS[colour.system].ratio * e, system: colour.system };
}

/** Adds reddening: observed colour = intrinsic + ratio·E(B−V). */
export function redden(colour: ColourValue, ebvMag: number, field = 'reddeningEbvMag'): ColourValue {
  const e = validateReddening(ebvMag, field);
  return { value: colour.value + REDDENING_RATIOS[colour.system].ratio * e, system: colour.system };
}

/** A target colour after de-reddening, placed on the dwarf sequence. */
export interface ResolvedColour {
  observed: ColourValue;
  reddeningEbvMag: number;
  intrinsic: ColourValue;
  /** The interpolated dwarf sequence at the intrinsic colour; null when outside the table. */
  sequence: DwarfSequencePoint | null;
}

/**
 * De-reddens a target colour and places it on the dwarf sequence (null outside the table;
 * callers that need the sequence throw then).
 */
export function resolveColour(
  colour: { value: number; system: TargetColourSystem | ColourSystem },
  reddeningEbvMag: number | undefined,
  field = 'colour',
): ResolvedColour {
  requireFinite(colour?.value, `${field}.value`);
  if (!(COLOUR_SYSTEMS as readonly string[]).includes(colour.system)) {
    throw new ScienceInputError(`${field}.system`, `must be one of ${COLOUR_SYSTEMS.join(', ')} (got ${String(colour.system)})`);
  }
  const ebv = validateReddening(reddeningEbvMag);
  const observed: ColourValue = { value: colour.value, system: colour.system };
  const intrinsic = deredden(observed, ebv);
  const { min, max } = sequenceRange(colour.system);
  const sequence =
    intrinsic.value >= min && intrinsic.value <= max ? dwarfSequenceAt(colour.system, intrinsic.value, `${field}.value`) : null;
  return { observed, reddeningEbvMag: ebv, intrinsic, sequence };
}

/**
 * The resolved colour's sequence point, or a ScienceInputError when it lies outside the table.
 * The message quotes the colour as typed; with reddening it also says what removing it gave.
 */
export function requireSequence(resolved: ResolvedColour, field = 'colour.value'): DwarfSequencePoint {
  if (resolved.sequence) return resolved.sequence;
  const system = resolved.intrinsic.system;
  const { min, max } = sequenceRange(system);
  const typed = `${LABEL[resolved.observed.system]} ${displayNumber(resolved.observed.value)}`;
  const dereddened =
    resolved.reddeningEbvMag > 0
      ? ` (${displayNumber(round(resolved.intrinsic.value))} after removing the reddening E(B−V) = ${displayNumber(resolved.reddeningEbvMag)})`
      : '';
  throw new ScienceInputError(
    field,
    `${typed}${dereddened} is outside the dwarf colour sequence (${between(min, max, UNIT[system])}; Pecaut & Mamajek 2013)`,
  );
}

function round(v: number): number {
  return Math.round(v * 1000) / 1000;
}
