import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIcon } from '@angular/material/icon';
import { ROTATION_VERDICT_LABELS, type RotationVerdict } from '@spincycle/shared/photometry/photometry';

const ICONS: Readonly<Record<RotationVerdict | 'pending', string>> = {
  measured: 'check_circle',
  tentative: 'help',
  not_detected: 'remove_circle_outline',
  pending: 'hourglass_empty',
};

/**
 * The verdict on a target's period, in words with an icon and a tint of the theme (Measured in
 * the amber of what matters, Tentative outlined and dashed, Not detected muted); "Not analysed"
 * while there is no verdict. The word carries the meaning, never the colour alone.
 */
@Component({
  selector: 'app-verdict-chip',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatIcon],
  template: `<span [class]="'chip ' + tone()" data-testid="verdict-chip"
    ><mat-icon fontSet="material-symbols-outlined" aria-hidden="true">{{ icon() }}</mat-icon
    >{{ label() }}</span
  >`,
  styles: `
    .chip {
      display: inline-flex;
      align-items: center;
      gap: 4px;
      padding: 0 8px 0 4px;
      border-radius: var(--mat-sys-corner-full);
      font: var(--mat-sys-label-medium);
      white-space: nowrap;
      border: 1px solid var(--mat-sys-outline-variant);
      background: var(--mat-sys-surface-container-high);
      color: var(--mat-sys-on-surface);
    }
    mat-icon {
      font-size: 16px;
      inline-size: 16px;
      block-size: 16px;
    }
    .measured {
      background: var(--mat-sys-tertiary-container);
      color: var(--mat-sys-on-tertiary-container);
      border-color: var(--mat-sys-tertiary);
    }
    .tentative {
      background: var(--mat-sys-secondary-container);
      color: var(--mat-sys-on-secondary-container);
      border-style: dashed;
      border-color: var(--mat-sys-secondary);
    }
    .not_detected {
      color: var(--mat-sys-on-surface-variant);
    }
    .pending {
      color: var(--mat-sys-on-surface-variant);
      font-style: italic;
      background: transparent;
    }
  `,
})
export class VerdictChip {
  /** Null: no verdict yet (not analysed). */
  readonly verdict = input.required<RotationVerdict | null>();
  protected readonly tone = computed(() => this.verdict() ?? 'pending');
  protected readonly icon = computed(() => ICONS[this.tone()]);
  protected readonly label = computed(() => {
    const verdict = this.verdict();
    return verdict ? ROTATION_VERDICT_LABELS[verdict] : 'Not analysed';
  });
}
