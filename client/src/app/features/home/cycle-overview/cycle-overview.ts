import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatCard, MatCardContent, MatCardHeader, MatCardSubtitle, MatCardTitle } from '@angular/material/card';
import { MatChip, MatChipSet } from '@angular/material/chips';
import { loadErrorText } from '../../../core/http/api-error-message';
import { Clock } from '../../../core/time/clock';
import { describeCountdown } from '../../../ui/time/countdown';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { CycleApi, CycleListing } from '../cycle-api';
import { DayPipe, LocalInstantPipe, UtcInstantPipe } from '../../../ui/time/date-pipes';

/** The open and upcoming cycles, with their deadlines in UTC and, when it reads differently, on the person's clock. */
@Component({
  selector: 'app-cycle-overview',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    DayPipe,
    LocalInstantPipe,
    UtcInstantPipe,
    LoadStatus,
    MatCard,
    MatCardContent,
    MatCardHeader,
    MatCardSubtitle,
    MatCardTitle,
    MatChip,
    MatChipSet,
  ],
  templateUrl: './cycle-overview.html',
  styleUrl: './cycle-overview.scss',
})
export class CycleOverview {
  private readonly clock = inject(Clock);
  protected readonly cycles = inject(CycleApi).listResource();

  private readonly all = computed<CycleListing[]>(() => (this.cycles.hasValue() ? this.cycles.value() : []));
  protected readonly open = computed(() =>
    this.all()
      .filter((cycle) => cycle.status === 'open')
      .sort((a, b) => a.callClosesAt.localeCompare(b.callClosesAt)),
  );
  protected readonly upcoming = computed(() =>
    this.all()
      .filter((cycle) => cycle.status === 'upcoming')
      .sort((a, b) => a.callOpensAt.localeCompare(b.callOpensAt)),
  );
  protected readonly error = computed(() => loadErrorText(this.cycles.error(), 'The cycles could not be loaded.'));
  protected readonly noneOpen = computed(() => this.cycles.hasValue() && this.open().length === 0);

  protected countdown(iso: string): string {
    return describeCountdown(iso, this.clock.now());
  }
}
