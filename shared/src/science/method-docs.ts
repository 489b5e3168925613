/**
 * Where each number of a target plan is explained: the anchor of its section in
 * docs/science.md, which the client serves as its Methods page (`/methods#<anchor>`).
 * The anchors are `<a id="…"></a>` elements before the headings of that file; a spec reads the
 * file and checks that every anchor named here exists and every quantity has one.
 */
import type { CadenceAssessment } from '../sky/cadence-assessment';
import type { NightDark, TargetWindowSummary } from '../sky/sky-types';
import type { PhaseCoverageAssessment } from '../planning/phase-coverage';
import type { SeasonAssessment } from '../planning/observing-season';
import type { TargetPlanQuantities } from './target-plan';

/** Route of the Methods page in the client. */
export const METHODS_PAGE_PATH = '/methods';

/** Section of docs/science.md that explains each quantity of a target plan. */
export const PLAN_QUANTITY_DOCS: Readonly<Record<keyof TargetPlanQuantities, string>> = {
  intrinsicColourMag: 'colour',
  relationColourMag: 'colour',
  periodDays: 'gyrochronology',
  shortestPeriodDays: 'period-range',
  longestPeriodDays: 'period-range',
  turnoverTimeDays: 'turnover-time',
  rossbyNumber: 'turnover-time',
  rossbyNumberAtLongestPeriod: 'turnover-time',
  amplitudeRperPpm: 'spot-amplitude',
  semiAmplitudePpm: 'spot-amplitude',
  magnitudeInNodeBand: 'magnitude',
  airmass: 'airmass',
  skyBrightnessMagPerArcsec2: 'sky-brightness',
  worstSkyBrightnessMagPerArcsec2: 'sky-brightness',
  starPhotonRatePerSecond: 'visit-precision',
  saturationLimitSeconds: 'exposure',
  perVisitPrecisionGoalPpm: 'exposure',
  exposureSeconds: 'exposure',
  exposuresPerVisit: 'exposure',
  perVisitPrecisionPpm: 'visit-precision',
  perVisitPrecisionMmag: 'visit-precision',
  nightlyPrecisionPpm: 'nightly-means',
  sampleIntervalDays: 'cadence',
  nightStepDays: 'cadence',
  visitsPerNight: 'cadence',
  baselineForCyclesDays: 'baseline',
  baselineForPrecisionDays: 'period-precision',
  baselineDays: 'baseline',
  visitNights: 'baseline',
  searchMinFrequencyPerDay: 'search-band',
  searchMaxFrequencyPerDay: 'search-band',
  independentFrequencies: 'detection-threshold',
  detectionThresholdPower: 'detection-threshold',
  requestedCompleteness: 'completeness',
  completeness: 'completeness',
  visitsForCadence: 'visits',
  visitsForCompleteness50: 'visits',
  visitsForCompleteness90: 'visits',
  visitsForCompleteness99: 'visits',
  visits: 'visits',
  expectedPeriodPrecisionDays: 'period-precision',
  visitSeconds: 'node-hours',
  nodeHoursClear: 'node-hours',
  nodeHours: 'node-hours',
  feeMinor: 'fee',
};

/** The sky-window numbers the product shows, by the field that carries each. */
export type SkyQuantityKey =
  | Exclude<keyof TargetWindowSummary, 'visibility'>
  | keyof Pick<
      CadenceAssessment,
      'qualifyingNights' | 'expectedClearNights' | 'visitingNightsNeeded' | 'cadenceNightsNeeded' | 'stretchDays'
    >
  | keyof Pick<SeasonAssessment, 'longestSeasonDays' | 'seasonsInCampaign'>
  | keyof Pick<PhaseCoverageAssessment, 'minCoverage' | 'requiredBaselineDays'>
  | keyof Pick<NightDark, 'darkHours'>;

/** Section of docs/science.md that defines each sky-window number (one definition each). */
export const SKY_QUANTITY_DOCS: Readonly<Record<SkyQuantityKey, string>> = {
  firstUsableNight: 'observable-nights',
  lastUsableNight: 'observable-nights',
  usableNights: 'observable-nights',
  totalNights: 'observable-nights',
  totalUsableHours: 'usable-hours',
  maxNightlyUsableHours: 'longest-nightly-window',
  longestGapNights: 'longest-gap',
  qualifyingNights: 'qualifying-nights',
  expectedClearNights: 'expected-clear-nights',
  visitingNightsNeeded: 'cadence-fit',
  cadenceNightsNeeded: 'cadence-fit',
  stretchDays: 'cadence-stretch',
  longestSeasonDays: 'longest-stretch',
  seasonsInCampaign: 'observing-season',
  minCoverage: 'phase-coverage',
  requiredBaselineDays: 'phase-coverage',
  darkHours: 'darkness',
};

/** Sections other screens link to directly (not through a quantity). */
export const METHOD_SECTIONS = [
  'overview',
  'assumptions',
  'red-noise',
  'scintillation',
  'sky-windows',
  'sky-counts',
  'simulation',
  'periodogram',
  'references',
  'checked-values',
] as const;

/** The section anchor of a plan or sky quantity, e.g. `completeness`; null for an unknown key. */
export function methodsAnchorFor(key: string): string | null {
  return (PLAN_QUANTITY_DOCS as Record<string, string>)[key] ?? (SKY_QUANTITY_DOCS as Record<string, string>)[key] ?? null;
}

/** The Methods page link of a plan or sky quantity, e.g. `/methods#completeness`; null for an unknown key. */
export function methodsLinkFor(key: string): string | null {
  const anchor = methodsAnchorFor(key);
  return anchor === null ? null : `${METHODS_PAGE_PATH}#${anchor}`;
}
