import { ChangeDetectionStrategy, Component, computed, inject, input, LOCALE_ID } from '@angular/core';
import {
  MatAccordion,
  MatExpansionPanel,
  MatExpansionPanelDescription,
  MatExpansionPanelHeader,
  MatExpansionPanelTitle,
} from '@angular/material/expansion';
import { MatIcon } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import { methodsAnchorFor } from '@spincycle/shared/science/method-docs';
import type { ScienceFlag } from '@spincycle/shared/science/explained';
import type { TargetPlan } from '@spincycle/shared/science/target-plan';
import {
  allQuantityRows,
  cadenceStory,
  completenessPrices,
  keyRows,
  noExpectedPeriodFlag,
  type QuantityRow,
  searchBandSentence,
  SEVERITY_LABELS,
} from '../plan-display';
import { PROVENANCE_DESCRIPTIONS, PROVENANCE_LABELS } from '../../../ui/text/plan-wording';

/** The cadence quantities, explained together in one panel. */
const CADENCE_KEYS: ReadonlySet<string> = new Set(['visitsPerNight', 'visitNights', 'sampleIntervalDays']);

/** One explanation panel: a number with its reason, formula and source. */
export interface ExplanationPanel {
  key: string;
  label: string;
  value: string;
  unit: string;
  alternative: string | null;
  why: string;
  source: string;
  provenanceLabel: string;
  provenanceDescription: string;
  provenance: string;
  /** Section of the Methods page that derives this number (null when none). */
  methodsAnchor: string | null;
}

/**
 * The plan number by number, on demand: one expansion panel per decision quantity (its reason,
 * formula and source in plain words), the notices, the price of other completeness levels, the
 * search band the analysis must use, and every intermediate number in a table.
 */
@Component({
  selector: 'app-planner-plan',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    MatAccordion,
    MatExpansionPanel,
    MatExpansionPanelDescription,
    MatExpansionPanelHeader,
    MatExpansionPanelTitle,
    MatIcon,
    RouterLink,
  ],
  templateUrl: './planner-plan.html',
  styleUrl: './planner-plan.scss',
})
export class PlannerPlan {
  readonly plan = input.required<TargetPlan>();
  readonly nodeCode = input<string>('');
  /** The plan's notices that are not reasons it fails, in plain words. */
  readonly notices = input<readonly ScienceFlag[]>([]);

  private readonly locale = inject(LOCALE_ID);
  protected readonly severityLabels = SEVERITY_LABELS;
  protected readonly methodsAnchorFor = methodsAnchorFor;

  protected readonly panels = computed<ExplanationPanel[]>(() => {
    const plan = this.plan();
    const rows = keyRows(plan, this.locale);
    const panels: ExplanationPanel[] = [];
    let cadenceDone = false;
    for (const row of rows) {
      if (CADENCE_KEYS.has(row.key)) {
        if (cadenceDone || noExpectedPeriodFlag(plan)) continue;
        cadenceDone = true;
        panels.push(this.cadencePanel(plan, rows));
        continue;
      }
      panels.push(toPanel(row));
    }
    return panels;
  });

  protected readonly allRows = computed(() => allQuantityRows(this.plan(), this.locale));
  protected readonly prices = computed(() => (noExpectedPeriodFlag(this.plan()) ? [] : completenessPrices(this.plan(), this.locale)));
  protected readonly searchBand = computed(() => searchBandSentence(this.plan(), this.locale));

  private cadencePanel(plan: TargetPlan, rows: QuantityRow[]): ExplanationPanel {
    const story = cadenceStory(plan, this.locale);
    const interval = rows.find((r) => r.key === 'sampleIntervalDays');
    return {
      key: 'cadence',
      label: 'Cadence',
      value: story.visitNights,
      unit: '',
      alternative: story.detail,
      why: story.why,
      source: interval?.source ?? '',
      provenanceLabel: interval?.tagLabel ?? PROVENANCE_LABELS.assumption,
      provenanceDescription: interval?.provenanceDescription ?? PROVENANCE_DESCRIPTIONS.assumption,
      provenance: interval?.provenance ?? 'assumption',
      methodsAnchor: methodsAnchorFor('sampleIntervalDays'),
    };
  }
}

function toPanel(row: QuantityRow): ExplanationPanel {
  return {
    key: row.key,
    label: row.label,
    value: row.value,
    unit: row.unit,
    alternative: row.alternative,
    why: row.why,
    source: row.source,
    provenanceLabel: row.tagLabel,
    provenanceDescription: row.provenanceDescription,
    provenance: row.provenance,
    methodsAnchor: methodsAnchorFor(row.key),
  };
}
