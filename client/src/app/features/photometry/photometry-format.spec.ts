import {
  fitSemiAmplitude,
  foldedModel,
  formatAge,
  formatAmplitude,
  formatExpected,
  formatFap,
  formatFapLevel,
  formatPeriod,
  isRunActive,
  periodDecimals,
  readableReferences,
  runPercent,
  runSentence,
  sinusoidAtPhase,
  spectrumByPeriod,
  superscript,
  thinEvenly,
  thinKeepingPeaks,
} from './photometry-format';
import { testRun } from './testing/photometry-fixtures';

describe('photometry-format', () => {
  describe('formatFap', () => {
    it('below 0.01: one significant figure times a power of ten, in superscript', () => {
      // 3.2e-5 rounds to 3e-5 (worked by hand in this test).
      expect(formatFap(3.2e-5, 'en-US')).toBe('3×10⁻⁵');
      expect(formatFap(0.00149, 'en-US')).toBe('1×10⁻³');
      expect(formatFap(9.7e-7, 'en-US')).toBe('1×10⁻⁶');
    });

    it('at or above 0.01: a plain decimal with two significant figures', () => {
      expect(formatFap(0.41, 'en-US')).toBe('0.41');
      expect(formatFap(0.0123, 'en-US')).toBe('0.012');
      // 0.0096 rounds to 0.01 at one figure: written as a decimal, not 1×10⁻² (worked by hand).
      expect(formatFap(0.0096, 'en-US')).toBe('0.0096');
      expect(formatFap(1, 'en-US')).toBe('1');
    });

    it('below 10⁻¹⁰: "< 10⁻¹⁰"; missing: an em dash', () => {
      expect(formatFap(4e-12, 'en-US')).toBe('< 10⁻¹⁰');
      expect(formatFap(0, 'en-US')).toBe('< 10⁻¹⁰');
      expect(formatFap(null, 'en-US')).toBe('—');
      expect(formatFap(Number.NaN, 'en-US')).toBe('—');
    });

    it('writes decimals the locale way', () => {
      expect(formatFap(0.41, 'de-DE')).toBe('0,41');
    });
  });

  it('superscript: digits and the minus sign', () => {
    expect(superscript(-10)).toBe('⁻¹⁰');
    expect(superscript(23)).toBe('²³');
  });

  it('formatFapLevel: a percentage without floating-point noise', () => {
    expect(formatFapLevel(0.01, 'en-US')).toBe('1 %');
    expect(formatFapLevel(0.001, 'en-US')).toBe('0.1 %');
    expect(formatFapLevel(0.0001, 'en-US')).toBe('0.01 %');
  });

  describe('periods', () => {
    it('shows the period to two significant figures of its uncertainty', () => {
      expect(periodDecimals(0.034)).toBe(3);
      expect(periodDecimals(0.4)).toBe(2);
      expect(periodDecimals(3)).toBe(1);
      expect(periodDecimals(40)).toBe(0);
      expect(periodDecimals(null)).toBe(2);
      expect(formatPeriod(8.2143, 0.034, 'en-US')).toBe('8.214 ± 0.034');
      expect(formatPeriod(1.14, 0.002, 'en-US')).toBe('1.1400 ± 0.0020');
    });

    it('without an uncertainty: the period alone; without a period: an em dash', () => {
      expect(formatPeriod(3.714, null, 'en-US')).toBe('3.71');
      expect(formatPeriod(null, null, 'en-US')).toBe('—');
    });

    it('expected period with its range', () => {
      expect(formatExpected({ periodDays: 8.6, lowDays: 6.9, highDays: 10.44 }, 'en-US')).toBe('8.6 (6.9–10.4)');
      expect(formatExpected(null, 'en-US')).toBe('—');
    });
  });

  it('amplitudes in the light curve’s unit: mmag for magnitudes, ppm for flux', () => {
    expect(formatAmplitude({ mmag: 4.23, ppm: 3870.4 }, 'mag', 'en-US')).toBe('4.2');
    expect(formatAmplitude({ mmag: 4.23, ppm: 3870.4 }, 'flux', 'en-US')).toBe('3,870');
    expect(formatAmplitude({ mmag: null, ppm: null }, 'flux', 'en-US')).toBe('—');
  });

  it('ages with their range, three significant figures', () => {
    expect(formatAge(612, 480, 750, 'en-US')).toBe('612 Myr (480–750)');
    expect(formatAge(2345, null, null, 'en-US')).toBe('2,350 Myr');
    expect(formatAge(null, 1, 2, 'en-US')).toBe('—');
  });

  describe('runs', () => {
    it('active while queued or running; percent done', () => {
      expect(isRunActive(testRun({ state: 'queued' }))).toBe(true);
      expect(isRunActive(testRun({ state: 'running' }))).toBe(true);
      expect(isRunActive(testRun())).toBe(false);
      expect(isRunActive(null)).toBe(false);
      expect(runPercent(testRun({ state: 'running', done: 1, total: 3 }))).toBe(33);
      expect(runPercent(testRun({ total: 0, done: 0 }))).toBe(0);
    });

    it('says the state in words', () => {
      expect(runSentence(testRun({ state: 'queued', done: 0 }))).toBe('Waiting to start the analysis of 3 targets…');
      expect(runSentence(testRun({ state: 'running', done: 2 }))).toBe('Measuring rotation periods: 2 of 3 targets analysed.');
      expect(runSentence(testRun())).toBe('Analysis finished: 3 of 3 targets analysed.');
      expect(runSentence(testRun({ state: 'failed', done: 1, error: 'the worker stopped' }))).toBe(
        'The analysis stopped after 1 of 3 targets: the worker stopped',
      );
    });
  });

  describe('thinning', () => {
    const spectrum = Array.from({ length: 1000 }, (_, i) => ({ x: i, y: i === 537 ? 9 : Math.sin(i) }));

    it('thinKeepingPeaks keeps at most the asked number and never loses the highest peak', () => {
      const thin = thinKeepingPeaks(spectrum, 50);
      expect(thin).toHaveLength(50);
      expect(thin).toContainEqual({ x: 537, y: 9 });
      // Each point is the highest of its run of 20 (worked by hand: 1000 / 50).
      expect(thin[0].y).toBe(Math.max(...spectrum.slice(0, 20).map((p) => p.y)));
      expect(thinKeepingPeaks(spectrum.slice(0, 10), 50)).toHaveLength(10);
    });

    it('thinEvenly keeps the first and last, evenly between', () => {
      const thin = thinEvenly(
        Array.from({ length: 101 }, (_, i) => i),
        11,
      );
      expect(thin).toEqual([0, 10, 20, 30, 40, 50, 60, 70, 80, 90, 100]);
    });
  });

  it('spectrumByPeriod: 1/f, shortest period first, zero frequency left out', () => {
    expect(spectrumByPeriod([0, 0.5, 0.25, 1], [9, 0.2, 0.3, 0.1])).toEqual([
      { x: 1, y: 0.1 },
      { x: 2, y: 0.2 },
      { x: 4, y: 0.3 },
    ]);
  });

  describe('folded model', () => {
    const fit = { offset: 0.01, sinCoefficient: 0.003, cosCoefficient: -0.004 };

    it('at a phase equals the time-domain fit at any time with that phase', () => {
      // y(t) = offset + s·sin(2πft) + c·cos(2πft) with f = 1/8.2 d; t = 3 cycles + 0.3 of one (worked by hand in this test).
      const f = 1 / 8.2;
      const t = (3 + 0.3) / f;
      const timeDomain =
        fit.offset + fit.sinCoefficient * Math.sin(2 * Math.PI * f * t) + fit.cosCoefficient * Math.cos(2 * Math.PI * f * t);
      expect(sinusoidAtPhase(fit, 0.3)).toBeCloseTo(timeDomain, 12);
      expect(sinusoidAtPhase(fit, 0)).toBeCloseTo(0.01 - 0.004, 12);
      expect(sinusoidAtPhase(fit, 0.25)).toBeCloseTo(0.01 + 0.003, 12);
    });

    it('spans one phase, ends equal, peak-to-peak twice the semi-amplitude √(s² + c²)', () => {
      const curve = foldedModel(fit, 201);
      expect(curve).toHaveLength(201);
      expect(curve[0].x).toBe(0);
      expect(curve[200].x).toBe(1);
      expect(curve[0].y).toBeCloseTo(curve[200].y, 12);
      // √(0.003² + 0.004²) = 0.005 (a 3-4-5 triangle, worked by hand).
      expect(fitSemiAmplitude(fit)).toBeCloseTo(0.005, 12);
      const ys = curve.map((p) => p.y);
      expect(Math.max(...ys) - Math.min(...ys)).toBeCloseTo(0.01, 4);
    });
  });

  it('readableReferences: citations only, without the notes that stay in code', () => {
    const refs = readableReferences({
      periodogram: 'Zechmeister & Kürster (2009), A&A 496, 577 (floating mean); standard normalisation as astropy LombScargle',
      grid: 'VanderPlas (2018), ApJS 236, 16; defaults as astropy LombScargle.autofrequency',
      periodUncertainty: 'σP = P²·σf: Montgomery & O’Donoghue (1999), Delta Scuti Star Newsletter 13, 28; Kovács (1981) (from memory)',
      amplitude: '1 mmag = 920.6 ppm (SCIENCE.md §3, derived); for flux, relative to the mean',
      verdict: 'A rule of this product; thresholds: common practice, no single source',
      offsets: 'Zero points per node by the median: common practice in differential photometry, no source',
    });
    expect(refs).toEqual([
      'Zechmeister & Kürster (2009), A&A 496, 577 (floating mean)',
      'VanderPlas (2018), ApJS 236, 16',
      'Montgomery & O’Donoghue (1999), Delta Scuti Star Newsletter 13, 28',
      'Kovács (1981)',
    ]);
  });
});
