import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { MatIconButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatTooltip } from '@angular/material/tooltip';
import type { PanelStanding, StandingEntry } from '@spincycle/shared/review/standing';
import { LocalInstantPipe, UtcInstantPipe } from '../../../../ui/time/date-pipes';

/** A request to move one proposal of the standing (the page asks for the reason). */
export interface MoveRequest {
  entry: StandingEntry;
  toPosition: number;
}

/**
 * The standing, best first, with buttons to move a proposal up, down or to any position (each
 * move asks for a reason), and the history of moves. Read-only once the standing is locked.
 */
@Component({
  selector: 'app-standing-list',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DecimalPipe, LocalInstantPipe, MatIcon, MatIconButton, MatTooltip, UtcInstantPipe],
  template: `
    <ol class="standing" data-testid="standing-list" aria-label="Standing, best first">
      @for (e of standing().entries; track e.proposal.proposalId; let first = $first; let last = $last) {
        <li [class.not-discussed]="e.proposal.notDiscussed" [attr.data-testid]="'standing-' + e.proposal.proposalId">
          <span class="position" aria-hidden="true">{{ e.position }}</span>
          <span class="what">
            <span class="title">{{ e.proposal.title }}</span>
            <span class="figures">
              Normalised mean {{ e.proposal.normalisedMean === null ? '—' : (e.proposal.normalisedMean | number: '1.2-2') }} · mean grade
              {{ e.proposal.mean === null ? '—' : (e.proposal.mean | number: '1.2-2') }}
              @if (e.proposal.flagged) {
                · <strong class="flag">grades differ</strong>
              }
              @if (e.proposal.notDiscussed) {
                · not discussed
              }
            </span>
          </span>
          @if (!standing().locked) {
            <span class="actions">
              <button
                matIconButton
                type="button"
                [disabled]="first || busy()"
                [attr.aria-label]="'Move ' + e.proposal.title + ' up from position ' + e.position"
                matTooltip="Move up"
                (click)="move.emit({ entry: e, toPosition: e.position - 1 })"
              >
                <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">arrow_upward</mat-icon>
              </button>
              <button
                matIconButton
                type="button"
                [disabled]="last || busy()"
                [attr.aria-label]="'Move ' + e.proposal.title + ' down from position ' + e.position"
                matTooltip="Move down"
                (click)="move.emit({ entry: e, toPosition: e.position + 1 })"
              >
                <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">arrow_downward</mat-icon>
              </button>
              <button
                matIconButton
                type="button"
                [disabled]="busy()"
                [attr.aria-label]="'Move ' + e.proposal.title + ' to another position'"
                matTooltip="Move to a position"
                (click)="move.emit({ entry: e, toPosition: e.position })"
              >
                <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">swap_vert</mat-icon>
              </button>
            </span>
          }
        </li>
      }
    </ol>

    <h3 id="moves-heading">Moves</h3>
    @if (standing().moves.length) {
      <ul class="moves" aria-labelledby="moves-heading" data-testid="standing-moves">
        @for (m of standing().moves; track m.id) {
          <li>
            <span
              ><strong>{{ m.proposalTitle }}</strong> from {{ m.fromPosition }} to {{ m.toPosition }}</span
            >
            <span class="who"
              >{{ m.movedBy ?? 'Someone no longer registered' }},
              <time [attr.datetime]="m.movedAt">{{ (m.movedAt | localInstant) || (m.movedAt | utcInstant) }}</time></span
            >
            <span class="reason">“{{ m.reason }}”</span>
          </li>
        }
      </ul>
    } @else {
      <p class="muted">No proposal has been moved yet: the standing follows the normalised means.</p>
    }
  `,
  styles: `
    ol {
      list-style: none;
      margin: 0;
      padding: 0;
    }
    ol li {
      display: flex;
      align-items: center;
      gap: 12px;
      padding: 6px 0;
      border-block-end: 1px solid var(--mat-sys-outline-variant);
    }
    .position {
      inline-size: 2.5em;
      text-align: end;
      font: var(--mat-sys-title-medium);
      font-variant-numeric: tabular-nums;
    }
    .what {
      flex: 1;
    }
    .what span {
      display: block;
    }
    .figures,
    .who,
    .muted {
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-body-small);
    }
    .flag {
      color: var(--mat-sys-tertiary);
    }
    li.not-discussed {
      opacity: 0.7;
      background: var(--mat-sys-surface-container);
    }
    h3 {
      font: var(--mat-sys-title-medium);
      margin-block: 16px 8px;
    }
    .moves {
      padding-inline-start: 0;
      list-style: none;
    }
    .moves li {
      display: flex;
      flex-direction: column;
      margin-block-end: 8px;
    }
  `,
})
export class StandingList {
  readonly standing = input.required<PanelStanding>();
  /** A move is being saved: the buttons wait. */
  readonly busy = input(false);
  readonly move = output<MoveRequest>();
}
