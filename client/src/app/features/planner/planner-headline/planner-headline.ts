import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIcon } from '@angular/material/icon';
import type { PlanSummary, SummaryTone } from '../plan-summary';

const ICONS: Readonly<Record<SummaryTone, string>> = {
  feasible: 'check_circle',
  warning: 'warning',
  infeasible: 'block',
  invalid: 'edit_note',
};

/**
 * The summary block at the top of the results: the verdict, the numbers a proposer decides on,
 * and, for a plan that cannot be carried out or is hard to justify, why and the ways out (each
 * said once, the cheapest first).
 */
@Component({
  selector: 'app-planner-headline',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatIcon],
  templateUrl: './planner-headline.html',
  styleUrl: './planner-headline.scss',
})
export class PlannerHeadline {
  readonly summary = input<PlanSummary | null>(null);
  /** The code of the plan's node, for the heading of the numbers. */
  readonly nodeCode = input<string | null>(null);

  protected readonly icon = computed(() => ICONS[this.summary()?.tone ?? 'invalid']);
}
