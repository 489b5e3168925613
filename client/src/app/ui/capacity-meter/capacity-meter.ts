import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';

/**
 * Requested node-hours against what a node offers, as a bar: the fill is the request, the
 * vertical mark the capacity. `scaleMax` (a pressure, default 1 or the pressure if higher)
 * lets several meters share one scale, so that rows compare at a glance. The bar is
 * decoration: the numbers beside it carry the meaning (it is hidden from screen readers).
 */
@Component({
  selector: 'app-capacity-meter',
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <span class="track" aria-hidden="true">
      <span class="fill" [class.over]="over()" [class.near]="near()" [class.beyond]="beyond()" [style.inline-size.%]="fillPercent()"></span>
      <span class="mark" [style.inset-inline-start.%]="markPercent()"></span>
    </span>
  `,
  styles: `
    :host {
      display: inline-block;
      inline-size: 100%;
      min-inline-size: 64px;
      vertical-align: middle;
    }
    .track {
      position: relative;
      display: block;
      block-size: 10px;
      border-radius: 5px;
      background: var(--mat-sys-surface-container-highest);
    }
    .fill {
      position: absolute;
      inset-block: 0;
      inset-inline-start: 0;
      border-radius: 5px;
      background: var(--mat-sys-primary);
    }
    .fill.near {
      background: var(--mat-sys-tertiary);
    }
    .fill.over {
      background: var(--mat-sys-error);
    }
    /* Past the end of the scale: the bar ends in a notch instead of a round cap. */
    .fill.beyond {
      border-start-end-radius: 0;
      border-end-end-radius: 0;
      clip-path: polygon(0 0, 100% 0, calc(100% - 6px) 50%, 100% 100%, 0 100%);
    }
    .mark {
      position: absolute;
      inset-block: -3px;
      inline-size: 2px;
      margin-inline-start: -1px;
      background: var(--mat-sys-on-surface);
    }
  `,
})
export class CapacityMeter {
  /** Requested ÷ offered; null when nothing is offered (drawn as full and over). */
  readonly pressure = input.required<number | null>();
  /** The pressure at the right end of the track (at least 1; alone, the meter's own pressure up to 2). */
  readonly scaleMax = input<number | null>(null);

  private readonly scale = computed(() => Math.max(1, this.scaleMax() ?? Math.min(2, this.pressure() ?? 1)));
  /** The request runs past the end of the track. */
  protected readonly beyond = computed(() => (this.pressure() ?? Infinity) > this.scale());
  protected readonly over = computed(() => {
    const p = this.pressure();
    return p === null || p > 1;
  });
  /** Within capacity but above 90 % of it. */
  protected readonly near = computed(() => {
    const p = this.pressure();
    return p !== null && p > 0.9 && p <= 1;
  });
  protected readonly fillPercent = computed(() => Math.min(100, ((this.pressure() ?? this.scale()) / this.scale()) * 100));
  protected readonly markPercent = computed(() => (1 / this.scale()) * 100);
}
