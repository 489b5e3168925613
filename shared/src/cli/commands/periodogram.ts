/** `spincycle periodogram`: Lomb–Scargle periodogram of a light curve (CSV file or stdin). */
import { readFileSync } from 'node:fs';
import {
  analyzePeriodogram,
  DEFAULT_SAMPLES_PER_PEAK,
  type FrequencyGrid,
  type LightCurve,
  type LombScargleMethod,
  type ValueKind,
} from '../../science/index';
import { ScienceInputError } from '../../science/science-input-error';
import { type CliCommand, CliUsageError, numberOption, parseCommandArgs } from '../cli-command';
import { nightlyMeans, parseLightCurveCsv } from '../light-curve-csv';

const usage = `Usage: spincycle periodogram FILE.csv|- [options]

Generalised (floating-mean) Lomb–Scargle periodogram (standard normalisation, as astropy):
best period, power, Baluev false-alarm probability, semi-amplitude and phase of the best-fit
sinusoid, and the strongest peaks. Reads CSV from FILE or from stdin with "-": time (days),
magnitude or flux, optional 1σ error; '#' comments; an optional header names the columns.

The false-alarm probability holds for the band searched (it grows with fmax): compare it
only with one computed over the same band. With --plan the band, the series and the
false-alarm level are the plan's, as the plan was sized for them.

Options:
  --plan FILE.json       analyse as the target plan says (the output of "spincycle plan", with
                         or without --summary): its search band, nightly means or single visits,
                         and "detected" against its false-alarm probability
  --fmin F               lowest frequency, 1/d (default: the plan's, else half the grid step)
  --fmax F               highest frequency, 1/d (default: the plan's, else 5 × the average
                         Nyquist frequency N/(2T)); --fmin/--fmax override the plan's band
  --nightly-means        average the points of each night (night = floor(t + 0.5), t in days:
                         MJD nights split at 12:00 UTC); σ_night from the errors, else from the
                         pooled within-night scatter (default when the plan's series is nightlyMeans)
  --single-visits        analyse every point, even when the plan's series is nightlyMeans
  --fap P                false-alarm probability for "detected" (default: the plan's)
  --kind mag|flux        what the values are (default mag); sets how the amplitude in ppm is computed
  --oversampling N       samples per peak n0: grid step 1/(n0·T) (default 10)
  --nyquist-factor N     multiple of the average Nyquist frequency for the default --fmax (default 5)
  --method fast|exact    Press & Rybicki O(N log N) or direct O(N·M) sums (default fast)
  --top K                number of peaks to list (default 5)
  -h, --help             this text

Example:
  spincycle periodogram star-a17.csv --fmax 2 --top 3
  spincycle plan --bprp 1.1 --age 800 --mag 11.5 --band G > plan.json
  spincycle periodogram visits.csv --plan plan.json
`;

const sig = (v: number) => String(Number(v.toPrecision(4)));

async function readStdin(): Promise<string> {
  const chunks: Buffer[] = [];
  for await (const chunk of process.stdin) chunks.push(chunk as Buffer);
  return Buffer.concat(chunks).toString('utf8');
}

/** The part of a target plan that says how to analyse the campaign. */
interface PlanAnalysis {
  series: 'nightlyMeans' | 'visits';
  minFrequencyPerDay: number;
  maxFrequencyPerDay: number;
  falseAlarmProbability: number;
}

/** Reads `analysis` from a plan JSON file (full or --summary output of `spincycle plan`). */
function readPlanAnalysis(path: string): PlanAnalysis {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (err) {
    throw new ScienceInputError('plan', `cannot read ${path}: ${(err as NodeJS.ErrnoException).code ?? (err as Error).message}`);
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (err) {
    throw new ScienceInputError('plan', `${path} is not JSON: ${(err as Error).message}`);
  }
  const a = (json as { analysis?: unknown } | null)?.analysis;
  if (typeof a !== 'object' || a === null || Array.isArray(a)) {
    throw new ScienceInputError('plan.analysis', `${path} has no "analysis" object (give the output of "spincycle plan")`);
  }
  const r = a as Record<string, unknown>;
  const num = (key: string, ok: (v: number) => boolean, what: string): number => {
    const v = r[key];
    if (typeof v !== 'number' || !Number.isFinite(v) || !ok(v))
      throw new ScienceInputError(`plan.analysis.${key}`, `must be ${what} (got ${JSON.stringify(v)})`);
    return v;
  };
  if (r.series !== 'nightlyMeans' && r.series !== 'visits') {
    throw new ScienceInputError('plan.analysis.series', `must be "nightlyMeans" or "visits" (got ${JSON.stringify(r.series)})`);
  }
  const minFrequencyPerDay = num('minFrequencyPerDay', (v) => v >= 0, 'a frequency ≥ 0');
  const maxFrequencyPerDay = num('maxFrequencyPerDay', (v) => v > minFrequencyPerDay, 'a frequency above minFrequencyPerDay');
  const falseAlarmProbability = num('falseAlarmProbability', (v) => v > 0 && v < 1, 'within (0, 1)');
  return { series: r.series, minFrequencyPerDay, maxFrequencyPerDay, falseAlarmProbability };
}

/**
 * A grid from fmin to exactly fmax with a step of at most 1/(n0·T) (T the series' baseline),
 * so that the search covers the plan's band and the false-alarm probability is for its fmax.
 */
function gridSpanning(lc: LightCurve, fmin: number, fmax: number, samplesPerPeak = DEFAULT_SAMPLES_PER_PEAK): FrequencyGrid | undefined {
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < lc.timeDays.length; i++) {
    lo = Math.min(lo, lc.timeDays[i]);
    hi = Math.max(hi, lc.timeDays[i]);
  }
  if (!(hi > lo) || !(samplesPerPeak > 0)) return undefined; // the analysis names the problem
  const intervals = Math.max(1, Math.ceil((fmax - fmin) * samplesPerPeak * (hi - lo) - 1e-9));
  return { minFrequencyPerDay: fmin, stepPerDay: (fmax - fmin) / intervals, count: intervals + 1 };
}

export const command: CliCommand = {
  name: 'periodogram',
  summary: 'Lomb–Scargle periodogram of a light curve: best period, power, FAP, amplitude',
  usage,
  async run(argv) {
    const { values, positionals } = parseCommandArgs(
      argv,
      {
        plan: { type: 'string' },
        kind: { type: 'string' },
        fmin: { type: 'string' },
        fmax: { type: 'string' },
        'nightly-means': { type: 'boolean' },
        'single-visits': { type: 'boolean' },
        fap: { type: 'string' },
        oversampling: { type: 'string' },
        'nyquist-factor': { type: 'string' },
        method: { type: 'string' },
        top: { type: 'string' },
        help: { type: 'boolean', short: 'h' },
      },
      true,
    );
    if (positionals.length !== 1) throw new CliUsageError('give one input: a CSV file, or - for stdin');
    if (values['nightly-means'] && values['single-visits'])
      throw new CliUsageError('give either --nightly-means or --single-visits, not both');
    const fminOption = numberOption(values.fmin, 'fmin', 'minimumFrequencyPerDay');
    const fmaxOption = numberOption(values.fmax, 'fmax', 'maximumFrequencyPerDay');
    const fapOption = numberOption(values.fap, 'fap', 'falseAlarmProbability');
    if (fapOption !== undefined && !(fapOption > 0 && fapOption < 1)) {
      throw new ScienceInputError('falseAlarmProbability', `must be within (0, 1) (got ${fapOption})`);
    }
    const plan = values.plan === undefined ? null : readPlanAnalysis(values.plan);

    const source = positionals[0];
    let text: string;
    if (source === '-') {
      text = await readStdin();
    } else {
      try {
        text = readFileSync(source, 'utf8');
      } catch (err) {
        throw new ScienceInputError('file', `cannot read ${source}: ${(err as NodeJS.ErrnoException).code ?? (err as Error).message}`);
      }
    }
    const lc = parseLightCurveCsv(text);
    const notes: string[] = [];

    // Series: single points, or nightly means (asked for, or the plan's).
    let seriesFrom: 'plan' | 'options' | 'default' = 'default';
    let useNightly = false;
    if (values['nightly-means'] || values['single-visits']) {
      seriesFrom = 'options';
      useNightly = values['nightly-means'] === true;
      if (plan && (plan.series === 'nightlyMeans') !== useNightly) {
        notes.push(
          `${useNightly ? '--nightly-means' : '--single-visits'} overrides the plan's series "${plan.series}": its false-alarm level was sized for ${plan.series === 'nightlyMeans' ? 'nightly means' : 'single visits'}`,
        );
      }
    } else if (plan) {
      seriesFrom = 'plan';
      useNightly = plan.series === 'nightlyMeans';
    }
    const nightly = useNightly ? nightlyMeans(lc) : null;
    const analysed: LightCurve = nightly ?? lc;

    // Band: options win over the plan, the plan over the automatic grid.
    const fmin = fminOption ?? plan?.minFrequencyPerDay;
    const fmax = fmaxOption ?? plan?.maxFrequencyPerDay;
    const searchFrom: 'plan' | 'options' | 'default' =
      fminOption !== undefined || fmaxOption !== undefined ? 'options' : plan ? 'plan' : 'default';
    if (plan && searchFrom === 'options') {
      const given = [fminOption !== undefined ? '--fmin' : null, fmaxOption !== undefined ? '--fmax' : null].filter(Boolean).join(' and ');
      notes.push(
        `${given} override${given.includes(' and ') ? '' : 's'} the plan's band ${sig(plan.minFrequencyPerDay)}–${sig(plan.maxFrequencyPerDay)} d⁻¹: the plan's false-alarm level ${plan.falseAlarmProbability} was sized for its own band, and a false-alarm probability is only comparable over the same band`,
      );
    }

    const samplesPerPeak = numberOption(values.oversampling, 'oversampling', 'samplesPerPeak');
    const result = analyzePeriodogram(analysed, {
      valueKind: (values.kind ?? 'mag') as ValueKind,
      // The plan's band is searched end to end (the automatic grid may stop up to half a step short of fmax).
      grid:
        searchFrom === 'plan' && plan
          ? gridSpanning(analysed, plan.minFrequencyPerDay, plan.maxFrequencyPerDay, samplesPerPeak)
          : undefined,
      minimumFrequencyPerDay: fmin,
      maximumFrequencyPerDay: fmax,
      samplesPerPeak,
      nyquistFactor: numberOption(values['nyquist-factor'], 'nyquist-factor', 'nyquistFactor'),
      method: (values.method ?? 'fast') as LombScargleMethod,
      top: numberOption(values.top, 'top', 'top'),
    });

    const level = fapOption ?? plan?.falseAlarmProbability;
    if (plan && fapOption !== undefined && fapOption !== plan.falseAlarmProbability) {
      notes.push(`--fap ${fapOption} overrides the plan's false-alarm level ${plan.falseAlarmProbability}`);
    }
    return {
      input: { source: source === '-' ? 'stdin' : source, columns: lc.columns },
      search: {
        minFrequencyPerDay: result.grid.minFrequencyPerDay,
        maxFrequencyPerDay: result.grid.maxFrequencyPerDay,
        from: searchFrom,
      },
      series: nightly
        ? {
            analysed: 'nightlyMeans',
            from: seriesFrom,
            points: nightly.pointCount,
            nights: nightly.nightCount,
            nightSigma: nightly.sigma,
            ...(nightly.withinNightRms !== null ? { withinNightRms: nightly.withinNightRms } : {}),
          }
        : { analysed: 'visits', from: seriesFrom, points: lc.timeDays.length },
      ...(level !== undefined
        ? {
            detection: {
              falseAlarmProbabilityLevel: level,
              from: fapOption !== undefined ? 'options' : 'plan',
              bestFalseAlarmProbability: result.best.falseAlarmProbability,
              detected: result.best.falseAlarmProbability <= level,
            },
          }
        : {}),
      ...(notes.length > 0 ? { notes } : {}),
      ...result,
    };
  },
};
