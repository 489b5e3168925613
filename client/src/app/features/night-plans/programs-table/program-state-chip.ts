import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { PROGRAM_STATE_LABELS, type ProgramState } from '@spincycle/shared/awards/awards';

/** A program's state in our words ("Scheduled", "Observing", "Complete", "Withdrawn"), tinted by how it stands. */
@Component({
  selector: 'app-program-state-chip',
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `<span [class]="tone()" data-testid="program-state-chip">{{ label() }}</span>`,
  styles: `
    .chip {
      display: inline-block;
      padding: 0 8px;
      border-radius: var(--mat-sys-corner-full);
      font: var(--mat-sys-label-medium);
      white-space: nowrap;
      background: var(--mat-sys-surface-container-high);
      color: var(--mat-sys-on-surface);
      border: 1px solid var(--mat-sys-outline-variant);
    }
    .observing {
      background: var(--mat-sys-secondary-container);
      color: var(--mat-sys-on-secondary-container);
    }
    .complete {
      background: var(--mat-sys-tertiary-container);
      color: var(--mat-sys-on-tertiary-container);
      border-color: var(--mat-sys-tertiary);
    }
    .withdrawn {
      color: var(--mat-sys-on-surface-variant);
      font-style: italic;
    }
  `,
})
export class ProgramStateChip {
  readonly state = input.required<ProgramState>();
  protected readonly label = computed(() => PROGRAM_STATE_LABELS[this.state()]);
  protected readonly tone = computed(() => `chip ${this.state()}`);
}
