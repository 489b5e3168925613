/**
 * The spectral window: the power of the sampling alone, W(f) = |Σ e^(2πi·f·tᵢ)|²/N² (0…1;
 * Deeming (1975), Ap&SS 36, 137, from memory). A peak of W at f_w means that a signal at f
 * also shows at f ± f_w: nightly sampling from one site gives f_w ≈ 1 d⁻¹ (the sidereal day,
 * 1.0027 d⁻¹, when visits keep the same sidereal time).
 *
 * Evaluated on a regular grid in O(N log N) the way the fast periodogram evaluates its sums
 * (Press & Rybicki (1989), ApJ 338, 277): the points are extirpolated onto a regular grid
 * with 8-point Lagrange weights (astropy's fast periodogram uses 4; the window has a single
 * sum, so the wider stencil is cheap and keeps the error below 3e-4 up to the top of the
 * grid instead of ≈ 1e-2) and the sum is read from one FFT (the `fft.js` package), so that a
 * window of 10⁵ points on 10⁴ frequencies costs milliseconds.
 */
import FFT from 'fft.js';
import { extirpolate, lagrangeDenominators, readTrigSums } from '../lomb-scargle/lomb-scargle-power';

export const WINDOW_SOURCE = 'Deeming (1975), Ap&SS 36, 137 (spectral window); evaluated as Press & Rybicki (1989), ApJ 338, 277';

const TWO_PI = 2 * Math.PI;
const ORDER = 8;
const OVERSAMPLING = 4;

function bitCeil(x: number): number {
  let p = 2;
  while (p < x) p *= 2;
  return p;
}

/**
 * W(f_k) = |Σ e^(2πi·f_k·tᵢ)|²/N² for f_k = f0 + k·df, k = 0 … count − 1 (times in days, any
 * origin: W does not depend on it).
 */
export function spectralWindow(timeDays: ArrayLike<number>, f0: number, df: number, count: number): Float64Array {
  const n = timeDays.length;
  const out = new Float64Array(count);
  if (n === 0 || count === 0) return out;
  let tMin = Infinity;
  for (let i = 0; i < n; i++) if (timeDays[i] < tMin) tMin = timeDays[i];
  const nfft = bitCeil(count * OVERSAMPLING);
  const fft = new FFT(nfft);
  const grid = new Float64Array(2 * nfft);
  const spectrum = new Float64Array(2 * nfft);
  const t = new Float64Array(n);
  for (let i = 0; i < n; i++) t[i] = timeDays[i] - tMin;
  // The periodogram's own extirpolation, with unit weights and a wider stencil.
  extirpolate(t, null, new Float64Array(n).fill(1), n, f0, df, nfft, ORDER, lagrangeDenominators(ORDER), grid);
  fft.transform(spectrum, grid);
  const re = new Float64Array(count);
  const im = new Float64Array(count);
  readTrigSums(spectrum, nfft, count, re, im);
  const norm = 1 / (n * n);
  for (let k = 0; k < count; k++) out[k] = Math.min(1, (re[k] * re[k] + im[k] * im[k]) * norm);
  return out;
}

/** W at arbitrary frequencies by direct sums (for tests and single values). */
export function spectralWindowAt(timeDays: ArrayLike<number>, frequenciesPerDay: ArrayLike<number>): Float64Array {
  const n = timeDays.length;
  const out = new Float64Array(frequenciesPerDay.length);
  for (let k = 0; k < frequenciesPerDay.length; k++) {
    const w = TWO_PI * frequenciesPerDay[k];
    let re = 0;
    let im = 0;
    for (let i = 0; i < n; i++) {
      re += Math.cos(w * timeDays[i]);
      im += Math.sin(w * timeDays[i]);
    }
    out[k] = n === 0 ? 0 : (re * re + im * im) / (n * n);
  }
  return out;
}
