import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatListItem, MatListItemLine, MatListItemTitle, MatNavList } from '@angular/material/list';
import { RouterLink } from '@angular/router';
import type { AwardCycleSummary } from '@spincycle/shared/awards/awards';
import { loadErrorText } from '../../../core/http/api-error-message';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { UtcInstantPipe } from '../../../ui/time/date-pipes';
import { AwardsApi } from '../awards-api';

/** "2 of 3 panels locked; 5 of 8 ranked proposals decided". */
export function cycleProgress(c: AwardCycleSummary): string {
  const panels = `${c.lockedPanels} of ${c.panels} ${c.panels === 1 ? 'panel' : 'panels'} locked`;
  const decided = c.ranked ? `${c.decided} of ${c.ranked} ranked ${c.ranked === 1 ? 'proposal' : 'proposals'} decided` : 'none ranked yet';
  return `${panels}; ${decided}`;
}

/** /awards: the cycles whose review has panels, with their award progress; choosing one opens its award board. */
@Component({
  selector: 'app-award-cycle-picker',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [LoadStatus, MatListItem, MatListItemLine, MatListItemTitle, MatNavList, RouterLink, UtcInstantPipe],
  template: `
    <div class="page">
      <h1>Awards</h1>
      <p class="page-lead">
        Choose a cycle to decide its awards: node-hours per node for each proposal its panels have ranked, against what each node offers.
      </p>
      <app-load-status
        [loading]="cycles.isLoading()"
        loadingLabel="Loading the cycles"
        [error]="error()"
        [empty]="empty()"
        emptyText="No cycle is ready for awards yet: a cycle appears here once it has a panel, and its proposals once the panel's chair locks the standing."
        (retry)="cycles.reload()"
      />
      @if (cycles.hasValue() && cycles.value().length) {
        <mat-nav-list aria-label="Cycles" data-testid="award-cycles">
          @for (c of cycles.value(); track c.id) {
            <a mat-list-item [routerLink]="['/awards', c.id]" [attr.data-testid]="'award-cycle-' + c.id">
              <span matListItemTitle>{{ c.code }} · {{ c.title }}</span>
              <span matListItemLine>{{ progress(c) }}</span>
              <span matListItemLine>
                @if (c.releasedAt) {
                  Decisions released {{ c.releasedAt | utcInstant }}
                } @else {
                  Not released
                }
              </span>
            </a>
          }
        </mat-nav-list>
      }
    </div>
  `,
})
export default class AwardCyclePicker {
  protected readonly cycles = inject(AwardsApi).cyclesResource();
  protected readonly progress = cycleProgress;
  protected readonly error = computed(() => loadErrorText(this.cycles.error(), 'The cycles could not be loaded.'));
  protected readonly empty = computed(() => this.cycles.hasValue() && this.cycles.value().length === 0);
}
