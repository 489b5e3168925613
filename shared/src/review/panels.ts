/**
 * The facility manager's side of review (/api/review/cycles/…, /api/review/panels/…): a cycle's
 * review settings, its panels with members and one chair, proposals to panels, the reviewer
 * assignment matrix (by hand and automatic), distributed review's team reviewers, and each
 * reviewer's declared expertise.
 */
import { z } from 'zod';
import type { MemberRole } from '../proposals/proposal-schemas';
import { idParam, idSchema, versionSchema } from '../http/ids';
import { safeText } from '../http/text';
import type { ProposalState } from '../proposals/proposal-states';
import type { IneligibleReason } from './assignment';

export const REVIEW_MODES = ['panel', 'distributed'] as const;
export type ReviewMode = (typeof REVIEW_MODES)[number];

export const REVIEW_MODE_LABELS: Record<ReviewMode, string> = {
  panel: 'Panels of reviewers',
  distributed: 'Distributed (each team names a reviewer)',
};

export const REVIEWERS_PER_PROPOSAL_MIN = 1;
export const REVIEWERS_PER_PROPOSAL_MAX = 10;
export const PANEL_NAME_MAX = 80;
export const PANEL_MEMBERS_MAX = 60;
export const EXPERTISE_MAX = 20;
export const EXPERTISE_NAME_MAX = 80;

const instantMessage = 'must be a date and time with a time zone (ISO 8601, e.g. 2027-03-01T12:00:00Z)';

/** PUT /api/review/cycles/:cycleId/settings. */
export const reviewSettingsSchema = z.object({
  reviewMode: z.enum(REVIEW_MODES, { message: `must be one of ${REVIEW_MODES.join(', ')}` }),
  /** k: reviewers each proposal gets (panel mode); proposals each team reviewer gets (distributed mode). */
  reviewersPerProposal: z
    .number({ message: 'must be a whole number' })
    .int({ message: 'must be a whole number' })
    .min(REVIEWERS_PER_PROPOSAL_MIN, { message: `must be at least ${REVIEWERS_PER_PROPOSAL_MIN}` })
    .max(REVIEWERS_PER_PROPOSAL_MAX, { message: `must be at most ${REVIEWERS_PER_PROPOSAL_MAX}` }),
  /** Grades lock at this instant (after the call closes); null = not set yet. */
  reviewDeadline: z.iso.datetime({ offset: true, message: instantMessage }).nullable(),
  /** Distributed review: set aside the proposals of teams whose reviewer missed the deadline. */
  setAsideLateTeams: z.boolean({ message: 'must be true or false' }),
});
export type ReviewSettingsInput = z.infer<typeof reviewSettingsSchema>;

/** GET/PUT /api/review/cycles/:cycleId/settings answer. */
export interface ReviewSettings extends ReviewSettingsInput {
  cycleId: number;
  cycleCode: string;
  cycleTitle: string;
  callClosesAt: string;
  /** Whether the call has closed (proposals can be assigned from then on). */
  callClosed: boolean;
  anonymousReview: boolean;
  categories: string[];
  /** Whether review assignments exist in the cycle (the review mode can then no longer change). */
  hasAssignments: boolean;
}

const panelName = safeText(
  z
    .string({ message: 'must be text' })
    .trim()
    .min(1, { message: 'give the panel a name' })
    .max(PANEL_NAME_MAX, { message: `must be at most ${PANEL_NAME_MAX} characters` }),
);

const panelFields = z.object({
  name: panelName,
  /** Accounts holding the reviewer role. */
  memberIds: z
    .array(idSchema, { message: 'must be a list of account ids' })
    .min(1, { message: 'choose at least one member' })
    .max(PANEL_MEMBERS_MAX, { message: `at most ${PANEL_MEMBERS_MAX} members` }),
  /** One of the members. */
  chairId: idSchema,
});

function checkPanelMembers(p: z.infer<typeof panelFields>, ctx: z.RefinementCtx): void {
  const seen = new Set<number>();
  p.memberIds.forEach((id, i) => {
    if (seen.has(id)) ctx.addIssue({ code: 'custom', path: ['memberIds', i], message: 'is listed twice' });
    seen.add(id);
  });
  if (!seen.has(p.chairId)) ctx.addIssue({ code: 'custom', path: ['chairId'], message: 'the chair must be one of the members' });
}

/** POST /api/review/cycles/:cycleId/panels. */
export const panelInputSchema = panelFields.superRefine(checkPanelMembers);
export type PanelInput = z.infer<typeof panelInputSchema>;

/** PUT /api/review/panels/:panelId: the panel as the manager last read it. */
export const panelUpdateSchema = panelFields.extend({ version: versionSchema }).superRefine(checkPanelMembers);
export type PanelUpdate = z.infer<typeof panelUpdateSchema>;

/** PUT /api/review/panels/:panelId/proposals: the panel's proposals (the whole set). */
export const panelProposalsSchema = z.object({
  proposalIds: z.array(idSchema, { message: 'must be a list of proposal ids' }).max(5000, { message: 'at most 5000 proposals' }),
});
export type PanelProposalsInput = z.infer<typeof panelProposalsSchema>;

/** PUT /api/review/panels/:panelId/assignments: one cell of the matrix. */
export const assignmentToggleSchema = z.object({
  proposalId: idSchema,
  reviewerId: idSchema,
  assigned: z.boolean({ message: 'must be true or false' }),
});
export type AssignmentToggleInput = z.infer<typeof assignmentToggleSchema>;

/** PUT /api/review/proposals/:proposalId/team-reviewer. */
export const teamReviewerSchema = z.object({
  email: z
    .string({ message: 'must be text' })
    .trim()
    .toLowerCase()
    .pipe(z.email({ message: 'must be an e-mail address' })),
});
export type TeamReviewerInput = z.infer<typeof teamReviewerSchema>;

/** PUT /api/review/me/expertise. */
export const expertiseSchema = z.object({
  expertise: z
    .array(
      safeText(
        z
          .string({ message: 'must be text' })
          .trim()
          .min(1, { message: 'must not be empty' })
          .max(EXPERTISE_NAME_MAX, { message: `must be at most ${EXPERTISE_NAME_MAX} characters` }),
      ),
      { message: 'must be a list of categories' },
    )
    .max(EXPERTISE_MAX, { message: `at most ${EXPERTISE_MAX} categories` })
    .superRefine((list, ctx) => {
      const seen = new Set<string>();
      list.forEach((e, i) => {
        const key = e.toLowerCase();
        if (seen.has(key)) ctx.addIssue({ code: 'custom', path: [i], message: 'is listed twice' });
        seen.add(key);
      });
    }),
});
export type ExpertiseInput = z.infer<typeof expertiseSchema>;

/** Route parameters. */
export const cycleParamsSchema = z.object({ cycleId: idParam });
export const panelParamsSchema = z.object({ panelId: idParam });
export const proposalParamsSchema = z.object({ proposalId: idParam });

/** An account holding the reviewer role, as the manager picks panel members. */
export interface ReviewerAccount {
  id: number;
  displayName: string;
  email: string;
  affiliation: string;
  expertise: string[];
}

/** GET /api/review/panels/:panelId and the panel lists. */
export interface Panel {
  id: number;
  cycleId: number;
  name: string;
  chairId: number | null;
  members: ReviewerAccount[];
  proposalCount: number;
  /** Whether the chair has locked the standing (assignments can then no longer change). */
  standingLocked: boolean;
  version: number;
}

/** One submitted proposal of the cycle, as the manager assigns it to a panel. */
export interface CycleReviewProposal {
  id: number;
  title: string;
  category: string | null;
  state: ProposalState;
  piName: string;
  panelId: number | null;
  /** Whether any grade exists (it can then no longer leave its panel). */
  graded: boolean;
}

/** One cell of the assignment matrix. */
export type MatrixCell =
  | { state: 'assigned'; source: 'manual' | 'automatic' | 'team'; graded: boolean; expertiseMatch: boolean }
  | { state: 'conflict'; reason: string }
  | { state: 'ineligible'; reason: IneligibleReason; label: string }
  | { state: 'free'; expertiseMatch: boolean };

export interface MatrixReviewer {
  id: number;
  displayName: string;
  affiliation: string;
  expertise: string[];
  chair: boolean;
  /** Assignments in the panel. */
  load: number;
}

export interface MatrixProposal {
  id: number;
  title: string;
  category: string | null;
  state: ProposalState;
  piName: string;
  /** Reviewers assigned (against k). */
  count: number;
  notDiscussed: boolean;
  /** One cell per reviewer, in the order of `reviewers`. */
  cells: MatrixCell[];
}

/** GET /api/review/panels/:panelId/matrix. */
export interface AssignmentMatrix {
  panel: { id: number; name: string; cycleId: number; cycleCode: string; version: number; standingLocked: boolean };
  reviewersPerProposal: number;
  reviewDeadline: string | null;
  reviewers: MatrixReviewer[];
  proposals: MatrixProposal[];
  /** Lowest and highest load among the reviewers. */
  loadRange: { lowest: number; highest: number };
}

/** POST /api/review/panels/:panelId/assign-automatically answer. */
export interface AutomaticAssignmentResult {
  added: number;
  removed: number;
  expertiseMatches: number;
  matrix: AssignmentMatrix;
}

/** Body of the 409 `assignment_infeasible` (beside code and message). */
export interface AssignmentInfeasibleDetails {
  proposals: { id: number; title: string; eligibleReviewers: number; needed: number }[];
  reviewers: { id: number; displayName: string; problem: 'over' | 'under'; load: number; lowest: number; highest: number }[];
}

/** GET/PUT /api/review/proposals/:proposalId/team-reviewer (the team). */
export interface TeamReviewer {
  proposalId: number;
  reviewer: { id: number; displayName: string; email: string } | null;
  namedAt: string | null;
  /** The cycle's review mode: a team names its reviewer only in distributed review. */
  reviewMode: ReviewMode;
  reviewDeadline: string | null;
  deadlinePassed: boolean;
  /** The viewer's part in the team (only the PI may name the reviewer). */
  myRole: MemberRole;
}

/** One row of GET /api/review/cycles/:cycleId/team-reviewers. */
export interface TeamReviewerRow {
  proposalId: number;
  title: string;
  state: ProposalState;
  piName: string;
  reviewer: { id: number; displayName: string; email: string } | null;
  assigned: number;
  graded: number;
  /** The deadline passed with grades missing (or no reviewer named). */
  late: boolean;
  setAside: boolean;
}

/** POST /api/review/cycles/:cycleId/distribute answer. */
export interface DistributionResult {
  reviewers: number;
  added: number;
  removed: number;
  rows: TeamReviewerRow[];
}

/** GET/PUT /api/review/me/expertise. */
export interface Expertise {
  expertise: string[];
  /** Category names of the cycles (suggestions). */
  suggestions: string[];
}

/** GET /api/review/me/panels: a panel the signed-in reviewer sits on (as member or chair). */
export interface MyPanel {
  panelId: number;
  panelName: string;
  cycleId: number;
  cycleCode: string;
  cycleTitle: string;
  isChair: boolean;
  /** The cycle's review deadline (ISO instant), null until the manager sets it. */
  reviewDeadline: string | null;
  /** True once the deadline has passed: the chair then sees the panel's grades and standing. */
  panelStage: boolean;
  standingLockedAt: string | null;
  proposals: number;
}
