import { HttpErrorResponse } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input } from '@angular/core';
import { MatTabLink, MatTabNav, MatTabNavPanel } from '@angular/material/tabs';
import { RouterLink, RouterLinkActive, RouterOutlet } from '@angular/router';
import { PROPOSAL_STATE_LABELS } from '@spincycle/shared/proposals/proposal-states';
import { readApiError } from '../../../core/http/api-error-message';
import { Clock } from '../../../core/time/clock';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { describeCountdown } from '../../../ui/time/countdown';
import { LocalInstantPipe, UtcInstantPipe } from '../../../ui/time/date-pipes';
import { EDITOR_TABS } from '../editor-tabs';
import { ProposalStateChip } from '../proposal-state-chip/proposal-state-chip';
import { ProposalStore } from '../proposal-store';

/** The tab of the program's returned photometry (a child route of /proposals/:id, not a tab of the proposal itself). */
const PHOTOMETRY_TAB = { path: 'photometry', label: 'Light curves' } as const;

/**
 * /proposals/:id: the proposal's header, the read-only banner once it is submitted, and its
 * tabs as linkable child routes. Provides the ProposalStore the tabs share.
 */
@Component({
  selector: 'app-proposal-editor',
  changeDetection: ChangeDetectionStrategy.OnPush,
  providers: [ProposalStore],
  imports: [
    LoadStatus,
    LocalInstantPipe,
    MatTabLink,
    MatTabNav,
    MatTabNavPanel,
    ProposalStateChip,
    RouterLink,
    RouterLinkActive,
    RouterOutlet,
    UtcInstantPipe,
  ],
  templateUrl: './proposal-editor.html',
  styleUrl: './proposal-editor.scss',
})
export default class ProposalEditor {
  protected readonly store = inject(ProposalStore);
  private readonly clock = inject(Clock);

  /** Route parameter. */
  readonly id = input<string>();
  private readonly parsedId = computed(() => {
    const id = Number(this.id());
    return Number.isInteger(id) && id > 0 ? id : null;
  });

  /**
   * The editor's tabs, and "Light curves" once the proposal is awarded: its program then exists
   * (the release of the awards creates it in the same transaction as the state).
   */
  protected readonly tabs = computed<readonly { path: string; label: string }[]>(() =>
    this.proposal()?.state === 'awarded' ? [...EDITOR_TABS, PHOTOMETRY_TAB] : EDITOR_TABS,
  );
  protected readonly stateLabels = PROPOSAL_STATE_LABELS;
  protected readonly proposal = this.store.proposal;

  protected readonly loadError = computed(() => {
    if (this.parsedId() === null) return 'There is no proposal at this address.';
    const error = this.store.resource.error();
    if (!error) return null;
    const cause = (error as { cause?: unknown }).cause ?? error;
    if (cause instanceof HttpErrorResponse && cause.status === 404) {
      return 'This proposal does not exist, or you are not on its team.';
    }
    return `The proposal could not be loaded. ${readApiError(error).message}`;
  });

  protected readonly closesIn = computed(() => {
    const proposal = this.proposal();
    return proposal ? describeCountdown(proposal.cycle.callClosesAt, this.clock.now()) : '';
  });
  protected readonly callClosed = computed(() => {
    const proposal = this.proposal();
    return !!proposal && Date.parse(proposal.cycle.callClosesAt) <= this.clock.now();
  });

  constructor() {
    effect(() => this.store.id.set(this.parsedId()));
  }
}
