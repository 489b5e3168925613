import { ChangeDetectionStrategy, Component, computed, inject, input, LOCALE_ID } from '@angular/core';
import { formatPercent } from '../../../ui/units/format-units';

/** A recovery fraction as a short bar with its percentage in words; "not estimated yet" before a build. */
@Component({
  selector: 'app-recovery-bar',
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    @if (fraction() === null) {
      <span class="muted">Not estimated yet</span>
    } @else {
      <span class="track" aria-hidden="true"><span class="fill" [style.inline-size.%]="width()"></span></span>
      <span class="value" data-testid="recovery-value">{{ text() }}</span>
    }
  `,
  styles: `
    :host {
      display: inline-flex;
      align-items: center;
      gap: 8px;
      white-space: nowrap;
      font-variant-numeric: tabular-nums;
    }
    .track {
      position: relative;
      display: inline-block;
      inline-size: 5rem;
      block-size: 8px;
      border-radius: 4px;
      background: var(--mat-sys-surface-container-highest);
      outline: 1px solid var(--mat-sys-outline-variant);
      overflow: hidden;
    }
    .fill {
      position: absolute;
      inset-block: 0;
      inset-inline-start: 0;
      background: var(--mat-sys-primary);
    }
    .muted {
      color: var(--mat-sys-on-surface-variant);
    }
  `,
})
export class RecoveryBar {
  readonly fraction = input<number | null>(null);
  private readonly locale = inject(LOCALE_ID);
  protected readonly width = computed(() => Math.max(0, Math.min(1, this.fraction() ?? 0)) * 100);
  protected readonly text = computed(() => formatPercent(this.fraction(), this.locale));
}
