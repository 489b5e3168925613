import { ChangeDetectionStrategy, Component, computed, inject, LOCALE_ID } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogActions, MatDialogClose, MatDialogContent, MatDialogTitle } from '@angular/material/dialog';
import { MatIcon } from '@angular/material/icon';
import type { TargetPlanRow } from '@spincycle/shared/proposals/plan-types';
import type { Explained, SourceTag } from '@spincycle/shared/science/explained';

/** Names of the plan's quantities in the side panel, in the order the computation reaches them. */
export const QUANTITY_LABELS: Readonly<Record<string, string>> = {
  intrinsicColourMag: 'Intrinsic colour',
  relationColourMag: "Colour in the relation's system",
  periodDays: 'Expected period',
  shortestPeriodDays: 'Shortest plausible period',
  longestPeriodDays: 'Longest plausible period',
  turnoverTimeDays: 'Convective turnover time',
  rossbyNumber: 'Rossby number',
  rossbyNumberAtLongestPeriod: 'Rossby number at the longest period',
  amplitudeRperPpm: 'Spot amplitude (peak to peak)',
  semiAmplitudePpm: 'Spot semi-amplitude',
  magnitudeInNodeBand: "Magnitude in the node's band",
  airmass: 'Airmass',
  starPhotonRatePerSecond: 'Photon rate from the star',
  saturationLimitSeconds: 'Exposure at saturation',
  perVisitPrecisionGoalPpm: 'Per-visit precision goal',
  exposureSeconds: 'Exposure',
  perVisitPrecisionPpm: 'Per-visit precision',
  perVisitPrecisionMmag: 'Per-visit precision (mmag)',
  sampleIntervalDays: 'Sample interval (cadence)',
  nightStepDays: 'Step between observing nights',
  visitsPerNight: 'Visits per night',
  baselineForCyclesDays: 'Baseline for the cycles',
  baselineForPrecisionDays: 'Baseline for the period precision',
  baselineDays: 'Baseline',
  searchMaxFrequencyPerDay: 'Highest searched frequency',
  independentFrequencies: 'Independent frequencies',
  detectionThresholdPower: 'Detection threshold (power)',
  visitsForDetection: 'Visits for detection',
  visitsForCadence: 'Visits for the cadence',
  visits: 'Visits',
  expectedFalseAlarmProbability: 'Expected false-alarm probability',
  expectedPeriodPrecisionDays: 'Expected period precision',
  visitSeconds: 'Time per visit',
  nodeHoursClear: 'Node-hours in clear time',
  nodeHours: 'Node-hours (after weather loss)',
  feeMinor: 'Fee',
};

export const SOURCE_TAG_LABELS: Readonly<Record<SourceTag, string>> = {
  paper: 'from the cited paper',
  derived: 'derived from a cited formula',
  memory: 'recalled, not re-read: verify',
  practice: 'common practice',
  choice: "Spincycle's choice",
};

/** `periodDays` → `Period days` for a quantity without a label. */
function humanize(key: string): string {
  const words = key.replace(/([A-Z])/g, ' $1').toLowerCase().trim();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

export interface ExplainedRow {
  key: string;
  label: string;
  value: string;
  unit: string;
  why: string;
  source: string;
  tag: SourceTag;
  tagLabel: string;
}

/** The side panel's rows: known quantities first in the computation's order, then any others. */
export function explainRows(quantities: Record<string, Explained<number | null>>, locale: string, currency: string): ExplainedRow[] {
  const known = Object.keys(QUANTITY_LABELS).filter((key) => key in quantities);
  const others = Object.keys(quantities).filter((key) => !(key in QUANTITY_LABELS));
  const format = new Intl.NumberFormat(locale, { maximumSignificantDigits: 4 });
  return [...known, ...others].map((key) => {
    const q = quantities[key];
    let value = q.value === null ? '—' : format.format(q.value);
    let unit = q.unit === '1' ? '' : q.unit;
    if (key === 'feeMinor' && q.value !== null) {
      const money = new Intl.NumberFormat(locale, { style: 'currency', currency: currency.toUpperCase() });
      const digits = money.resolvedOptions().maximumFractionDigits ?? 2;
      value = money.format(q.value / 10 ** digits);
      unit = '';
    }
    return { key, label: QUANTITY_LABELS[key] ?? humanize(key), value, unit, why: q.why, source: q.source, tag: q.tag, tagLabel: SOURCE_TAG_LABELS[q.tag] ?? q.tag };
  });
}

/** A side panel that explains every number of one target plan: value, unit, why, source and trust. */
@Component({
  selector: 'app-plan-explain-dialog',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButton, MatDialogActions, MatDialogClose, MatDialogContent, MatDialogTitle, MatIcon],
  templateUrl: './plan-explain-dialog.html',
  styleUrl: './plan-explain-dialog.scss',
})
export class PlanExplainDialog {
  protected readonly row = inject<TargetPlanRow>(MAT_DIALOG_DATA);
  private readonly locale = inject(LOCALE_ID);
  protected readonly rows = computed(() => explainRows(this.row.quantities, this.locale, this.row.currency));
}
