import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import type { FeesCycleSummary } from '@spincycle/shared/billing/billing';
import { loadErrorText } from '../../../core/http/api-error-message';
import { CyclePicker, type CyclePickerCycle } from '../../../ui/cycle-picker/cycle-picker';
import { BillingApi } from '../billing-api';

/** A cycle in the picker: when its awards were released (invoices bill released awards only). */
function toPickerCycle(c: FeesCycleSummary): CyclePickerCycle {
  return { id: c.id, code: c.code, title: c.title, lines: [{ text: 'Awards released', at: c.awardsReleasedAt }] };
}

/** /fees/manage, for facility managers: the cycles whose awards are released; choosing one opens its fees. */
@Component({
  selector: 'app-fees-cycle-picker',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [CyclePicker],
  template: `
    <div class="page">
      <h1>Fees</h1>
      <p class="page-lead">
        Choose a cycle to invoice its awarded programs: prepare the drafts from the awards and the rate card, issue them to the billing
        contacts, and follow what is paid, outstanding and overdue.
      </p>
      <app-cycle-picker
        [cycles]="pickerCycles()"
        [loading]="cycles.isLoading()"
        [error]="error()"
        emptyText="No cycle has released its awards yet: a cycle appears here once its decisions are released to the teams."
        linkBase="/fees/manage"
        testId="fee-cycles"
        itemTestId="fee-cycle-"
        (retry)="cycles.reload()"
      />
    </div>
  `,
})
export default class FeesCyclePicker {
  protected readonly cycles = inject(BillingApi).cyclesResource();
  protected readonly pickerCycles = computed(() => (this.cycles.hasValue() ? (this.cycles.value() ?? []).map(toPickerCycle) : undefined));
  protected readonly error = computed(() => loadErrorText(this.cycles.error(), 'The cycles could not be loaded.'));
}
