import { z } from 'zod';
import type { CycleSummary } from '../facility/facility-types';
import { linkTokenSchema } from '../accounts/account-schemas';
import { idSchema, versionSchema } from '../http/ids';
import { safeMultiLineText, safeText } from '../http/text';
import type { ProposalState } from './proposal-states';

/** Longest abstract, characters. */
export const ABSTRACT_MAX_LENGTH = 4000;

/** POST /api/proposals: a new draft in an open cycle; the creator becomes its PI. */
export const createProposalSchema = z.object({
  cycleId: idSchema,
  title: safeText(z.string().trim().min(1, { message: 'give the proposal a title' }).max(200)),
});
export type CreateProposalInput = z.infer<typeof createProposalSchema>;

/** Default probability that a target plan recovers the period (a new proposal's completeness). */
export const DEFAULT_COMPLETENESS = 0.9;
/** Range of a proposal's completeness (the plans' probability of recovering each period). */
export const COMPLETENESS_RANGE = { min: 0.5, max: 0.99 } as const;

const completenessMessage = 'completeness must be between 50 % and 99 %';

/**
 * Completeness of a proposal's plans: the probability (0.5–0.99) that each plan recovers the
 * period; higher costs more visits. The API carries the fraction, the form shows percent.
 */
export const completenessSchema = z
  .number({ message: completenessMessage })
  .min(COMPLETENESS_RANGE.min, { message: completenessMessage })
  .max(COMPLETENESS_RANGE.max, { message: completenessMessage });

/**
 * PATCH /api/proposals/:id (autosave). `version` is the one the editor last read: a
 * different current version means someone else saved in between → 409 `version_conflict`.
 */
export const updateProposalSchema = z.object({
  version: versionSchema,
  title: safeText(z.string().trim().min(1, { message: 'give the proposal a title' }).max(200)).optional(),
  abstract: safeMultiLineText(z.string().max(ABSTRACT_MAX_LENGTH, { message: `at most ${ABSTRACT_MAX_LENGTH} characters` })).optional(),
  category: safeText(z.string().trim().max(80)).nullable().optional(),
  nodeIds: z.array(idSchema).max(20).optional(),
  /** Probability that each plan recovers the period (0.5–0.99); changing it queues the plans again. */
  completeness: completenessSchema.optional(),
});
export type UpdateProposalInput = z.infer<typeof updateProposalSchema>;

/** POST /api/proposals/:id/members: invite a co-investigator by e-mail. */
export const inviteMemberSchema = z.object({
  email: z
    .string()
    .trim()
    .toLowerCase()
    .pipe(z.email({ message: 'Enter a valid e-mail address' })),
});
export type InviteMemberInput = z.infer<typeof inviteMemberSchema>;

/** POST /api/invitations/accept */
export const acceptInvitationSchema = z.object({ token: linkTokenSchema });

/** Days an invitation link stays valid after it was (last) sent. */
export const INVITATION_VALID_DAYS = 14;
/** Minutes between two invitation mails to the same address for the same proposal. */
export const INVITATION_RESEND_MINUTES = 10;

/** Answer of POST /api/invitations/accept: the proposal the account has joined. */
export interface InvitationAccepted {
  proposalId: number;
}

export type MemberRole = 'pi' | 'coi';

export interface ProposalMember {
  id: number;
  /** null until the invitee has an account and accepted. */
  accountId: number | null;
  email: string;
  displayName: string | null;
  role: MemberRole;
  status: 'active' | 'invited';
  invitedAt: string;
}

export interface JustificationFile {
  filename: string;
  sizeBytes: number;
  sha256: string;
  uploadedAt: string;
  uploadedBy: string;
}

/** Node-hours requested on one node (sum of the current feasible target plans on it; infeasible ones are counted, not requested). */
export interface NodeRequest {
  nodeId: number;
  nodeCode: string;
  nodeHours: number;
  feeMinor: number;
  currency: string;
  targets: number;
  infeasibleTargets: number;
  /** Node-hours the infeasible target plans would take: shown apart, never part of `nodeHours`. */
  infeasibleNodeHours: number;
}

/** A proposal as its team sees it. */
export interface Proposal {
  id: number;
  cycle: CycleSummary;
  title: string;
  abstract: string;
  category: string | null;
  state: ProposalState;
  version: number;
  nodeIds: number[];
  /** Probability (0.5–0.99) that each target plan recovers the period; default 0.9. */
  completeness: number;
  team: ProposalMember[];
  justification: JustificationFile | null;
  targetCount: number;
  request: NodeRequest[];
  /** The viewer's part in it. */
  myRole: MemberRole;
  /** False once submitted (or after the call closed). */
  editable: boolean;
  submittedAt: string | null;
  createdAt: string;
  updatedAt: string;
}

/** GET /api/proposals items (the viewer's own proposals). */
export interface ProposalSummary {
  id: number;
  cycleId: number;
  cycleCode: string;
  callClosesAt: string;
  title: string;
  state: ProposalState;
  piName: string;
  myRole: MemberRole;
  targetCount: number;
  requestedNodeHours: number;
  submittedAt: string | null;
  updatedAt: string;
}

/** Why a proposal cannot be submitted yet (GET /api/proposals/:id/readiness and 422 bodies). */
export interface SubmissionCheck {
  ready: boolean;
  problems: { field: string; message: string }[];
  /** Things worth a look that do not block submission (e.g. infeasible targets). */
  warnings: { field: string; message: string }[];
}
