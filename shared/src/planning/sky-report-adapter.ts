/**
 * Turns the plain-JSON sky windows of one target (`TargetWindowsReport`, what
 * POST /api/sky-windows returns) back into the typed-array `TargetWindows` that
 * `assessCadence`, `combinePlanWithSky` and `computeNodeTargetPlan` read, so that a client can
 * plan against the windows without asking the server again.
 *
 * Fidelity: the report rounds interval edges to whole seconds (`toIsoUtc`) and usable hours
 * to 0.001 h; a night's visit capacity can therefore differ from the server's only when an
 * interval is within a second of holding one more visit. The Moon's altitude comes back to
 * 0.01°, its separation to 0.1° and its illumination to 0.001, enough for the moonlit sky of
 * `computeNodeTargetPlan`. A report written before it carried `moonAltitudeDeg` gives NaN there;
 * `computeNodeTargetPlan` then plans under the site's dark sky and says the Moon could not be
 * counted (`assessCadence` does not read the Moon's altitude).
 */
import { SkyInputError } from '../sky/sky-input-error';
import { MAX_INTERVALS_PER_NIGHT, type TargetWindows } from '../sky/sky-types';
import type { TargetWindowsReport } from '../sky/sky-windows-report';

/**
 * Rebuilds a `TargetWindows` from one target of a report. The report must carry the target's
 * per-night list (`includeNights` true, the API's default).
 *
 * @param targetIndex echoed as `targetIndex` (the target's position in the request).
 * @throws SkyInputError (`nights`) when the report has no per-night list, or (`nights[i].intervals`)
 *   when an interval edge cannot be read.
 */
export function targetWindowsFromReport(report: TargetWindowsReport, targetIndex = 0): TargetWindows {
  const nights = report.nights;
  if (!nights) throw new SkyInputError('nights', 'the report has no per-night list: request it with includeNights true');
  const count = nights.length;
  const usable = new Float64Array(count);
  const altitude = new Float64Array(count);
  const moonSeparation = new Float64Array(count);
  const moonAltitude = new Float64Array(count);
  const moonIllumination = new Float64Array(count);
  const moonExcluded = new Uint8Array(count);
  const intervalCount = new Uint8Array(count);
  const intervals = new Float64Array(count * MAX_INTERVALS_PER_NIGHT * 2);
  const nightDates: string[] = new Array(count);

  for (let n = 0; n < count; n++) {
    const night = nights[n];
    nightDates[n] = night.nightDate;
    usable[n] = night.usableHours;
    altitude[n] = night.altitudeAtMidDarkDeg;
    moonSeparation[n] = night.moonSeparationDeg;
    // Older reports do not carry it (and JSON turns a non-finite number into null).
    moonAltitude[n] = typeof night.moonAltitudeDeg === 'number' ? night.moonAltitudeDeg : Number.NaN;
    moonIllumination[n] = night.moonIllumination;
    moonExcluded[n] = night.moonExcluded ? 1 : 0;
    const list = night.intervals.slice(0, MAX_INTERVALS_PER_NIGHT);
    intervalCount[n] = list.length;
    list.forEach((interval, k) => {
      const start = Date.parse(interval.startUtc);
      const end = Date.parse(interval.endUtc);
      if (!Number.isFinite(start) || !Number.isFinite(end)) {
        throw new SkyInputError(`nights[${n}].intervals[${k}]`, `cannot read ${JSON.stringify(interval)} as ISO 8601 instants`);
      }
      const base = (n * MAX_INTERVALS_PER_NIGHT + k) * 2;
      intervals[base] = start;
      intervals[base + 1] = end;
    });
  }

  return {
    targetIndex,
    name: report.name,
    raDeg: report.raDeg,
    decDeg: report.decDeg,
    nightDates,
    usableHoursByNight: usable,
    altitudeAtMidDarkDegByNight: altitude,
    moonSeparationDegByNight: moonSeparation,
    moonAltitudeDegByNight: moonAltitude,
    moonIlluminationByNight: moonIllumination,
    moonExcludedByNight: moonExcluded,
    intervalCountByNight: intervalCount,
    intervalsUtcMs: intervals,
    summary: { ...report.summary },
  };
}
