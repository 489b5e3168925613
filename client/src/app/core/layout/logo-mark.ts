import { ChangeDetectionStrategy, Component } from '@angular/core';

/**
 * Spincycle's mark: a star with a dark spot, circled by an arrow (the star turns, the spot
 * comes round again). Decorative: the product name always stands beside it.
 */
@Component({
  selector: 'app-logo-mark',
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <svg viewBox="0 0 32 32" width="32" height="32" aria-hidden="true" focusable="false">
      <path class="orbit" d="M16 3A13 13 0 1 1 4.74 9.5" />
      <polygon class="arrow" points="6.34,6.73 6.91,10.75 2.57,8.25" />
      <circle class="star" cx="16" cy="16" r="8" />
      <circle class="spot" cx="19" cy="13.2" r="2.6" />
    </svg>
  `,
  styles: `
    :host {
      display: inline-flex;
      inline-size: 32px;
      block-size: 32px;
    }
    .orbit {
      fill: none;
      stroke: currentColor;
      stroke-width: 2;
      stroke-linecap: round;
    }
    .arrow {
      fill: currentColor;
    }
    .star {
      fill: var(--mat-sys-tertiary-fixed-dim);
    }
    .spot {
      fill: var(--mat-sys-on-tertiary-fixed-variant);
    }
  `,
})
export class LogoMark {}
