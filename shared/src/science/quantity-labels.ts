/**
 * Words for the science core's explained numbers, shared by every screen (and the command
 * line) that shows a target plan: quantity names and what each source tag means.
 */
import type { SourceTag } from './explained';
import type { TargetPlanQuantities } from './target-plan';

/** Names of the plan's quantities, in the order the computation reaches them. */
export const QUANTITY_LABELS: Readonly<Record<keyof TargetPlanQuantities, string>> = {
  intrinsicColourMag: 'Intrinsic colour',
  relationColourMag: 'Colour used by the relation',
  periodDays: 'Expected rotation period',
  shortestPeriodDays: 'Shortest plausible period',
  longestPeriodDays: 'Longest plausible period',
  turnoverTimeDays: 'Convective turnover time (τc)',
  rossbyNumber: 'Rossby number',
  rossbyNumberAtLongestPeriod: 'Rossby number at the longest period',
  amplitudeRperPpm: 'Spot amplitude (Rₚₑᵣ)',
  semiAmplitudePpm: 'Semi-amplitude',
  magnitudeInNodeBand: "Magnitude in the node's band",
  airmass: 'Planning airmass',
  skyBrightnessMagPerArcsec2: 'Sky brightness assumed',
  worstSkyBrightnessMagPerArcsec2: 'Brightest sky on an observable night',
  starPhotonRatePerSecond: 'Star photon rate',
  saturationLimitSeconds: 'Saturation limit',
  perVisitPrecisionGoalPpm: 'Per-visit precision goal',
  exposureSeconds: 'Exposure',
  exposuresPerVisit: 'Exposures per visit',
  perVisitPrecisionPpm: 'Per-visit precision',
  perVisitPrecisionMmag: 'Per-visit precision (mag)',
  nightlyPrecisionPpm: 'Precision of a night',
  sampleIntervalDays: 'Sample interval',
  nightStepDays: 'Night step',
  visitsPerNight: 'Visits per night',
  baselineForCyclesDays: 'Baseline for enough rotations',
  baselineForPrecisionDays: 'Baseline for the period precision',
  baselineDays: 'Baseline',
  visitNights: 'Visit nights',
  searchMinFrequencyPerDay: 'Lowest searched frequency',
  searchMaxFrequencyPerDay: 'Highest searched frequency',
  independentFrequencies: 'Independent frequencies searched (W)',
  detectionThresholdPower: 'Periodogram power needed for a detection (z₀)',
  requestedCompleteness: 'Completeness asked for',
  completeness: 'Completeness delivered',
  visitsForCadence: 'Visits for the cadence',
  visitsForCompleteness50: 'Visits for 50 % completeness',
  visitsForCompleteness90: 'Visits for 90 % completeness',
  visitsForCompleteness99: 'Visits for 99 % completeness',
  visits: 'Visits',
  expectedPeriodPrecisionDays: 'Expected period precision',
  visitSeconds: 'Visit length',
  nodeHoursClear: 'Node-hours in clear weather',
  nodeHours: 'Node-hours requested',
  feeMinor: 'Fee',
};

/**
 * The kind of source, in a few words a scientist recognises. The tags themselves keep the
 * maintainers' trust levels (`memory`: recalled, not re-read; see SourceTag); users see the
 * kind of provenance only: a published relation (its reference is in the source line), a
 * calculation, standard practice, an assumption of this product, or the node's own value.
 */
export const SOURCE_TAG_LABELS: Readonly<Record<SourceTag, string>> = {
  paper: 'published relation',
  derived: 'calculation',
  memory: 'published relation',
  practice: 'standard observing practice',
  choice: 'assumption of this product',
  facility: 'node parameter',
};

/** The same, in a sentence (tooltips). */
export const SOURCE_TAG_DESCRIPTIONS: Readonly<Record<SourceTag, string>> = {
  paper: 'A relation or value from the literature; the reference is given',
  derived: 'Computed from a published formula or from the definitions',
  memory: 'A relation or value from the literature; the reference is given',
  practice: 'Standard observing practice, not tied to one publication',
  choice: 'An assumption of this product, explained on the Methods page',
  facility: "Taken from the node's own configuration or rate card",
};
