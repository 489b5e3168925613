import type { Scale } from 'chart.js';
import { logTickLabel } from './chart-format';
import { ceil125, floor125, logAxis125Hooks, ticks125 } from './log-ticks';

describe('floor125 / ceil125', () => {
  it('round to the 1–2–5 values around a number, exact values kept', () => {
    expect([0.37, 0.1, 1.9, 7, 10, 83, 0.0042].map(floor125)).toEqual([0.2, 0.1, 1, 5, 10, 50, 0.002]);
    expect([0.37, 0.1, 1.9, 7, 10, 83, 0.0042].map(ceil125)).toEqual([0.5, 0.1, 2, 10, 10, 100, 0.005]);
  });
});

describe('ticks125', () => {
  it('a period axis 0.1–50 d: 0.1, 0.2, 0.5, 1, 2, 5, 10, 20, 50 without floating-point noise', () => {
    expect(ticks125(0.1, 50)).toEqual([0.1, 0.2, 0.5, 1, 2, 5, 10, 20, 50]);
  });

  it('only the values inside the range; an age axis 100 Myr–10 Gyr', () => {
    expect(ticks125(0.37, 83)).toEqual([0.5, 1, 2, 5, 10, 20, 50]);
    expect(ticks125(100, 10_000)).toEqual([100, 200, 500, 1000, 2000, 5000, 10_000]);
  });

  it('too many for the room: powers of ten only, then every second one (always through 1)', () => {
    expect(ticks125(0.1, 50, 5)).toEqual([0.1, 1, 10]);
    expect(ticks125(0.001, 1000, 4)).toEqual([0.01, 1, 100]);
  });

  it('a range a log axis cannot show gives no ticks', () => {
    expect(ticks125(0, 10)).toEqual([]);
    expect(ticks125(-1, 10)).toEqual([]);
    expect(ticks125(10, 1)).toEqual([]);
  });

  it('every tick is labelled, plainly (no exponent, no 0.30000000000000004)', () => {
    expect(ticks125(0.01, 20_000).map((v) => logTickLabel(v, 'en-GB'))).toEqual([
      '0.01',
      '0.02',
      '0.05',
      '0.1',
      '0.2',
      '0.5',
      '1',
      '2',
      '5',
      '10',
      '20',
      '50',
      '100',
      '200',
      '500',
      '1,000',
      '2,000',
      '5,000',
      '10,000',
      '20,000',
    ]);
    expect(logTickLabel(3, 'en-GB')).toBe('');
  });
});

describe('logAxis125Hooks', () => {
  function fakeScale(min: number, max: number, horizontal: boolean, length: number) {
    return {
      min,
      max,
      ticks: [] as { value: number; major?: boolean }[],
      width: horizontal ? length : 40,
      height: horizontal ? 30 : length,
      isHorizontal: () => horizontal,
    };
  }

  it('widens the data range to 1–2–5 ends and puts the ticks (and so the grid lines) on 1–2–5 values only', () => {
    const hooks = logAxis125Hooks();
    const scale = fakeScale(0.37, 83, false, 300);
    hooks.afterDataLimits(scale as unknown as Scale);
    expect([scale.min, scale.max]).toEqual([0.2, 100]);
    hooks.afterBuildTicks(scale as unknown as Scale);
    expect(scale.ticks.map((t) => t.value)).toEqual([0.2, 0.5, 1, 2, 5, 10, 20, 50, 100]);
    expect(scale.ticks.filter((t) => t.major).map((t) => t.value)).toEqual([1, 10, 100]);
  });

  it('a narrow horizontal axis keeps its labels apart: powers of ten only', () => {
    const hooks = logAxis125Hooks();
    const scale = fakeScale(100, 10_000, true, 200);
    hooks.afterDataLimits(scale as unknown as Scale);
    hooks.afterBuildTicks(scale as unknown as Scale);
    expect(scale.ticks.map((t) => t.value)).toEqual([100, 1000, 10_000]);
  });
});
