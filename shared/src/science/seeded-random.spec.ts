import { seededRandom } from './seeded-random';

describe('seededRandom', () => {
  it('repeats its sequence for the same seed and differs for another', () => {
    const a = seededRandom(7);
    const b = seededRandom(7);
    const c = seededRandom(8);
    const sa = Array.from({ length: 5 }, () => a.next());
    expect(Array.from({ length: 5 }, () => b.next())).toEqual(sa);
    expect(Array.from({ length: 5 }, () => c.next())).not.toEqual(sa);
  });

  it('draws uniform values in [0, 1) without repeats over 10⁵ draws, and unit normals', () => {
    const r = seededRandom(1);
    const seen = new Set<number>();
    let sum = 0;
    let sumSq = 0;
    let outside = 0;
    for (let i = 0; i < 100_000; i++) {
      const u = r.next();
      if (!(u >= 0 && u < 1)) outside++;
      seen.add(u);
      const z = r.normal();
      sum += z;
      sumSq += z * z;
    }
    expect(outside).toBe(0);
    expect(seen.size).toBe(100_000);
    expect(sum / 1e5).toBeCloseTo(0, 1);
    expect(sumSq / 1e5).toBeCloseTo(1, 1);
  });
});
