import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { MatCard } from '@angular/material/card';
import { MatIcon } from '@angular/material/icon';
import { PROGRAM_STATE_LABELS, type AwardOutcome, type TeamDecision } from '@spincycle/shared/awards/awards';
import { loadErrorTextUnlessMissing } from '../../../core/http/api-error-message';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { LocalInstantPipe, UtcInstantPipe } from '../../../ui/time/date-pipes';
import { AwardsApi } from '../awards-api';

/** The outcome as the team reads it. */
const HEADLINES: Record<AwardOutcome, string> = {
  awarded: 'Your proposal was awarded node-hours.',
  reserve: 'Your proposal is on the reserve list.',
  not_awarded: 'Your proposal was not awarded node-hours in this cycle.',
};

const EXPLANATIONS: Record<AwardOutcome, string> = {
  awarded: 'The node-hours below are yours to observe in the campaign; the facility plans the nights from them.',
  reserve:
    'It is awarded the node-hours below only if awarded time becomes free during the cycle. The facility will tell you if that happens.',
  not_awarded: 'The reviewers’ comments below may help with a proposal to a later cycle.',
};

let nextId = 0;

/**
 * The decision on a proposal, for its team, once the facility has released the cycle's
 * decisions: the outcome in words, the node-hours per node, the targets kept in a partial
 * award, the program's state, and the reviewers' comments without their names. Shows nothing
 * before the release (404) and a small error state when the decision cannot be read.
 */
@Component({
  selector: 'app-decision-card',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DecimalPipe, LoadStatus, LocalInstantPipe, MatCard, MatIcon, UtcInstantPipe],
  template: `
    @if (decision(); as d) {
      <mat-card appearance="outlined" class="decision" [attr.data-outcome]="d.outcome" data-testid="decision-card">
        <section [attr.aria-labelledby]="titleId">
          <h2 [id]="titleId">Decision for cycle {{ d.cycleCode }}</h2>
          <p class="headline" data-testid="decision-headline">
            <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">{{ icon(d.outcome) }}</mat-icon>
            <strong>{{ headline(d.outcome) }}</strong>
          </p>
          <p class="muted">
            {{ explanation(d.outcome) }} Decided and sent on
            <time [attr.datetime]="d.releasedAt">{{ (d.releasedAt | localInstant) || (d.releasedAt | utcInstant) }}</time>.
          </p>

          @if (d.outcome !== 'not_awarded' && d.nodes.length) {
            <h3>{{ d.outcome === 'reserve' ? 'Node-hours if promoted' : 'Node-hours awarded' }}</h3>
            <ul class="nodes" data-testid="decision-nodes">
              @for (n of d.nodes; track n.nodeId) {
                <li>
                  <span class="code">{{ n.code }}</span>
                  <span class="muted">{{ n.name }}</span>
                  <span class="hours">{{ n.nodeHours | number: '1.0-2' }} node-hours</span>
                </li>
              }
            </ul>
            <p class="muted total">Total: {{ total(d) | number: '1.0-2' }} node-hours</p>
          }

          @if (d.outcome !== 'not_awarded') {
            @if (d.awardedTargets; as targets) {
              <h3>Targets awarded</h3>
              <p data-testid="decision-targets">
                Only {{ targets.length }} of your targets {{ targets.length === 1 ? 'is' : 'are' }} part of the award:
                {{ targets.join(', ') }}.
              </p>
            } @else {
              <p data-testid="decision-targets">Every target of the proposal is part of the award.</p>
            }
          }

          @if (d.programState; as state) {
            <p data-testid="decision-program"><strong>Program:</strong> {{ programLabel(state) }}{{ programNote(state) }}</p>
          }

          <h3>Reviewers’ comments</h3>
          @if (d.comments.length) {
            <div class="comments" data-testid="decision-comments">
              @for (c of d.comments; track $index) {
                <article class="comment" [attr.aria-label]="c.reviewer">
                  <h4>{{ c.reviewer }}</h4>
                  <p class="label">Strengths</p>
                  <p class="text">{{ c.strengths || 'No comment.' }}</p>
                  <p class="label">Weaknesses</p>
                  <p class="text">{{ c.weaknesses || 'No comment.' }}</p>
                </article>
              }
            </div>
          } @else {
            <p class="muted">The reviewers left no comments.</p>
          }
        </section>
      </mat-card>
    } @else if (error(); as e) {
      <app-load-status [error]="e" (retry)="resource.reload()" data-testid="decision-error" />
    }
  `,
  styles: `
    :host {
      display: block;
    }
    .decision {
      margin: 0 0 16px;
    }
    section {
      padding: 12px 16px 16px;
    }
    h2 {
      font: var(--mat-sys-title-medium);
      margin: 0 0 8px;
    }
    h3 {
      font: var(--mat-sys-title-small);
      margin: 16px 0 4px;
    }
    h4 {
      font: var(--mat-sys-label-large);
      margin: 0 0 4px;
    }
    .headline {
      display: flex;
      align-items: center;
      gap: 8px;
      margin: 0 0 4px;
      padding: 8px 12px;
      border-radius: var(--mat-sys-corner-medium);
      background: var(--mat-sys-surface-container);
    }
    [data-outcome='awarded'] .headline {
      background: var(--mat-sys-primary-container);
      color: var(--mat-sys-on-primary-container);
    }
    [data-outcome='reserve'] .headline {
      background: var(--mat-sys-tertiary-container);
      color: var(--mat-sys-on-tertiary-container);
    }
    .muted {
      color: var(--mat-sys-on-surface-variant);
    }
    .nodes {
      list-style: none;
      margin: 0;
      padding: 0;
      font-variant-numeric: tabular-nums;
    }
    .nodes li {
      display: flex;
      flex-wrap: wrap;
      gap: 4px 12px;
      padding: 4px 0;
      border-block-end: 1px solid var(--mat-sys-outline-variant);
    }
    .code {
      font-weight: 600;
      min-inline-size: 6rem;
    }
    .hours {
      margin-inline-start: auto;
    }
    .total {
      margin-block: 4px 0;
    }
    .comments {
      display: grid;
      gap: 12px;
    }
    .comment {
      padding: 8px 12px;
      border-radius: var(--mat-sys-corner-small);
      background: var(--mat-sys-surface-container-low);
    }
    .label {
      margin: 4px 0 0;
      font: var(--mat-sys-label-medium);
      color: var(--mat-sys-on-surface-variant);
    }
    .text {
      margin: 0;
      white-space: pre-line;
      max-inline-size: 80ch;
    }
  `,
})
export class DecisionCard {
  /** The proposal whose decision this is. */
  readonly proposalId = input.required<number>();
  private readonly api = inject(AwardsApi);

  protected readonly titleId = `decision-title-${++nextId}`;
  protected readonly resource = this.api.decisionResource(() => this.proposalId());
  protected readonly decision = computed<TeamDecision | null>(() => (this.resource.hasValue() ? this.resource.value() : null));
  /** Not released yet (404): nothing to show. Any other failure: a small error state. */
  protected readonly error = computed(() =>
    loadErrorTextUnlessMissing(this.resource.error(), 'The decision on this proposal could not be loaded.'),
  );

  protected headline(outcome: AwardOutcome): string {
    return HEADLINES[outcome];
  }

  protected explanation(outcome: AwardOutcome): string {
    return EXPLANATIONS[outcome];
  }

  protected icon(outcome: AwardOutcome): string {
    return outcome === 'awarded' ? 'verified' : outcome === 'reserve' ? 'hourglass_top' : 'info';
  }

  protected total(d: TeamDecision): number {
    return d.nodes.reduce((sum, n) => sum + n.nodeHours, 0);
  }

  protected programLabel(state: keyof typeof PROGRAM_STATE_LABELS): string {
    return PROGRAM_STATE_LABELS[state];
  }

  protected programNote(state: keyof typeof PROGRAM_STATE_LABELS): string {
    switch (state) {
      case 'scheduled':
        return ': the facility is planning its nights.';
      case 'observing':
        return ': the nodes are observing your targets.';
      case 'complete':
        return ': observing has finished; its progress below says why.';
      case 'withdrawn':
        return ': it will not be observed.';
    }
  }
}
