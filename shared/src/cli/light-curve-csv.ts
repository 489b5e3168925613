/**
 * Reads a light curve from CSV text: columns time (days), value (magnitude or flux) and an
 * optional 1σ error, separated by commas, semicolons, tabs or spaces. Lines starting with
 * `#` and blank lines are skipped; a first line that is not numeric is a header, whose
 * column names choose the columns (time/t/jd/bjd/mjd/hjd, mag/flux/value/y, err/error/dy/
 * sigma/e_mag/e_flux/uncertainty); without a header the columns are time, value[, error].
 */
import type { LightCurve } from '../science/lomb-scargle/light-curve';
import { ScienceInputError } from '../science/science-input-error';

const TIME_NAMES = ['time', 't', 'jd', 'bjd', 'mjd', 'hjd', 'btjd', 'time_days', 'timedays', 'date'];
const VALUE_NAMES = ['mag', 'magnitude', 'flux', 'value', 'y', 'rel_flux', 'relflux'];
const ERROR_NAMES = ['err', 'error', 'dy', 'sigma', 'e_mag', 'e_flux', 'mag_err', 'flux_err', 'uncertainty', 'magerr', 'fluxerr'];

export interface CsvLightCurve extends LightCurve {
  columns: { time: string; value: string; error: string | null };
}

export function parseLightCurveCsv(text: string): CsvLightCurve {
  const lines = text.split(/\r?\n/);
  const split = (line: string) => line.trim().split(/\s*[,;\t]\s*|\s+/);
  let header: string[] | null = null;
  let ti = 0;
  let vi = 1;
  let ei: number | null = null;
  const t: number[] = [];
  const y: number[] = [];
  const e: number[] = [];
  let decided = false;
  for (let li = 0; li < lines.length; li++) {
    const line = lines[li];
    if (line.trim() === '' || line.trimStart().startsWith('#')) continue;
    const cells = split(line);
    if (!decided) {
      decided = true;
      if (!cells.every((c) => c !== '' && Number.isFinite(Number(c)))) {
        header = cells.map((c) => c.toLowerCase().replace(/^["']|["']$/g, ''));
        const find = (names: string[]) => header!.findIndex((h) => names.includes(h));
        const ht = find(TIME_NAMES);
        const hv = find(VALUE_NAMES);
        const he = find(ERROR_NAMES);
        ti = ht >= 0 ? ht : 0;
        vi = hv >= 0 ? hv : ti === 0 ? 1 : 0;
        ei = he >= 0 ? he : header.length > 2 && ht < 0 && hv < 0 ? 2 : null;
        continue;
      }
      ei = cells.length >= 3 ? 2 : null;
    }
    const row = t.length;
    const num = (idx: number, field: string) => {
      const c = cells[idx];
      const v = c === undefined ? NaN : Number(c);
      if (c === undefined || c === '' || !Number.isFinite(v)) {
        throw new ScienceInputError(`series[${row}].${field}`, `line ${li + 1}: "${c ?? ''}" is not a number`);
      }
      return v;
    };
    t.push(num(ti, 'timeDays'));
    y.push(num(vi, 'value'));
    if (ei !== null) e.push(num(ei, 'uncertainty'));
  }
  if (t.length === 0) throw new ScienceInputError('series', 'the file holds no data rows');
  const name = (i: number | null, fallback: string) => (i === null ? null : (header?.[i] ?? fallback));
  return {
    timeDays: t,
    values: y,
    uncertainties: ei === null ? undefined : e,
    columns: { time: name(ti, 'column 1') as string, value: name(vi, 'column 2') as string, error: name(ei, 'column 3') },
  };
}

/** A light curve averaged per night, and how the nights were formed. */
export interface NightlyMeansCurve extends LightCurve {
  /** Points read, nights formed. */
  pointCount: number;
  nightCount: number;
  /** Where σ_night comes from. */
  sigma: 'errors' | 'scatter' | 'none';
  /** Pooled within-night rms of single points when σ_night comes from the scatter, else null. */
  withinNightRms: number | null;
}

/**
 * Averages the points of each night: night = floor(t + 0.5) with t in days (for MJD the
 * nights then split at 12:00 UTC; JD splits at 0:00 UTC, so convert JD to MJD first).
 * Each night gives one point: the plain mean of its times and of its values (every visit
 * counts equally, as the plan assumes) and σ_night:
 * - with errors: sqrt(Σσᵢ²)/k, the error of the mean of k points;
 * - without: s/sqrt(k), s the pooled within-night rms (pooled variance over the nights with
 *   two or more points, Σ(k − 1) degrees of freedom); when no night has two points, no
 *   uncertainties (every night weighs the same).
 * Neither sees noise that is correlated within a night (a systematic floor): σ_night is then
 * too small, but the same for every night of k points, so only the weights between nights of
 * different k are affected.
 */
export function nightlyMeans(lc: LightCurve): NightlyMeansCurve {
  const n = lc.timeDays.length;
  const nights = new Map<number, number[]>();
  for (let i = 0; i < n; i++) {
    const night = Math.floor(lc.timeDays[i] + 0.5);
    const list = nights.get(night);
    if (list) list.push(i);
    else nights.set(night, [i]);
  }
  const keys = [...nights.keys()].sort((a, b) => a - b);
  const errors = lc.uncertainties;
  const t: number[] = [];
  const y: number[] = [];
  const e: number[] = [];
  let pooledSs = 0;
  let pooledDof = 0;
  const sizes: number[] = [];
  for (const key of keys) {
    const idx = nights.get(key) as number[];
    const k = idx.length;
    let st = 0;
    let sy = 0;
    let se2 = 0;
    for (const i of idx) {
      st += lc.timeDays[i];
      sy += lc.values[i];
      if (errors) se2 += errors[i] ** 2;
    }
    const mean = sy / k;
    for (const i of idx) pooledSs += (lc.values[i] - mean) ** 2;
    pooledDof += k - 1;
    t.push(st / k);
    y.push(mean);
    sizes.push(k);
    if (errors) e.push(Math.sqrt(se2) / k);
  }
  let sigma: NightlyMeansCurve['sigma'] = errors ? 'errors' : 'none';
  let withinNightRms: number | null = null;
  let uncertainties: number[] | undefined = errors ? e : undefined;
  if (!errors && pooledDof > 0 && pooledSs > 0) {
    const s = Math.sqrt(pooledSs / pooledDof);
    sigma = 'scatter';
    withinNightRms = s;
    uncertainties = sizes.map((k) => s / Math.sqrt(k));
  }
  return { timeDays: t, values: y, uncertainties, pointCount: n, nightCount: keys.length, sigma, withinNightRms };
}
