/**
 * Invented data for the returned-photometry unit tests (imported by specs only). The program
 * "Spin-down of the Lantern cluster" has three targets: Lantern-14, measured at 8.2 d; Lantern-22,
 * not detected; Lantern-31, whose best peak may be a one-day alias. Charts are small synthetic
 * series built here (a sinusoid of period 8.2 d sampled once a night).
 */
import type {
  PhotometryRunStatus,
  PhotometryTargetRow,
  ProgramPhotometry,
  RotationMeasurement,
  TargetPhotometry,
} from '@spincycle/shared/photometry/photometry';
import { DEFAULT_DETREND } from '@spincycle/shared/photometry/photometry';

export function testRun(overrides: Partial<PhotometryRunStatus> = {}): PhotometryRunStatus {
  return {
    id: 61,
    state: 'done',
    total: 3,
    done: 3,
    requestedAt: '2027-05-02T09:00:00Z',
    startedAt: '2027-05-02T09:00:01Z',
    finishedAt: '2027-05-02T09:00:04Z',
    error: null,
    ...overrides,
  };
}

export function testRow(targetId: number, overrides: Partial<PhotometryTargetRow> = {}): PhotometryTargetRow {
  return {
    targetId,
    targetName: `Lantern-${targetId}`,
    colour: 0.82,
    colourSystem: 'BV',
    reddeningEbv: null,
    points: 412,
    valueKind: 'mag',
    nodes: ['KRG-50'],
    uploadedAt: '2027-05-02T08:59:00Z',
    expected: { periodDays: 8.6, lowDays: 6.9, highDays: 10.4, from: 'the target plan on node KRG-50' },
    verdict: 'measured',
    periodDays: 8.214,
    periodUncertaintyDays: 0.034,
    falseAlarmProbability: 3.2e-5,
    semiAmplitudePpm: 3870,
    semiAmplitudeMmag: 4.2,
    aliasFlagged: false,
    ageMyr: 612,
    ageLowMyr: 480,
    ageHighMyr: 750,
    cautions: [],
    analysedAt: '2027-05-02T09:00:03Z',
    ...overrides,
  };
}

/** Lantern-22: a light curve, no significant peak. */
export function testNotDetectedRow(): PhotometryTargetRow {
  return testRow(22, {
    colour: 1.1,
    verdict: 'not_detected',
    periodDays: 3.71,
    periodUncertaintyDays: null,
    falseAlarmProbability: 0.41,
    semiAmplitudePpm: 900,
    semiAmplitudeMmag: 0.98,
    ageMyr: null,
    ageLowMyr: null,
    ageHighMyr: null,
    cautions: [],
  });
}

/** Lantern-31: a peak whose one-day alias is nearly as strong. */
export function testAliasRow(): PhotometryTargetRow {
  return testRow(31, {
    colour: 0.95,
    verdict: 'tentative',
    periodDays: 1.14,
    periodUncertaintyDays: 0.002,
    falseAlarmProbability: 4e-12,
    aliasFlagged: true,
    ageMyr: 35,
    ageLowMyr: 20,
    ageHighMyr: 60,
    cautions: ['The period may be an alias of the one-day sampling.', 'Fast rotator: the age is a lower limit.'],
  });
}

/** Lantern-40: nothing uploaded yet. */
export function testEmptyRow(): PhotometryTargetRow {
  return testRow(40, {
    points: null,
    nodes: [],
    uploadedAt: null,
    verdict: null,
    periodDays: null,
    periodUncertaintyDays: null,
    falseAlarmProbability: null,
    semiAmplitudePpm: null,
    semiAmplitudeMmag: null,
    aliasFlagged: null,
    ageMyr: null,
    ageLowMyr: null,
    ageHighMyr: null,
    analysedAt: null,
  });
}

export function testProgram(overrides: Partial<ProgramPhotometry> = {}): ProgramPhotometry {
  return {
    proposalId: 5,
    title: 'Spin-down of the Lantern cluster',
    programState: 'observing',
    canUpload: true,
    detrend: DEFAULT_DETREND,
    run: testRun(),
    targets: [testRow(14), testNotDetectedRow(), testAliasRow()],
    cluster: null,
    progress: {
      visitsDone: 36,
      visitsRequired: 40,
      targetsAwarded: 4,
      targetsWithPhotometry: 3,
      targetsAnalysed: 3,
      targetsMeasured: 1,
    },
    ...overrides,
  };
}

const PERIOD = 8.214;
const FIT = { offset: 0, sinCoefficient: 0.0036, cosCoefficient: -0.0022 };

/** A measured target's full measurement (magnitudes), with small synthetic chart series. */
export function testMeasurement(overrides: Partial<RotationMeasurement> = {}): RotationMeasurement {
  const nights = Array.from({ length: 40 }, (_, i) => i * 1.01);
  const model = (t: number) =>
    FIT.offset + FIT.sinCoefficient * Math.sin((2 * Math.PI * t) / PERIOD) + FIT.cosCoefficient * Math.cos((2 * Math.PI * t) / PERIOD);
  const frequencies = Array.from({ length: 200 }, (_, i) => 0.02 + i * 0.01);
  const peakF = 1 / PERIOD;
  const power = frequencies.map((f) => 0.05 + 0.6 * Math.exp(-(((f - peakF) / 0.01) ** 2)));
  const windowPower = frequencies.map((f) => Math.exp(-(((f - 1.0027) / 0.02) ** 2)));
  const phases = nights.map((t) => (t / PERIOD) % 1);
  return {
    modelVersion: 1,
    input: {
      points: 412,
      valueKind: 'mag',
      timeSystems: ['bjd_tdb'],
      nodes: ['KRG-50'],
      firstBjd: 2461400.6,
      lastBjd: 2461440.0,
      hasErrors: true,
    },
    detrend: {
      options: DEFAULT_DETREND,
      pointsUsed: 409,
      pointsClipped: 3,
      offsets: [{ label: 'KRG-50', value: 12.31 }],
      offsetCount: 1,
      binnedPoints: null,
      steps: ['Removed one zero point per node (1 node).', 'Clipped 3 points beyond 5σ.'],
    },
    search: {
      minFrequencyPerDay: 0.02,
      maxFrequencyPerDay: 2.01,
      frequencies: 200,
      why: 'From 0.5 to 50 days: the expected range with a margin, within the baseline of 39 days.',
    },
    expected: { periodDays: 8.6, lowDays: 6.9, highDays: 10.4, from: 'the target plan on node KRG-50' },
    best: {
      periodDays: PERIOD,
      frequencyPerDay: peakF,
      periodUncertaintyDays: 0.034,
      power: 0.65,
      falseAlarmProbability: 3.2e-5,
      semiAmplitude: 0.0042,
      semiAmplitudePpm: 3870,
      semiAmplitudeMmag: 4.2,
      residualRms: 0.0011,
      cyclesCovered: 4.8,
      withinExpected: true,
      fit: FIT,
    },
    peaks: [
      { frequencyPerDay: peakF, periodDays: PERIOD, power: 0.65, falseAlarmProbability: 3.2e-5 },
      { frequencyPerDay: 1.0027 + peakF, periodDays: 1 / (1.0027 + peakF), power: 0.21, falseAlarmProbability: 0.3 },
    ],
    alias: { flagged: false, windowPeaks: [{ frequencyPerDay: 1.0027, periodDays: 0.9973, power: 0.93 }], candidates: [], message: null },
    verdict: 'measured',
    verdictReasons: ['False-alarm probability 3×10⁻⁵ is below 10⁻³: yes.', 'At least 3 cycles covered: yes (4.8).'],
    verdictRule: 'Measured: false-alarm probability below 10⁻³, at least 3 cycles, no strong alias.',
    age: {
      relation: 'barnes2007',
      relationLabel: 'Barnes (2007)',
      source: 'Barnes (2007), ApJ 669, 1167',
      ageMyr: 612,
      lowMyr: 480,
      highMyr: 750,
      flags: [],
    },
    epochBjd: 2461400.6,
    charts: {
      lightCurve: { timeDays: nights, values: nights.map(model), errors: nights.map(() => 0.001) },
      periodogram: { frequencyPerDay: frequencies, power },
      window: { frequencyPerDay: frequencies, power: windowPower },
      falseAlarmLevels: [
        { falseAlarmProbability: 0.01, power: 0.3 },
        { falseAlarmProbability: 0.001, power: 0.36 },
      ],
      folded: {
        phase: phases,
        values: nights.map(model),
        bins: Array.from({ length: 10 }, (_, k) => ({ phase: (k + 0.5) / 10, mean: model(((k + 0.5) / 10) * PERIOD), count: 4 })),
      },
    },
    sources: { periodogram: 'Lomb (1976); Scargle (1982)', falseAlarm: 'Baluev (2008)' },
    ...overrides,
  };
}

/** The alias-flagged measurement of Lantern-31. */
export function testAliasMeasurement(): RotationMeasurement {
  const m = testMeasurement();
  return {
    ...m,
    verdict: 'tentative',
    best: {
      ...m.best!,
      periodDays: 1.14,
      frequencyPerDay: 1 / 1.14,
      periodUncertaintyDays: 0.002,
      withinExpected: false,
      cyclesCovered: 34.6,
    },
    alias: {
      flagged: true,
      windowPeaks: m.alias.windowPeaks,
      candidates: [
        {
          frequencyPerDay: 0.1294,
          periodDays: 7.73,
          power: 0.58,
          falseAlarmProbability: 2e-9,
          windowFrequencyPerDay: 1.0027,
          relation: 'f − 1.003 d⁻¹',
          powerRatio: 0.92,
        },
      ],
      message: 'A peak at 7.73 d, one sidereal day away, is nearly as strong: the true period may be either.',
    },
    age: {
      ...m.age!,
      ageMyr: 35,
      lowMyr: 20,
      highMyr: 60,
      flags: [{ code: 'saturated', severity: 'caution', message: 'Fast rotator: the age is a lower limit.' }],
    },
  };
}

export function testTargetPhotometry(overrides: Partial<TargetPhotometry> = {}): TargetPhotometry {
  return {
    proposalId: 5,
    row: testRow(14),
    uploads: [{ fileName: 'lantern-14-krg.csv', points: 412, uploadedAt: '2027-05-02T08:59:00Z', uploadedBy: 'Orla Venn' }],
    measurement: testMeasurement(),
    ...overrides,
  };
}
