import { GYRO_RELATION_INFO, periodFromAge } from '@spincycle/shared/science/gyrochronology';
import { testPlanRow, testTarget } from '../../testing/fixtures';
import { clusterSeries, feasibilityOf, sharedAgeMyr } from './cluster-curves';

describe('cluster-curves', () => {
  it('sharedAgeMyr: only for two or more targets of one age', () => {
    expect(sharedAgeMyr([{ ageMyr: 650 }, { ageMyr: 650 }])).toBe(650);
    expect(sharedAgeMyr([{ ageMyr: 650 }, { ageMyr: 700 }])).toBeNull();
    expect(sharedAgeMyr([{ ageMyr: 650 }])).toBeNull();
  });

  it('feasibilityOf: every node, some, none, not planned', () => {
    expect(feasibilityOf([{ feasible: true }, { feasible: true }])).toBe('feasible');
    expect(feasibilityOf([{ feasible: true }, { feasible: false }])).toBe('partly');
    expect(feasibilityOf([{ feasible: false }])).toBe('infeasible');
    expect(feasibilityOf([])).toBe('unplanned');
  });

  it('B−V list: each relation over its calibrated colours, the default (Barnes 2007) with a band around it', () => {
    const targets = [testTarget(1, { colour: 0.8, reddeningEbv: 0 }), testTarget(2, { colour: 1.2, reddeningEbv: 0 })];
    const series = clusterSeries(targets, [testPlanRow(1, 1), testPlanRow(2, 1, { feasible: false })])!;
    expect(series.system).toBe('BV');
    expect(series.ageMyr).toBe(650);
    expect(series.defaultRelation).toBe('barnes2007');

    const barnes = series.curves.find((c) => c.relation === 'barnes2007')!;
    const range = GYRO_RELATION_INFO.barnes2007.calibratedColour;
    expect(Math.min(...barnes.points.map((p) => p.x))).toBeGreaterThanOrEqual(range.min);
    expect(Math.max(...barnes.points.map((p) => p.x))).toBeLessThanOrEqual(range.max);
    const mid = barnes.points[Math.floor(barnes.points.length / 2)];
    expect(mid.y).toBeCloseTo(periodFromAge('barnes2007', mid.x, 650), 10);

    const mh = series.curves.find((c) => c.relation === 'mamajekHillenbrand2008')!;
    expect(Math.min(...mh.points.map((p) => p.x))).toBeGreaterThanOrEqual(0.5);
    expect(Math.max(...mh.points.map((p) => p.x))).toBeLessThanOrEqual(0.9);

    expect(series.band).not.toBeNull();
    series.band!.low.forEach((low, i) => {
      expect(low.y).toBeLessThan(barnes.points[i].y);
      expect(series.band!.high[i].y).toBeGreaterThan(barnes.points[i].y);
    });

    expect(series.points.map((p) => [p.targetId, p.x, p.y, p.feasibility])).toEqual([
      [1, 0.8, 10.2, 'feasible'],
      [2, 1.2, 10.2, 'infeasible'],
    ]);
  });

  it('targets are placed at their de-reddened colour', () => {
    const series = clusterSeries([testTarget(1, { colour: 1.0, reddeningEbv: 0.1 }), testTarget(2)], [])!;
    expect(series.points[0].x).toBeCloseTo(0.9, 10);
    expect(series.points[0].feasibility).toBe('unplanned');
  });

  it('mixed ages: no series', () => {
    expect(clusterSeries([testTarget(1), testTarget(2, { ageMyr: 120 })], [])).toBeNull();
  });
});
