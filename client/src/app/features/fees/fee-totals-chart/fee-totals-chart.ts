import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { FeeTotals } from '@spincycle/shared/billing/billing';
import { currencyDigits, formatMinorUnits } from '@spincycle/shared/proposals/money';
import { OKABE_ITO } from '../../../ui/charts/chart-palette';

/** One part of a currency's bar. */
export interface FeeSegment {
  key: 'paid' | 'due' | 'overdue' | 'draft' | 'refunded';
  label: string;
  colour: string;
  minor: number;
}

/** The parts of a bar, in the order they stack, with their colours from Okabe & Ito (2008). */
export const FEE_SEGMENTS: readonly Omit<FeeSegment, 'minor'>[] = [
  { key: 'paid', label: 'Paid', colour: OKABE_ITO.bluishGreen },
  { key: 'due', label: 'Outstanding, not yet due', colour: OKABE_ITO.blue },
  { key: 'overdue', label: 'Outstanding and overdue', colour: OKABE_ITO.vermillion },
  { key: 'draft', label: 'Drafts (not issued)', colour: OKABE_ITO.orange },
  { key: 'refunded', label: 'Refunded', colour: OKABE_ITO.reddishPurple },
];

/** A currency's totals as the parts of its bar (outstanding split into not yet due and overdue). */
export function feeSegments(t: FeeTotals): FeeSegment[] {
  const minor: Record<FeeSegment['key'], number> = {
    paid: t.paidMinor,
    due: Math.max(0, t.outstandingMinor - t.overdueMinor),
    overdue: t.overdueMinor,
    draft: t.draftMinor,
    refunded: t.refundedMinor,
  };
  return FEE_SEGMENTS.map((s) => ({ ...s, minor: minor[s.key] }));
}

/**
 * Ticks of an amount axis from 0 in major units (euros, not cents): 1, 2 or 5 × 10ⁿ apart, about
 * four of them, the last at or past `maxMajor` (the "nice numbers" of axis labelling; common
 * practice, no source).
 */
export function amountTicks(maxMajor: number): number[] {
  if (!(maxMajor > 0)) return [0];
  const rough = maxMajor / 4;
  const magnitude = 10 ** Math.floor(Math.log10(rough));
  const norm = rough / magnitude;
  const step = (norm <= 1 ? 1 : norm <= 2 ? 2 : norm <= 5 ? 5 : 10) * magnitude;
  const ticks: number[] = [];
  for (let v = 0; v < maxMajor + step / 2; v += step) ticks.push(Number(v.toPrecision(12)));
  if (ticks[ticks.length - 1] < maxMajor) ticks.push(Number((ticks[ticks.length - 1] + step).toPrecision(12)));
  return ticks;
}

const WIDTH = 640;
const LEFT = 12;
const RIGHT = 28;
const PLOT = WIDTH - LEFT - RIGHT;

interface DrawnSegment extends FeeSegment {
  x: number;
  width: number;
  text: string;
}

interface CurrencyBar {
  currency: string;
  totalText: string;
  segments: DrawnSegment[];
  ticks: { x: number; text: string }[];
  summary: string;
  empty: boolean;
}

let nextId = 0;

/**
 * The money of a cycle per currency, as one horizontal stacked bar each (paid, outstanding not
 * yet due, overdue, drafts, refunded) on an axis titled with its currency; the same figures in a
 * table under the bars for screen readers and for reading exact amounts. Currencies are never
 * added together.
 */
@Component({
  selector: 'app-fee-totals-chart',
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './fee-totals-chart.html',
  styleUrl: './fee-totals-chart.scss',
})
export class FeeTotalsChart {
  readonly totals = input.required<readonly FeeTotals[]>();
  /** The cycle, for the figure's name ("2027A"). */
  readonly cycleCode = input('');

  protected readonly uid = `fee-chart-${++nextId}`;
  protected readonly legend = FEE_SEGMENTS;
  protected readonly width = WIDTH;
  protected readonly plotLeft = LEFT;
  protected readonly plotRight = LEFT + PLOT;
  protected readonly format = formatMinorUnits;

  protected readonly bars = computed<CurrencyBar[]>(() =>
    this.totals().map((t) => {
      const digits = currencyDigits(t.currency);
      const segments = feeSegments(t);
      const total = segments.reduce((s, x) => s + x.minor, 0);
      const ticks = amountTicks(total / 10 ** digits);
      const scaleMinor = ticks[ticks.length - 1] * 10 ** digits;
      let x = LEFT;
      const drawn: DrawnSegment[] = [];
      for (const s of segments) {
        const width = scaleMinor > 0 ? (s.minor / scaleMinor) * PLOT : 0;
        drawn.push({ ...s, x, width, text: formatMinorUnits(s.minor, t.currency) });
        x += width;
      }
      return {
        currency: t.currency,
        totalText: formatMinorUnits(total, t.currency),
        segments: drawn.filter((s) => s.width > 0),
        ticks: ticks.map((v) => ({
          x: LEFT + (scaleMinor > 0 ? ((v * 10 ** digits) / scaleMinor) * PLOT : 0),
          text: v.toLocaleString('en-GB', { maximumFractionDigits: digits }),
        })),
        summary: segments.map((s) => `${s.label}: ${formatMinorUnits(s.minor, t.currency)}`).join('; '),
        empty: total === 0,
      };
    }),
  );
}
