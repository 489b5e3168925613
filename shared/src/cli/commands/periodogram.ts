/** `spincycle periodogram`: Lomb–Scargle periodogram of a light curve (CSV file or stdin). */
import { readFileSync } from 'node:fs';
import { analyzePeriodogram, type LombScargleMethod, type ValueKind } from '../../science/index';
import { ScienceInputError } from '../../science/science-input-error';
import { type CliCommand, CliUsageError, numberOption, parseCommandArgs } from '../cli-command';
import { parseLightCurveCsv } from '../light-curve-csv';

const usage = `Usage: spincycle periodogram FILE.csv|- [options]

Generalised (floating-mean) Lomb–Scargle periodogram (standard normalisation, as astropy):
best period, power, Baluev false-alarm probability, semi-amplitude and phase of the best-fit
sinusoid, and the strongest peaks. Reads CSV from FILE or from stdin with "-": time (days),
magnitude or flux, optional 1σ error; '#' comments; an optional header names the columns.

Options:
  --kind mag|flux        what the values are (default mag); sets how the amplitude in ppm is computed
  --fmin F               lowest frequency, 1/d (default half the grid step)
  --fmax F               highest frequency, 1/d (default 5 × the average Nyquist frequency)
  --oversampling N       samples per peak n0: grid step 1/(n0·T) (default 10)
  --nyquist-factor N     multiple of the average Nyquist frequency for the default --fmax (default 5)
  --method fast|exact    Press & Rybicki O(N log N) or direct O(N·M) sums (default fast)
  --top K                number of peaks to list (default 5)
  -h, --help             this text

Example:
  spincycle periodogram star-a17.csv --fmax 2 --top 3
`;

async function readStdin(): Promise<string> {
  const chunks: Buffer[] = [];
  for await (const chunk of process.stdin) chunks.push(chunk as Buffer);
  return Buffer.concat(chunks).toString('utf8');
}

export const command: CliCommand = {
  name: 'periodogram',
  summary: 'Lomb–Scargle periodogram of a light curve: best period, power, FAP, amplitude',
  usage,
  async run(argv) {
    const { values, positionals } = parseCommandArgs(
      argv,
      {
        kind: { type: 'string' },
        fmin: { type: 'string' },
        fmax: { type: 'string' },
        oversampling: { type: 'string' },
        'nyquist-factor': { type: 'string' },
        method: { type: 'string' },
        top: { type: 'string' },
        help: { type: 'boolean', short: 'h' },
      },
      true,
    );
    if (positionals.length !== 1) throw new CliUsageError('give one input: a CSV file, or - for stdin');
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
    const result = analyzePeriodogram(lc, {
      valueKind: (values.kind ?? 'mag') as ValueKind,
      minimumFrequencyPerDay: numberOption(values.fmin, 'fmin', 'minimumFrequencyPerDay'),
      maximumFrequencyPerDay: numberOption(values.fmax, 'fmax', 'maximumFrequencyPerDay'),
      samplesPerPeak: numberOption(values.oversampling, 'oversampling', 'samplesPerPeak'),
      nyquistFactor: numberOption(values['nyquist-factor'], 'nyquist-factor', 'nyquistFactor'),
      method: (values.method ?? 'fast') as LombScargleMethod,
      top: numberOption(values.top, 'top', 'top'),
    });
    return { input: { source: source === '-' ? 'stdin' : source, columns: lc.columns }, ...result };
  },
};
