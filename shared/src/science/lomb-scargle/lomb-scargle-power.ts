/**
 * Generalised (floating-mean) Lomb–Scargle periodogram, Zechmeister & Kürster (2009),
 * A&A 496, 577, eqs. 4–15 (equation numbers from memory), in the 'standard' normalisation (power = fraction of the weighted
 * variance explained by a sinusoid plus offset, 0–1). Conventions match astropy's
 * `LombScargle(t, y, dy, fit_mean=True, center_data=True, normalization='standard')`: data
 * centred on their weighted mean, weights 1/dy² normalised to sum 1, and the power written
 * with the time shift τ through trigonometric identities, as astropy's `lombscargle_fast`
 * does (VanderPlas 2018, ApJS 236, 16, §5; section from memory).
 *
 * Two evaluations of the same sums:
 * - `exact`: O(N·M) direct sums; on a regular grid the phases advance by a complex rotation
 *   per frequency step (re-seeded exactly every 256 steps), so there is no trig call in the
 *   inner loop;
 * - `fast`: O(N log N), Press & Rybicki (1989), ApJ 338, 277: the weighted points are
 *   "extirpolated" onto a regular grid with Lagrange weights over `order` neighbours and the
 *   sums read from one FFT (the `fft.js` package) per sum, with astropy's defaults
 *   (oversampling 5, order 4) — an approximation whose error falls as N grows.
 */
import FFT from 'fft.js';
import { ScienceInputError, requireInteger, requireOneOf } from '../science-input-error';
import { type FrequencyGrid, validateGrid } from './frequency-grid';
import { type LightCurve, type PreparedLightCurve, isPreparedLightCurve, prepareLightCurve } from './light-curve';

export const LOMB_SCARGLE_METHODS = ['fast', 'exact'] as const;
export type LombScargleMethod = (typeof LOMB_SCARGLE_METHODS)[number];

export const LOMB_SCARGLE_SOURCE =
  'Zechmeister & Kürster (2009), A&A 496, 577 (floating mean); standard normalisation as astropy LombScargle';
export const FAST_METHOD_SOURCE = 'Press & Rybicki (1989), ApJ 338, 277 (extirpolation + FFT), as astropy lombscargle_fast';

export interface FastMethodOptions {
  /** FFT length ≈ oversampling × number of frequencies, rounded up to a power of two (default 5, as astropy). */
  oversampling?: number;
  /** Points of the Lagrange extirpolation (default 4, as astropy's Mfft). */
  order?: number;
}

export interface PowerOptions extends FastMethodOptions {
  /** Default `fast`. */
  method?: LombScargleMethod;
}

const TWO_PI = 2 * Math.PI;
const SQRT_HALF = Math.SQRT1_2;
/** CC or SS below this (weights sum to 1) means the sinusoid is degenerate at that frequency: no power. */
const DEGENERATE = 1e-14;

/** Power on a regular grid. */
export function lombScarglePower(lc: LightCurve | PreparedLightCurve, grid: FrequencyGrid, options: PowerOptions = {}): Float64Array {
  const data = isPreparedLightCurve(lc) ? lc : prepareLightCurve(lc);
  validateGrid(grid);
  const method = requireOneOf(options.method ?? 'fast', 'method', LOMB_SCARGLE_METHODS);
  return method === 'fast' ? fastPower(data, grid, options) : exactPowerRegular(data, grid);
}

/** Exact power at arbitrary frequencies (per day, ≥ 0). */
export function lombScarglePowerAt(lc: LightCurve | PreparedLightCurve, frequenciesPerDay: ArrayLike<number>): Float64Array {
  const data = isPreparedLightCurve(lc) ? lc : prepareLightCurve(lc);
  const m = frequenciesPerDay.length;
  const out = new Float64Array(m);
  const { n, t, y, w, yy } = data;
  for (let k = 0; k < m; k++) {
    const f = frequenciesPerDay[k];
    if (typeof f !== 'number' || !Number.isFinite(f) || f < 0) {
      throw new ScienceInputError(`frequencies[${k}]`, `must be a finite frequency ≥ 0 (got ${String(f)})`);
    }
    let C = 0;
    let S = 0;
    let Ch = 0;
    let Sh = 0;
    let C2 = 0;
    let S2 = 0;
    const omega = TWO_PI * f;
    for (let i = 0; i < n; i++) {
      const ph = omega * t[i];
      const c = Math.cos(ph);
      const s = Math.sin(ph);
      const wi = w[i];
      const wy = wi * y[i];
      C += wi * c;
      S += wi * s;
      Ch += wy * c;
      Sh += wy * s;
      C2 += wi * (c * c - s * s);
      S2 += wi * 2 * s * c;
    }
    out[k] = powerFromSums(Ch, Sh, C, S, C2, S2, yy);
  }
  return out;
}

/**
 * The standard-normalised power from the six weighted sums at one frequency (astropy
 * `lombscargle_fast`, step 2; Zechmeister & Kürster 2009, eqs. 4–15 (from memory) with τ eliminated):
 * tan 2ωτ = (S2 − 2SC)/(C2 − (C² − S²)); YC, YS, CC, SS at the shifted time; p = (YC²/CC + YS²/SS)/YY.
 */
export function powerFromSums(Ch: number, Sh: number, C: number, S: number, C2: number, S2: number, yy: number): number {
  const num = S2 - 2 * S * C;
  const den = C2 - (C * C - S * S);
  const r = Math.sqrt(num * num + den * den);
  let C2w = 1;
  let S2w = 0;
  if (r > 0) {
    // cos 2ωτ = 1/sqrt(1 + tan²) = |den|/r, sin 2ωτ = tan·cos 2ωτ = sign(den)·num/r.
    C2w = Math.abs(den) / r;
    S2w = den < 0 ? -num / r : num / r;
  }
  const Cw = SQRT_HALF * Math.sqrt(1 + C2w);
  const Sw = SQRT_HALF * Math.sign(S2w) * Math.sqrt(Math.max(0, 1 - C2w));
  const YC = Ch * Cw + Sh * Sw;
  const YS = Sh * Cw - Ch * Sw;
  const a = C * Cw + S * Sw;
  const b = S * Cw - C * Sw;
  const CC = 0.5 * (1 + C2 * C2w + S2 * S2w) - a * a;
  const SS = 0.5 * (1 - C2 * C2w - S2 * S2w) - b * b;
  let p = 0;
  if (CC > DEGENERATE) p += (YC * YC) / CC;
  if (SS > DEGENERATE) p += (YS * YS) / SS;
  p /= yy;
  return Number.isFinite(p) ? p : 0;
}

/**
 * Exact sums on a regular grid with rotating phases. One interleaved array per point
 * (cos, sin, cos step, sin step, w, w·y) keeps the inner loop on one cache stream.
 */
function exactPowerRegular(data: PreparedLightCurve, grid: FrequencyGrid): Float64Array {
  const { n, t, y, w, yy } = data;
  const { minFrequencyPerDay: f0, stepPerDay: df, count } = grid;
  const a = new Float64Array(6 * n);
  for (let i = 0; i < n; i++) {
    const step = TWO_PI * df * t[i];
    a[6 * i + 2] = Math.cos(step);
    a[6 * i + 3] = Math.sin(step);
    a[6 * i + 4] = w[i];
    a[6 * i + 5] = w[i] * y[i];
  }
  const len = 6 * n;
  const out = new Float64Array(count);
  for (let k = 0; k < count; k++) {
    if ((k & 255) === 0) {
      // Re-seed the phases exactly so that rounding in the rotations cannot accumulate.
      const omega = TWO_PI * (f0 + df * k);
      for (let i = 0; i < n; i++) {
        const ph = omega * t[i];
        a[6 * i] = Math.cos(ph);
        a[6 * i + 1] = Math.sin(ph);
      }
    }
    let C = 0;
    let S = 0;
    let Ch = 0;
    let Sh = 0;
    let C2 = 0;
    let S2 = 0;
    for (let j = 0; j < len; j += 6) {
      const c = a[j];
      const s = a[j + 1];
      const rc = a[j + 2];
      const rs = a[j + 3];
      const wi = a[j + 4];
      const wyi = a[j + 5];
      C += wi * c;
      S += wi * s;
      Ch += wyi * c;
      Sh += wyi * s;
      C2 += wi * (c * c - s * s);
      S2 += wi * 2 * s * c;
      a[j] = c * rc - s * rs;
      a[j + 1] = s * rc + c * rs;
    }
    out[k] = powerFromSums(Ch, Sh, C, S, C2, S2, yy);
  }
  return out;
}

// ---------------------------------------------------------------------------------------
// Fast method.

interface FftWorkspace {
  size: number;
  fft: FFT;
  grid: Float64Array;
  out: Float64Array;
}

/**
 * FFT plan and buffers of the last size used, reused across calls ("FFT plans reused").
 * Only sizes up to {@link MAX_CACHED_FFT} are kept (2 × 32 MB); larger ones are released
 * after the call so that a server does not hold hundreds of MB.
 */
let cached: FftWorkspace | null = null;
const MAX_CACHED_FFT = 1 << 21;

function workspace(size: number): FftWorkspace {
  if (cached && cached.size === size) return cached;
  const ws = { size, fft: new FFT(size), grid: new Float64Array(2 * size), out: new Float64Array(2 * size) };
  if (size <= MAX_CACHED_FFT) cached = ws;
  return ws;
}

function bitCeil(x: number): number {
  let p = 2;
  while (p < x) p *= 2;
  return p;
}

/** Lagrange denominators for `order` points: den_0 = (order−1)!, den_j = den_{j−1}·j/(j−order). */
export function lagrangeDenominators(order: number): Float64Array {
  const den = new Float64Array(order);
  let d = 1;
  for (let j = 2; j < order; j++) d *= j;
  for (let j = 0; j < order; j++) {
    if (j > 0) d *= j / (j - order);
    den[j] = d;
  }
  return den;
}

function fastPower(data: PreparedLightCurve, grid: FrequencyGrid, options: FastMethodOptions): Float64Array {
  const oversampling = requireInteger(options.oversampling ?? 5, 'oversampling', 1);
  const order = requireInteger(options.order ?? 4, 'order', 2);
  const { n, t, y, w, yy } = data;
  const { minFrequencyPerDay: f0, stepPerDay: df, count: nf } = grid;
  const nfft = bitCeil(nf * oversampling);
  if (order > nfft) throw new ScienceInputError('order', `must not exceed the FFT length ${nfft}`);
  const { fft, grid: buffer, out } = workspace(nfft);

  const den = lagrangeDenominators(order);

  // Three sums, one FFT each, through one grid buffer: w·y at f, w at f, w at 2f
  // (frequencies 2f0 + k·2df).
  const Ch = new Float64Array(nf);
  const Sh = new Float64Array(nf);
  const C = new Float64Array(nf);
  const S = new Float64Array(nf);
  buffer.fill(0);
  extirpolate(t, y, w, n, f0, df, nfft, order, den, buffer);
  fft.transform(out, buffer);
  readTrigSums(out, nfft, nf, Ch, Sh);
  buffer.fill(0);
  extirpolate(t, null, w, n, f0, df, nfft, order, den, buffer);
  fft.transform(out, buffer);
  readTrigSums(out, nfft, nf, C, S);
  buffer.fill(0);
  extirpolate(t, null, w, n, 2 * f0, 2 * df, nfft, order, den, buffer);
  fft.transform(out, buffer);
  const powerOut = new Float64Array(nf);
  for (let k = 0; k < nf; k++) {
    const idx = k === 0 ? 0 : 2 * (nfft - k);
    powerOut[k] = powerFromSums(Ch[k], Sh[k], C[k], S[k], out[idx], out[idx + 1], yy);
  }
  return powerOut;
}

/**
 * The FFT computes Σ g_j·e^(−2πi·jk/N); the sums need e^(+2πi·jk/N), found at index N − k.
 */
export function readTrigSums(out: Float64Array, nfft: number, nf: number, cosSum: Float64Array, sinSum: Float64Array): void {
  cosSum[0] = out[0];
  sinSum[0] = out[1];
  for (let k = 1; k < nf; k++) {
    const idx = 2 * (nfft - k);
    cosSum[k] = out[idx];
    sinSum[k] = out[idx + 1];
  }
}

/**
 * Extirpolation (Press & Rybicki 1989; astropy `extirpolate`): each point's complex weight
 * h·e^(2πi·f0·t) is spread over `order` neighbouring nodes of the grid x = t·N·df mod N with
 * Lagrange weights, so that Σ h·e^(2πi(f0 + k·df)t) ≈ Σ_j g_j·e^(2πi·jk/N). The weights h
 * are w·y when `y` is given, else w.
 */
export function extirpolate(
  t: Float64Array,
  y: Float64Array | null,
  w: Float64Array,
  n: number,
  f0: number,
  df: number,
  nfft: number,
  order: number,
  den: Float64Array,
  grid: Float64Array,
): void {
  const scale = nfft * df;
  const half = order >> 1;
  const maxLo = nfft - order;
  const withOffset = f0 > 0;
  const omega0 = TWO_PI * f0;
  for (let i = 0; i < n; i++) {
    const ti = t[i];
    const h = y === null ? w[i] : w[i] * y[i];
    let re = h;
    let im = 0;
    if (withOffset) {
      const ph = omega0 * ti;
      re = h * Math.cos(ph);
      im = h * Math.sin(ph);
    }
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
    for (let m = 0; m < order; m++) numerator *= x - lo - m;
    for (let j = 0; j < order; j++) {
      const ind = lo + order - 1 - j;
      const c = numerator / (den[j] * (x - ind));
      const g = 2 * ind;
      grid[g] += c * re;
      grid[g + 1] += c * im;
    }
  }
}
