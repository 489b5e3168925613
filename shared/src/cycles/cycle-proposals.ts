/**
 * GET /api/cycles/:id/proposals (facility managers): the proposals submitted to a cycle with
 * what each requests per node against the node's capacity, and the pressure on each node.
 */
import type { CycleSummary } from '../facility/facility-types';
import type { ProposalState } from '../proposals/proposal-states';

/** What one proposal requests on one node, against what the cycle offers there. */
export interface CycleProposalNodeRequest {
  nodeId: number;
  nodeCode: string;
  /** Node-hours of the feasible target plans (the request). */
  nodeHours: number;
  /** Node-hours the infeasible target plans would take, shown apart (not requested). */
  infeasibleNodeHours: number;
  targets: number;
  infeasibleTargets: number;
  /** What the cycle offers on the node; null when the node no longer takes part. */
  nodeHoursAvailable: number | null;
  /** The request alone exceeds what the cycle offers on the node. */
  overCapacity: boolean;
}

export interface CycleProposalItem {
  id: number;
  title: string;
  piName: string;
  state: ProposalState;
  submittedAt: string | null;
  request: CycleProposalNodeRequest[];
  /** Sum of `request[].nodeHours`. */
  totalNodeHours: number;
  /** Some node's request exceeds its capacity. */
  overCapacity: boolean;
}

/** Pressure on one node: requested over offered, by the submitted proposals. */
export interface CycleNodePressure {
  nodeId: number;
  nodeCode: string;
  nodeHoursAvailable: number;
  requestedNodeHours: number;
  infeasibleNodeHours: number;
  /** Submitted proposals requesting the node. */
  proposals: number;
  /** requested ÷ offered; null when the node offers nothing (0 node-hours). */
  pressure: number | null;
}

export interface CycleProposalsReport {
  cycle: CycleSummary;
  nodes: CycleNodePressure[];
  proposals: CycleProposalItem[];
  /** Drafts in the cycle, not counted anywhere above. */
  draftCount: number;
}

/** Requested over offered (null when nothing is offered), rounded to 3 decimals. */
export function pressureOf(requested: number, offered: number): number | null {
  return offered > 0 ? Math.round((requested / offered) * 1000) / 1000 : null;
}
