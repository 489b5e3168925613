import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import { MatListItem, MatListItemLine, MatListItemTitle, MatNavList } from '@angular/material/list';
import { RouterLink } from '@angular/router';
import { LoadStatus } from '../load-status/load-status';
import { UtcInstantPipe } from '../time/date-pipes';

/** One line under a cycle's title: plain words, and optionally an instant written after them in UTC. */
export interface CyclePickerLine {
  text: string;
  /** ISO instant shown after the text ("Decisions released" + "1 Sep 2026, 12:00 UTC"). */
  at?: string | null;
}

/** A cycle as the picker lists it: its code and title, and what the page needs to say of it. */
export interface CyclePickerCycle {
  id: number;
  code: string;
  title: string;
  lines: readonly CyclePickerLine[];
}

/**
 * The cycles to choose from, each a link to `[linkBase, id]`, with the loading, error and empty
 * states of the list (LoadStatus). The page around it gives the heading and what choosing does.
 */
@Component({
  selector: 'app-cycle-picker',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [LoadStatus, MatListItem, MatListItemLine, MatListItemTitle, MatNavList, RouterLink, UtcInstantPipe],
  template: `
    <app-load-status
      [loading]="loading()"
      loadingLabel="Loading the cycles"
      [error]="error()"
      [empty]="empty()"
      [emptyText]="emptyText()"
      (retry)="retry.emit()"
    />
    @let itemPrefix = itemTestId();
    @if (cycles(); as list) {
      @if (list.length) {
        <mat-nav-list aria-label="Cycles" [attr.data-testid]="testId()">
          @for (c of list; track c.id) {
            <a
              mat-list-item
              [routerLink]="[linkBase(), c.id]"
              [activated]="c.id === selectedId()"
              [attr.data-testid]="itemPrefix ? itemPrefix + c.id : null"
              (click)="selected.emit(c.id)"
            >
              <span matListItemTitle>{{ c.code }} · {{ c.title }}</span>
              @for (line of c.lines; track $index) {
                <span matListItemLine>{{ line.text }}{{ line.at ? ' ' + (line.at | utcInstant) : '' }}</span>
              }
            </a>
          }
        </mat-nav-list>
      }
    }
  `,
})
export class CyclePicker {
  /** The cycles, in the order to show; undefined until they are loaded. */
  readonly cycles = input<readonly CyclePickerCycle[] | undefined>(undefined);
  readonly loading = input(false);
  /** The sentence of a failed load, or null. */
  readonly error = input<string | null>(null);
  /** What an empty list means on this page, and when a cycle appears. */
  readonly emptyText = input.required<string>();
  /** The route each cycle links to, followed by its id: `/awards` → `/awards/7`. */
  readonly linkBase = input.required<string>();
  /** The cycle shown as chosen, if any (highlighted; Material sets its `aria-current`). */
  readonly selectedId = input<number | null>(null);
  /** `data-testid` of the list. */
  readonly testId = input('cycle-list');
  /** Prefix of each link's `data-testid` (followed by the cycle's id); none when null. */
  readonly itemTestId = input<string | null>(null);
  /** The cycle chosen (as its link is followed). */
  readonly selected = output<number>();
  /** "Try again" after a failed load. */
  readonly retry = output<void>();

  protected readonly empty = computed(() => this.cycles()?.length === 0);
}
