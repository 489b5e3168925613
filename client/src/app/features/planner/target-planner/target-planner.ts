import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { PlannerCharts } from '../planner-charts/planner-charts';
import { PlannerHeadline } from '../planner-headline/planner-headline';
import { PlannerInputs } from '../planner-inputs/planner-inputs';
import { PlannerPlan } from '../planner-plan/planner-plan';
import { PlannerSky } from '../planner-sky/planner-sky';
import { PlannerStore } from '../planner-store';

/**
 * The target planner: a star's expected period, amplitude, precision, cadence, visits,
 * node-hours and fee on one node, recomputed in the browser as the inputs change. The summary
 * comes first; each number's explanation, the gyrochronology charts and, given RA/Dec and a
 * cycle, the sky window from one or several nodes follow. State lives in {@link PlannerStore}.
 */
@Component({
  selector: 'app-target-planner',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [LoadStatus, PlannerCharts, PlannerHeadline, PlannerInputs, PlannerPlan, PlannerSky],
  providers: [PlannerStore],
  templateUrl: './target-planner.html',
  styleUrl: './target-planner.scss',
})
export default class TargetPlanner {
  protected readonly store = inject(PlannerStore);
  protected readonly nodeCode = computed(() => this.store.planNode()?.code ?? this.store.selectedNode()?.code ?? null);
}
