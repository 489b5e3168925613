import { ChangeDetectionStrategy, Component, computed, inject, LOCALE_ID } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogActions, MatDialogClose, MatDialogContent, MatDialogTitle } from '@angular/material/dialog';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import type { TargetPlanRow } from '@spincycle/shared/proposals/plan-types';
import type { Explained, FlagSeverity, ScienceFlag, SourceTag } from '@spincycle/shared/science/explained';
import { methodsAnchorFor } from '@spincycle/shared/science/method-docs';
import { QUANTITY_LABELS } from '@spincycle/shared/science/quantity-labels';
import { RouterLink } from '@angular/router';
import { plainFlag, plainSentence, provenanceOf } from '../../../../ui/text/plan-wording';
import { loadErrorText } from '../../../../core/http/api-error-message';
import { reasonSentence } from '../../../../ui/text/reason-sentence';
import { FeeWhyPipe } from '../../../../ui/units/fee-why-pipe';
import { formatMinorCurrency, formatPercent } from '../../../../ui/units/format-units';
import { PlanApi } from '../plan-api';

/** `periodDays` → `Period days` for a quantity without a label. */
function humanize(key: string): string {
  const words = key
    .replace(/([A-Z])/g, ' $1')
    .toLowerCase()
    .trim();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

/** Quantities that are probabilities held as 0–1, shown as percentages. */
const PERCENT_KEYS: ReadonlySet<string> = new Set(['requestedCompleteness', 'completeness']);

/** The severity of a flag, as the panel says it. */
const SEVERITY_WORDS: Readonly<Record<FlagSeverity, string>> = { info: 'Note', caution: 'Caution', blocking: 'Blocking' };

export interface ExplainedRow {
  key: string;
  label: string;
  value: string;
  unit: string;
  why: string;
  source: string;
  tag: SourceTag;
  /** The kind of source in plain words (published relation, node parameter, assumption, your input, calculation). */
  tagLabel: string;
  /** Section of the Methods page that derives the number, or null. */
  methodsAnchor: string | null;
}

/** The blocking flag saying that no relation gives the star a period, or undefined. */
function noExpectedPeriod(flags: readonly ScienceFlag[]): ScienceFlag | undefined {
  return flags.find((flag) => flag.code === 'noExpectedPeriod' && flag.severity === 'blocking');
}

/**
 * The side panel's rows: known quantities first in the computation's order, then any others.
 * With a blocking "no expected period" flag the period reads as such, not as the relation's
 * number (which the science core computes but which must not be shown).
 */
export function explainRows(
  quantities: Record<string, Explained<number | null>>,
  locale: string,
  currency: string,
  flags: readonly ScienceFlag[] = [],
): ExplainedRow[] {
  const noPeriod = noExpectedPeriod(flags);
  const known = Object.keys(QUANTITY_LABELS).filter((key) => key in quantities);
  const others = Object.keys(quantities).filter((key) => !(key in QUANTITY_LABELS));
  const format = new Intl.NumberFormat(locale, { maximumSignificantDigits: 4 });
  // Whole numbers (visits, nights) in full: 4 significant figures would round 37 268 visits.
  const whole = new Intl.NumberFormat(locale, { maximumFractionDigits: 0 });
  return [...known, ...others].map((key) => {
    const q = quantities[key];
    let value =
      q.value === null || !Number.isFinite(q.value) ? '—' : Number.isInteger(q.value) ? whole.format(q.value) : format.format(q.value);
    let unit = q.unit === '1' ? '' : q.unit;
    if (key === 'feeMinor' && q.value !== null) {
      value = formatMinorCurrency(q.value, currency, locale);
      unit = '';
    } else if (PERCENT_KEYS.has(key)) {
      value = formatPercent(q.value, locale);
      unit = '';
    } else if (key === 'periodDays' && noPeriod) {
      const source = noPeriod.source ?? q.source;
      const p = provenanceOf({ source, tag: q.tag });
      return {
        key,
        label: QUANTITY_LABELS.periodDays,
        value: 'No expected period',
        unit: '',
        why: plainSentence(reasonSentence(noPeriod.message)),
        source: p.reference,
        tag: q.tag,
        tagLabel: p.label,
        methodsAnchor: methodsAnchorFor(key),
      };
    }
    const p = provenanceOf(q);
    return {
      key,
      label: (QUANTITY_LABELS as Record<string, string>)[key] ?? humanize(key),
      value,
      unit,
      why: plainSentence(q.why),
      source: p.reference,
      tag: q.tag,
      tagLabel: p.label,
      methodsAnchor: methodsAnchorFor(key),
    };
  });
}

/** A side panel that explains every number of one target plan: value, unit, why, source and trust. */
@Component({
  selector: 'app-plan-explain-dialog',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [FeeWhyPipe, MatButton, MatDialogActions, MatDialogClose, MatDialogContent, MatDialogTitle, MatIcon, MatProgressBar, RouterLink],
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
    return explanation ? explainRows(explanation.quantities, this.locale, explanation.currency, explanation.flags ?? []) : [];
  });
  /** Where the period comes from, in words. */
  protected readonly periodOrigin = computed(() => {
    const flags = this.row.flags;
    if (noExpectedPeriod(flags)) return 'No expected period: no relation gives one for this star.';
    if (flags.some((flag) => flag.code === 'explicitPeriod')) return 'Period given by the proposer.';
    return `Period from ${this.row.relationLabel}.`;
  });
  protected readonly severityWords = SEVERITY_WORDS;
  /** The row's flags, messages and sources in plain words. */
  protected readonly flags = this.row.flags.map(plainFlag);
  protected readonly reasonSentence = reasonSentence;
  protected readonly loadError = computed(() => loadErrorText(this.explanation.error(), 'The numbers could not be loaded.'));
}

/** What the plans table passes to the side panel. */
export interface PlanExplainData {
  proposalId: number;
  row: TargetPlanRow;
}
