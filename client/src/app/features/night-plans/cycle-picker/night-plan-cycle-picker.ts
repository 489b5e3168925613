import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import type { NightPlanCycleSummary } from '@spincycle/shared/night-plans/night-plans';
import { loadErrorText } from '../../../core/http/api-error-message';
import { CyclePicker, type CyclePickerCycle } from '../../../ui/cycle-picker/cycle-picker';
import { NightPlansApi } from '../night-plans-api';

/** A cycle in the picker: its programs, and when its night plans were last built. */
function toPickerCycle(c: NightPlanCycleSummary): CyclePickerCycle {
  const build = c.lastBuildAt ? { text: 'Night plans last built', at: c.lastBuildAt } : { text: 'No night plans built yet' };
  return { id: c.id, code: c.code, title: c.title, lines: [{ text: `${c.programs} ${c.programs === 1 ? 'program' : 'programs'}` }, build] };
}

/** /night-plans: the cycles whose awards are released; choosing one opens its night plans. */
@Component({
  selector: 'app-night-plan-cycle-picker',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [CyclePicker],
  template: `
    <div class="page">
      <h1>Night plans</h1>
      <p class="page-lead">
        Choose a cycle to plan its campaign: each node's visits night by night, from the awarded programs, and what the nodes have observed
        so far.
      </p>
      <app-cycle-picker
        [cycles]="pickerCycles()"
        [loading]="cycles.isLoading()"
        [error]="error()"
        emptyText="No cycle has released its awards yet: a cycle appears here once its decisions are released to the teams."
        linkBase="/night-plans"
        testId="night-plan-cycles"
        itemTestId="night-plan-cycle-"
        (retry)="cycles.reload()"
      />
    </div>
  `,
})
export default class NightPlanCyclePicker {
  protected readonly cycles = inject(NightPlansApi).cyclesResource();
  protected readonly pickerCycles = computed(() => (this.cycles.hasValue() ? this.cycles.value().map(toPickerCycle) : undefined));
  protected readonly error = computed(() => loadErrorText(this.cycles.error(), 'The cycles could not be loaded.'));
}
