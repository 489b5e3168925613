import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatListItem, MatListItemLine, MatListItemTitle, MatNavList } from '@angular/material/list';
import { RouterLink } from '@angular/router';
import { loadErrorText } from '../../../../core/http/api-error-message';
import { LoadStatus } from '../../../../ui/load-status/load-status';
import { UtcInstantPipe } from '../../../../ui/time/date-pipes';
import { ReviewAdminApi } from '../review-admin-api';

const STATUS_LABELS = { upcoming: 'call not open yet', open: 'call open', closed: 'call closed' } as const;

/** /review/manage: the cycles, newest first; choosing one opens its review page. */
@Component({
  selector: 'app-cycle-picker',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [LoadStatus, MatListItem, MatListItemLine, MatListItemTitle, MatNavList, RouterLink, UtcInstantPipe],
  template: `
    <div class="page">
      <h1>Review</h1>
      <p class="page-lead">Choose a cycle to set up its review: the deadline, the panels and who reviews what.</p>
      <app-load-status
        [loading]="cycles.isLoading()"
        loadingLabel="Loading the cycles"
        [error]="error()"
        [empty]="empty()"
        emptyText="There are no cycles yet."
        (retry)="cycles.reload()"
      />
      @if (cycles.hasValue() && cycles.value().length) {
        <mat-nav-list aria-label="Cycles" data-testid="cycle-list">
          @for (c of cycles.value(); track c.id) {
            <a mat-list-item [routerLink]="['/review/manage', c.id]">
              <span matListItemTitle>{{ c.code }} · {{ c.title }}</span>
              <span matListItemLine>{{ statusLabel[c.status] }}; closes {{ c.callClosesAt | utcInstant }}</span>
            </a>
          }
        </mat-nav-list>
      }
    </div>
  `,
})
export default class CyclePicker {
  protected readonly cycles = inject(ReviewAdminApi).cyclesResource();
  protected readonly statusLabel = STATUS_LABELS;
  protected readonly error = computed(() => loadErrorText(this.cycles.error(), 'The cycles could not be loaded.'));
  protected readonly empty = computed(() => this.cycles.hasValue() && this.cycles.value().length === 0);
}
