import { createHash } from 'node:crypto';
import type { Knex } from 'knex';
import type { TelescopeNode } from '@spincycle/shared/facility/facility-types';
import { inParallel } from '../../../db/in-parallel';
import { findCycleById, type StoredCycle } from '../../cycles/cycle-repository';
import { listNodes } from '../../facility/facility-repository';
import { findProposalById, listProposalNodeIds, type StoredProposal } from '../proposal-repository';
import { TARGET_PLAN_MODEL_VERSION } from '@spincycle/shared/science/target-plan';
import { listTargets, type StoredTarget } from '../targets/target-repository';

/**
 * Version of the plan computation (the science core's, plus the sky-window combination). Part
 * of the inputs hash, so that raising it marks every stored plan stale.
 */
export const PLAN_MODEL_VERSION = TARGET_PLAN_MODEL_VERSION;

/** Everything a proposal's plans are computed from. */
export interface PlanInputs {
  campaign: { firstNight: string; lastNight: string };
  /** The requested nodes, with their sites, by code. */
  nodes: TelescopeNode[];
  /** In list order. */
  targets: StoredTarget[];
  /** The proposal's probability that each plan recovers the period (0.5–0.99). */
  completeness: number;
}

/** Loads the inputs of a proposal's plans, or undefined when the proposal no longer exists. */
export async function loadPlanInputs(db: Knex, proposalId: number): Promise<PlanInputs | undefined> {
  const proposal = await findProposalById(db, proposalId);
  if (!proposal) return undefined;
  return loadPlanInputsOf(db, proposal, (await findCycleById(db, proposal.cycleId))!);
}

/** The inputs of the plans of a proposal whose row and cycle are already at hand (e.g. from accessProposal). */
export async function loadPlanInputsOf(
  db: Knex,
  proposal: Pick<StoredProposal, 'id' | 'completeness'>,
  cycle: Pick<StoredCycle, 'campaignStart' | 'campaignEnd'>,
): Promise<PlanInputs> {
  const proposalId = proposal.id;
  const [nodeIds, targets] = await inParallel(db, [() => listProposalNodeIds(db, proposalId), () => listTargets(db, proposalId)] as const);
  const nodes = nodeIds.length ? await listNodes(db, nodeIds) : [];
  return {
    campaign: { firstNight: cycle.campaignStart, lastNight: cycle.campaignEnd },
    nodes,
    targets,
    completeness: proposal.completeness,
  };
}

/**
 * SHA-256 of what the plans depend on: the campaign, the proposal's completeness, each
 * requested node's instrument and site, and each target's science values including an expected
 * period of its own (not its name, notes or position, which change no number). Stored with the
 * plans; a different hash now means the plans are stale.
 */
export function planInputsHash(inputs: PlanInputs): string {
  const nodes = [...inputs.nodes]
    .sort((a, b) => a.id - b.id)
    .map(({ id, site, code: _c, name: _n, siteId: _s, active: _a, ...spec }) => ({
      id,
      spec,
      site: { lat: site.latitudeDeg, lon: site.longitudeDeg, el: site.elevationM, tz: site.timeZone, sky: site.skyBrightnessMagPerArcsec2 },
    }));
  const targets = [...inputs.targets]
    .sort((a, b) => a.id - b.id)
    .map((t) => [
      t.id,
      t.raDeg,
      t.decDeg,
      t.magnitude,
      t.magnitudeBand,
      t.colour,
      t.colourSystem,
      t.reddeningEbv,
      t.ageMyr,
      t.ageUncertaintyMyr,
      t.periodPrecisionDays,
      t.periodDays,
      t.periodUncertaintyDays,
    ]);
  return createHash('sha256')
    .update(JSON.stringify({ v: PLAN_MODEL_VERSION, campaign: inputs.campaign, completeness: inputs.completeness, nodes, targets }))
    .digest('hex');
}
