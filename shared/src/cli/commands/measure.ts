/** `spincycle measure`: a target's rotation period from its returned light curve, as the product measures it. */
import { readFileSync } from 'node:fs';
import { parse } from 'csv-parse/sync';
import { LightCurveReader } from '../../photometry/light-curve-reader';
import {
  type DetrendOptions,
  type ExpectedPeriod,
  type LightCurveValueKind,
  type RotationMeasurement,
  type TimeSystem,
  detrendOptionsSchema,
  LIGHT_CURVE_VALUE_KINDS,
  TIME_SYSTEMS,
} from '../../photometry/photometry';
import type { GyroRelationId } from '../../science/gyrochronology';
import { type StarForAge, expectedPeriodFor, measureRotation } from '../../science/rotation/index';
import { ScienceInputError } from '../../science/science-input-error';
import { defaultRelationFor } from '../../science/target-plan';
import {
  type CliCommand,
  CliUsageError,
  COLOUR_OPTIONS,
  colourOption,
  numberOption,
  parseCommandArgs,
  relationOption,
} from '../cli-command';

const usage = `Usage: spincycle measure FILE.csv [options]

Measures one target's rotation period from its light curve the way the product does with
returned photometry: zero points per node, clipping and binning as chosen; the generalised
Lomb–Scargle periodogram over the expected band; the best period with its uncertainty
(σP = P²·σf), Baluev false-alarm probability and semi-amplitude; the spectral window and the
alias check; the verdict (measured, tentative, not detected) with its rule; and, with a
colour, the gyrochronological age the period implies.

The CSV has a header naming its columns (any case): time (or bjd, jd, mjd, utc: the name
says the time system), mag or flux (or value with --kind), optional error, node, time_system
and target. Lines starting with '#' are skipped. Times are converted to BJD (TDB).

Options:
  --time-system S          bjd_tdb | jd_utc | mjd_utc | iso_utc, for a column named "time"
  --kind mag|flux          for a column named "value"
  --ra DEG --dec DEG       the target's J2000 coordinates, needed to convert JD, MJD or ISO
                           (UTC) times to BJD (TDB)
  --target NAME            with a target column: the rows of this target
  --bv X | --bprp X        observed colour, for the implied age (and the expected period with --age)
  --ebv X                  reddening E(B−V), mag (default 0)
  --relation NAME          barnes2007 | mh2008 | angus2015 | angus2019
                           (default angus2019 for --bprp, barnes2007 for --bv)
  --expected-period P      expected period, days, with its plausible range:
  --expected-low L         shortest plausible period, days (default 0.7 × P)
  --expected-high H        longest plausible period, days (default 1.3 × P)
  --age MYR                instead of --expected-*: the expected period from the colour and
  --age-error MYR          this age (and its 1σ) through the relation
  --offsets MODE           none | node | node_night (default node)
  --clip S|none            clip at S σ (robust σ from the MAD; default 5), or none
  --bin MIN                bin to MIN minutes before the periodogram (default: no binning)
  --charts                 include the chart series (periodogram, window, light curve, folded)
  -h, --help               this text

Exit code 2 with every problem of the file listed (row and column) when it cannot be read.

Example:
  spincycle measure star-a17.csv --time-system mjd_utc --ra 150.25 --dec 20.5 --bv 0.9
`;

/** The first problem of a zod parse as a field error. */
function detrendFrom(values: { offsets?: string; clip?: string; bin?: string }): DetrendOptions {
  const clip =
    values.clip === undefined
      ? undefined
      : values.clip.trim().toLowerCase() === 'none'
        ? null
        : numberOption(values.clip, 'clip', 'clipSigma');
  const r = detrendOptionsSchema.safeParse({
    offsets: values.offsets,
    clipSigma: clip,
    binMinutes: values.bin === undefined ? undefined : numberOption(values.bin, 'bin', 'binMinutes'),
  });
  if (!r.success) {
    const issue = r.error.issues[0];
    throw new ScienceInputError(String(issue.path[0] ?? 'detrend'), issue.message);
  }
  return r.data;
}

function readRecords(path: string): string[][] {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (err) {
    throw new ScienceInputError('file', `cannot read ${path}: ${(err as NodeJS.ErrnoException).code ?? (err as Error).message}`);
  }
  try {
    return parse(text, { comment: '#', skip_empty_lines: true, relax_column_count: true, bom: true }) as string[][];
  } catch (err) {
    throw new ScienceInputError('file', `${path} is not a CSV file: ${(err as Error).message}`);
  }
}

export const command: CliCommand = {
  name: 'measure',
  summary: 'rotation period of a returned light curve: verdict, FAP, amplitude, alias check, implied age',
  usage,
  async run(argv) {
    const { values, positionals } = parseCommandArgs(
      argv,
      {
        ...COLOUR_OPTIONS,
        'time-system': { type: 'string' },
        kind: { type: 'string' },
        ra: { type: 'string' },
        dec: { type: 'string' },
        target: { type: 'string' },
        'expected-period': { type: 'string' },
        'expected-low': { type: 'string' },
        'expected-high': { type: 'string' },
        age: { type: 'string' },
        'age-error': { type: 'string' },
        offsets: { type: 'string' },
        clip: { type: 'string' },
        bin: { type: 'string' },
        charts: { type: 'boolean' },
      },
      true,
    );
    if (positionals.length !== 1) throw new CliUsageError('give one light-curve CSV file');
    const file = positionals[0];
    const timeSystem = values['time-system'];
    if (timeSystem !== undefined && !(TIME_SYSTEMS as readonly string[]).includes(timeSystem)) {
      throw new ScienceInputError('timeSystem', `must be one of ${TIME_SYSTEMS.join(', ')} (got "${timeSystem}")`);
    }
    if (values.kind !== undefined && !(LIGHT_CURVE_VALUE_KINDS as readonly string[]).includes(values.kind)) {
      throw new ScienceInputError('valueKind', `must be mag or flux (got "${values.kind}")`);
    }
    const ra = numberOption(values.ra, 'ra', 'raDeg');
    const dec = numberOption(values.dec, 'dec', 'decDeg');
    if ((ra === undefined) !== (dec === undefined)) throw new CliUsageError('give both --ra and --dec, or neither');
    if (ra !== undefined && !(ra >= 0 && ra < 360)) throw new ScienceInputError('raDeg', `must be within [0, 360) (got ${ra})`);
    if (dec !== undefined && !(dec >= -90 && dec <= 90)) throw new ScienceInputError('decDeg', `must be within [−90, 90] (got ${dec})`);
    const detrend = detrendFrom(values);

    const hasColour = values.bv !== undefined || values.bprp !== undefined;
    const star: StarForAge | null = hasColour
      ? (() => {
          const colour = colourOption(values);
          return {
            colour,
            reddeningEbvMag: numberOption(values.ebv, 'ebv', 'reddeningEbvMag') ?? null,
            relation: (relationOption(values.relation) ?? defaultRelationFor(colour.system)) as GyroRelationId,
          };
        })()
      : null;
    const expected = expectedFrom(values, star);

    // One pseudo-target: the file's rows (or those of --target).
    const records = readRecords(file);
    if (records.length === 0) throw new ScienceInputError('file', `${file} holds no rows`);
    const [header, ...rows] = records;
    const targetColumn = header.findIndex((h) => h.trim().toLowerCase() === 'target');
    if (targetColumn >= 0 && values.target === undefined) {
      throw new CliUsageError('the file has a target column: choose the target with --target NAME');
    }
    const name = values.target?.trim() ?? 'the target';
    const reader = new LightCurveReader({
      fileName: file,
      timeSystem: timeSystem as TimeSystem | undefined,
      valueKind: values.kind as LightCurveValueKind | undefined,
      targetId: 1,
      targets: [{ id: 1, name, raDeg: ra ?? 0, decDeg: dec ?? 0 }],
    });
    reader.header(header);
    let matched = 0;
    rows.forEach((record, i) => {
      if (targetColumn >= 0 && (record[targetColumn] ?? '').trim().toLowerCase() !== name.toLowerCase()) return;
      matched++;
      reader.row(record, i + 1);
    });
    if (targetColumn >= 0 && matched === 0) throw new ScienceInputError('target', `${file} holds no rows of ${name}`);
    const read = reader.finish();
    if (read.errorCount > 0) {
      const listed = read.errors.map((e) => `  ${e.message}`).join('\n');
      const more = read.errorCount > read.errors.length ? `\n  … and ${read.errorCount - read.errors.length} more` : '';
      throw new ScienceInputError('file', `${read.errorCount} problem${read.errorCount === 1 ? '' : 's'} in ${file}:\n${listed}${more}`);
    }
    const series = read.series[0];
    if (!series) throw new ScienceInputError('file', `${file} holds no rows`);
    if (ra === undefined && series.timeSystems.some((s) => s !== 'bjd_tdb')) {
      throw new ScienceInputError(
        'raDeg',
        'the times are UTC (JD, MJD or ISO): give --ra and --dec so that they can be converted to BJD (TDB)',
      );
    }
    const m = measureRotation(
      {
        bjd: series.bjd,
        values: series.values,
        errors: series.errors,
        nodes: series.nodes,
        valueKind: series.valueKind,
        timeSystems: series.timeSystems,
      },
      { expected, star },
      detrend,
    );
    return { file, summary: summaryOf(m), ...(values.charts ? m : withoutCharts(m)) };
  },
};

function expectedFrom(
  values: { 'expected-period'?: string; 'expected-low'?: string; 'expected-high'?: string; age?: string; 'age-error'?: string },
  star: StarForAge | null,
): ExpectedPeriod | null {
  const p = numberOption(values['expected-period'], 'expected-period', 'expectedPeriodDays');
  const age = numberOption(values.age, 'age', 'ageMyr');
  if (p !== undefined && age !== undefined) throw new CliUsageError('give either --expected-period or --age, not both');
  if (p !== undefined) {
    if (!(p > 0)) throw new ScienceInputError('expectedPeriodDays', `must be positive (got ${p})`);
    const low = numberOption(values['expected-low'], 'expected-low', 'expectedLowDays') ?? 0.7 * p;
    const high = numberOption(values['expected-high'], 'expected-high', 'expectedHighDays') ?? 1.3 * p;
    if (!(low > 0 && low <= p))
      throw new ScienceInputError('expectedLowDays', `must be positive and at most the expected period ${p} (got ${low})`);
    if (!(high >= p)) throw new ScienceInputError('expectedHighDays', `must be at least the expected period ${p} (got ${high})`);
    return { periodDays: p, lowDays: low, highDays: high, from: 'the command line' };
  }
  if (values['expected-low'] !== undefined || values['expected-high'] !== undefined) {
    throw new CliUsageError('--expected-low and --expected-high need --expected-period');
  }
  if (age === undefined) return null;
  if (!star) throw new CliUsageError('--age needs a colour (--bv or --bprp) to give the expected period');
  if (!(age > 0)) throw new ScienceInputError('ageMyr', `must be positive (got ${age})`);
  const e = expectedPeriodFor(star, age, numberOption(values['age-error'], 'age-error', 'ageUncertaintyMyr') ?? null);
  if (!e)
    throw new ScienceInputError('ageMyr', `the relation gives no period for this colour at ${age} Myr; give --expected-period instead`);
  return e;
}

/** The lines a reader wants first. */
function summaryOf(m: RotationMeasurement) {
  return {
    verdict: m.verdict,
    periodDays: m.best?.periodDays ?? null,
    periodUncertaintyDays: m.best?.periodUncertaintyDays ?? null,
    falseAlarmProbability: m.best?.falseAlarmProbability ?? null,
    semiAmplitudeMmag: m.best?.semiAmplitudeMmag ?? null,
    semiAmplitudePpm: m.best?.semiAmplitudePpm ?? null,
    cyclesCovered: m.best?.cyclesCovered ?? null,
    aliasFlagged: m.alias.flagged,
    aliasMessage: m.alias.message,
    ageMyr: m.age?.ageMyr ?? null,
    ageLowMyr: m.age?.lowMyr ?? null,
    ageHighMyr: m.age?.highMyr ?? null,
  };
}

function withoutCharts(m: RotationMeasurement): Omit<RotationMeasurement, 'charts'> {
  const { charts: _charts, ...rest } = m;
  return rest;
}
