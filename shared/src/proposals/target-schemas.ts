import { z } from 'zod';
import { NODE_BANDS } from '../facility/facility-types';
import { versionSchema } from '../http/ids';
import { between, withTyped } from '../http/range-text';
import { safeMultiLineText, safeText } from '../http/text';
import { TARGET_COLOUR_SYSTEMS } from '../science/colour-sequence';

/** Most targets one proposal may hold (and one CSV may carry). */
export const MAX_TARGETS_PER_PROPOSAL = 2000;

/** A number field's rules, in the product's one voice (see `http/range-text.ts`). */
interface NumberRule {
  /** "the magnitude": what the empty-field message asks for. */
  noun: string;
  /** "a magnitude between −2 and 22 mag": what the range message asks for. */
  wanted: string;
  /** Optional fields may be left empty (null). */
  optional?: boolean;
}

/**
 * A number field that says, for every way it can be wrong, what to enter and what was typed:
 * "Enter a magnitude between −2 and 22 mag (you typed 40)." (zod 4 rejects NaN and ±∞ itself).
 */
function numberField(rule: NumberRule, bounds: (n: z.ZodNumber, rangeMessage: (iss: { input?: unknown }) => string) => z.ZodNumber) {
  const orEmpty = rule.optional ? ', or leave it empty' : '';
  const rangeMessage = (iss: { input?: unknown }) => withTyped(`Enter ${rule.wanted}${orEmpty}`, iss.input);
  const typeMessage = (iss: { input?: unknown }) =>
    iss.input === undefined || iss.input === null || iss.input === ''
      ? `Enter ${rule.noun}.`
      : withTyped(`Enter ${rule.noun} as a number`, iss.input);
  return bounds(z.number({ error: typeMessage }), rangeMessage);
}

const lengthMessage = (what: string, max: number) => (iss: { input?: unknown }) =>
  `Shorten ${what} to ${max} characters at most (${typeof iss.input === 'string' ? `${iss.input.length} now` : 'too long now'}).`;

/** Ranges of the target fields (the database's CHECK constraints hold the same). */
export const TARGET_RANGES = {
  magnitude: { min: -2, max: 22 },
  colour: { min: -0.5, max: 6 },
  reddeningEbv: { min: 0, max: 3 },
  ageMyr: { max: 14000 },
  periodDays: { min: 0.05, max: 1000 },
} as const;

const R = TARGET_RANGES;

/**
 * One target row as stored and as the table form sends it (positions in J2000 degrees; the
 * CSV reader turns sexagesimal text into degrees before this schema runs). Every bad field is
 * reported at once, each message naming the value that was typed.
 */
export const targetInputSchema = z
  .object({
    name: safeText(
      z
        .string({ error: 'Give the target a name.' })
        .trim()
        .min(1, { error: 'Give the target a name.' })
        .max(80, { error: lengthMessage('the name', 80) }),
    ),
    raDeg: numberField({ noun: 'the right ascension', wanted: `a right ascension ${between(0, 360, '°')}, 360° excluded` }, (n, m) =>
      n.min(0, { error: m }).lt(360, { error: m }),
    ),
    decDeg: numberField({ noun: 'the declination', wanted: `a declination ${between(-90, 90, '°')}` }, (n, m) =>
      n.min(-90, { error: m }).max(90, { error: m }),
    ),
    magnitude: numberField({ noun: 'the magnitude', wanted: `a magnitude ${between(R.magnitude.min, R.magnitude.max, 'mag')}` }, (n, m) =>
      n.min(R.magnitude.min, { error: m }).max(R.magnitude.max, { error: m }),
    ),
    magnitudeBand: z.enum(NODE_BANDS, {
      error: (iss) => withTyped(`Choose the band of the magnitude: ${NODE_BANDS.join(', ')}`, iss.input),
    }),
    colour: numberField({ noun: 'the colour index', wanted: `a colour index ${between(R.colour.min, R.colour.max, 'mag')}` }, (n, m) =>
      n.min(R.colour.min, { error: m }).max(R.colour.max, { error: m }),
    ),
    colourSystem: z.enum(TARGET_COLOUR_SYSTEMS, {
      error: (iss) => withTyped('Choose the colour system: BPRP for Gaia BP−RP or BV for B−V', iss.input),
    }),
    reddeningEbv: numberField(
      { noun: 'the reddening E(B−V)', wanted: `an E(B−V) ${between(R.reddeningEbv.min, R.reddeningEbv.max, 'mag')}`, optional: true },
      (n, m) => n.min(R.reddeningEbv.min, { error: m }).max(R.reddeningEbv.max, { error: m }),
    )
      .nullable()
      .default(null),
    ageMyr: numberField({ noun: 'the age', wanted: `an age above 0 Myr and at most ${R.ageMyr.max} Myr` }, (n, m) =>
      n.gt(0, { error: m }).max(R.ageMyr.max, { error: m }),
    ),
    ageUncertaintyMyr: numberField({ noun: 'the age uncertainty', wanted: 'an age uncertainty of 0 Myr or more', optional: true }, (n, m) =>
      n.min(0, { error: m }),
    )
      .nullable()
      .default(null),
    periodPrecisionDays: numberField({ noun: 'the period precision', wanted: 'a period precision above 0 d', optional: true }, (n, m) =>
      n.gt(0, { error: m }),
    )
      .nullable()
      .default(null),
    /**
     * Expected rotation period, days, given by the proposer for a star without an expected
     * period from a gyrochronology relation (fast rotators, colours beyond a relation's range,
     * ages above the age of the universe); when given, the plan uses it instead of the relation's.
     */
    periodDays: numberField(
      { noun: 'the period', wanted: `a period ${between(R.periodDays.min, R.periodDays.max, 'd')}`, optional: true },
      (n, m) => n.min(R.periodDays.min, { error: m }).max(R.periodDays.max, { error: m }),
    )
      .nullable()
      .default(null),
    /** 1σ uncertainty of `periodDays`, days; only with a period. */
    periodUncertaintyDays: numberField(
      { noun: 'the period uncertainty', wanted: 'a period uncertainty of 0 d or more', optional: true },
      (n, m) => n.min(0, { error: m }),
    )
      .nullable()
      .default(null),
    notes: safeMultiLineText(z.string().max(500, { error: lengthMessage('the notes', 500) })).default(''),
  })
  .refine((t) => t.periodUncertaintyDays === null || t.periodDays !== null, {
    message: 'Enter the period as well, or clear its uncertainty.',
    path: ['periodUncertaintyDays'],
    // Checked even when other fields are wrong, so that every problem shows at once; only the two
    // fields it reads need to be readable.
    when: (payload) => !payload.issues.some((i) => i.path?.[0] === 'periodDays' || i.path?.[0] === 'periodUncertaintyDays'),
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
  {
    name: 'period_error',
    required: false,
    help: '1σ uncertainty of the expected period, days (also read as period_err_d); needs a period',
  },
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
  /**
   * Warnings about rows that were stored anyway (a colour implausible for its colour system),
   * with the row and column like the problems of a refused file.
   */
  notes: CsvRowError[];
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
