/** `spincycle windows`: sky windows of a list of targets from one site over a campaign. */
import { readFileSync } from 'node:fs';
import { parse } from 'csv-parse/sync';
import type { CadenceRequirement } from '../../sky/cadence-assessment';
import { parseDec, parseRa } from '../../sky/ra-dec-parser';
import { SkyInputError } from '../../sky/sky-input-error';
import type { RefractionMode, SkyLimits, SkyTarget } from '../../sky/sky-types';
import { computeSkyWindows } from '../../sky/sky-windows';
import { toSkyWindowsReport } from '../../sky/sky-windows-report';
import { type CliCommand, CliUsageError, numberOption, parseCommandArgs } from '../cli-command';

const usage = `Usage: spincycle windows --lat DEG --lon DEG --tz ZONE --from DATE --to DATE
                         (--alt-limit DEG | --airmass-limit X) (--targets FILE.csv | --ra RA --dec DEC) [options]

Sky windows: for each local night of the campaign, the darkness edges (UTC), the hours each
target stands at or above the altitude limit in darkness, its altitude at mid-darkness and the
Moon; per target, first/last usable night, usable nights and hours, longest gap.

Site:
  --lat DEG               latitude, degrees (north positive)
  --lon DEG               longitude, degrees (EAST positive)
  --elevation M           elevation, metres (default 0)
  --tz ZONE               IANA time zone naming the local nights, e.g. America/Santiago
Campaign:
  --from YYYY-MM-DD       first local night (the night of D begins on the evening of D)
  --to YYYY-MM-DD         last local night
Limits:
  --alt-limit DEG         lowest usable altitude, degrees
  --airmass-limit X       or: highest airmass (Kasten & Young 1989)
  --sun-limit DEG         Sun altitude for darkness, degrees (default -18; -12 nautical)
  --moon-sep DEG          exclude nights with the Moon up and closer than this (optional)
  --min-hours H           a night counts as usable from H hours (default 0: any time)
  --refraction MODE       normal (default) | none
Targets:
  --targets FILE.csv      header row with columns name,ra,dec (optional: pmra,pmdec in mas/yr,
                          epoch as a Julian year); RA/Dec in degrees, RA in hours as "12.5h",
                          or sexagesimal ("18:36:56.3", "+38 47 01", "−05°20′30″")
  --name TEXT --ra RA --dec DEC   or one target on the command line
Requirement (optional; adds a cadence assessment per target):
  --visits-per-night N  --visit-hours H  --cadence-days D  --baseline-days D  --total-visits N
  --weather-loss F        fraction of nights lost to weather, 0-1 (default 0)
Output:
  --summary-only          per-target summaries without the per-night lists
  -h, --help              this text

Example:
  spincycle windows --lat -30.2 --lon -70.8 --elevation 2200 --tz America/Santiago \\
    --from 2025-03-01 --to 2025-03-03 --alt-limit 30 --targets targets.csv
`;

/** Reads the targets CSV; errors name the row (`targets[3].dec`) and the line. */
export function readTargetsCsv(path: string): SkyTarget[] {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (err) {
    throw new SkyInputError('targets', `cannot read ${path}: ${(err as Error).message}`);
  }
  let rows: Record<string, string>[];
  try {
    rows = parse(text, {
      columns: (header: string[]) => header.map((h) => h.trim().toLowerCase()),
      skip_empty_lines: true,
      trim: true,
      bom: true,
      comment: '#',
    }) as Record<string, string>[];
  } catch (err) {
    throw new SkyInputError('targets', `${path} is not valid CSV: ${(err as Error).message}`);
  }
  if (rows.length === 0) throw new SkyInputError('targets', `${path} has no target rows`);
  for (const column of ['ra', 'dec']) {
    if (!(column in rows[0])) throw new SkyInputError('targets', `${path} needs a header row with columns name,ra,dec (no "${column}")`);
  }
  return rows.map((row, i) => {
    const field = `targets[${i}]`;
    const where = ` (line ${i + 2} of ${path})`;
    try {
      const target: SkyTarget = { raDeg: parseRa(row.ra, `${field}.ra`), decDeg: parseDec(row.dec, `${field}.dec`) };
      if (row.name) target.name = row.name;
      const optional = (column: string, key: 'pmRaCosDecMasPerYr' | 'pmDecMasPerYr' | 'epochYear') => {
        const raw = row[column];
        if (raw === undefined || raw === '') return;
        const v = Number(raw);
        if (!Number.isFinite(v)) throw new SkyInputError(`${field}.${column}`, `must be a number, got ${JSON.stringify(raw)}`);
        target[key] = v;
      };
      optional('pmra', 'pmRaCosDecMasPerYr');
      optional('pmdec', 'pmDecMasPerYr');
      optional('epoch', 'epochYear');
      return target;
    } catch (err) {
      if (err instanceof SkyInputError) throw new SkyInputError(err.field, err.reason + where);
      throw err;
    }
  });
}

function requirementFrom(values: Record<string, string | boolean | undefined>): CadenceRequirement | null {
  const keys = ['visits-per-night', 'visit-hours', 'cadence-days', 'baseline-days', 'total-visits'] as const;
  const given = keys.filter((k) => values[k] !== undefined);
  if (given.length === 0) return null;
  if (given.length < keys.length) {
    throw new CliUsageError(
      `a requirement needs all of --${keys.join(', --')} (missing --${keys.filter((k) => !given.includes(k)).join(', --')})`,
    );
  }
  const num = (k: (typeof keys)[number], field: string) => numberOption(values[k] as string, k, field, true) as number;
  return {
    visitsPerNight: num('visits-per-night', 'requirement.visitsPerNight'),
    visitHours: num('visit-hours', 'requirement.visitHours'),
    cadenceDays: num('cadence-days', 'requirement.cadenceDays'),
    baselineDays: num('baseline-days', 'requirement.baselineDays'),
    totalVisits: num('total-visits', 'requirement.totalVisits'),
  };
}

function runWindows(argv: string[]): unknown {
  const { values } = parseCommandArgs(argv, {
    lat: { type: 'string' },
    lon: { type: 'string' },
    elevation: { type: 'string' },
    tz: { type: 'string' },
    from: { type: 'string' },
    to: { type: 'string' },
    'alt-limit': { type: 'string' },
    'airmass-limit': { type: 'string' },
    'sun-limit': { type: 'string' },
    'moon-sep': { type: 'string' },
    'min-hours': { type: 'string' },
    refraction: { type: 'string' },
    targets: { type: 'string' },
    name: { type: 'string' },
    ra: { type: 'string' },
    dec: { type: 'string' },
    'visits-per-night': { type: 'string' },
    'visit-hours': { type: 'string' },
    'cadence-days': { type: 'string' },
    'baseline-days': { type: 'string' },
    'total-visits': { type: 'string' },
    'weather-loss': { type: 'string' },
    'summary-only': { type: 'boolean' },
    help: { type: 'boolean', short: 'h' },
  });
  if (values.tz === undefined) throw new CliUsageError('missing --tz (IANA time zone, e.g. America/Santiago)');
  if (values.from === undefined || values.to === undefined) throw new CliUsageError('missing --from and/or --to (YYYY-MM-DD)');
  if (values['alt-limit'] === undefined && values['airmass-limit'] === undefined) {
    throw new CliUsageError('missing --alt-limit DEG (or --airmass-limit X)');
  }

  const targets: SkyTarget[] = [];
  if (values.targets !== undefined) targets.push(...readTargetsCsv(values.targets));
  if (values.ra !== undefined || values.dec !== undefined) {
    const index = targets.length;
    const target: SkyTarget = { raDeg: parseRa(values.ra, `targets[${index}].ra`), decDeg: parseDec(values.dec, `targets[${index}].dec`) };
    if (values.name !== undefined) target.name = values.name;
    targets.push(target);
  }
  if (targets.length === 0) throw new CliUsageError('no targets: give --targets FILE.csv or --ra/--dec');

  const limits: SkyLimits = {
    altitudeLimitDeg: numberOption(values['alt-limit'], 'alt-limit', 'limits.altitudeLimitDeg'),
    airmassLimit: numberOption(values['airmass-limit'], 'airmass-limit', 'limits.airmassLimit'),
    sunAltitudeLimitDeg: numberOption(values['sun-limit'], 'sun-limit', 'limits.sunAltitudeLimitDeg'),
    moonSeparationMinDeg: numberOption(values['moon-sep'], 'moon-sep', 'limits.moonSeparationMinDeg'),
    minUsableHours: numberOption(values['min-hours'], 'min-hours', 'limits.minUsableHours'),
    refraction: values.refraction as RefractionMode | undefined,
  };
  for (const key of Object.keys(limits) as (keyof SkyLimits)[]) if (limits[key] === undefined) delete limits[key];

  const result = computeSkyWindows({
    site: {
      latitudeDeg: numberOption(values.lat, 'lat', 'site.latitudeDeg', true) as number,
      longitudeDeg: numberOption(values.lon, 'lon', 'site.longitudeDeg', true) as number,
      elevationM: numberOption(values.elevation, 'elevation', 'site.elevationM') ?? 0,
      timeZone: values.tz,
    },
    limits,
    campaign: { firstNight: values.from, lastNight: values.to },
    targets,
  });
  const requirement = requirementFrom(values);
  return toSkyWindowsReport(result, {
    includeNights: !values['summary-only'],
    ...(requirement ? { requirement } : {}),
    weatherLossFraction: numberOption(values['weather-loss'], 'weather-loss', 'weatherLossFraction') ?? 0,
  });
}

export const command: CliCommand = {
  name: 'windows',
  summary: 'sky windows: darkness and usable hours per target and night from one site',
  usage,
  // A SkyInputError (bad site, limits, campaign or target) is reported by the driver as bad
  // input, exit 2, like the science core's errors: both name their field.
  async run(argv) {
    return runWindows(argv);
  },
};
