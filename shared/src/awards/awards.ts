/**
 * Awards (facility managers): node-hours per node decided from the panels' locked standings,
 * the capacity each decision leaves, the audit log, and the release of the decisions to the
 * teams (mails, proposal states, programs). Request schemas and response shapes of
 * /api/awards/… and of the team's GET /api/awards/proposals/:proposalId/decision.
 *
 * Units: node-hours as the proposals request them, that is including the node's weather
 * allowance (docs/science.md: requested = clear hours / (1 − weather loss)). A node's capacity
 * in a cycle is the node-hours it offers (`cycle_nodes.node_hours_available`); the hours
 * expected clear are shown beside it (offered × (1 − weather loss)).
 */
import { z } from 'zod';
import { idSchema } from '../http/ids';
import { safeMultiLineText } from '../http/text';
import type { ProposalState } from '../proposals/proposal-states';

/** Outcomes of a decision (DESIGN.md). */
export const AWARD_OUTCOMES = ['awarded', 'reserve', 'not_awarded'] as const;
export type AwardOutcome = (typeof AWARD_OUTCOMES)[number];

export const AWARD_OUTCOME_LABELS: Record<AwardOutcome, string> = {
  awarded: 'Awarded',
  reserve: 'Reserve',
  not_awarded: 'Not awarded',
};

/** Program states (DESIGN.md): scheduled → observing → complete, or withdrawn. */
export const PROGRAM_STATES = ['scheduled', 'observing', 'complete', 'withdrawn'] as const;
export type ProgramState = (typeof PROGRAM_STATES)[number];

export const PROGRAM_STATE_LABELS: Record<ProgramState, string> = {
  scheduled: 'Scheduled',
  observing: 'Observing',
  complete: 'Complete',
  withdrawn: 'Withdrawn',
};

/** Largest node-hours on one node in one award (the database holds numeric(10,2)). */
export const MAX_AWARD_NODE_HOURS = 100_000;

const hoursMessage = `must be a number of node-hours above 0 and at most ${MAX_AWARD_NODE_HOURS.toLocaleString('en-GB')}`;

const optionalNote = (what: string) =>
  safeMultiLineText(
    z
      .string({ message: `must be text (${what})` })
      .trim()
      .max(1000, { message: 'must be at most 1000 characters' }),
  );

/**
 * PUT /api/awards/proposals/:proposalId: the decision on one ranked proposal.
 * - `awarded`: at least one node with hours; `targetIds` null for every target, else the
 *   targets awarded (a partial award), each a target of the proposal (a list naming every
 *   target is stored as null).
 * - `reserve`: nodes optional (the hours it would get if promoted; they do not use capacity);
 *   `targetIds` as for an award.
 * - `not_awarded`: no nodes, `targetIds` null.
 * Each node must be one the cycle offers, listed once. When an award would take a node past
 * what it offers in the cycle (counting the other proposals awarded), the server answers 409
 * `capacity_exceeded` naming `nodes.<i>.nodeHours` unless `overrideReason` is given (every
 * node of an award is checked, also on a later change).
 * `version`: the award's version as last read (0 when the proposal has none yet).
 *
 * Refusals: 400 `validation_failed` naming `nodes`, `nodes.<i>.nodeId`, `targetIds` or
 * `targetIds.<i>`; 404 `proposal_not_found`; 409 `standing_not_locked` (the proposal's panel
 * standing is not locked, or it is in no panel); 409 `stale_version` with the current row
 * (`StaleAwardBody`); 409 `capacity_exceeded` with `fieldErrors`. After the release a change
 * also sets the proposal's state and program and mails the team.
 */
export const awardInputSchema = z.object({
  version: z
    .number({ message: 'must be the version you last read (0 for a first decision)' })
    .int({ message: 'must be a whole number' })
    .min(0, { message: 'must be 0 or more' })
    .max(2_147_483_647, { message: 'must be at most 2147483647' }),
  outcome: z.enum(AWARD_OUTCOMES, { message: 'must be one of awarded, reserve, not_awarded' }),
  nodes: z
    .array(
      z.object({
        nodeId: idSchema,
        nodeHours: z
          .number({ message: hoursMessage })
          .positive({ message: hoursMessage })
          .max(MAX_AWARD_NODE_HOURS, { message: hoursMessage })
          .refine((h) => Math.abs(h * 100 - Math.round(h * 100)) < 1e-6, { message: 'must have at most two decimals' }),
      }),
      { message: 'must be a list of nodes with their node-hours' },
    )
    .max(50, { message: 'must list at most 50 nodes' }),
  targetIds: z.array(idSchema, { message: 'must be a list of target ids, or null for every target' }).max(10_000).nullable(),
  /** Why the award may take a node past its capacity (kept in the audit log). */
  overrideReason: optionalNote('the reason for exceeding capacity').nullable(),
  /** Why this decision or change (kept in the audit log; optional). */
  note: optionalNote('a note for the audit log').optional(),
});
export type AwardInput = z.infer<typeof awardInputSchema>;

/** Body of the 409 `stale_version` answer of PUT /api/awards/proposals/:proposalId. */
export interface StaleAwardBody {
  code: 'stale_version';
  message: string;
  /** The proposal's board row as it is now (its `award.version` is the one to send next). */
  row: AwardBoardRow;
}

/** One node's hours in an award. */
export interface AwardNodeHours {
  nodeId: number;
  nodeHours: number;
}

/** The decision on one proposal, as stored. */
export interface AwardDecision {
  outcome: AwardOutcome;
  nodes: AwardNodeHours[];
  /** Null: every target of the proposal. */
  targetIds: number[] | null;
  overrideReason: string | null;
  decidedAt: string;
  /** Display name of the manager who decided; null when that account no longer exists. */
  decidedBy: string | null;
  version: number;
  /** When the team was told (the decisions released, or this decision changed after release). */
  mailedAt: string | null;
}

/** A node of the cycle with what the awards use of it. */
export interface AwardNodeCapacity {
  nodeId: number;
  code: string;
  name: string;
  siteName: string;
  /** Node-hours the node offers in the cycle. */
  offeredHours: number;
  weatherLossFraction: number;
  /** offeredHours × (1 − weatherLossFraction): hours expected clear. */
  clearHours: number;
  /** Sum of the awarded proposals' hours on the node. */
  awardedHours: number;
  /** offeredHours − awardedHours (negative when past capacity by override). */
  remainingHours: number;
  /** Sum of the reserve proposals' hours on the node (not counted in awardedHours). */
  reserveHours: number;
  /** Sum of what the ranked proposals request on the node. */
  requestedHours: number;
}

/** What a proposal asks and what its plans need on one node. */
export interface AwardNodeRequest {
  nodeId: number;
  /** Node-hours of the feasible plans of every target on the node (the proposal's request). */
  requestedHours: number;
  /** Node-hours the feasible plans of the awarded targets need (every target when none is chosen). */
  neededForAwardedTargets: number;
}

/** One ranked proposal on the award board. */
export interface AwardBoardRow {
  proposalId: number;
  title: string;
  piName: string;
  panelId: number;
  panelName: string;
  /** Position in its panel's locked standing (1 = best). */
  position: number;
  /** Mean normalised grade (z), null when no grades. */
  meanZ: number | null;
  state: ProposalState;
  targetCount: number;
  feasibleTargets: number;
  /** Targets (id, name) for choosing a partial award. */
  targets: { id: number; name: string; feasible: boolean }[];
  requests: AwardNodeRequest[];
  award: AwardDecision | null;
  programState: ProgramState | null;
}

/** A panel of the cycle and whether its standing is locked (only locked standings can be awarded). */
export interface AwardBoardPanel {
  id: number;
  name: string;
  standingLocked: boolean;
  proposals: number;
}

/** GET /api/awards/cycles/:cycleId (and the answer of every award write). */
export interface AwardBoard {
  cycle: {
    id: number;
    code: string;
    title: string;
    campaignStart: string;
    campaignEnd: string;
    /** When the decisions were released to the teams; null before. */
    releasedAt: string | null;
  };
  nodes: AwardNodeCapacity[];
  panels: AwardBoardPanel[];
  /** Ranked proposals of the locked panels, by panel (name) then position. */
  rows: AwardBoardRow[];
  /** Ranked proposals without a decision (release needs none left). */
  undecided: number;
}

/** GET /api/awards/cycles: cycles whose review has reached a locked standing (the manager's picker). */
export interface AwardCycleSummary {
  id: number;
  code: string;
  title: string;
  lockedPanels: number;
  panels: number;
  ranked: number;
  decided: number;
  releasedAt: string | null;
}

/**
 * POST /api/awards/cycles/:cycleId/release: the decisions go to the teams. Refusals: 404;
 * 409 `already_released`; 409 `standing_not_locked` while a panel holding proposals has no
 * locked standing (body `panelIds`); 409 `nothing_to_release` when no proposal is ranked;
 * 409 `undecided` while ranked proposals have no decision (body `proposalIds`, the message
 * names them).
 */
export const releaseSchema = z.object({
  /** The manager confirms that the decisions follow the facility's own allocation rules. */
  confirm: z.literal(true, { message: 'confirm that the decisions are final and may be sent to the teams' }),
});
export type ReleaseInput = z.infer<typeof releaseSchema>;

export interface ReleaseResult {
  board: AwardBoard;
  /**
   * Teams mailed now, and mails the relay did not take now (they stay in the outbox, which the
   * worker tries again; the award's `mailedAt` is set when the mail is sent).
   */
  mailed: number;
  mailFailures: number;
  programsCreated: number;
}

/** One audit entry (GET /api/awards/cycles/:cycleId/audit). */
export interface AuditEntry {
  id: number;
  at: string;
  /** Display name of who did it; null when that account no longer exists. */
  actorName: string | null;
  /**
   * What changed: `award` (a decision), `release`, `program`; from night plans `night_plan` (a build), `lost_night`, `visit`,
   * `calendar_feed` (a node's calendar subscription link), `invoice` (billing: issued, voided, paid, refunded).
   */
  entity: 'award' | 'release' | 'program' | 'night_plan' | 'lost_night' | 'visit' | 'calendar_feed' | 'invoice';
  entityId: number;
  /** The proposal's title when the entry concerns one. */
  proposalTitle: string | null;
  action: string;
  before: unknown;
  after: unknown;
  reason: string | null;
}

/** GET /api/awards/proposals/:proposalId/decision (the team, once released; 404 before). */
export interface TeamDecision {
  proposalId: number;
  proposalTitle: string;
  cycleCode: string;
  outcome: AwardOutcome;
  nodes: (AwardNodeHours & { code: string; name: string })[];
  /** Names of the awarded targets; null when every target is awarded. */
  awardedTargets: string[] | null;
  releasedAt: string;
  programState: ProgramState | null;
  /** The reviewers' comments, anonymised: "Reviewer 1", "Reviewer 2", … in a fixed order. */
  comments: { reviewer: string; strengths: string; weaknesses: string }[];
}
