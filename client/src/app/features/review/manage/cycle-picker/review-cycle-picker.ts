import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import type { CycleSummary } from '@spincycle/shared/facility/facility-types';
import { loadErrorText } from '../../../../core/http/api-error-message';
import { CyclePicker, type CyclePickerCycle } from '../../../../ui/cycle-picker/cycle-picker';
import { ReviewAdminApi } from '../review-admin-api';

const STATUS_LABELS = { upcoming: 'call not open yet', open: 'call open', closed: 'call closed' } as const;

/** A cycle in the picker: its call's status and when the call closes. */
function toPickerCycle(c: CycleSummary): CyclePickerCycle {
  return { id: c.id, code: c.code, title: c.title, lines: [{ text: `${STATUS_LABELS[c.status]}; closes`, at: c.callClosesAt }] };
}

/** /review/manage: the cycles, newest first; choosing one opens its review page. */
@Component({
  selector: 'app-review-cycle-picker',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [CyclePicker],
  template: `
    <div class="page">
      <h1>Review</h1>
      <p class="page-lead">Choose a cycle to set up its review: the deadline, the panels and who reviews what.</p>
      <app-cycle-picker
        [cycles]="pickerCycles()"
        [loading]="cycles.isLoading()"
        [error]="error()"
        emptyText="There are no cycles yet."
        linkBase="/review/manage"
        testId="cycle-list"
        (retry)="cycles.reload()"
      />
    </div>
  `,
})
export default class ReviewCyclePicker {
  protected readonly cycles = inject(ReviewAdminApi).cyclesResource();
  protected readonly pickerCycles = computed(() => (this.cycles.hasValue() ? this.cycles.value().map(toPickerCycle) : undefined));
  protected readonly error = computed(() => loadErrorText(this.cycles.error(), 'The cycles could not be loaded.'));
}
