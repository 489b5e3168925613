import { GYRO_RELATION_INFO, periodFromAge, predictPeriod } from '@spincycle/shared/science/gyrochronology';
import { GYROCHRONE_AGE_RANGE_MYR, gyrochroneSeries, logSpace, periodColourSeries, relationCoverage } from './gyro-curves';

describe('gyro-curves', () => {
  it('logSpace: ends exactly at both limits, evenly in log', () => {
    const xs = logSpace(100, 10000, 5);
    expect(xs[0]).toBeCloseTo(100, 9);
    expect(xs[4]).toBeCloseTo(10000, 6);
    expect(xs[2]).toBeCloseTo(1000, 6);
  });

  it('gyrochrones of a K dwarf: every relation that covers it, equal to the core’s periods, and a band around the plan’s relation', () => {
    const s = gyrochroneSeries({ colour: { value: 1.1, system: 'BPRP' }, relation: 'angus2019', star: null });
    expect(s.curves.map((c) => c.relation).sort()).toEqual(['angus2015', 'angus2019', 'barnes2007', 'mamajekHillenbrand2008']);
    expect(s.uncovered).toEqual([]);
    for (const curve of s.curves) {
      expect(curve.points[0].x).toBeCloseTo(GYROCHRONE_AGE_RANGE_MYR.min, 6);
      const p = curve.points[10];
      expect(p.y).toBeCloseTo(periodFromAge(curve.relation, curve.relationColour.value, p.x), 9);
    }
    expect(s.curves.filter((c) => c.selected).map((c) => c.relation)).toEqual(['angus2019']);
    const band = s.band!;
    const curve = s.curves.find((c) => c.relation === 'angus2019')!;
    for (let i = 0; i < band.low.length; i++) {
      expect(band.low[i].y).toBeLessThan(curve.points[i].y);
      expect(band.high[i].y).toBeGreaterThan(curve.points[i].y);
    }
    const mid = predictPeriod({ relation: 'angus2019', colour: { value: 1.1, system: 'BPRP' }, ageMyr: band.low[30].x });
    expect(band.low[30].y).toBeCloseTo(mid.rangeDays.low, 9);
  });

  it('an early M dwarf is outside the calibration of two relations, which are listed instead of drawn', () => {
    const s = gyrochroneSeries({ colour: { value: 2.0, system: 'BPRP' }, relation: 'angus2019', star: null });
    expect(s.uncovered.map((u) => u.relation).sort()).toEqual(['angus2015', 'mamajekHillenbrand2008']);
    expect(s.uncovered[0].reason).toMatch(/outside its calibrated/);
  });

  it('de-reddens before choosing: E(B−V) moves the star into a relation’s range', () => {
    expect(relationCoverage('mamajekHillenbrand2008', { value: 0.95, system: 'BV' }).covered).toBe(false);
    const s = gyrochroneSeries({ colour: { value: 0.95, system: 'BV' }, reddeningEbvMag: 0.1, relation: 'barnes2007', star: null });
    expect(s.colour.value).toBeCloseTo(0.85, 9);
    expect(s.uncovered.map((u) => u.relation)).not.toContain('mamajekHillenbrand2008');
  });

  it('period against colour: each relation only over its calibrated colours, in the chosen system', () => {
    const s = periodColourSeries({ system: 'BV', ageMyr: 600, relation: 'barnes2007', star: null });
    for (const curve of s.curves) {
      const info = GYRO_RELATION_INFO[curve.relation];
      if (info.colourSystem !== 'BV') continue;
      for (const p of curve.points) {
        expect(p.x).toBeGreaterThanOrEqual(info.calibratedColour.min - 1e-9);
        expect(p.x).toBeLessThanOrEqual(info.calibratedColour.max + 1e-9);
      }
    }
    const mh = s.curves.find((c) => c.relation === 'mamajekHillenbrand2008')!;
    expect(mh.points[0].x).toBeGreaterThanOrEqual(0.5);
    expect(mh.points[mh.points.length - 1].x).toBeLessThanOrEqual(0.9);
    expect(s.curves.every((c) => c.ageCalibrated)).toBe(true);
    const young = periodColourSeries({ system: 'BPRP', ageMyr: 150, relation: 'angus2019', star: null });
    expect(young.curves.find((c) => c.relation === 'angus2019')?.ageCalibrated).toBe(false);
  });
});
