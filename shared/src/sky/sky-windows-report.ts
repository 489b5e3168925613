/**
 * Sky windows as plain JSON (ISO 8601 UTC instants, rounded numbers, no typed arrays): what the
 * CLI prints and what an API response can carry. `JSON.stringify` of a `SkyWindowsResult` itself
 * would turn its typed arrays into index-keyed objects.
 */
import type { NodeSpec } from '../facility/facility-types';
import { assessCadence, type CadenceAssessment, type CadenceRequirement } from './cadence-assessment';
import { toIsoUtc } from './local-nights';
import type { Darkness, ResolvedSkyLimits, SkyCampaign, SkyLimits, SkySite, SkyWindowsResult, TargetWindowSummary } from './sky-types';
import { listTargetNights } from './sky-windows';

/** One night's darkness in the report. */
export interface NightDarkReport {
  nightDate: string;
  darkness: Darkness;
  darkStartUtc: string | null;
  darkEndUtc: string | null;
  darkHours: number;
  moonIllumination: number;
}

/** One target on one night in the report. */
export interface TargetNightReport {
  nightDate: string;
  darkStartUtc: string | null;
  darkEndUtc: string | null;
  usableHours: number;
  intervals: { startUtc: string; endUtc: string }[];
  altitudeAtMidDarkDeg: number;
  moonSeparationDeg: number;
  /**
   * The Moon's altitude at the instant of `moonSeparationDeg`, degrees (what the moonlit sky of
   * the plan needs). Absent from reports written before it was added: read it as unknown.
   */
  moonAltitudeDeg?: number;
  moonIllumination: number;
  /** Present (true) only on nights excluded by the Moon-separation minimum. */
  moonExcluded?: true;
}

/** One target in the report. */
export interface TargetWindowsReport {
  name: string | null;
  raDeg: number;
  decDeg: number;
  summary: TargetWindowSummary;
  assessment?: CadenceAssessment;
  nights?: TargetNightReport[];
}

/** The whole report. */
export interface SkyWindowsReport {
  site: SkySite;
  limits: ResolvedSkyLimits;
  campaign: SkyCampaign;
  nights: NightDarkReport[];
  targets: TargetWindowsReport[];
}

/** Options of `toSkyWindowsReport`. */
export interface SkyWindowsReportOptions {
  /** Include each target's per-night list (default true). */
  includeNights?: boolean;
  /** When given, each target gets `assessCadence(…, requirement, weatherLossFraction)`. */
  requirement?: CadenceRequirement;
  /** Weather loss for the assessment, 0–1 (default 0). */
  weatherLossFraction?: number;
}

const round = (x: number, digits: number): number => Number(x.toFixed(digits));
const iso = (ms: number | null): string | null => (ms === null ? null : toIsoUtc(ms));

/** Turns a result into plain JSON: hours to 0.001 h, altitudes (target and Moon) to 0.01°, separations to 0.1°. */
export function toSkyWindowsReport(result: SkyWindowsResult, options: SkyWindowsReportOptions = {}): SkyWindowsReport {
  const includeNights = options.includeNights ?? true;
  return {
    site: result.site,
    limits: result.limits,
    campaign: result.campaign,
    nights: result.nights.map((n) => ({
      nightDate: n.nightDate,
      darkness: n.darkness,
      darkStartUtc: iso(n.darkStartUtcMs),
      darkEndUtc: iso(n.darkEndUtcMs),
      darkHours: round(n.darkHours, 3),
      moonIllumination: round(n.moonIlluminationAtMidDark, 3),
    })),
    targets: result.targets.map((w, t) => {
      const report: TargetWindowsReport = {
        name: w.name,
        raDeg: w.raDeg,
        decDeg: w.decDeg,
        summary: {
          ...w.summary,
          totalUsableHours: round(w.summary.totalUsableHours, 3),
          maxNightlyUsableHours: round(w.summary.maxNightlyUsableHours, 3),
        },
      };
      if (options.requirement) report.assessment = assessCadence(w, options.requirement, options.weatherLossFraction ?? 0);
      if (includeNights) {
        report.nights = listTargetNights(result, t).map((tn) => ({
          nightDate: tn.nightDate,
          darkStartUtc: iso(tn.darkStartUtcMs),
          darkEndUtc: iso(tn.darkEndUtcMs),
          usableHours: round(tn.usableHours, 3),
          intervals: tn.intervals.map((i) => ({ startUtc: toIsoUtc(i.startUtcMs), endUtc: toIsoUtc(i.endUtcMs) })),
          altitudeAtMidDarkDeg: round(tn.altitudeAtMidDarkDeg, 2),
          moonSeparationDeg: round(tn.moonSeparationDeg, 1),
          moonAltitudeDeg: round(tn.moonAltitudeDeg, 2),
          moonIllumination: round(tn.moonIllumination, 3),
          ...(tn.moonExcluded ? { moonExcluded: true as const } : {}),
        }));
      }
      return report;
    }),
  };
}

/**
 * The limits of a node's own safety configuration (altitude and Sun limits), plus optional
 * extras (Moon separation, minimum usable hours, refraction).
 */
export function skyLimitsForNode(
  node: Pick<NodeSpec, 'altitudeLimitDeg' | 'sunAltitudeLimitDeg'>,
  extra: Pick<SkyLimits, 'moonSeparationMinDeg' | 'minUsableHours' | 'refraction'> = {},
): SkyLimits {
  return { altitudeLimitDeg: node.altitudeLimitDeg, sunAltitudeLimitDeg: node.sunAltitudeLimitDeg, ...extra };
}
