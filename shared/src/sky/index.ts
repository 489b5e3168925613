/**
 * Sky windows: when targets can be observed from a site over a campaign (pure, no I/O).
 * Entry points: `computeSkyWindows`, `assessCadence`, `toUsableHoursGrid`, `parseRaDec`.
 */
export { SkyInputError } from './sky-input-error';
export * from './sky-types';
export { computeSkyWindows, listTargetNights, usableIntervals, toUsableHoursGrid, summarizeTargetWindows } from './sky-windows';
export type { UsableHoursGrid } from './sky-windows';
export { assessCadence, nightVisitCapacity, validateCadenceRequirement } from './cadence-assessment';
export type { CadenceAssessment, CadenceRequirement } from './cadence-assessment';
export { parseRaDec, parseRa, parseDec } from './ra-dec-parser';
export type { RaDecDeg } from './ra-dec-parser';
export { kastenYoungAirmass, altitudeForAirmassDeg } from './airmass-limit';
export { toIsoUtc, nightWindow } from './local-nights';
export { DEFAULT_SUN_ALTITUDE_LIMIT_DEG, MAX_CAMPAIGN_NIGHTS, MAX_TARGETS } from './sky-input-validation';
export { toSkyWindowsReport, skyLimitsForNode } from './sky-windows-report';
export type {
  SkyWindowsReport,
  SkyWindowsReportOptions,
  TargetWindowsReport,
  TargetNightReport,
  NightDarkReport,
} from './sky-windows-report';
