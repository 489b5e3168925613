/**
 * A small seeded pseudo-random generator for reproducible synthetic data (tests,
 * benchmarks, demo light curves): mulberry32 (a 32-bit generator of the public-domain
 * "mulberry" family; common practice, no source), with Box–Muller normal deviates.
 */
export interface SeededRandom {
  /** Uniform in [0, 1). */
  next(): number;
  /** Uniform in [min, max). */
  uniform(min: number, max: number): number;
  /** Normal with the given mean and standard deviation. */
  normal(mean?: number, sd?: number): number;
}

/** A generator from a 32-bit integer seed; the same seed gives the same sequence. */
export function seededRandom(seed: number): SeededRandom {
  let a = seed >>> 0;
  let spare: number | null = null;
  const next32 = (): number => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return (t ^ (t >>> 14)) >>> 0;
  };
  // 53 random bits from two draws, so that long series have no repeated values.
  const next = (): number => ((next32() >>> 5) * 67108864 + (next32() >>> 6)) / 9007199254740992;
  return {
    next,
    uniform: (min, max) => min + (max - min) * next(),
    normal(mean = 0, sd = 1) {
      if (spare !== null) {
        const v = spare;
        spare = null;
        return mean + sd * v;
      }
      let u = 0;
      while (u === 0) u = next();
      const v = next();
      const r = Math.sqrt(-2 * Math.log(u));
      spare = r * Math.sin(2 * Math.PI * v);
      return mean + sd * r * Math.cos(2 * Math.PI * v);
    },
  };
}
