import type { DetrendOptions, ExpectedPeriod, LightCurveValueKind } from '../../photometry/photometry';
import { seededRandom } from '../seeded-random';
import { type MeasureInput, measureRotation } from './measure-rotation';
import { spectralWindow, spectralWindowAt } from './window-function';
import { VERDICT_RULES, rotationVerdict } from './verdict';

const RAW: DetrendOptions = { offsets: 'none', clipSigma: null, binMinutes: null };
const BY_NODE: DetrendOptions = { offsets: 'node', clipSigma: 5, binMinutes: null };

interface Campaign {
  periodDays: number;
  nights: number;
  /** Nodes: longitude offset of their night (days) and zero point (value unit). */
  nodes: { code: string; nightOffsetDays: number; zeroPoint: number }[];
  visitsPerNight: number;
  /** Spread of a night's visits, days. */
  nightWindowDays: number;
  /** Fraction of nights lost to weather, per node. */
  weatherLoss: number;
  semiAmplitude: number;
  noise: number;
  kind: LightCurveValueKind;
  withErrors: boolean;
}

/**
 * A synthetic season as nodes return it: night-only sampling (visits spread over each node's
 * dark window), nights lost to weather at random, one zero point per node, white noise; a
 * sinusoid of known period (mag, or flux around 1).
 */
function season(c: Campaign, seed: number): MeasureInput {
  const r = seededRandom(seed);
  const phase = r.uniform(0, 2 * Math.PI);
  const bjd: number[] = [];
  const values: number[] = [];
  const errors: number[] = [];
  const nodes: string[] = [];
  for (const node of c.nodes) {
    for (let night = 0; night < c.nights; night++) {
      if (r.next() < c.weatherLoss) continue;
      for (let k = 0; k < c.visitsPerNight; k++) {
        const t = 2460600.6 + night + node.nightOffsetDays + (c.nightWindowDays * (k + r.next())) / c.visitsPerNight;
        const signal = c.semiAmplitude * Math.sin((2 * Math.PI * (t - 2460600)) / c.periodDays + phase);
        const base = c.kind === 'mag' ? 11.5 : 1;
        bjd.push(t);
        values.push(base + node.zeroPoint + signal + r.normal(0, c.noise));
        errors.push(c.noise);
        nodes.push(node.code);
      }
    }
  }
  return { bjd, values, errors: c.withErrors ? errors : null, nodes, valueKind: c.kind, timeSystems: ['bjd_tdb'] };
}

const ONE_SITE = [{ code: 'N1', nightOffsetDays: 0, zeroPoint: 0 }];

const CASES: { label: string; campaign: Campaign; expected: ExpectedPeriod }[] = [
  {
    label: '3.7 d, one site, 4 visits a night over 6 h, 30 % of nights lost, mag with errors',
    campaign: {
      periodDays: 3.7,
      nights: 45,
      nodes: ONE_SITE,
      visitsPerNight: 4,
      nightWindowDays: 0.25,
      weatherLoss: 0.3,
      semiAmplitude: 0.008,
      noise: 0.004,
      kind: 'mag',
      withErrors: true,
    },
    expected: { periodDays: 4, lowDays: 3, highDays: 5.5, from: 'test' },
  },
  {
    label: '8.2 d, three nodes at other longitudes with zero points 0, +0.04, −0.03 mag, 3 visits a night',
    campaign: {
      periodDays: 8.2,
      nights: 70,
      nodes: [
        { code: 'N1', nightOffsetDays: 0, zeroPoint: 0 },
        { code: 'N2', nightOffsetDays: 0.35, zeroPoint: 0.04 },
        { code: 'N3', nightOffsetDays: 0.62, zeroPoint: -0.03 },
      ],
      visitsPerNight: 3,
      nightWindowDays: 0.2,
      weatherLoss: 0.4,
      semiAmplitude: 0.005,
      noise: 0.005,
      kind: 'mag',
      withErrors: true,
    },
    expected: { periodDays: 8, lowDays: 6, highDays: 11, from: 'test' },
  },
  {
    label: '15 d, one site, 2 visits a night 5 h apart, relative flux without errors',
    campaign: {
      periodDays: 15,
      nights: 120,
      nodes: ONE_SITE,
      visitsPerNight: 2,
      nightWindowDays: 0.4,
      weatherLoss: 0.35,
      semiAmplitude: 0.006,
      noise: 0.004,
      kind: 'flux',
      withErrors: false,
    },
    expected: { periodDays: 14, lowDays: 10, highDays: 20, from: 'test' },
  },
];

describe('measureRotation: injection and recovery', () => {
  describe.each(CASES)('$label', ({ campaign, expected }) => {
    it.each([1, 2, 3, 4, 5])('seed %i: recovered within 3σP, verdict measured, within the expected range', (seed) => {
      const m = measureRotation(season(campaign, seed), { expected, star: null }, BY_NODE);
      const best = m.best!;
      expect(best).not.toBeNull();
      // Common practice, no source: an honest 1σ keeps the error within 3σ; the σ itself must be
      // small enough to mean something (below 2 % of the period here, where T ≥ 45 d covers ≥ 3 cycles).
      expect(best.periodUncertaintyDays).not.toBeNull();
      expect(Math.abs(best.periodDays - campaign.periodDays)).toBeLessThanOrEqual(3 * best.periodUncertaintyDays!);
      expect(best.periodUncertaintyDays!).toBeLessThan(0.02 * campaign.periodDays);
      // And within half a resolution element, |Δf| ≤ 1/(2T) (the recovery criterion of campaign-simulation.ts).
      const T = m.input.lastBjd - m.input.firstBjd;
      expect(Math.abs(best.frequencyPerDay - 1 / campaign.periodDays)).toBeLessThanOrEqual(1 / (2 * T));
      expect(m.alias.flagged).toBe(false);
      expect(m.verdict).toBe('measured');
      expect(best.withinExpected).toBe(true);
      // The fitted semi-amplitude is the injected one within 25 % (noise and the zero points' share of the signal).
      expect(best.semiAmplitude).toBeGreaterThan(0.75 * campaign.semiAmplitude);
      expect(best.semiAmplitude).toBeLessThan(1.25 * campaign.semiAmplitude);
    });
  });

  it('keeps a single-site period whose daily alias has ≥ 80 % of the power but a far worse fit (likelihood test)', () => {
    const m = measureRotation(season(CASES[0].campaign, 3), { expected: CASES[0].expected, star: null }, BY_NODE);
    expect(m.alias.candidates[0].powerRatio).toBeGreaterThanOrEqual(0.8);
    expect(m.alias.flagged).toBe(false);
    expect(m.verdict).toBe('measured');
    expect(m.verdictReasons[2]).toMatch(/fits clearly worse \(likelihood ratio above 150 to 1\): not counted as an alias/);
  });

  it('needs the zero points removed when nodes differ (without, the node offsets swamp the 8.2-d signal)', () => {
    const input = season(CASES[1].campaign, 7);
    const raw = measureRotation(input, { expected: CASES[1].expected, star: null }, RAW);
    const fixed = measureRotation(input, { expected: CASES[1].expected, star: null }, BY_NODE);
    expect(fixed.verdict).toBe('measured');
    expect(Math.abs(fixed.best!.periodDays - 8.2)).toBeLessThan(3 * fixed.best!.periodUncertaintyDays!);
    // The raw series' residual rms carries the ±0.04 mag offsets.
    expect(raw.best!.residualRms).toBeGreaterThan(3 * fixed.best!.residualRms);
  });

  it('finds pure noise not detected in at least 95 % of 40 seeds (the tentative level is a 5 % false-alarm probability)', () => {
    const noise: Campaign = { ...CASES[0].campaign, semiAmplitude: 0 };
    let notDetected = 0;
    for (let seed = 100; seed < 140; seed++) {
      const m = measureRotation(season(noise, seed), { expected: null, star: null }, BY_NODE);
      if (m.verdict === 'not_detected') notDetected++;
    }
    expect(notDetected).toBeGreaterThanOrEqual(38);
  });

  it('flags a 0.9-d period sampled once a night at the same sidereal time as a possible alias', () => {
    // One visit per sidereal day (0.99727 d): a 0.9-d signal is indistinguishable from one at
    // f − 1.0027 d⁻¹ (P ≈ 9.2 d) and f + 1.0027 d⁻¹ (worked by hand: 1/0.9 − 1.0027 = 0.1084 d⁻¹).
    const r = seededRandom(5);
    const bjd: number[] = [];
    const values: number[] = [];
    for (let k = 0; k < 80; k++) {
      const t = 2460600.7 + k * 0.9972696;
      bjd.push(t);
      values.push(12 + 0.01 * Math.sin((2 * Math.PI * t) / 0.9) + r.normal(0, 0.002));
    }
    const m = measureRotation(
      { bjd, values, errors: null, nodes: null, valueKind: 'mag', timeSystems: ['bjd_tdb'] },
      { expected: null, star: null },
      RAW,
    );
    expect(m.alias.flagged).toBe(true);
    expect(m.verdict).not.toBe('measured');
    expect(m.alias.windowPeaks[0].frequencyPerDay).toBeCloseTo(1.0027, 2);
    const periods = [m.best!.periodDays, ...m.alias.candidates.map((c) => c.periodDays)];
    // The true period and its alias near 9.2 d are both among the best and its candidates.
    expect(periods.some((p) => Math.abs(p - 0.9) < 0.01)).toBe(true);
    expect(periods.some((p) => p > 8.5 && p < 10)).toBe(true);
    expect(m.alias.message).toMatch(/may be an alias/);
    expect(m.verdictReasons.join(' ')).toMatch(/may be an alias.*cannot count as measured/);
  });

  it('says why nothing was measured with too few points', () => {
    const m = measureRotation(
      { bjd: [2460600.1, 2460600.2, 2460601.3], values: [1, 2, 3], errors: null, nodes: null, valueKind: 'mag', timeSystems: ['bjd_tdb'] },
      { expected: null, star: null },
      RAW,
    );
    expect(m.best).toBeNull();
    expect(m.verdict).toBe('not_detected');
    expect(m.verdictReasons[0]).toMatch(/at least 10 are needed/);
    expect(JSON.stringify(m)).not.toMatch(/null,"values":\[\]|NaN/);
  });

  it('gives the implied age through the relation, and none when not detected', () => {
    // SCIENCE.md §8 check 5: Barnes (2007), P 26.09 d, B−V 0.642 → 4565 Myr.
    const c: Campaign = { ...CASES[2].campaign, periodDays: 26.09, nights: 200, kind: 'mag', withErrors: true, noise: 0.002 };
    const star = { colour: { value: 0.642, system: 'BV' as const }, relation: 'barnes2007' as const };
    const m = measureRotation(season(c, 3), { expected: null, star }, BY_NODE);
    expect(m.verdict).toBe('measured');
    expect(m.age?.relation).toBe('barnes2007');
    expect(m.age!.ageMyr!).toBeGreaterThan(4565 * 0.97);
    expect(m.age!.ageMyr!).toBeLessThan(4565 * 1.03);
    expect(m.age!.lowMyr!).toBeLessThan(m.age!.ageMyr!);
    const flat = measureRotation(season({ ...c, semiAmplitude: 0 }, 3), { expected: null, star }, BY_NODE);
    expect(flat.verdict).toBe('not_detected');
    expect(flat.age).toBeNull();
  });

  it('thins the charts and gives false-alarm levels that invert the Baluev probability', () => {
    const c: Campaign = { ...CASES[0].campaign, visitsPerNight: 200, nightWindowDays: 0.3 };
    const m = measureRotation(season(c, 1), { expected: CASES[0].expected, star: null }, BY_NODE);
    expect(m.input.points).toBeGreaterThan(3000);
    expect(m.charts.lightCurve.timeDays.length).toBeLessThanOrEqual(3000);
    expect(m.charts.periodogram.power.length).toBeLessThanOrEqual(2000);
    expect(m.charts.window.power.length).toBeLessThanOrEqual(2000);
    expect(m.charts.folded.phase.length).toBeLessThanOrEqual(2000);
    expect(m.charts.folded.bins.reduce((s, b) => s + b.count, 0)).toBe(m.detrend.pointsUsed);
    // The thinned periodogram keeps the highest grid point.
    expect(Math.max(...m.charts.periodogram.power)).toBeCloseTo(m.peaks[0].power, 12);
    const levels = m.charts.falseAlarmLevels.map((l) => l.power);
    expect(levels[0]).toBeLessThan(levels[1]);
    expect(levels[1]).toBeLessThan(levels[2]);
  });
});

describe('spectralWindow', () => {
  it('equals the direct sums within 1e-3 (fast evaluation) and is 1 at zero frequency', () => {
    const r = seededRandom(9);
    const t: number[] = [];
    for (let k = 0; k < 300; k++) t.push(2460600 + Math.floor(r.uniform(0, 60)) + r.uniform(0.1, 0.35));
    const df = 1 / 600;
    const fast = spectralWindow(t, 0, df, 1500);
    const exact = spectralWindowAt(
      t,
      Array.from({ length: 1500 }, (_, k) => k * df),
    );
    let worst = 0;
    for (let k = 0; k < 1500; k++) worst = Math.max(worst, Math.abs(fast[k] - exact[k]));
    expect(worst).toBeLessThan(1e-3);
    expect(exact[0]).toBeCloseTo(1, 12);
  });
});

describe('rotationVerdict', () => {
  const v = (falseAlarmProbability: number, cyclesCovered: number, aliasFlagged = false) =>
    rotationVerdict({ falseAlarmProbability, cyclesCovered, aliasFlagged }).verdict;
  it('applies the written rule at its edges (a rule of this product)', () => {
    expect(v(VERDICT_RULES.measuredMaxFalseAlarm, 3)).toBe('measured');
    expect(v(0.0011, 3)).toBe('tentative');
    expect(v(0.0001, 2.9)).toBe('tentative');
    expect(v(0.0001, 10, true)).toBe('tentative');
    expect(v(0.05, 1.5)).toBe('tentative');
    expect(v(0.051, 10)).toBe('not_detected');
    expect(v(0.0001, 1.4)).toBe('not_detected');
    expect(rotationVerdict({ falseAlarmProbability: 0.0001, cyclesCovered: 5, aliasFlagged: false }).reasons).toHaveLength(3);
  });
});
