import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatListItem, MatListItemLine, MatListItemTitle, MatNavList } from '@angular/material/list';
import { RouterLink } from '@angular/router';
import { loadErrorText } from '../../../core/http/api-error-message';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { UtcInstantPipe } from '../../../ui/time/date-pipes';
import { NightPlansApi } from '../night-plans-api';

/** /night-plans: the cycles whose awards are released; choosing one opens its night plans. */
@Component({
  selector: 'app-night-plan-cycle-picker',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [LoadStatus, MatListItem, MatListItemLine, MatListItemTitle, MatNavList, RouterLink, UtcInstantPipe],
  template: `
    <div class="page">
      <h1>Night plans</h1>
      <p class="page-lead">
        Choose a cycle to plan its campaign: each node's visits night by night, from the awarded programs, and what the nodes have observed
        so far.
      </p>
      <app-load-status
        [loading]="cycles.isLoading()"
        loadingLabel="Loading the cycles"
        [error]="error()"
        [empty]="empty()"
        emptyText="No cycle has released its awards yet: a cycle appears here once its decisions are released to the teams."
        (retry)="cycles.reload()"
      />
      @if (cycles.hasValue() && cycles.value().length) {
        <mat-nav-list aria-label="Cycles" data-testid="night-plan-cycles">
          @for (c of cycles.value(); track c.id) {
            <a mat-list-item [routerLink]="['/night-plans', c.id]" [attr.data-testid]="'night-plan-cycle-' + c.id">
              <span matListItemTitle>{{ c.code }} · {{ c.title }}</span>
              <span matListItemLine>{{ c.programs }} {{ c.programs === 1 ? 'program' : 'programs' }}</span>
              <span matListItemLine>
                @if (c.lastBuildAt) {
                  Night plans last built {{ c.lastBuildAt | utcInstant }}
                } @else {
                  No night plans built yet
                }
              </span>
            </a>
          }
        </mat-nav-list>
      }
    </div>
  `,
})
export default class NightPlanCyclePicker {
  protected readonly cycles = inject(NightPlansApi).cyclesResource();
  protected readonly error = computed(() => loadErrorText(this.cycles.error(), 'The cycles could not be loaded.'));
  protected readonly empty = computed(() => this.cycles.hasValue() && this.cycles.value().length === 0);
}
