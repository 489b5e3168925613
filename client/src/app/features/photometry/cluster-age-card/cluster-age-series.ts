/**
 * The series of the cluster-age chart of a program's returned photometry: rotation period
 * against colour, the relation's sequence at the age the proposal gave the cluster, the
 * sequence at the age fitted from the measured members (with its range as a band), and each
 * member with a period at its colour, by verdict, with its 1σ period range. Pure; computed
 * with the shared science core (the same relations the target plans use).
 */
import type { ClusterAgeFit, PhotometryTargetRow } from '@spincycle/shared/photometry/photometry';
import { colourLabel, convertColour, deredden, type TargetColourSystem } from '@spincycle/shared/science/colour-sequence';
import { GYRO_RELATION_INFO, type GyroRelationId, periodFromAge, SUPPORTED_COLOUR_DOMAIN } from '@spincycle/shared/science/gyrochronology';
import { defaultRelationFor } from '@spincycle/shared/science/target-plan';
import { relationCoverage, scienceOrNull } from '../../planner/gyro-curves';
import type { XY } from '../photometry-format';

/** A member placed on the chart. */
export interface ClusterMemberPoint extends XY {
  targetId: number;
  name: string;
  verdict: 'measured' | 'tentative';
  /** 1σ period range (null without an uncertainty). */
  lowDays: number | null;
  highDays: number | null;
}

export interface ClusterAgeSeries {
  system: TargetColourSystem;
  axisLabel: string;
  relation: GyroRelationId;
  relationLabel: string;
  ageMyr: number;
  /** The relation's sequence at the cluster's given age. */
  expected: XY[];
  fit: ClusterAgeFit | null;
  /** The sequence at the fitted age, and the band between those at its low and high ages. */
  fitted: XY[] | null;
  fittedBand: { low: XY[]; high: XY[] } | null;
  members: ClusterMemberPoint[];
  /** Members with a period that cannot be placed (colour outside the relations), by name. */
  unplaced: string[];
}

/** Colours sampled along a sequence. */
const SAMPLES = 121;

/** The relation's period at each colour of the system's domain it covers, at one age. */
export function periodSequence(relation: GyroRelationId, system: TargetColourSystem, ageMyr: number, samples = SAMPLES): XY[] {
  const dom = SUPPORTED_COLOUR_DOMAIN[system];
  const start = dom.minExclusive ? dom.min + 1e-3 : dom.min;
  const out: XY[] = [];
  for (let i = 0; i < samples; i++) {
    const x = start + ((dom.max - start) * i) / (samples - 1);
    const coverage = relationCoverage(relation, { value: x, system });
    if (!coverage.covered) continue;
    const y = scienceOrNull(() => periodFromAge(relation, coverage.relationColour.value, ageMyr));
    if (y !== null) out.push({ x, y });
  }
  return out;
}

/**
 * A row's intrinsic colour (de-reddened by the E(B−V) the proposal gives) in the chart's system
 * (through the dwarf sequence when they differ), or null.
 */
function colourIn(row: Pick<PhotometryTargetRow, 'colour' | 'colourSystem' | 'reddeningEbv'>, system: TargetColourSystem): number | null {
  const intrinsic = row.reddeningEbv
    ? scienceOrNull(() => deredden({ value: row.colour, system: row.colourSystem }, row.reddeningEbv!).value)
    : row.colour;
  if (intrinsic === null) return null;
  if (row.colourSystem === system) return intrinsic;
  return scienceOrNull(() => convertColour(intrinsic, row.colourSystem, system));
}

/** The chart's series for a cluster program. */
export function clusterAgeSeries(
  cluster: { ageMyr: number; colourSystem: TargetColourSystem; fit: ClusterAgeFit | null },
  rows: readonly PhotometryTargetRow[],
): ClusterAgeSeries {
  const system = cluster.colourSystem;
  const relation = cluster.fit?.relation ?? defaultRelationFor(system);
  const fit = cluster.fit;
  const members: ClusterMemberPoint[] = [];
  const unplaced: string[] = [];
  for (const row of rows) {
    if ((row.verdict !== 'measured' && row.verdict !== 'tentative') || row.periodDays === null) continue;
    const x = colourIn(row, system);
    if (x === null) {
      unplaced.push(row.targetName);
      continue;
    }
    const sigma = row.periodUncertaintyDays;
    members.push({
      x,
      y: row.periodDays,
      targetId: row.targetId,
      name: row.targetName,
      verdict: row.verdict,
      lowDays: sigma !== null && sigma > 0 ? Math.max(row.periodDays - sigma, row.periodDays * 1e-3) : null,
      highDays: sigma !== null && sigma > 0 ? row.periodDays + sigma : null,
    });
  }
  let fittedBand: ClusterAgeSeries['fittedBand'] = null;
  if (fit) {
    const low = periodSequence(relation, system, fit.lowMyr);
    const high = periodSequence(relation, system, fit.highMyr);
    // Older is slower: the band runs from the young edge up to the old edge.
    if (low.length >= 2 && high.length >= 2) fittedBand = { low, high };
  }
  return {
    system,
    axisLabel: `Intrinsic colour (${colourLabel(system)}) (mag)`,
    relation,
    relationLabel: fit?.relationLabel ?? GYRO_RELATION_INFO[relation].label,
    ageMyr: cluster.ageMyr,
    expected: periodSequence(relation, system, cluster.ageMyr),
    fit,
    fitted: fit ? periodSequence(relation, system, fit.ageMyr) : null,
    fittedBand,
    members,
    unplaced,
  };
}
