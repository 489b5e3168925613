import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import type { AwardCycleSummary } from '@spincycle/shared/awards/awards';
import { loadErrorText } from '../../../core/http/api-error-message';
import { CyclePicker, type CyclePickerCycle } from '../../../ui/cycle-picker/cycle-picker';
import { AwardsApi } from '../awards-api';

/** "2 of 3 panels locked; 5 of 8 ranked proposals decided". */
export function cycleProgress(c: AwardCycleSummary): string {
  const panels = `${c.lockedPanels} of ${c.panels} ${c.panels === 1 ? 'panel' : 'panels'} locked`;
  const decided = c.ranked ? `${c.decided} of ${c.ranked} ranked ${c.ranked === 1 ? 'proposal' : 'proposals'} decided` : 'none ranked yet';
  return `${panels}; ${decided}`;
}

/** A cycle in the picker: its award progress, and whether (when) its decisions were released. */
function toPickerCycle(c: AwardCycleSummary): CyclePickerCycle {
  const release = c.releasedAt ? { text: 'Decisions released', at: c.releasedAt } : { text: 'Not released' };
  return { id: c.id, code: c.code, title: c.title, lines: [{ text: cycleProgress(c) }, release] };
}

/** /awards: the cycles whose review has panels, with their award progress; choosing one opens its award board. */
@Component({
  selector: 'app-award-cycle-picker',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [CyclePicker],
  template: `
    <div class="page">
      <h1>Awards</h1>
      <p class="page-lead">
        Choose a cycle to decide its awards: node-hours per node for each proposal its panels have ranked, against what each node offers.
      </p>
      <app-cycle-picker
        [cycles]="pickerCycles()"
        [loading]="cycles.isLoading()"
        [error]="error()"
        emptyText="No cycle is ready for awards yet: a cycle appears here once it has a panel, and its proposals once the panel's chair locks the standing."
        linkBase="/awards"
        testId="award-cycles"
        itemTestId="award-cycle-"
        (retry)="cycles.reload()"
      />
    </div>
  `,
})
export default class AwardCyclePicker {
  protected readonly cycles = inject(AwardsApi).cyclesResource();
  protected readonly pickerCycles = computed(() => (this.cycles.hasValue() ? this.cycles.value().map(toPickerCycle) : undefined));
  protected readonly error = computed(() => loadErrorText(this.cycles.error(), 'The cycles could not be loaded.'));
}
