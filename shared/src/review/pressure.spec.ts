import { computeSkyWindows } from '../sky/sky-windows';
import type { SkySite } from '../sky/sky-types';
import { computePressure, darkHoursByRaBin, raBinCentreDeg, raBinOf, RA_BIN_COUNT } from './pressure';

describe('raBinOf', () => {
  it('puts RA into 2-h bins (15° per hour)', () => {
    expect(raBinOf(0)).toBe(0);
    expect(raBinOf(29.99)).toBe(0);
    expect(raBinOf(30)).toBe(1);
    expect(raBinOf(359.99)).toBe(11);
    expect(raBinCentreDeg(0)).toBe(15);
    expect(raBinCentreDeg(11)).toBe(345);
  });
});

describe('computePressure', () => {
  /*
   * Worked by hand in this test: one node N (100 node-hours available); target A at RA 15°
   * (1 h → bin 0) requests 30 h, target B at RA 100° (6.67 h → bin 3) requests 50 h; a plan on a
   * node outside the cycle (20 h) is left out. Dark hours given: bin 0 10 h, bin 3 40 h, others 0.
   *   node N: 30 + 50 = 80 requested, 80/100 = 0.8
   *   bin 0: 30/10 = 3;  bin 3: 50/40 = 1.25;  bin 1: 0 requested, 0 dark → null
   */
  const dark = new Array<number>(RA_BIN_COUNT).fill(0);
  dark[0] = 10;
  dark[3] = 40;
  const result = computePressure(
    [{ nodeId: 1, nodeCode: 'N', nodeHoursAvailable: 100 }],
    [
      { nodeId: 1, raDeg: 15, nodeHours: 30 },
      { nodeId: 1, raDeg: 100, nodeHours: 50 },
      { nodeId: 2, raDeg: 100, nodeHours: 20 },
    ],
    new Map([[1, dark]]),
  );

  it('per node: requested over available (worked by hand in this test)', () => {
    expect(result.nodes).toEqual([{ nodeId: 1, nodeCode: 'N', requestedNodeHours: 80, availableNodeHours: 100, pressure: 0.8 }]);
  });

  it('per RA bin: requested over dark hours (worked by hand in this test)', () => {
    expect(result.raBins[0]).toEqual({ bin: 0, startHours: 0, endHours: 2, requestedNodeHours: 30, darkHours: 10, pressure: 3 });
    expect(result.raBins[3]).toMatchObject({ requestedNodeHours: 50, darkHours: 40, pressure: 1.25 });
    expect(result.raBins[1]).toMatchObject({ requestedNodeHours: 0, darkHours: 0, pressure: null });
    expect(result.raBins).toHaveLength(12);
  });

  it('a node without capacity has no ratio', () => {
    const r = computePressure([{ nodeId: 1, nodeCode: 'N', nodeHoursAvailable: 0 }], [{ nodeId: 1, raDeg: 0, nodeHours: 5 }], new Map());
    expect(r.nodes[0].pressure).toBeNull();
  });
});

describe('darkHoursByRaBin, checked against shared/src/sky', () => {
  // An invented northern site; three December nights (Sun near RA 18 h).
  const site: SkySite = { latitudeDeg: 34.9, longitudeDeg: -108.4, elevationM: 2210, timeZone: 'America/Denver' };
  const campaign = { firstNight: '2027-12-20', lastNight: '2027-12-22' };
  const hours = darkHoursByRaBin(site, 30, campaign);

  it('each bin equals the usable hours computeSkyWindows gives a zenith-passing star at the bin centre (source: shared/src/sky)', () => {
    for (const bin of [0, 3, 8]) {
      const own = computeSkyWindows({
        site,
        limits: { altitudeLimitDeg: 30, sunAltitudeLimitDeg: -18 },
        campaign,
        targets: [{ raDeg: raBinCentreDeg(bin), decDeg: site.latitudeDeg }],
      });
      const sum = Array.from(own.targets[0].usableHoursByNight).reduce((s, h) => s + h, 0);
      expect(hours[bin]).toBeCloseTo(sum, 9);
    }
  });

  it('no bin gets more than the nights’ astronomical dark hours (source: shared/src/sky night darkness)', () => {
    const nights = computeSkyWindows({ site, limits: { altitudeLimitDeg: 30, sunAltitudeLimitDeg: -18 }, campaign, targets: [] }).nights;
    const dark = nights.reduce((s, n) => s + n.darkHours, 0);
    expect(dark).toBeGreaterThan(25); // three long December nights at 35° N
    for (const h of hours) expect(h).toBeLessThanOrEqual(dark + 1e-9);
    // Opposite the Sun (RA ≈ 6 h: bins 2–3) is darkest; beside it (bin 8, 16–18 h) gets nothing:
    // worked by hand: a zenith star with a 30° limit is up for |HA| ≤ 5.0 h, darkness spans the
    // Sun's HA ±5.3 h around midnight, so a star 1 h west of the Sun is never up in the dark.
    expect(Math.max(...hours)).toBe(Math.max(hours[2], hours[3]));
    expect(hours[8]).toBe(0);
    expect(hours[3]).toBeGreaterThan(20);
  });
});
