import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { RouterLink } from '@angular/router';
import { loadErrorText } from '../../../core/http/api-error-message';
import { Clock } from '../../../core/time/clock';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { describeCountdown } from '../../../ui/time/countdown';
import { ProposalApi } from '../../proposals/proposal-api';
import { ProposalStateChip } from '../../proposals/proposal-state-chip/proposal-state-chip';

/** How many proposals the home page lists (the proposals page has them all). */
export const HOME_PROPOSAL_COUNT = 5;

/** The proposer's section of the home page: the latest proposals, drafts' deadlines first. */
@Component({
  selector: 'app-your-proposals',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DecimalPipe, LoadStatus, MatButton, ProposalStateChip, RouterLink],
  template: `
    <section aria-labelledby="your-proposals-heading">
      <h2 id="your-proposals-heading">Your proposals</h2>
      <app-load-status
        [loading]="proposals.isLoading()"
        loadingLabel="Loading your proposals"
        [error]="error()"
        [empty]="empty()"
        emptyText="You have no proposal yet."
        (retry)="proposals.reload()"
      />
      @if (shown().length) {
        <ul class="list" data-testid="home-proposals">
          @for (p of shown(); track p.id) {
            <li>
              <a [routerLink]="['/proposals', p.id]" class="title">{{ p.title }}</a>
              <app-proposal-state-chip [state]="p.state" />
              <span class="meta"
                >{{ p.cycleCode }} · {{ p.targetCount | number }} targets · {{ p.requestedNodeHours | number: '1.0-1' }} node-hours</span
              >
              @if (p.state === 'draft') {
                <span class="due" [class.closed]="isClosed(p.callClosesAt)">
                  {{ isClosed(p.callClosesAt) ? 'Call closed' : 'Call closes ' + countdown(p.callClosesAt) }}
                </span>
              }
            </li>
          }
        </ul>
      }
      <p class="links">
        <a matButton routerLink="/proposals">{{ total() > shown().length ? 'All ' + total() + ' proposals' : 'Go to your proposals' }}</a>
      </p>
    </section>
  `,
  styles: `
    .list {
      list-style: none;
      margin: 8px 0 0;
      padding: 0;
      border: 1px solid var(--mat-sys-outline-variant);
      border-radius: var(--mat-sys-corner-medium);
    }
    li {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      gap: 4px 12px;
      padding: 8px 16px;
      border-block-end: 1px solid var(--mat-sys-outline-variant);
      &:last-child {
        border-block-end: none;
      }
    }
    .title {
      font-weight: 500;
      flex: 1 1 240px;
    }
    .meta,
    .due {
      color: var(--mat-sys-on-surface-variant);
      font-variant-numeric: tabular-nums;
    }
    .due:not(.closed) {
      color: var(--mat-sys-on-tertiary-container);
      background: var(--mat-sys-tertiary-container);
      border-radius: var(--mat-sys-corner-small);
      padding: 0 6px;
    }
    .links {
      margin: 8px 0 0;
    }
  `,
})
export class YourProposals {
  private readonly clock = inject(Clock);
  protected readonly proposals = inject(ProposalApi).listResource();

  private readonly all = computed(() => (this.proposals.hasValue() ? this.proposals.value() : []));
  protected readonly total = computed(() => this.all().length);
  /** Open drafts by deadline first, then the rest by last update. */
  protected readonly shown = computed(() => {
    const now = this.clock.now();
    const openDraft = (p: { state: string; callClosesAt: string }) => p.state === 'draft' && Date.parse(p.callClosesAt) > now;
    return [...this.all()]
      .sort((a, b) => {
        const da = openDraft(a);
        const db = openDraft(b);
        if (da !== db) return da ? -1 : 1;
        return da ? a.callClosesAt.localeCompare(b.callClosesAt) : b.updatedAt.localeCompare(a.updatedAt);
      })
      .slice(0, HOME_PROPOSAL_COUNT);
  });
  protected readonly error = computed(() => loadErrorText(this.proposals.error(), 'Your proposals could not be loaded.'));
  protected readonly empty = computed(() => this.proposals.hasValue() && this.all().length === 0);

  protected countdown(iso: string): string {
    return describeCountdown(iso, this.clock.now());
  }

  protected isClosed(iso: string): boolean {
    return Date.parse(iso) <= this.clock.now();
  }
}
