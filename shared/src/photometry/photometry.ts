/**
 * Returned photometry: a program's team uploads the light curves its nodes returned; the worker
 * measures each target's rotation period (shared/src/science/rotation/), its significance, the
 * alias check, a verdict and the gyrochronological age it implies. Request schemas and response
 * shapes of /api/proposals/:id/photometry/….
 *
 * Times in the analysis are BJD (TDB) days; uploads may give BJD (TDB), JD or MJD (UTC) or ISO
 * 8601 UTC instants, converted on reading (MJD = JD − 2400000.5).
 */
import { z } from 'zod';
import type { ScienceFlag } from '../science/explained';
import type { GyroRelationId } from '../science/gyrochronology';
import type { TargetColourSystem } from '../science/colour-sequence';

/** How the time column counts. */
export const TIME_SYSTEMS = ['bjd_tdb', 'jd_utc', 'mjd_utc', 'iso_utc'] as const;
export type TimeSystem = (typeof TIME_SYSTEMS)[number];
export const TIME_SYSTEM_LABELS: Record<TimeSystem, string> = {
  bjd_tdb: 'BJD (TDB), days',
  jd_utc: 'JD (UTC), days',
  mjd_utc: 'MJD (UTC), days',
  iso_utc: 'Date and time (ISO 8601, UTC)',
};

/** What the value column holds. */
export const LIGHT_CURVE_VALUE_KINDS = ['mag', 'flux'] as const;
export type LightCurveValueKind = (typeof LIGHT_CURVE_VALUE_KINDS)[number];
export const LIGHT_CURVE_VALUE_KIND_LABELS: Record<LightCurveValueKind, string> = {
  mag: 'Magnitudes',
  flux: 'Relative flux',
};

/**
 * Columns of a light-curve CSV (header names, case-insensitive):
 * - `time` (or `bjd`, `jd`, `mjd`, `utc`: the name then says the time system);
 * - `mag` or `flux` (the name says which; `value` needs the form's value kind);
 * - optional `error` (1σ, same unit as the value), `node` (a node's code), `target` (a target's
 *   name in the proposal; needed when the form names no target), `time_system` (per row, one of
 *   TIME_SYSTEMS; otherwise the form's or the time column's name).
 */
export const LIGHT_CURVE_COLUMN_HELP = [
  { name: 'time', help: 'Time of the exposure’s mid-point: BJD, JD or MJD in days, or an ISO 8601 UTC date and time.' },
  { name: 'mag / flux', help: 'Brightness as a magnitude, or as relative flux (any unit).' },
  { name: 'error', help: 'Optional 1σ uncertainty, in the same unit.' },
  { name: 'node', help: 'Optional code of the node that took it (for one zero point per node).' },
  { name: 'target', help: 'The target’s name as in the proposal; needed when one file holds several targets.' },
] as const;

/** Limits of one upload. */
export const LIGHT_CURVE_LIMITS = {
  /** Largest file, bytes (a season of 1-minute photometry of one target is about 4 MB). */
  maxFileBytes: 32 * 1024 * 1024,
  /** Files in one upload. */
  maxFiles: 20,
  /** Points of one target (in all files of the upload). */
  maxPointsPerTarget: 200_000,
  /** Points of one upload, all targets. */
  maxPointsPerUpload: 1_000_000,
  /** Problems listed in a refusal (the count of all is given). */
  maxListedErrors: 200,
} as const;

/** Zero points removed before the periodogram. */
export const OFFSET_MODES = ['none', 'node', 'node_night'] as const;
export type OffsetMode = (typeof OFFSET_MODES)[number];
export const OFFSET_MODE_LABELS: Record<OffsetMode, string> = {
  none: 'None',
  node: 'One zero point per node',
  node_night: 'One zero point per node and night',
};

/** Detrending choices, each optional; recorded with every measurement. */
export const detrendOptionsSchema = z.object({
  offsets: z.enum(OFFSET_MODES, { message: 'offsets must be none, node or node_night' }).default('node'),
  /** Iterative clipping at this many σ (robust σ from the median absolute deviation); null: none. */
  clipSigma: z
    .number({ message: 'Enter the clipping level in σ' })
    .min(2, 'Clip at 2σ or more')
    .max(20, 'Clip at 20σ or less')
    .nullable()
    .default(5),
  /** Bin to this interval in minutes before the periodogram; null: no binning. */
  binMinutes: z
    .number({ message: 'Enter the bin width in minutes' })
    .min(1, 'Bin to 1 minute or more')
    .max(1440, 'Bin to one day (1440 minutes) or less')
    .nullable()
    .default(null),
});
export type DetrendOptions = z.infer<typeof detrendOptionsSchema>;
export const DEFAULT_DETREND: DetrendOptions = { offsets: 'node', clipSigma: 5, binMinutes: null };

/**
 * POST /api/proposals/:id/photometry/uploads, multipart: `files` (1…maxFiles CSVs) and these
 * fields (text). `targetId` names the target of files without a `target` column.
 */
export const lightCurveUploadFieldsSchema = z.object({
  timeSystem: z.enum(TIME_SYSTEMS, { message: 'Choose the time system: BJD (TDB), JD, MJD or ISO UTC' }).optional(),
  valueKind: z.enum(LIGHT_CURVE_VALUE_KINDS, { message: 'Choose magnitudes or relative flux' }).optional(),
  targetId: z.coerce.number({ message: 'targetId must be a target’s id' }).int().positive().optional(),
  offsets: z.enum(OFFSET_MODES, { message: 'offsets must be none, node or node_night' }).optional(),
  clipSigma: z.union([z.literal(''), z.coerce.number().min(2, 'Clip at 2σ or more').max(20, 'Clip at 20σ or less')]).optional(),
  binMinutes: z
    .union([z.literal(''), z.coerce.number().min(1, 'Bin to 1 minute or more').max(1440, 'Bin to 1440 minutes or less')])
    .optional(),
});
export type LightCurveUploadFields = z.infer<typeof lightCurveUploadFieldsSchema>;

/** POST /api/proposals/:id/photometry/analyses: analyse every stored light curve again with these choices. */
export const reanalyseSchema = z.object({ detrend: detrendOptionsSchema });

/** One problem of an uploaded file: file name, data row (from 1; 0 for the file as a whole), column. */
export interface LightCurveRowError {
  file: string;
  row: number;
  field: string;
  message: string;
}

/** 400 `invalid_light_curve` body: the usual error body, every problem (up to maxListedErrors), and their count. */
export interface LightCurveErrorBody {
  code: 'invalid_light_curve';
  message: string;
  fieldErrors?: Record<string, string[]>;
  rows: LightCurveRowError[];
  totalErrors: number;
}

/** The verdict on a target's period. */
export const ROTATION_VERDICTS = ['measured', 'tentative', 'not_detected'] as const;
export type RotationVerdict = (typeof ROTATION_VERDICTS)[number];
export const ROTATION_VERDICT_LABELS: Record<RotationVerdict, string> = {
  measured: 'Measured',
  tentative: 'Tentative',
  not_detected: 'Not detected',
};

/** What the analysis was told to expect (from the target plan, or the relation when there is none). */
export interface ExpectedPeriod {
  periodDays: number;
  /** Plausible range (the plan's shortest and longest period). */
  lowDays: number;
  highDays: number;
  /** Where it came from, in plain words ("the target plan on node N1", "Barnes (2007) at 600 Myr"). */
  from: string;
}

/** A peak of the periodogram or of the window function. */
export interface SpectrumPeak {
  frequencyPerDay: number;
  periodDays: number;
  power: number;
  /** Baluev false-alarm probability (periodogram peaks only). */
  falseAlarmProbability?: number;
}

/** Another peak that the best one may be an alias of (or that may be the best one's alias). */
export interface AliasCandidate extends SpectrumPeak {
  /** The window peak that links them, 1/d (e.g. 1.0027 for the sidereal day). */
  windowFrequencyPerDay: number;
  /** "f − 1.003 d⁻¹": how the candidate sits relative to the best peak. */
  relation: string;
  /** Power of the candidate over the best's (≤ 1). */
  powerRatio: number;
}

/** Series for the charts, thinned to a few thousand points at most. */
export interface MeasurementCharts {
  /** Detrended light curve (days since `epochBjd`, value unit); binned for display when long. */
  lightCurve: { timeDays: number[]; values: number[]; errors: number[] | null };
  /** Periodogram: frequency (1/d) and power, thinned keeping each stretch's maximum. */
  periodogram: { frequencyPerDay: number[]; power: number[] };
  /** Spectral window (power of the sampling alone, 0…1), same thinning. */
  window: { frequencyPerDay: number[]; power: number[] };
  /** Power that a peak needs for these false-alarm probabilities (Baluev, over the band searched). */
  falseAlarmLevels: { falseAlarmProbability: number; power: number }[];
  /** Phase-folded at the best period (phase 0…1 from `epochBjd`), thinned; with 50 phase bins (mean, count). */
  folded: { phase: number[]; values: number[]; bins: { phase: number; mean: number; count: number }[] };
}

/** The age implied by the measured period through the target's relation. */
export interface ImpliedAge {
  relation: GyroRelationId;
  relationLabel: string;
  source: string;
  /** Null when the relation gives no age for this star (the flags say why). */
  ageMyr: number | null;
  lowMyr: number | null;
  highMyr: number | null;
  /** Cautions: outside the calibrated colours, fully convective, saturated fast rotator, weakened braking. */
  flags: ScienceFlag[];
}

/** One target's measurement: everything the screens, the table and the CLI show. */
export interface RotationMeasurement {
  modelVersion: number;
  input: {
    points: number;
    valueKind: LightCurveValueKind;
    timeSystems: TimeSystem[];
    nodes: string[];
    firstBjd: number;
    lastBjd: number;
    hasErrors: boolean;
  };
  detrend: {
    options: DetrendOptions;
    pointsUsed: number;
    pointsClipped: number;
    /** Zero points removed (node or node/night label and value), the first 50. */
    offsets: { label: string; value: number }[];
    offsetCount: number;
    /** Points after binning (null: not binned). */
    binnedPoints: number | null;
    /** What was done, in plain words, one line per step. */
    steps: string[];
  };
  search: {
    minFrequencyPerDay: number;
    maxFrequencyPerDay: number;
    frequencies: number;
    /** Plain words: why this band (the expected range with margin, and the data's limits). */
    why: string;
  };
  expected: ExpectedPeriod | null;
  /** Null when nothing could be measured (too few points); `verdict` is then not_detected. */
  best: {
    periodDays: number;
    frequencyPerDay: number;
    /** 1σ, σP = P²·σf with σf = sqrt(6/N)·σ/(π·A·T) (SCIENCE.md §6); null with zero amplitude. */
    periodUncertaintyDays: number | null;
    power: number;
    falseAlarmProbability: number;
    /** Semi-amplitude of the fitted sinusoid in the value's unit, and in ppm and mmag. */
    semiAmplitude: number;
    semiAmplitudePpm: number;
    semiAmplitudeMmag: number;
    residualRms: number;
    /** Cycles of the best period in the baseline. */
    cyclesCovered: number;
    /** Whether the period lies in the expected range (null without an expectation). */
    withinExpected: boolean | null;
    fit: { offset: number; sinCoefficient: number; cosCoefficient: number };
  } | null;
  peaks: SpectrumPeak[];
  alias: {
    flagged: boolean;
    /** The window's strongest peaks above zero frequency. */
    windowPeaks: SpectrumPeak[];
    candidates: AliasCandidate[];
    /** Plain words when flagged. */
    message: string | null;
  };
  /**
   * Whether the rotation period may be twice the best period (two spot groups, two dips per
   * turn): a caution beside the verdict, which it does not change. Absent in measurements made
   * before the check existed.
   */
  doublePeriod?: {
    flagged: boolean;
    /** Twice the best period, days (null when it is longer than the time covered: not checked). */
    doublePeriodDays: number | null;
    likelihoodRatio: number | null;
    message: string | null;
    rule: string;
  };
  verdict: RotationVerdict;
  /** Why this verdict: each rule line with its outcome. */
  verdictReasons: string[];
  /** The rule, in plain words, as shown beside every verdict. */
  verdictRule: string;
  age: ImpliedAge | null;
  /** Epoch (BJD) the charts' times and phases count from. */
  epochBjd: number;
  charts: MeasurementCharts;
  sources: Record<string, string>;
}

/** State of a program's photometry analysis (the progress bar). */
export type PhotometryRunState = 'queued' | 'running' | 'done' | 'failed';
export interface PhotometryRunStatus {
  id: number;
  state: PhotometryRunState;
  /** Targets to analyse and analysed. */
  total: number;
  done: number;
  requestedAt: string;
  startedAt: string | null;
  finishedAt: string | null;
  error: string | null;
}

/** One target in the program's table. */
export interface PhotometryTargetRow {
  targetId: number;
  targetName: string;
  colour: number;
  colourSystem: TargetColourSystem;
  /** E(B−V) the proposal gives (null: none); the cluster chart places members at their intrinsic colour. */
  reddeningEbv: number | null;
  /** Null: no light curve uploaded yet. */
  points: number | null;
  /** What the stored curve's values are (null without one): the unit its amplitude is best read in. */
  valueKind: LightCurveValueKind | null;
  nodes: string[];
  uploadedAt: string | null;
  expected: ExpectedPeriod | null;
  /** Null until analysed. */
  verdict: RotationVerdict | null;
  periodDays: number | null;
  periodUncertaintyDays: number | null;
  falseAlarmProbability: number | null;
  semiAmplitudePpm: number | null;
  semiAmplitudeMmag: number | null;
  aliasFlagged: boolean | null;
  ageMyr: number | null;
  ageLowMyr: number | null;
  ageHighMyr: number | null;
  /** Short cautions for the table (the target's page has the full text). */
  cautions: string[];
  analysedAt: string | null;
}

/** The cluster's age fitted from its measured members. */
export interface ClusterAgeFit {
  ageMyr: number;
  lowMyr: number;
  highMyr: number;
  /** Members used (verdict measured and an age from the relation), and those left out with why. */
  members: number;
  excluded: { targetName: string; reason: string }[];
  /** Reduced χ² of the members about the fitted age (scatter beyond their uncertainties when > 1). */
  reducedChiSquare: number | null;
  /** The method, in plain words, with its sources. */
  method: string;
  relation: GyroRelationId;
  relationLabel: string;
}

/** GET /api/proposals/:id/photometry. */
export interface ProgramPhotometry {
  proposalId: number;
  title: string;
  programState: string;
  /** Whether the viewer may upload and re-analyse. */
  canUpload: boolean;
  detrend: DetrendOptions;
  run: PhotometryRunStatus | null;
  targets: PhotometryTargetRow[];
  /** A cluster program (targets sharing one age): its members' colours, and the fitted age (null with fewer than 2 measured members). */
  cluster: { ageMyr: number; colourSystem: TargetColourSystem; fit: ClusterAgeFit | null } | null;
  progress: {
    visitsDone: number;
    visitsRequired: number;
    targetsAwarded: number;
    targetsWithPhotometry: number;
    targetsAnalysed: number;
    targetsMeasured: number;
  };
}

/** GET /api/proposals/:id/photometry/targets/:targetId. */
export interface TargetPhotometry {
  proposalId: number;
  row: PhotometryTargetRow;
  uploads: { fileName: string; points: number; uploadedAt: string; uploadedBy: string | null }[];
  measurement: RotationMeasurement | null;
}
