import { ChangeDetectionStrategy, Component, computed, inject, LOCALE_ID } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogActions, MatDialogClose, MatDialogContent, MatDialogTitle } from '@angular/material/dialog';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import type { TargetPlanRow } from '@spincycle/shared/proposals/plan-types';
import type { Explained, SourceTag } from '@spincycle/shared/science/explained';
import { QUANTITY_LABELS, SOURCE_TAG_LABELS } from '@spincycle/shared/science/quantity-labels';
import { loadErrorText } from '../../../core/http/api-error-message';
import { formatMinorCurrency } from '../../../ui/units/format-units';
import { PlanApi } from '../plan-api';

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
      value = formatMinorCurrency(q.value, currency, locale);
      unit = '';
    }
    return { key, label: (QUANTITY_LABELS as Record<string, string>)[key] ?? humanize(key), value, unit, why: q.why, source: q.source, tag: q.tag, tagLabel: SOURCE_TAG_LABELS[q.tag] ?? q.tag };
  });
}

/** A side panel that explains every number of one target plan: value, unit, why, source and trust. */
@Component({
  selector: 'app-plan-explain-dialog',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButton, MatDialogActions, MatDialogClose, MatDialogContent, MatDialogTitle, MatIcon, MatProgressBar],
  templateUrl: './plan-explain-dialog.html',
  styleUrl: './plan-explain-dialog.scss',
})
export class PlanExplainDialog {
  private readonly data = inject<PlanExplainData>(MAT_DIALOG_DATA);
  protected readonly row = this.data.row;
  private readonly locale = inject(LOCALE_ID);
  /** The explained numbers are loaded when the panel opens (the plans list leaves them out). */
  protected readonly explanation = inject(PlanApi).explanationResource(() => ({
    proposalId: this.data.proposalId,
    targetId: this.row.targetId,
    nodeId: this.row.nodeId,
  }));
  protected readonly rows = computed(() => {
    const explanation = this.explanation.hasValue() ? this.explanation.value() : undefined;
    return explanation ? explainRows(explanation.quantities, this.locale, explanation.currency) : [];
  });
  protected readonly loadError = computed(() => loadErrorText(this.explanation.error(), 'The numbers could not be loaded.'));
}

/** What the plans table passes to the side panel. */
export interface PlanExplainData {
  proposalId: number;
  row: TargetPlanRow;
}
