/**
 * SCIENCE.md §8 check values of the science core (rows 1–10 and 13–15; 11–12 belong to the
 * sky windows), in one table. Each row names its source and tag as SCIENCE.md gives it.
 */
import {
  airmassKastenYoung,
  autoFrequencyGrid,
  baluevFalseAlarmProbability,
  estimateAge,
  gridMaxFrequency,
  lombScarglePowerAt,
  periodFromAge,
  periodPrecision,
  prepareLightCurve,
  scintillationYoung1967,
  turnoverTimeCranmerSaar2011,
  turnoverTimeNoyes1984,
  turnoverTimeWright2011,
} from '../../shared/src/science/index';

function checkSeries() {
  const timeDays: number[] = [];
  const values: number[] = [];
  for (let i = 0; i < 40; i++) {
    const t = i + 0.1 * Math.sin(1.7 * i);
    timeDays.push(t);
    values.push(0.01 * Math.sin((2 * Math.PI * t) / 7.3) + 0.002 * Math.cos(3.1 * i));
  }
  return { timeDays, values };
}

describe('SCIENCE.md §8 check values', () => {
  // [#, description, computed, expected, decimal places, source and tag]
  const rows: Array<[number, string, () => number, number, number, string]> = [
    [1, 'Barnes 2007, B−V 0.642, 4566 Myr → P', () => periodFromAge('barnes2007', 0.642, 4566), 26.09, 2, '[derived] from Barnes (2007) coefficients; his solar calibration'],
    [2, 'Mamajek & Hillenbrand 2008, B−V 0.65, 4570 Myr → P', () => periodFromAge('mamajekHillenbrand2008', 0.65, 4570), 26.18, 2, '[derived]'],
    [3, 'Angus 2015, B−V 0.65, 4570 Myr → P', () => periodFromAge('angus2015', 0.65, 4570), 25.02, 2, '[derived]'],
    [4, 'Angus 2019, BP−RP 0.82, 4.57 Gyr → P', () => periodFromAge('angus2019', 0.82, 4570), 26.02, 2, '[derived]'],
    [5, 'Barnes eq. 16 inverse, P 26.09 d, B−V 0.642 → age', () => estimateAge({ relation: 'barnes2007', colour: { value: 0.642, system: 'BV' }, periodDays: 26.09 }).ageMyr, 4565, 0, '[derived]'],
    [5, 'Barnes eq. 16 inverse → δt/t', () => estimateAge({ relation: 'barnes2007', colour: { value: 0.642, system: 'BV' }, periodDays: 26.09 }).fractionalUncertainty, 0.168, 3, '[derived]'],
    [6, 'Noyes τ, B−V 0.65', () => turnoverTimeNoyes1984(0.65), 11.99, 2, '[derived]'],
    [7, 'Cranmer & Saar τ, 5772 K', () => turnoverTimeCranmerSaar2011(5772), 12.875, 3, '[derived]'],
    [8, 'Wright 2011 τ, 1 M☉', () => turnoverTimeWright2011(1), 14.45, 2, '[derived]'],
    [9, 'Kasten–Young airmass at 30°', () => airmassKastenYoung(30), 1.9943, 4, '[derived]; formula [memory]'],
    [9, 'Kasten–Young airmass at 90°', () => airmassKastenYoung(90), 0.9997, 4, '[derived]; formula [memory]'],
    [10, 'Young scintillation, D 0.4 m, X 1, h 0 m, 60 s (ppt)', () => 1e3 * scintillationYoung1967(0.4, 1, 0, 60), 0.7, 2, '[derived]; formula [memory]'],
    [13, 'LS power at f = 1/7.3', () => lombScarglePowerAt(checkSeries(), [1 / 7.3])[0], 0.964919769, 9, '[derived] astropy 5.2.1 and 8.0.1 agree'],
    [13, 'LS power at f = 0.1', () => lombScarglePowerAt(checkSeries(), [0.1])[0], 0.0586052498, 9, '[derived] astropy 5.2.1 and 8.0.1 agree'],
    [13, 'LS power at f = 0.3', () => lombScarglePowerAt(checkSeries(), [0.3])[0], 0.002094777, 9, '[derived] astropy 5.2.1 and 8.0.1 agree'],
    [
      14,
      'Baluev FAP of Z = 0.3, fmax 0.5 (astropy autofrequency limit)',
      () => {
        const d = prepareLightCurve(checkSeries());
        const g = autoFrequencyGrid(d.baselineDays, d.n, { samplesPerPeak: 5, maximumFrequencyPerDay: 0.5 });
        return baluevFalseAlarmProbability(0.3, { pointCount: d.n, maximumFrequencyPerDay: gridMaxFrequency(g), timeVarianceDays2: d.timeVariance });
      },
      0.0772966,
      7,
      '[derived] astropy',
    ],
    [15, 'σP with N 60, A 0.005, σ 0.003, T 60 d, P 10 d', () => periodPrecision({ visits: 60, semiAmplitudePpm: 5000, sigmaPpm: 3000, baselineDays: 60, periodDays: 10 }).sigmaPeriodDays, 0.101, 3, '[derived]; formula [memory]'],
  ];

  it.each(rows)('#%i %s', (_n, _what, compute, expected, digits) => {
    expect(compute()).toBeCloseTo(expected, digits);
  });
});
