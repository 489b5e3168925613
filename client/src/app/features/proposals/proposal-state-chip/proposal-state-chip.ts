import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { PROPOSAL_STATE_LABELS, type ProposalState } from '@spincycle/shared/proposals/proposal-states';

/** A proposal's state in our words ("Draft", "In review", "Not awarded"), tinted by how it stands. */
@Component({
  selector: 'app-proposal-state-chip',
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `<span class="chip" [class]="tone()" data-testid="state-chip">{{ label() }}</span>`,
  styles: `
    .chip {
      display: inline-block;
      padding: 2px 10px;
      border-radius: var(--mat-sys-corner-full);
      font: var(--mat-sys-label-medium);
      white-space: nowrap;
      background: var(--mat-sys-surface-container-high);
      color: var(--mat-sys-on-surface);
      border: 1px solid var(--mat-sys-outline-variant);
    }
    .draft {
      background: var(--mat-sys-surface-container);
      color: var(--mat-sys-on-surface-variant);
    }
    .active {
      background: var(--mat-sys-secondary-container);
      color: var(--mat-sys-on-secondary-container);
    }
    .good {
      background: var(--mat-sys-tertiary-container);
      color: var(--mat-sys-on-tertiary-container);
    }
    .ended {
      color: var(--mat-sys-on-surface-variant);
      font-style: italic;
    }
  `,
})
export class ProposalStateChip {
  readonly state = input.required<ProposalState>();
  protected readonly label = computed(() => PROPOSAL_STATE_LABELS[this.state()]);
  protected readonly tone = computed(() => {
    switch (this.state()) {
      case 'draft':
        return 'chip draft';
      case 'submitted':
      case 'in_review':
      case 'ranked':
        return 'chip active';
      case 'awarded':
      case 'reserve':
        return 'chip good';
      default:
        return 'chip ended';
    }
  });
}
