import type { Knex } from 'knex';
import type { ReviewPlan, ReviewTarget, ReviewTeam } from '@spincycle/shared/review/reviewing';
import type { AssessedPlan } from '@spincycle/shared/review/technical-assessment';

/**
 * One assignment of the reviewer as stored, with its proposal and cycle. Only assignments the
 * reviewer may see: the proposal has left the draft state and the reviewer has declared no
 * conflict with it (the panels part should never assign a conflicted reviewer; this is the
 * second lock on that door).
 */
export interface StoredAssignment {
  assignmentId: number;
  proposalId: number;
  title: string;
  category: string | null;
  abstract: string;
  abstractShort: string;
  completenessGoal: number;
  cycleId: number;
  cycleCode: string;
  cycleTitle: string;
  anonymousReview: boolean;
  reviewDeadline: Date | null;
  campaignDays: number;
  grade: number | null;
  strengths: string;
  weaknesses: string;
  committeeNote: string;
  savedAt: Date | null;
  submittedAt: Date | null;
  version: number;
  /** Null in an anonymous cycle (the query never reads the team there). */
  team: ReviewTeam | null;
  /**
   * `inputs_version:plans_version` of the proposal's plan run row: they change with anything
   * the technical assessment reads (see assessment-cache.ts); null without a plan run row.
   */
  planVersions: string | null;
}

interface AssignmentRow {
  assignment_id: number;
  proposal_id: number;
  title: string;
  category: string | null;
  abstract: string | null;
  abstract_short: string;
  completeness: number;
  cycle_id: number;
  cycle_code: string;
  cycle_title: string;
  anonymous_review: boolean;
  review_deadline: Date | null;
  campaign_days: number;
  grade: number | null;
  strengths: string;
  weaknesses: string;
  committee_note: string;
  saved_at: Date | null;
  submitted_at: Date | null;
  version: number;
  team: { piName: string; affiliations: string[] | null } | null;
  plan_versions: string | null;
}

function toAssignment(r: AssignmentRow): StoredAssignment {
  return {
    assignmentId: r.assignment_id,
    proposalId: r.proposal_id,
    title: r.title,
    category: r.category,
    abstract: r.abstract ?? '',
    abstractShort: r.abstract_short,
    completenessGoal: r.completeness,
    cycleId: r.cycle_id,
    cycleCode: r.cycle_code,
    cycleTitle: r.cycle_title,
    anonymousReview: r.anonymous_review,
    reviewDeadline: r.review_deadline,
    campaignDays: r.campaign_days,
    grade: r.grade,
    strengths: r.strengths,
    weaknesses: r.weaknesses,
    committeeNote: r.committee_note,
    savedAt: r.saved_at,
    submittedAt: r.submitted_at,
    version: r.version,
    // Anonymity is decided in SQL as well (the CASE below); this keeps a stray team out regardless.
    team: r.anonymous_review || !r.team ? null : { piName: r.team.piName, affiliations: r.team.affiliations ?? [] },
    planVersions: r.plan_versions,
  };
}

/** Length of the abstract in the grading table. */
const ABSTRACT_SHORT = 300;

/**
 * The reviewer's visible assignments, one query: proposal, cycle and (outside anonymous cycles)
 * the PI's name and the active team's affiliations. `withAbstract` reads the whole abstract
 * (the reading page); the table reads its first characters only.
 */
function assignmentsQuery(db: Knex, reviewerId: number, options: { withAbstract?: boolean } = {}) {
  return db('review_assignments as ra')
    .join('proposals as p', 'p.id', 'ra.proposal_id')
    .join('cycles as c', 'c.id', 'p.cycle_id')
    .leftJoin('plan_runs as pr', 'pr.proposal_id', 'p.id')
    .where('ra.reviewer_account_id', reviewerId)
    .whereNot('p.state', 'draft')
    .whereNotExists(
      db('review_conflicts as rc')
        .whereRaw('rc.proposal_id = ra.proposal_id')
        .andWhere('rc.reviewer_account_id', reviewerId)
        .select(db.raw('1')),
    )
    .select(
      'ra.id as assignment_id',
      'p.id as proposal_id',
      'p.title',
      'p.category',
      options.withAbstract ? 'p.abstract' : db.raw('NULL AS abstract'),
      db.raw(
        `CASE WHEN char_length(p.abstract) > ${ABSTRACT_SHORT} THEN rtrim(left(p.abstract, ${ABSTRACT_SHORT - 1})) || '…' ELSE p.abstract END AS abstract_short`,
      ),
      'p.completeness',
      'c.id as cycle_id',
      'c.code as cycle_code',
      'c.title as cycle_title',
      'c.anonymous_review',
      'c.review_deadline',
      db.raw('(c.campaign_end - c.campaign_start + 1)::int AS campaign_days'),
      'ra.grade',
      'ra.strengths',
      'ra.weaknesses',
      'ra.committee_note',
      'ra.saved_at',
      'ra.submitted_at',
      'ra.version',
      db.raw(`CASE WHEN pr.proposal_id IS NULL THEN NULL ELSE pr.inputs_version || ':' || pr.plans_version END AS plan_versions`),
      db.raw(`CASE WHEN c.anonymous_review THEN NULL ELSE json_build_object(
          'piName', (SELECT a.display_name FROM accounts a WHERE a.id = p.pi_account_id),
          'affiliations', (SELECT array_agg(DISTINCT btrim(a.affiliation) ORDER BY btrim(a.affiliation))
                             FROM proposal_members m JOIN accounts a ON a.id = m.account_id
                            WHERE m.proposal_id = p.id AND m.accepted_at IS NOT NULL AND btrim(a.affiliation) <> '')
        ) END AS team`),
    );
}

/** Every visible assignment of the reviewer (optionally of one cycle), by cycle then proposal. */
export async function listAssignmentsOf(db: Knex, reviewerId: number, cycleId?: number): Promise<StoredAssignment[]> {
  const q = assignmentsQuery(db, reviewerId).orderBy([{ column: 'c.id', order: 'desc' }, { column: 'p.id' }]);
  if (cycleId !== undefined) q.where('c.id', cycleId);
  return ((await q) as AssignmentRow[]).map(toAssignment);
}

/** One visible assignment; `forUpdate` locks the assignment row for the rest of the transaction. */
export async function findAssignment(
  db: Knex,
  reviewerId: number,
  proposalId: number,
  options: { forUpdate?: boolean; withAbstract?: boolean } = {},
): Promise<StoredAssignment | undefined> {
  const q = assignmentsQuery(db, reviewerId, options).where('p.id', proposalId).first();
  if (options.forUpdate) q.forUpdate('ra');
  const row = (await q) as AssignmentRow | undefined;
  return row ? toAssignment(row) : undefined;
}

/** The visible assignments of the reviewer in a cycle, locked for the rest of the transaction. */
export async function lockAssignmentsOfCycle(db: Knex, reviewerId: number, cycleId: number): Promise<StoredAssignment[]> {
  const rows = (await assignmentsQuery(db, reviewerId).where('c.id', cycleId).orderBy('p.id').forUpdate('ra')) as AssignmentRow[];
  return rows.map(toAssignment);
}

/** What the technical assessment reads of one proposal. */
export interface AssessmentInputs {
  targets: { id: number; name: string }[];
  plans: AssessedPlan[];
}

/**
 * What the technical assessment reads of the proposals' plans, one query for any number of
 * proposals: every target (with or without a plan), and the plans on requested nodes with the
 * few numbers the assessment needs picked out of the stored summary in SQL (not the ~4 kB
 * summaries themselves). Each summary is decompressed once (`jsonb_to_record` takes every
 * number in one pass, where one `->>` per number would decompress it for each); the flag codes
 * and reasons come as JSON. Infeasible plans bring their reasons; feasible ones have none.
 */
export async function listAssessmentInputs(db: Knex, proposalIds: number[]): Promise<Map<number, AssessmentInputs>> {
  const out = new Map<number, AssessmentInputs>();
  for (const id of proposalIds) out.set(id, { targets: [], plans: [] });
  if (!proposalIds.length) return out;
  const { rows } = await db.raw<{
    rows: {
      proposal_id: number;
      target_id: number;
      target_name: string;
      node_id: number | null;
      node_code: string | null;
      feasible: boolean | null;
      node_hours: number | null;
      amplitude_ppm: number | null;
      precision_ppm: number | null;
      longest_period_days: number | null;
      baseline_days: number | null;
      cadence_days: number | null;
      usable_nights: number | null;
      completeness: number | null;
      flag_codes: string[] | null;
      reasons: string[] | null;
    }[];
  }>(
    `SELECT t.proposal_id, t.id AS target_id, t.name AS target_name, x.node_id, x.node_code, x.feasible, x.node_hours,
            x.amplitude_ppm, x.precision_ppm, x.longest_period_days, x.baseline_days, x.cadence_days, x.usable_nights,
            x.completeness, x.flag_codes, x.reasons
       FROM targets t
       LEFT JOIN (
         SELECT tp.target_id, tp.node_id, n.code AS node_code, tp.feasible, tp.node_hours::float8 AS node_hours,
                s."amplitudePpm" AS amplitude_ppm, s."perVisitPrecisionPpm" AS precision_ppm,
                s."longestPeriodDays" AS longest_period_days, s."baselineDays" AS baseline_days,
                s."cadenceDays" AS cadence_days, s."usableNights" AS usable_nights, s.completeness,
                (SELECT jsonb_agg(f->'code') FROM jsonb_array_elements(s.flags) f) AS flag_codes,
                CASE WHEN tp.feasible THEN NULL ELSE s.reasons END AS reasons
           FROM target_plans tp
           JOIN proposal_nodes pn ON pn.proposal_id = tp.proposal_id AND pn.node_id = tp.node_id
           JOIN nodes n ON n.id = tp.node_id
           CROSS JOIN LATERAL jsonb_to_record(tp.summary) AS s(
             "amplitudePpm" float8, "perVisitPrecisionPpm" float8, "longestPeriodDays" float8, "baselineDays" float8,
             "cadenceDays" float8, "usableNights" float8, completeness float8, flags jsonb, reasons jsonb)
          WHERE tp.proposal_id = ANY(?::int[]) AND tp.summary IS NOT NULL
       ) x ON x.target_id = t.id
      WHERE t.proposal_id = ANY(?::int[])
      ORDER BY t.proposal_id, t.position, t.id, x.node_code`,
    [proposalIds, proposalIds],
  );
  for (const r of rows) {
    const entry = out.get(r.proposal_id)!;
    const last = entry.targets[entry.targets.length - 1];
    if (!last || last.id !== r.target_id) entry.targets.push({ id: r.target_id, name: r.target_name });
    if (r.node_id === null) continue;
    entry.plans.push({
      targetId: r.target_id,
      nodeId: r.node_id,
      nodeCode: r.node_code ?? '',
      feasible: r.feasible === true,
      nodeHours: r.node_hours ?? 0,
      amplitudePpm: r.amplitude_ppm ?? 0,
      perVisitPrecisionPpm: r.precision_ppm ?? 0,
      longestPeriodDays: r.longest_period_days ?? 0,
      baselineDays: r.baseline_days ?? 0,
      cadenceDays: r.cadence_days ?? 1,
      usableNights: r.usable_nights ?? 0,
      completeness: r.completeness,
      flagCodes: r.flag_codes ?? [],
      reasons: r.reasons ?? [],
    });
  }
  return out;
}

/** The requested nodes of a proposal. */
export async function listRequestedNodes(db: Knex, proposalId: number): Promise<{ id: number; code: string; name: string }[]> {
  return db('proposal_nodes as pn')
    .join('nodes as n', 'n.id', 'pn.node_id')
    .where('pn.proposal_id', proposalId)
    .orderBy('n.code')
    .select('n.id', 'n.code', 'n.name');
}

/** The targets of a proposal (list order) with their stored plans on the requested nodes. */
export async function listTargetsWithPlans(db: Knex, proposalId: number): Promise<ReviewTarget[]> {
  const targets: {
    id: number;
    name: string;
    ra_deg: number;
    dec_deg: number;
    magnitude: number;
    magnitude_band: string;
    colour: number;
    colour_system: 'BV' | 'BPRP';
    reddening_ebv: number | null;
    age_myr: number;
    age_uncertainty_myr: number | null;
  }[] = await db('targets')
    .where({ proposal_id: proposalId })
    .orderBy(['position', 'id'])
    // Never `notes`: free text the team wrote, which may name it.
    .select(
      'id',
      'name',
      'ra_deg',
      'dec_deg',
      'magnitude',
      'magnitude_band',
      'colour',
      'colour_system',
      'reddening_ebv',
      'age_myr',
      'age_uncertainty_myr',
    );
  const plans: { target_id: number; node_id: number; node_code: string; plan: Omit<ReviewPlan, 'nodeId' | 'nodeCode'> }[] = await db(
    'target_plans as tp',
  )
    .join('proposal_nodes as pn', function () {
      this.on('pn.proposal_id', 'tp.proposal_id').andOn('pn.node_id', 'tp.node_id');
    })
    .join('nodes as n', 'n.id', 'tp.node_id')
    .where('tp.proposal_id', proposalId)
    .whereNotNull('tp.summary')
    .orderBy('n.code')
    .select(
      'tp.target_id',
      'tp.node_id',
      'n.code as node_code',
      // Only what the reading page shows: the summary's explanations and suggestions stay behind.
      db.raw(`jsonb_build_object(
          'feasible', tp.summary->'feasible', 'reasons', tp.summary->'reasons', 'skyVerdict', tp.summary->'skyVerdict',
          'periodDays', tp.summary->'periodDays', 'amplitudePpm', tp.summary->'amplitudePpm',
          'perVisitPrecisionPpm', tp.summary->'perVisitPrecisionPpm', 'visits', tp.summary->'visits',
          'visitsPerNight', tp.summary->'visitsPerNight', 'cadenceDays', tp.summary->'cadenceDays',
          'baselineDays', tp.summary->'baselineDays', 'nodeHours', tp.summary->'nodeHours',
          'completeness', tp.summary->'completeness') AS plan`),
    );
  const byTarget = new Map<number, ReviewPlan[]>();
  for (const p of plans) {
    const list = byTarget.get(p.target_id) ?? [];
    list.push({ nodeId: p.node_id, nodeCode: p.node_code, ...p.plan, completeness: p.plan.completeness ?? null });
    byTarget.set(p.target_id, list);
  }
  return targets.map((t) => ({
    id: t.id,
    name: t.name,
    raDeg: t.ra_deg,
    decDeg: t.dec_deg,
    magnitude: t.magnitude,
    magnitudeBand: t.magnitude_band,
    colour: t.colour,
    colourSystem: t.colour_system,
    reddeningEbv: t.reddening_ebv,
    ageMyr: t.age_myr,
    ageUncertaintyMyr: t.age_uncertainty_myr,
    plans: byTarget.get(t.id) ?? [],
  }));
}

/** Whether the proposal has a justification PDF. */
export async function hasJustification(db: Knex, proposalId: number): Promise<boolean> {
  return !!(await db('proposal_files').where({ proposal_id: proposalId, kind: 'justification' }).first('id'));
}

/**
 * Writes the review if the row still has `version`; returns the new row's version and saved
 * instant, or undefined when the version moved on.
 */
export async function updateReview(
  db: Knex,
  assignmentId: number,
  version: number,
  review: { grade: number | null; strengths: string; weaknesses: string; committeeNote: string },
  savedAt: Date,
): Promise<{ version: number; savedAt: Date } | undefined> {
  const [row] = await db('review_assignments')
    .where({ id: assignmentId, version })
    .whereNull('submitted_at')
    .update({
      grade: review.grade,
      strengths: review.strengths,
      weaknesses: review.weaknesses,
      committee_note: review.committeeNote,
      saved_at: savedAt,
      version: db.raw('version + 1'),
    })
    .returning(['version', 'saved_at']);
  return row ? { version: row.version, savedAt: row.saved_at } : undefined;
}

/** Marks the assignments submitted. */
export async function markSubmitted(db: Knex, assignmentIds: number[], submittedAt: Date): Promise<void> {
  await db('review_assignments')
    .whereIn('id', assignmentIds)
    .update({ submitted_at: submittedAt, version: db.raw('version + 1') });
}

/** Records the conflict and removes the assignment with its review (caller's transaction). */
export async function recordConflict(
  db: Knex,
  input: { assignmentId: number; proposalId: number; reviewerId: number; reason: string; declaredAt: Date },
): Promise<void> {
  await db('review_conflicts')
    .insert({ proposal_id: input.proposalId, reviewer_account_id: input.reviewerId, reason: input.reason, declared_at: input.declaredAt })
    .onConflict(['proposal_id', 'reviewer_account_id'])
    .merge(['reason', 'declared_at']);
  await db('review_assignments').where({ id: input.assignmentId }).del();
}

/** E-mail addresses of the facility managers (active accounts), who hear of every conflict. */
export async function listFacilityManagerEmails(db: Knex): Promise<string[]> {
  return db('accounts as a')
    .join('account_roles as r', 'r.account_id', 'a.id')
    .where('r.role', 'facility_manager')
    .whereNull('a.disabled_at')
    .orderBy('a.id')
    .pluck('a.email');
}
