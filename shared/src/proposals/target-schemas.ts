import { z } from 'zod';
import { NODE_BANDS } from '../facility/facility-types';
import { versionSchema } from '../http/ids';
import { safeMultiLineText, safeText } from '../http/text';
import { TARGET_COLOUR_SYSTEMS } from '../science/colour-sequence';

/** Most targets one proposal may hold (and one CSV may carry). */
export const MAX_TARGETS_PER_PROPOSAL = 2000;

const finite = (label: string) => z.number({ message: `${label} must be a number` }).refine(Number.isFinite, { message: `${label} must be a finite number` });

/**
 * One target row as stored and as the table form sends it (positions in J2000 degrees; the
 * CSV reader turns sexagesimal text into degrees before this schema runs).
 */
export const targetInputSchema = z.object({
  name: safeText(z.string().trim().min(1, { message: 'give the target a name' }).max(80)),
  raDeg: finite('ra').pipe(z.number().min(0, { message: 'ra must be within 0…360°' }).lt(360, { message: 'ra must be within 0…360°' })),
  decDeg: finite('dec').pipe(z.number().min(-90, { message: 'dec must be within −90…90°' }).max(90, { message: 'dec must be within −90…90°' })),
  magnitude: finite('magnitude').pipe(z.number().min(-2, { message: 'magnitude must be within −2…22' }).max(22, { message: 'magnitude must be within −2…22' })),
  magnitudeBand: z.enum(NODE_BANDS, { message: `band must be one of ${NODE_BANDS.join(', ')}` }),
  colour: finite('colour').pipe(z.number().min(-0.5, { message: 'colour must be within −0.5…6' }).max(6, { message: 'colour must be within −0.5…6' })),
  colourSystem: z.enum(TARGET_COLOUR_SYSTEMS, { message: 'colour system must be BV (B−V) or BPRP (Gaia BP−RP)' }),
  reddeningEbv: finite('ebv').pipe(z.number().min(0, { message: 'E(B−V) must be within 0…3' }).max(3, { message: 'E(B−V) must be within 0…3' })).nullable().default(null),
  ageMyr: finite('age').pipe(z.number().gt(0, { message: 'age must be positive' }).max(14000, { message: 'age must be at most 14000 Myr' })),
  ageUncertaintyMyr: finite('age uncertainty').pipe(z.number().min(0, { message: 'age uncertainty must not be negative' })).nullable().default(null),
  periodPrecisionDays: finite('period precision').pipe(z.number().gt(0, { message: 'period precision must be positive' })).nullable().default(null),
  /**
   * Expected rotation period, days, given by the proposer for a star without an expected
   * period from a gyrochronology relation (fast rotators, colours beyond a relation's range,
   * ages above the age of the universe); when given, the plan uses it instead of the relation's.
   */
  periodDays: finite('period').pipe(z.number().min(0.05, { message: 'period must be within 0.05…1000 d' }).max(1000, { message: 'period must be within 0.05…1000 d' })).nullable().default(null),
  /** 1σ uncertainty of `periodDays`, days; only with a period. */
  periodUncertaintyDays: finite('period uncertainty').pipe(z.number().min(0, { message: 'period uncertainty must not be negative' })).nullable().default(null),
  notes: safeMultiLineText(z.string().max(500, { message: 'notes: at most 500 characters' })).default(''),
}).refine((t) => t.periodUncertaintyDays === null || t.periodDays !== null, {
  message: 'period uncertainty needs a period',
  path: ['periodUncertaintyDays'],
});
export type TargetInput = z.input<typeof targetInputSchema>;
export type TargetValues = z.output<typeof targetInputSchema>;

/** PUT /api/proposals/:id/targets/:targetId carries the row's version. */
export const targetUpdateSchema = z.object({ version: versionSchema, target: targetInputSchema });

/** A stored target. */
export interface TargetRow extends TargetValues {
  id: number;
  position: number;
  version: number;
}

/**
 * Columns of the target-list CSV, in order (header names are case-insensitive; `name`, `ra`,
 * `dec`, `magnitude`, `band`, `colour`, `colour_system` and `age_myr` are required). `ra` accepts degrees, `12.5h` or sexagesimal hours (`12:30:00`); `dec`
 * degrees or sexagesimal degrees (`-05:20:30`).
 */
export const TARGET_CSV_COLUMNS = [
  { name: 'name', required: true, help: 'target name, unique within the list' },
  { name: 'ra', required: true, help: 'J2000 right ascension: degrees (187.5), hours (12.5h) or sexagesimal hours (12:30:00)' },
  { name: 'dec', required: true, help: 'J2000 declination: degrees (-5.34) or sexagesimal (-05:20:30)' },
  { name: 'magnitude', required: true, help: 'apparent magnitude' },
  { name: 'band', required: true, help: 'band of the magnitude: B, V, R, I or G (Gaia)' },
  { name: 'colour', required: true, help: 'colour index value' },
  { name: 'colour_system', required: true, help: 'BV for B−V, BPRP for Gaia BP−RP' },
  { name: 'ebv', required: false, help: 'reddening E(B−V), mag (empty for none)' },
  { name: 'age_myr', required: true, help: 'age, Myr' },
  { name: 'age_err_myr', required: false, help: '1σ age uncertainty, Myr' },
  { name: 'period_precision_d', required: false, help: 'requested 1σ period precision, days' },
  {
    name: 'period',
    required: false,
    help: 'expected rotation period, days (also read as period_d): only for stars without an expected period from their colour and age (fast rotators, M dwarfs beyond the relations)',
  },
  { name: 'period_error', required: false, help: '1σ uncertainty of the expected period, days (also read as period_err_d); needs a period' },
  { name: 'notes', required: false, help: 'free text' },
] as const;

/**
 * Other header names read as a column of TARGET_CSV_COLUMNS (after lower-casing and turning
 * spaces and hyphens into underscores): the unit-suffixed spelling of the other columns.
 */
export const TARGET_CSV_HEADER_ALIASES: Readonly<Record<string, (typeof TARGET_CSV_COLUMNS)[number]['name']>> = {
  period_d: 'period',
  period_err_d: 'period_error',
  period_error_d: 'period_error',
};

/**
 * One problem of an uploaded list: row 1 is the first data row after the header; row 0 is the
 * header itself (missing or unknown columns). `field` is the CSV column name.
 */
export interface CsvRowError {
  row: number;
  field: string;
  message: string;
}

/** POST /api/proposals/:id/targets/upload?mode=replace|append (default replace). */
export const targetUploadQuerySchema = z.object({
  mode: z.enum(['replace', 'append'], { message: 'mode must be replace or append' }).default('replace'),
});
export type TargetUploadMode = z.output<typeof targetUploadQuerySchema>['mode'];

/** Answer of a successful upload: the whole list as stored now. */
export interface TargetUploadResult {
  mode: TargetUploadMode;
  /** Rows read from the file and stored. */
  added: number;
  /** Rows removed first (replace mode; 0 in append mode). */
  removed: number;
  targets: TargetRow[];
}

/**
 * 400 `invalid_target_list` body: the usual error body plus every problem of the file
 * (`fieldErrors` carries the same problems keyed `rows.<row>.<column>`).
 */
export interface TargetListErrorBody {
  code: string;
  message: string;
  fieldErrors?: Record<string, string[]>;
  rows: CsvRowError[];
}
