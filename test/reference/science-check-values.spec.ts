/**
 * SCIENCE.md §8 check values of the science core (rows 1–10 and 13–15; 11–12 belong to the
 * sky windows, test/reference/sky-windows-astropy.spec.ts). Every row names its full source
 * beside its value, and the source is part of the printed test name.
 *
 * Rows 1–10 and 15 are derived here from published formulas: the expected value is the
 * SCIENCE.md §8 value. Rows 13–14 are astropy's: the expected value is what astropy computes
 * in this test run (astropy-oracle.py, request kind "pointwise"), not a number copied from an
 * earlier run; the value SCIENCE.md §8 records is checked against the same run.
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
import { type PointwiseAnswer, requireAstropy, runAstropyPointwise } from './astropy-oracle';

/** SCIENCE.md §8 #13: t_i = i + 0.1·sin(1.7i), y_i = 0.01·sin(2πt_i/7.3) + 0.002·cos(3.1i), i = 0…39. */
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

/** A check value derived here from a published formula. */
interface DerivedRow {
  /** Row of the SCIENCE.md §8 table. */
  n: number;
  what: string;
  compute: () => number;
  expected: number;
  /** Decimal places of `toBeCloseTo`. */
  digits: number;
  /** Paper with equation or table, and how the value was derived; SCIENCE.md tags kept. */
  source: string;
}

const BARNES_2007 = 'Barnes (2007), ApJ 669, 1167, eqs. 1–3 with its published coefficients (a 0.7725, b 0.601, c 0.40, n 0.5189)';
const barnesAge = () => estimateAge({ relation: 'barnes2007', colour: { value: 0.642, system: 'BV' }, periodDays: 26.09 });

const DERIVED_ROWS: DerivedRow[] = [
  {
    n: 1,
    what: 'Barnes 2007, B−V 0.642, 4566 Myr → P (d)',
    compute: () => periodFromAge('barnes2007', 0.642, 4566),
    expected: 26.09,
    digits: 2,
    source: `derived here from ${BARNES_2007}; equals his solar calibration`,
  },
  {
    n: 2,
    what: 'Mamajek & Hillenbrand 2008, B−V 0.65, 4570 Myr → P (d)',
    compute: () => periodFromAge('mamajekHillenbrand2008', 0.65, 4570),
    expected: 26.18,
    digits: 2,
    source:
      'derived here from Mamajek & Hillenbrand (2008), ApJ 687, 1264, eqs. 12–14 with its published coefficients (a 0.407, b 0.325, c 0.495, n 0.566)',
  },
  {
    n: 3,
    what: 'Angus 2015, B−V 0.65, 4570 Myr → P (d)',
    compute: () => periodFromAge('angus2015', 0.65, 4570),
    expected: 25.02,
    digits: 2,
    source:
      'derived here from Angus et al. (2015), MNRAS 450, 1787, eq. 15 with its published coefficients (a 0.40, b 0.31, c 0.45, n 0.55)',
  },
  {
    n: 4,
    what: 'Angus 2019, BP−RP 0.82, 4.57 Gyr → P (d)',
    compute: () => periodFromAge('angus2019', 0.82, 4570),
    expected: 26.02,
    digits: 2,
    source:
      'derived here from Angus et al. (2019), AJ 158, 173, log10 P = cA·log10(t/yr) + Σ ck·x^k with the full-precision coefficients of its Table (SCIENCE.md §1)',
  },
  {
    n: 5,
    what: 'Barnes eq. 16 inverse, P 26.09 d, B−V 0.642 → age (Myr)',
    compute: () => barnesAge().ageMyr,
    expected: 4565,
    digits: 0,
    source: `derived here by inverting ${BARNES_2007}`,
  },
  {
    n: 5,
    what: 'Barnes eq. 16 inverse, P 26.09 d, B−V 0.642 → δt/t',
    compute: () => barnesAge().fractionalUncertainty,
    expected: 0.168,
    digits: 3,
    source: 'derived here from Barnes (2007), ApJ 669, 1167, eq. 16 (age error, t in Myr, x = (B−V)0 − 0.4)',
  },
  {
    n: 6,
    what: 'Noyes τ, B−V 0.65 (d)',
    compute: () => turnoverTimeNoyes1984(0.65),
    expected: 11.99,
    digits: 2,
    source:
      'derived here from Noyes et al. (1984), ApJ 279, 763, eq. 4 (equation number [memory]), log10 τ = 1.362 − 0.166x + 0.025x² − 5.323x³, x = 1 − (B−V)',
  },
  {
    n: 7,
    what: 'Cranmer & Saar τ, 5772 K (d)',
    compute: () => turnoverTimeCranmerSaar2011(5772),
    expected: 12.875,
    digits: 3,
    source: 'derived here from Cranmer & Saar (2011), ApJ 741, 54, eq. 36',
  },
  {
    n: 8,
    what: 'Wright 2011 τ, 1 M☉ (d)',
    compute: () => turnoverTimeWright2011(1),
    expected: 14.45,
    digits: 2,
    source: 'derived here from Wright et al. (2011), ApJ 743, 48, eq. 11',
  },
  {
    n: 9,
    what: 'Kasten–Young airmass at 30°',
    compute: () => airmassKastenYoung(30),
    expected: 1.9943,
    digits: 4,
    source: 'derived here from Kasten & Young (1989), Appl. Opt. 28, 4735, formula as SCIENCE.md §5 [memory]',
  },
  {
    n: 9,
    what: 'Kasten–Young airmass at 90°',
    compute: () => airmassKastenYoung(90),
    expected: 0.9997,
    digits: 4,
    source: 'derived here from Kasten & Young (1989), Appl. Opt. 28, 4735, formula as SCIENCE.md §5 [memory]',
  },
  {
    n: 10,
    what: 'Young scintillation, D 0.4 m, X 1, h 0 m, 60 s (ppt)',
    compute: () => 1e3 * scintillationYoung1967(0.4, 1, 0, 60),
    expected: 0.7,
    digits: 2,
    source: 'derived here from Young (1967), AJ 72, 747, σ = 0.09·D_cm^(−2/3)·X^1.75·exp(−h/8000 m)·(2t)^(−1/2) as SCIENCE.md §5 [memory]',
  },
  {
    n: 15,
    what: 'σP with N 60, A 0.005, σ 0.003, T 60 d, P 10 d (d)',
    compute: () =>
      periodPrecision({ visits: 60, semiAmplitudePpm: 5000, sigmaPpm: 3000, baselineDays: 60, periodDays: 10 }).sigmaPeriodDays,
    expected: 0.101,
    digits: 3,
    source:
      "derived here from Montgomery & O'Donoghue (1999), DSSN 13, 28 (Kovács 1981 form), σf = sqrt(6/N)·σ/(π·A·T), σP = P²·σf [memory]",
  },
];

describe('SCIENCE.md §8 check values derived from published formulas', () => {
  it.each(DERIVED_ROWS)('#$n $what = $expected (source: $source)', ({ compute, expected, digits }) => {
    expect(compute()).toBeCloseTo(expected, digits);
  });
});

const ASTROPY_POWER =
  'astropy 5.2.1 LombScargle(fit_mean=True, center_data=True, normalization="standard").power(method="slow"), run in this test';
const ASTROPY_FAP =
  'astropy 5.2.1 LombScargle.false_alarm_probability(method="baluev", samples_per_peak=5, maximum_frequency=0.5), i.e. Baluev (2008), MNRAS 385, 1279, run in this test';
const FAP_POWER = 0.3;
const FAP_LIMITS = { samplesPerPeak: 5, maximumFrequency: 0.5 };

/** A check value whose expected value is astropy's, computed in this run. */
interface AstropyRow {
  n: number;
  what: string;
  compute: () => number;
  /** Picks astropy's value out of the oracle's answer. */
  astropy: (answer: PointwiseAnswer) => number;
  digits: number;
  /** The value SCIENCE.md §8 records (from an earlier astropy run), checked against this run. */
  recorded: number;
  source: string;
}

const POWER_FREQUENCIES = [1 / 7.3, 0.1, 0.3];

const ASTROPY_ROWS: AstropyRow[] = [
  ...(
    [
      ['1/7.3', 0.964919769],
      ['0.1', 0.0586052498],
      ['0.3', 0.002094777],
    ] as const
  ).map(([label, recorded], k): AstropyRow => ({
    n: 13,
    what: `Lomb–Scargle power of the check series at f = ${label} d⁻¹`,
    compute: () => lombScarglePowerAt(checkSeries(), [POWER_FREQUENCIES[k]])[0],
    astropy: (a) => a.power[k],
    digits: 9,
    recorded,
    source: ASTROPY_POWER,
  })),
  {
    n: 14,
    what: `Baluev FAP of Z = ${FAP_POWER} on the check series, fmax ${FAP_LIMITS.maximumFrequency} (astropy's autofrequency limit)`,
    compute: () => {
      const d = prepareLightCurve(checkSeries());
      // astropy's false_alarm_probability(maximum_frequency=0.5) uses the last frequency of
      // autofrequency(samples_per_peak=5, maximum_frequency=0.5): 0.50041…, checked below.
      const g = autoFrequencyGrid(d.baselineDays, d.n, {
        samplesPerPeak: FAP_LIMITS.samplesPerPeak,
        maximumFrequencyPerDay: FAP_LIMITS.maximumFrequency,
      });
      return baluevFalseAlarmProbability(FAP_POWER, {
        pointCount: d.n,
        maximumFrequencyPerDay: gridMaxFrequency(g),
        timeVarianceDays2: d.timeVariance,
      });
    },
    astropy: (a) => a.fap![0],
    digits: 7,
    recorded: 0.0772966,
    source: ASTROPY_FAP,
  },
];

describe('SCIENCE.md §8 check values computed by astropy (oracle run in this test)', () => {
  let version = '';
  let answer: PointwiseAnswer;

  beforeAll(() => {
    requireAstropy();
    const { timeDays, values } = checkSeries();
    const run = runAstropyPointwise([
      { t: timeDays, y: values, dy: null, frequencies: POWER_FREQUENCIES, fap: { powers: [FAP_POWER], ...FAP_LIMITS } },
    ]);
    version = run.astropyVersion;
    answer = run.cases[0];
  }, 120_000);

  it('runs astropy 5.2.x, the version the source column names', () => {
    expect(version).toMatch(/^5\.2\./);
  });

  it.each(ASTROPY_ROWS)(
    "#$n $what = astropy's value to $digits decimals; SCIENCE.md records $recorded (source: $source)",
    ({ compute, astropy, digits, recorded }) => {
      const theirs = astropy(answer);
      expect(compute()).toBeCloseTo(theirs, digits);
      expect(theirs).toBeCloseTo(recorded, digits);
    },
  );

  it("#14 takes fmax as astropy does: our grid ends at astropy's autofrequency limit (source: astropy 5.2.1 LombScargle.autofrequency, run in this test)", () => {
    const d = prepareLightCurve(checkSeries());
    const g = autoFrequencyGrid(d.baselineDays, d.n, {
      samplesPerPeak: FAP_LIMITS.samplesPerPeak,
      maximumFrequencyPerDay: FAP_LIMITS.maximumFrequency,
    });
    expect(gridMaxFrequency(g)).toBeCloseTo(answer.fapFrequencyLimits![1], 12);
  });
});
