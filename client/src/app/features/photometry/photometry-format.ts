/**
 * Pure formatting and series helpers of the returned-photometry screens: false-alarm
 * probabilities written as powers of ten, periods with their uncertainty, amplitudes in the
 * unit of the light curve, ages with their range, the analysis's state in words, thinning of
 * long series for drawing, and the fitted sinusoid over phase.
 */
import type { LightCurveValueKind, PhotometryRunStatus, RotationMeasurement } from '@spincycle/shared/photometry/photometry';

const SUPERSCRIPTS: Readonly<Record<string, string>> = {
  '-': '⁻',
  '0': '⁰',
  '1': '¹',
  '2': '²',
  '3': '³',
  '4': '⁴',
  '5': '⁵',
  '6': '⁶',
  '7': '⁷',
  '8': '⁸',
  '9': '⁹',
};

/** `-5` → `⁻⁵`: an exponent written in superscript characters. */
export function superscript(value: number): string {
  return [...String(value)].map((c) => SUPERSCRIPTS[c] ?? c).join('');
}

/** Below this, a false-alarm probability is written "< 10⁻¹⁰" (the tail approximation says no more). */
export const SMALLEST_SHOWN_FAP = 1e-10;

/**
 * A false-alarm probability as people read it: `0.23`, `0.012`, `3×10⁻⁵`, `< 10⁻¹⁰`; an em dash
 * when there is none. Below 0.01 one significant figure (the order of magnitude is what it says).
 */
export function formatFap(p: number | null | undefined, locale: string): string {
  if (p === null || p === undefined || !Number.isFinite(p)) return '—';
  if (p < SMALLEST_SHOWN_FAP) return `< 10${superscript(-10)}`;
  const rounded = Number(p.toPrecision(1));
  if (rounded >= 0.01) return new Intl.NumberFormat(locale, { maximumSignificantDigits: 2 }).format(Math.min(p, 1));
  const exponent = Math.floor(Math.log10(rounded) + 1e-9);
  const mantissa = Math.round(rounded / 10 ** exponent);
  return `${mantissa}×10${superscript(exponent)}`;
}

/** A false-alarm level as a percentage for a chart label: 0.01 → `1 %`, 0.001 → `0.1 %`. */
export function formatFapLevel(p: number, locale: string): string {
  const percent = Number((p * 100).toPrecision(6));
  return `${new Intl.NumberFormat(locale, { maximumSignificantDigits: 3 }).format(percent)} %`;
}

/**
 * Decimals that show a period to its uncertainty: two significant figures of σ (σ = 0.034 →
 * 3 decimals, σ = 0.4 → 2, σ = 3 → 1), from 0 to 5; 2 without an uncertainty.
 */
export function periodDecimals(sigmaDays: number | null | undefined): number {
  if (sigmaDays === null || sigmaDays === undefined || !(sigmaDays > 0) || !Number.isFinite(sigmaDays)) return 2;
  return Math.min(5, Math.max(0, 1 - Math.floor(Math.log10(sigmaDays))));
}

/** `12.41 ± 0.08` (days implied by the header); the period alone without an uncertainty; `—` without a period. */
export function formatPeriod(periodDays: number | null | undefined, sigmaDays: number | null | undefined, locale: string): string {
  if (periodDays === null || periodDays === undefined || !Number.isFinite(periodDays)) return '—';
  const digits = periodDecimals(sigmaDays);
  const f = new Intl.NumberFormat(locale, { minimumFractionDigits: digits, maximumFractionDigits: digits });
  return sigmaDays !== null && sigmaDays !== undefined && sigmaDays > 0
    ? `${f.format(periodDays)} ± ${f.format(sigmaDays)}`
    : f.format(periodDays);
}

/** A number with at most `digits` decimals in the locale's way; `—` when missing. */
export function formatNumber(value: number | null | undefined, locale: string, digits = 2): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  return new Intl.NumberFormat(locale, { maximumFractionDigits: digits }).format(value);
}

/** The unit a semi-amplitude is shown in: millimagnitudes for magnitudes, ppm for relative flux. */
export function amplitudeUnit(kind: LightCurveValueKind): 'mmag' | 'ppm' {
  return kind === 'mag' ? 'mmag' : 'ppm';
}

/** A semi-amplitude in the light curve's own unit: `4.2` (mmag) or `3,870` (ppm); `—` when missing. */
export function formatAmplitude(amplitude: { mmag: number | null; ppm: number | null }, kind: LightCurveValueKind, locale: string): string {
  return kind === 'mag' ? formatNumber(amplitude.mmag, locale, 1) : formatNumber(amplitude.ppm, locale, 0);
}

/** `610 Myr (480–750)`, `610 Myr` without a range, `—` without an age. */
export function formatAge(ageMyr: number | null, lowMyr: number | null, highMyr: number | null, locale: string): string {
  if (ageMyr === null || !Number.isFinite(ageMyr)) return '—';
  const f = new Intl.NumberFormat(locale, { maximumSignificantDigits: 3 });
  const range =
    lowMyr !== null && highMyr !== null && Number.isFinite(lowMyr) && Number.isFinite(highMyr)
      ? ` (${f.format(lowMyr)}–${f.format(highMyr)})`
      : '';
  return `${f.format(ageMyr)} Myr${range}`;
}

/** `11.9 (8.4–16.0)`: an expected period with its plausible range, days. */
export function formatExpected(expected: { periodDays: number; lowDays: number; highDays: number } | null, locale: string): string {
  if (!expected) return '—';
  const f = (v: number) => formatNumber(v, locale, 1);
  return `${f(expected.periodDays)} (${f(expected.lowDays)}–${f(expected.highDays)})`;
}

/** Whether an analysis is still on its way (its status is polled). */
export function isRunActive(run: PhotometryRunStatus | null | undefined): boolean {
  return run?.state === 'queued' || run?.state === 'running';
}

/** Percent of the targets analysed (0–100, whole). */
export function runPercent(run: PhotometryRunStatus | null | undefined): number {
  return run && run.total > 0 ? Math.round((100 * Math.min(run.done, run.total)) / run.total) : 0;
}

/** The analysis's state in words, for the line above its progress bar. */
export function runSentence(run: PhotometryRunStatus): string {
  const of = `${run.done} of ${run.total} ${run.total === 1 ? 'target' : 'targets'}`;
  switch (run.state) {
    case 'queued':
      return `Waiting to start the analysis of ${run.total} ${run.total === 1 ? 'target' : 'targets'}…`;
    case 'running':
      return `Measuring rotation periods: ${of} analysed.`;
    case 'done':
      return `Analysis finished: ${of} analysed.`;
    case 'failed':
      return `The analysis stopped after ${of}${run.error ? `: ${run.error}` : '.'}`;
  }
}

/** A point of a chart. */
export interface XY {
  x: number;
  y: number;
}

/**
 * At most `maxPoints` points of a spectrum, keeping the highest of each stretch (so that no
 * peak is lost): the points are cut into equal runs and each run gives its maximum. A series
 * that fits is returned whole.
 */
export function thinKeepingPeaks(points: readonly XY[], maxPoints: number): XY[] {
  if (points.length <= maxPoints || maxPoints < 1) return [...points];
  const out: XY[] = [];
  const size = points.length / maxPoints;
  for (let k = 0; k < maxPoints; k++) {
    const start = Math.floor(k * size);
    const end = Math.min(points.length, Math.floor((k + 1) * size));
    let best = points[start];
    for (let i = start + 1; i < end; i++) if (points[i].y > best.y) best = points[i];
    out.push(best);
  }
  return out;
}

/** At most `maxPoints` points of a scatter, evenly spaced through the series (first and last kept). */
export function thinEvenly<T>(points: readonly T[], maxPoints: number): T[] {
  if (points.length <= maxPoints || maxPoints < 2) return [...points];
  const step = (points.length - 1) / (maxPoints - 1);
  return Array.from({ length: maxPoints }, (_, k) => points[Math.round(k * step)]);
}

/**
 * A spectrum given in frequency (1/d) as points of period (d) and power, shortest period first
 * (frequencies at or below zero have no period and are left out).
 */
export function spectrumByPeriod(frequencyPerDay: readonly number[], power: readonly number[]): XY[] {
  const out: XY[] = [];
  for (let i = 0; i < frequencyPerDay.length; i++) {
    const f = frequencyPerDay[i];
    if (f > 0 && Number.isFinite(power[i])) out.push({ x: 1 / f, y: power[i] });
  }
  return out.sort((a, b) => a.x - b.x);
}

/** The fitted sinusoid's coefficients (value = offset + s·sin(2πft) + c·cos(2πft), t in days from the epoch). */
export type SinusoidFit = NonNullable<RotationMeasurement['best']>['fit'];

/**
 * The fitted sinusoid at a phase φ = frac(f·t): since sin and cos have period 1 in f·t, the
 * model at time t equals offset + s·sin(2πφ) + c·cos(2πφ) (the same curve evaluated at t = φ/f).
 */
export function sinusoidAtPhase(fit: SinusoidFit, phase: number): number {
  const angle = 2 * Math.PI * phase;
  return fit.offset + fit.sinCoefficient * Math.sin(angle) + fit.cosCoefficient * Math.cos(angle);
}

/** The fitted sinusoid over one phase, `samples` points from 0 to 1 inclusive. */
export function foldedModel(fit: SinusoidFit, samples = 101): XY[] {
  return Array.from({ length: samples }, (_, i) => {
    const phase = i / (samples - 1);
    return { x: phase, y: sinusoidAtPhase(fit, phase) };
  });
}

/** The semi-amplitude of a fit, √(s² + c²), in the value's unit. */
export function fitSemiAmplitude(fit: SinusoidFit): number {
  return Math.hypot(fit.sinCoefficient, fit.cosCoefficient);
}

/** Source keys whose text is a rule of this product (shown with the verdict and the alias check), not a reference. */
const RULE_SOURCES = new Set(['alias', 'verdict']);

/**
 * The measurement's references as a reader wants them: citations only, without the notes that
 * stay in code (how a value was checked, "from memory", our science notes, which library a
 * method matches) and without sentences that cite nothing.
 */
export function readableReferences(sources: Readonly<Record<string, string>>): string[] {
  const out: string[] = [];
  for (const [key, text] of Object.entries(sources)) {
    if (RULE_SOURCES.has(key)) continue;
    const parts = text
      .split(/;\s*/)
      .map((part) =>
        part
          .replace(/\s*\((?:from memory|derived|SCIENCE\.md[^)]*)\)/g, '')
          .replace(/,?\s*(?:defaults )?as astropy\b.*$/, '')
          .replace(/\s*\(as astropy[^)]*\)/g, '')
          .replace(/^.*?:\s*(?=[A-Z][\p{L}’'-]+(?: et al\.| &| and|,)? .*\(\d{4}\))/u, '')
          .trim(),
      )
      .filter((part) => /\(\d{4}\)/.test(part));
    for (const part of parts) if (!out.includes(part)) out.push(part);
  }
  return out;
}
