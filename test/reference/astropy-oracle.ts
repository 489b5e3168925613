/**
 * Calls Debian's astropy (through /usr/bin/python3) as the oracle of the reference tests and
 * of the benchmarks: astropy-oracle.py beside this file for the Lomb–Scargle tests, or a script
 * given by the caller (the sky windows). Data go in as JSON on stdin and come back as JSON on
 * stdout.
 */
import { spawnSync } from 'node:child_process';
import { join } from 'node:path';

export const PYTHON = '/usr/bin/python3';
const SCRIPT = join(__dirname, 'astropy-oracle.py');

/** Throws a clear error unless /usr/bin/python3 can import astropy (the oracle never skips). */
export function requireAstropy(): string {
  const r = spawnSync(PYTHON, ['-c', 'import astropy, numpy; print(astropy.__version__)'], { encoding: 'utf8' });
  if (r.error || r.status !== 0) {
    throw new Error(
      `astropy oracle unavailable: ${PYTHON} cannot import astropy (${r.error?.message ?? r.stderr.trim()}). ` +
        "Install Debian's python3-astropy (apt-get install python3-astropy); the test set-up does this on a fresh machine.",
    );
  }
  return r.stdout.trim();
}

/**
 * Runs an oracle on a request (JSON on stdin) and returns its parsed answer (JSON on stdout).
 * By default the Lomb–Scargle oracle beside this file; `pythonArgs` runs another one, e.g.
 * `['-c', source]` for a script kept beside its test.
 */
export function runAstropyOracle<T>(request: unknown, pythonArgs: string[] = [SCRIPT]): T {
  const r = spawnSync(PYTHON, pythonArgs, { input: JSON.stringify(request), encoding: 'utf8', maxBuffer: 512 * 1024 * 1024 });
  if (r.error || r.status !== 0) {
    throw new Error(`astropy oracle failed (exit ${r.status}): ${r.error?.message ?? r.stderr}`);
  }
  return JSON.parse(r.stdout) as T;
}

/** A series for the "pointwise" request of astropy-oracle.py (no frequency grid). */
export interface PointwiseCase {
  t: number[];
  y: number[];
  dy: number[] | null;
  /** Frequencies (d⁻¹) at which astropy's exact power is wanted. */
  frequencies: number[];
  /** Powers whose Baluev false-alarm probability is wanted, with astropy's own frequency limits. */
  fap?: { powers: number[]; samplesPerPeak: number; maximumFrequency: number };
}

export interface PointwiseAnswer {
  /** LombScargle(t, y, dy, fit_mean=True, center_data=True, normalization='standard').power(f, method='slow'). */
  power: number[];
  fapPowers?: number[];
  /** LombScargle.false_alarm_probability(z, method='baluev', samples_per_peak, maximum_frequency). */
  fap?: number[];
  /** [fmin, fmax] of LombScargle.autofrequency with the same limits: the fmax the FAP used. */
  fapFrequencyLimits?: [number, number];
}

/** Runs astropy's Lomb–Scargle at explicit frequencies (request kind "pointwise" of astropy-oracle.py). */
export function runAstropyPointwise(cases: PointwiseCase[]): { astropyVersion: string; cases: PointwiseAnswer[] } {
  return runAstropyOracle({ kind: 'pointwise', cases });
}
