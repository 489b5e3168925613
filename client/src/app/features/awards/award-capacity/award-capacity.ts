import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, LOCALE_ID } from '@angular/core';
import { MatIcon } from '@angular/material/icon';
import type { AwardNodeCapacity } from '@spincycle/shared/awards/awards';
import { formatHours, formatPercent } from '../../../ui/units/format-units';

/** A round step for an axis of `span` over about four intervals: 1, 2, 2.5 or 5 × a power of ten. */
export function niceStep(span: number): number {
  if (!(span > 0)) return 1;
  const raw = span / 4;
  const power = 10 ** Math.floor(Math.log10(raw));
  const mantissa = [1, 2, 2.5, 5, 10].find((m) => m * power >= raw - 1e-9) ?? 10;
  return mantissa * power;
}

/** One node's bar: positions in percent of the shared axis. */
interface NodeBar {
  node: AwardNodeCapacity;
  offered: number;
  awarded: number;
  over: number;
  overStart: number;
  reserveStart: number;
  reserve: number;
  clear: number;
  pastCapacity: boolean;
  /** What the bar says in words (read by screen readers in place of the bar). */
  words: string;
}

/**
 * Capacity per node on the award board: a horizontal bar per node on one shared axis of
 * node-hours (the track is what the node offers, filled with the awarded hours, then the
 * reserve's hours striped, the clear-weather share marked with a dashed line, any overrun in
 * the warning colour and in words), and the numbers in a table under it.
 */
@Component({
  selector: 'app-award-capacity',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DecimalPipe, MatIcon],
  template: `
    <div class="legend" aria-hidden="true">
      <span><span class="swatch awarded"></span>Awarded</span>
      <span><span class="swatch reserve"></span>Reserve (if promoted)</span>
      <span><span class="swatch remaining"></span>Remaining</span>
      <span><span class="swatch clear-mark"></span>Expected clear after weather loss</span>
      @if (anyOver()) {
        <span><span class="swatch over"></span>Past capacity</span>
      }
    </div>
    <ul class="bars" aria-label="Capacity per node" data-testid="capacity-bars">
      @for (b of bars(); track b.node.nodeId) {
        <li [class.past]="b.pastCapacity" [attr.data-testid]="'capacity-bar-' + b.node.code">
          <span class="node">{{ b.node.code }}</span>
          <span class="track-area" aria-hidden="true">
            <span class="track" [style.inline-size.%]="b.offered"></span>
            <span class="fill awarded" [style.inline-size.%]="b.awarded"></span>
            @if (b.over > 0) {
              <span class="fill over" [style.inset-inline-start.%]="b.overStart" [style.inline-size.%]="b.over"></span>
            }
            @if (b.reserve > 0) {
              <span class="fill reserve" [style.inset-inline-start.%]="b.reserveStart" [style.inline-size.%]="b.reserve"></span>
            }
            <span class="mark clear" [style.inset-inline-start.%]="b.clear"></span>
            <span class="mark offered" [style.inset-inline-start.%]="b.offered"></span>
          </span>
          <span class="words">
            @if (b.pastCapacity) {
              <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">warning</mat-icon>
            }
            {{ b.words }}
          </span>
        </li>
      }
      <li class="axis" aria-hidden="true">
        <span></span>
        <span class="ticks">
          @for (t of ticks(); track t.value) {
            <span class="tick" [style.inset-inline-start.%]="t.at">{{ t.value | number: '1.0-1' }}</span>
          }
        </span>
        <span></span>
      </li>
      <li class="axis-title" aria-hidden="true"><span></span><span>Node-hours</span><span></span></li>
    </ul>

    <div class="table-scroll" tabindex="0" role="region" aria-label="Capacity per node, in node-hours">
      <p class="table-scroll-hint">
        <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">swipe</mat-icon>Scroll sideways for more columns
      </p>
      <table class="capacity-table" data-testid="capacity-table">
        <caption class="visually-hidden">
          Capacity of each node in node-hours: offered, expected clear after weather loss, awarded, remaining, on reserve and requested
        </caption>
        <thead>
          <tr>
            <th scope="col">Node</th>
            <th scope="col" class="num">Offered</th>
            <th scope="col" class="num">Expected clear (weather loss)</th>
            <th scope="col" class="num">Awarded</th>
            <th scope="col" class="num">Remaining</th>
            <th scope="col" class="num">Reserve</th>
            <th scope="col" class="num">Requested</th>
          </tr>
        </thead>
        <tbody>
          @for (n of nodes(); track n.nodeId) {
            <tr [class.past]="n.remainingHours < 0" [attr.data-testid]="'capacity-' + n.code">
              <th scope="row">
                <span class="code">{{ n.code }}</span>
                <span class="muted">{{ n.name }} · {{ n.siteName }}</span>
              </th>
              <td class="num">{{ n.offeredHours | number: '1.0-1' }}</td>
              <td class="num">
                {{ n.clearHours | number: '1.0-1' }} <span class="muted">({{ percent(n.weatherLossFraction) }})</span>
              </td>
              <td class="num">{{ n.awardedHours | number: '1.0-1' }}</td>
              <td class="num remaining">{{ n.remainingHours | number: '1.0-1' }}</td>
              <td class="num">{{ n.reserveHours | number: '1.0-1' }}</td>
              <td class="num">{{ n.requestedHours | number: '1.0-1' }}</td>
            </tr>
          }
        </tbody>
      </table>
    </div>
    <p class="note">
      All figures in node-hours, as proposals request them (with each node's weather allowance). Expected clear is what the node offers less
      its usual weather loss; reserve hours are what reserve proposals would get if promoted and use no capacity until then.
    </p>
  `,
  styles: `
    :host {
      display: block;
      --award-colour: var(--mat-sys-primary);
      --reserve-colour: var(--mat-sys-tertiary);
      --over-colour: var(--mat-sys-error);
    }
    .legend {
      display: flex;
      flex-wrap: wrap;
      gap: 4px 16px;
      margin-block-end: 8px;
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface-variant);
    }
    .legend > span {
      display: inline-flex;
      align-items: center;
      gap: 6px;
    }
    .swatch {
      display: inline-block;
      inline-size: 14px;
      block-size: 10px;
      border-radius: 2px;
    }
    .swatch.awarded,
    .fill.awarded {
      background: var(--award-colour);
    }
    .swatch.reserve,
    .fill.reserve {
      background: repeating-linear-gradient(
        135deg,
        var(--reserve-colour) 0 3px,
        color-mix(in srgb, var(--reserve-colour) 35%, transparent) 3px 6px
      );
    }
    .swatch.remaining {
      background: var(--mat-sys-surface-container-highest);
      outline: 1px solid var(--mat-sys-outline);
    }
    .swatch.over,
    .fill.over {
      background: repeating-linear-gradient(
        45deg,
        var(--over-colour) 0 4px,
        color-mix(in srgb, var(--over-colour) 60%, transparent) 4px 8px
      );
    }
    .swatch.clear-mark {
      inline-size: 0;
      block-size: 14px;
      border-inline-start: 2px dashed var(--mat-sys-on-surface);
      border-radius: 0;
    }
    .bars {
      list-style: none;
      margin: 0 0 16px;
      padding: 0;
      display: grid;
      grid-template-columns: minmax(4.5rem, max-content) minmax(160px, 1fr) minmax(0, 16rem);
      gap: 10px 16px;
      align-items: center;
    }
    .bars li {
      display: grid;
      grid-column: 1 / -1;
      grid-template-columns: subgrid;
      align-items: center;
    }
    .node {
      font-weight: 600;
    }
    .track-area {
      position: relative;
      display: block;
      block-size: 18px;
    }
    .track,
    .fill {
      position: absolute;
      inset-block: 0;
      inset-inline-start: 0;
    }
    .track {
      background: var(--mat-sys-surface-container-highest);
      outline: 1px solid var(--mat-sys-outline-variant);
      border-radius: 3px;
    }
    .fill.awarded {
      border-start-start-radius: 3px;
      border-end-start-radius: 3px;
    }
    .mark {
      position: absolute;
      inset-block: -4px;
      margin-inline-start: -1px;
    }
    .mark.clear {
      border-inline-start: 2px dashed var(--mat-sys-on-surface);
    }
    .mark.offered {
      border-inline-start: 2px solid var(--mat-sys-on-surface);
    }
    .words {
      display: inline-flex;
      align-items: center;
      gap: 4px;
      font-variant-numeric: tabular-nums;
      color: var(--mat-sys-on-surface-variant);
    }
    .past .words {
      color: var(--over-colour);
      font-weight: 600;
    }
    .words mat-icon {
      font-size: 18px;
      inline-size: 18px;
      block-size: 18px;
    }
    .ticks {
      position: relative;
      display: block;
      block-size: 1.2em;
      border-block-start: 1px solid var(--mat-sys-outline);
      font: var(--mat-sys-label-small);
      color: var(--mat-sys-on-surface-variant);
      font-variant-numeric: tabular-nums;
    }
    .tick {
      position: absolute;
      inset-block-start: 2px;
      transform: translateX(-50%);
      white-space: nowrap;
    }
    .axis-title span {
      text-align: center;
      font: var(--mat-sys-label-medium);
      color: var(--mat-sys-on-surface-variant);
    }
    @media (max-width: 600px) {
      .bars {
        grid-template-columns: minmax(3.5rem, max-content) minmax(120px, 1fr);
      }
      .words {
        grid-column: 1 / -1;
      }
      .axis > span:last-child,
      .axis-title > span:last-child {
        display: none;
      }
    }
    table {
      border-collapse: collapse;
      inline-size: 100%;
      font-variant-numeric: tabular-nums;
    }
    th,
    td {
      padding: 6px 10px;
      border-block-end: 1px solid var(--mat-sys-outline-variant);
      text-align: start;
      vertical-align: top;
    }
    thead th {
      font-weight: 600;
    }
    .num {
      text-align: end;
      white-space: nowrap;
    }
    th .code,
    th .muted {
      display: block;
    }
    .muted,
    .note {
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-body-small);
    }
    tr.past .remaining {
      color: var(--over-colour);
      font-weight: 600;
    }
    .note {
      max-inline-size: 80ch;
    }
  `,
})
export class AwardCapacity {
  readonly nodes = input.required<readonly AwardNodeCapacity[]>();
  private readonly locale = inject(LOCALE_ID);

  /** The axis: from 0 to a round number at or past the longest bar. */
  private readonly axis = computed(() => {
    const longest = Math.max(0, ...this.nodes().map((n) => Math.max(n.offeredHours, n.awardedHours + n.reserveHours)));
    const step = niceStep(longest);
    const max = Math.max(step, Math.ceil(longest / step - 1e-9) * step);
    return { step, max };
  });

  protected readonly ticks = computed(() => {
    const { step, max } = this.axis();
    const count = Math.round(max / step);
    return Array.from({ length: count + 1 }, (_, i) => ({ value: i * step, at: ((i * step) / max) * 100 }));
  });

  protected readonly bars = computed<NodeBar[]>(() => {
    const { max } = this.axis();
    const pct = (hours: number) => (Math.max(0, hours) / max) * 100;
    return this.nodes().map((node) => {
      const within = Math.min(node.awardedHours, node.offeredHours);
      const overHours = Math.max(0, node.awardedHours - node.offeredHours);
      const pastCapacity = node.remainingHours < 0 || overHours > 0;
      const offered = formatHours(node.offeredHours, this.locale);
      const words = pastCapacity
        ? `Past capacity: ${formatHours(node.awardedHours, this.locale)} awarded, ${formatHours(Math.max(overHours, -node.remainingHours), this.locale)} more than the ${offered} offered`
        : `${formatHours(node.remainingHours, this.locale)} left of ${offered}` +
          (node.reserveHours > 0 ? `; reserve ${formatHours(node.reserveHours, this.locale)}` : '');
      return {
        node,
        offered: pct(node.offeredHours),
        awarded: pct(within),
        overStart: pct(node.offeredHours),
        over: pct(overHours),
        reserveStart: pct(node.awardedHours),
        reserve: pct(node.reserveHours),
        clear: pct(node.clearHours),
        pastCapacity,
        words,
      };
    });
  });

  protected readonly anyOver = computed(() => this.bars().some((b) => b.pastCapacity));

  protected percent(fraction: number): string {
    return `${formatPercent(fraction, this.locale)} loss`;
  }
}
