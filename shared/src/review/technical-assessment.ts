/**
 * The technical assessment a reviewer reads beside a proposal: how much of the target list the
 * stored target plans can carry out on the nodes the team asked for, what that costs in
 * node-hours, and which targets are at risk and why. Pure: it reads only the numbers the plan
 * worker stored (`target_plans.summary`, see proposals/plan-types.ts), so the server computes it
 * for a whole grading table from one batched read, and the same code explains it on screen.
 */

/** What the assessment reads of one stored plan (a subset of the plans table's row). */
export interface AssessedPlan {
  targetId: number;
  nodeId: number;
  nodeCode: string;
  feasible: boolean;
  nodeHours: number;
  /** Rper amplitude of the spot modulation (ppm) and the node's per-visit precision (ppm). */
  amplitudePpm: number;
  perVisitPrecisionPpm: number;
  /** Longest plausible period (days) of the target. */
  longestPeriodDays: number;
  baselineDays: number;
  /** Nights between visit nights (1 = every night). */
  cadenceDays: number;
  /** Nights of the campaign on which the target is observable from the node's site. */
  usableNights: number;
  /** Probability that the plan recovers the period; null for plans stored before it was kept. */
  completeness: number | null;
  /** Codes of the plan's science flags (e.g. `amplitudeBelowFloor`). */
  flagCodes: string[];
  /** Why the plan is infeasible (empty when feasible). */
  reasons: string[];
}

export interface AssessmentInput {
  /** Every target of the proposal, in list order. */
  targets: { id: number; name: string }[];
  /** The stored plans on the nodes the proposal requests (plans on other nodes are left out by the caller). */
  plans: AssessedPlan[];
  /** Nights in the cycle's campaign (campaign_end − campaign_start + 1). */
  campaignDays: number;
  /** The completeness the proposal asks of every plan (0.5–0.99). */
  completenessGoal: number;
}

/** Why a target is at risk on a node. */
export type RiskKind = 'notPlanned' | 'skyWindowShort' | 'amplitudeBelowPrecision' | 'periodBeyondCampaign' | 'completenessUnreachable';

/** Plain words for each kind of risk (the screen's legend). */
export const RISK_LABELS: Record<RiskKind, string> = {
  notPlanned: 'No plan could be computed',
  skyWindowShort: 'Sky window shorter than the plan needs',
  amplitudeBelowPrecision: 'Signal smaller than one visit’s noise',
  periodBeyondCampaign: 'Period may be longer than the campaign',
  completenessUnreachable: 'Asked completeness not reached',
};

export interface TargetRisk {
  kind: RiskKind;
  /** Nodes on which it applies (empty for `notPlanned`). */
  nodeCodes: string[];
  /** One plain sentence with the numbers behind it. */
  detail: string;
}

export interface TargetAtRisk {
  targetId: number;
  targetName: string;
  /** Whether some requested node still carries a feasible plan of the target. */
  feasibleSomewhere: boolean;
  risks: TargetRisk[];
}

/** The numbers of the assessment, each with a one-line plain explanation. */
export interface TechnicalAssessment {
  targetCount: number;
  /** Targets with a feasible plan on at least one requested node. */
  feasibleTargets: number;
  /** feasibleTargets ÷ targetCount (0–1); null without targets. */
  feasibleShare: number | null;
  /** Node-hours of every stored plan on the requested nodes, feasible or not: what the team's plans ask of the nodes. */
  requestedNodeHours: number;
  /** Node-hours of the feasible plans only: what the plans that can be carried out need (the request counted against capacity). */
  neededNodeHours: number;
  /** Node-hours of the infeasible plans (requestedNodeHours − neededNodeHours). */
  infeasibleNodeHours: number;
  /** Each feasible target once, on its cheapest feasible node: the least the science needs. */
  leastNodeHours: number;
  targetsAtRisk: TargetAtRisk[];
  /** One plain sentence per number above, by its name. */
  explanations: Record<
    'feasibleShare' | 'requestedNodeHours' | 'neededNodeHours' | 'infeasibleNodeHours' | 'leastNodeHours' | 'targetsAtRisk',
    string
  >;
}

/** The numbers of the grading table's row (the full assessment stays on the reading page). */
export interface TechnicalAssessmentSummary {
  targetCount: number;
  feasibleTargets: number;
  feasibleShare: number | null;
  requestedNodeHours: number;
  neededNodeHours: number;
  targetsAtRisk: number;
  /** One plain sentence, e.g. "9 of 10 targets feasible; 120.5 of 140 node-hours needed; 2 targets at risk". */
  line: string;
}

/** Completeness counts as reached within half a percentage point (plans round to a grid of visits). */
const COMPLETENESS_TOLERANCE = 0.005;

/** Node-hours rounded to two decimals, as the plans store them. */
const hours2 = (h: number) => Math.round(h * 100) / 100;
const fmtHours = (h: number) => String(hours2(h));
const fmtNum = (x: number) => (Math.abs(x) >= 100 ? String(Math.round(x)) : String(Math.round(x * 10) / 10));
const pct = (x: number) => `${Math.round(x * 100)} %`;
const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? '' : 's'}`;

/** Reasons the plan worker writes when the sky window cannot hold the baseline (sky/cadence-assessment.ts, planning/observing-season.ts). */
const SKY_BASELINE_REASON =
  /never observable|less than the baseline|does not fit in one observing season|observing seasons here last|no usable night/i;
/** Reason the plan worker writes when the longest plausible period exceeds the campaign (planning/phase-coverage.ts). */
const PERIOD_CAMPAIGN_REASON = /too long for the campaign/i;

/** The risks of one plan. */
function planRisks(plan: AssessedPlan, input: AssessmentInput): { kind: RiskKind; detail: string }[] {
  const risks: { kind: RiskKind; detail: string }[] = [];
  // Visit nights the cadence needs over the baseline, against the nights the target is observable.
  const nightsNeeded = Math.ceil(plan.baselineDays / Math.max(1, plan.cadenceDays) - 1e-9);
  const skyReason = plan.reasons.find((r) => SKY_BASELINE_REASON.test(r));
  if (!plan.feasible && (plan.usableNights < nightsNeeded || skyReason)) {
    risks.push({
      kind: 'skyWindowShort',
      detail:
        plan.usableNights < nightsNeeded
          ? `observable on ${plural(plan.usableNights, 'night')}, but a visit night every ${plural(Math.max(1, plan.cadenceDays), 'night')} over ${fmtNum(plan.baselineDays)} d needs ${nightsNeeded}`
          : skyReason!,
    });
  }
  if (plan.amplitudePpm < plan.perVisitPrecisionPpm || plan.flagCodes.includes('amplitudeBelowFloor')) {
    risks.push({
      kind: 'amplitudeBelowPrecision',
      detail: `expected amplitude ${fmtNum(plan.amplitudePpm)} ppm is below the ${fmtNum(plan.perVisitPrecisionPpm)} ppm noise of one visit, so only many visits together can show it`,
    });
  }
  const periodReason = plan.reasons.find((r) => PERIOD_CAMPAIGN_REASON.test(r));
  if (plan.longestPeriodDays > input.campaignDays || periodReason) {
    risks.push({
      kind: 'periodBeyondCampaign',
      detail:
        plan.longestPeriodDays > input.campaignDays
          ? `the longest plausible period, ${fmtNum(plan.longestPeriodDays)} d, is longer than the ${input.campaignDays}-night campaign`
          : periodReason!,
    });
  }
  const short = plan.completeness !== null && plan.completeness < input.completenessGoal - COMPLETENESS_TOLERANCE;
  if (short || plan.flagCodes.includes('amplitudeBelowFloor')) {
    risks.push({
      kind: 'completenessUnreachable',
      detail:
        plan.completeness !== null
          ? `the plan recovers the period with ${pct(plan.completeness)} probability, below the ${pct(input.completenessGoal)} the proposal asks`
          : `no number of visits reaches the ${pct(input.completenessGoal)} completeness the proposal asks`,
    });
  }
  return risks;
}

/**
 * The technical assessment of a proposal from its stored plans on the requested nodes.
 * Each target counts as feasible when at least one requested node carries a feasible plan; a
 * risk names the nodes it applies to (the first plan's sentence stands for all of them).
 */
export function assessProposal(input: AssessmentInput): TechnicalAssessment {
  const plansByTarget = new Map<number, AssessedPlan[]>();
  for (const p of input.plans) {
    const list = plansByTarget.get(p.targetId) ?? [];
    list.push(p);
    plansByTarget.set(p.targetId, list);
  }
  let requested = 0;
  let needed = 0;
  let least = 0;
  let feasibleTargets = 0;
  const targetsAtRisk: TargetAtRisk[] = [];
  for (const t of input.targets) {
    const plans = plansByTarget.get(t.id) ?? [];
    const feasible = plans.filter((p) => p.feasible);
    for (const p of plans) requested += p.nodeHours;
    for (const p of feasible) needed += p.nodeHours;
    if (feasible.length) {
      feasibleTargets++;
      least += Math.min(...feasible.map((p) => p.nodeHours));
    }
    const risks: TargetRisk[] = [];
    if (!plans.length) {
      risks.push({ kind: 'notPlanned', nodeCodes: [], detail: 'no plan could be computed from its input on any requested node' });
    }
    for (const p of plans) {
      for (const r of planRisks(p, input)) {
        const same = risks.find((x) => x.kind === r.kind);
        if (same) {
          if (!same.nodeCodes.includes(p.nodeCode)) same.nodeCodes.push(p.nodeCode);
        } else {
          risks.push({ kind: r.kind, nodeCodes: [p.nodeCode], detail: r.detail });
        }
      }
    }
    if (risks.length) targetsAtRisk.push({ targetId: t.id, targetName: t.name, feasibleSomewhere: feasible.length > 0, risks });
  }
  const n = input.targets.length;
  requested = hours2(requested);
  needed = hours2(needed);
  least = hours2(least);
  const infeasible = hours2(requested - needed);
  const share = n ? feasibleTargets / n : null;
  return {
    targetCount: n,
    feasibleTargets,
    feasibleShare: share,
    requestedNodeHours: requested,
    neededNodeHours: needed,
    infeasibleNodeHours: infeasible,
    leastNodeHours: least,
    targetsAtRisk,
    explanations: {
      feasibleShare: n
        ? `${feasibleTargets} of ${plural(n, 'target')} can be observed as planned on at least one of the requested nodes.`
        : 'The proposal has no targets.',
      requestedNodeHours: `The stored plans of every target on every requested node add up to ${fmtHours(requested)} node-hours, feasible or not.`,
      neededNodeHours: `The plans that can be carried out need ${fmtHours(needed)} node-hours; this is the request counted against the cycle's capacity.`,
      infeasibleNodeHours:
        infeasible > 0
          ? `${fmtHours(infeasible)} node-hours belong to plans that cannot be carried out as they stand and are not part of the request.`
          : 'Every stored plan can be carried out: no node-hours are left out of the request.',
      leastNodeHours: `Observing each feasible target once, on its cheapest feasible node, would take ${fmtHours(least)} node-hours; more than that means targets are planned on several nodes.`,
      targetsAtRisk: targetsAtRisk.length
        ? `${plural(targetsAtRisk.length, 'target')} carry a risk: a sky window, signal, period or completeness problem on at least one node.`
        : 'No target carries a risk on the requested nodes.',
    },
  };
}

/** The grading table's short form of an assessment. */
export function summarizeAssessment(a: TechnicalAssessment): TechnicalAssessmentSummary {
  const line = a.targetCount
    ? `${a.feasibleTargets} of ${plural(a.targetCount, 'target')} feasible; ${fmtHours(a.neededNodeHours)} of ${fmtHours(a.requestedNodeHours)} node-hours needed; ${plural(a.targetsAtRisk.length, 'target')} at risk`
    : 'No targets';
  return {
    targetCount: a.targetCount,
    feasibleTargets: a.feasibleTargets,
    feasibleShare: a.feasibleShare,
    requestedNodeHours: a.requestedNodeHours,
    neededNodeHours: a.neededNodeHours,
    targetsAtRisk: a.targetsAtRisk.length,
    line,
  };
}
