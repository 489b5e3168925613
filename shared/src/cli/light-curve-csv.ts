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
