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

  // Lagrange denominators for ORDER points: den_0 = (ORDER−1)!, den_j = den_{j−1}·j/(j−ORDER).
  const den = new Float64Array(ORDER);
  let d = 1;
  for (let j = 2; j < ORDER; j++) d *= j;
  for (let j = 0; j < ORDER; j++) {
    if (j > 0) d *= j / (j - ORDER);
    den[j] = d;
  }
  const scale = nfft * df;
  const half = ORDER >> 1;
  const maxLo = nfft - ORDER;
  const omega0 = TWO_PI * f0;
  for (let i = 0; i < n; i++) {
    const ti = timeDays[i] - tMin;
    const re = Math.cos(omega0 * ti);
    const im = Math.sin(omega0 * ti);
    let x = ti * scale;
    x -= Math.floor(x / nfft) * nfft;
    if (x === Math.floor(x)) {
      const j = 2 * (x | 0);
      grid[j] += re;
      grid[j + 1] += im;
      continue;
    }
    let lo = Math.trunc(x - half);
    if (lo < 0) lo = 0;
    else if (lo > maxLo) lo = maxLo;
    let numerator = 1;
    for (let m = 0; m < ORDER; m++) numerator *= x - lo - m;
    for (let j = 0; j < ORDER; j++) {
      const ind = lo + ORDER - 1 - j;
      const c = numerator / (den[j] * (x - ind));
      grid[2 * ind] += c * re;
      grid[2 * ind + 1] += c * im;
    }
  }
  fft.transform(spectrum, grid);
  // The FFT computes Σ g_j·e^(−2πi·jk/N); the sum needs e^(+2πi·jk/N), found at index N − k.
  const norm = 1 / (n * n);
  for (let k = 0; k < count; k++) {
    const idx = k === 0 ? 0 : 2 * (nfft - k);
    const re = spectrum[idx];
    const im = spectrum[idx + 1];
    out[k] = Math.min(1, (re * re + im * im) * norm);
  }
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
