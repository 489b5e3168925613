import { assessProposal, summarizeAssessment, type AssessedPlan, type AssessmentInput } from './technical-assessment';

/** A plan with nothing wrong (override what the case is about). */
function plan(overrides: Partial<AssessedPlan> & Pick<AssessedPlan, 'targetId' | 'nodeId' | 'nodeCode'>): AssessedPlan {
  return {
    feasible: true,
    nodeHours: 10,
    amplitudePpm: 2000,
    perVisitPrecisionPpm: 1000,
    longestPeriodDays: 20,
    baselineDays: 40,
    cadenceDays: 1,
    usableNights: 50,
    completeness: 0.9,
    flagCodes: [],
    reasons: [],
    ...overrides,
  };
}

/**
 * Worked by hand in this test: four targets on two requested nodes (N1, N2) of a 60-night
 * campaign, completeness goal 0.9.
 * - A: feasible on N1 (10 h) and N2 (6 h), nothing wrong.
 * - B: infeasible on N1 (8 h): observable on 20 nights but a nightly cadence over 45 d needs 45;
 *   amplitude 500 ppm below the 800 ppm of one visit.
 * - C: feasible on N2 (12 h), longest plausible period 75 d > 60 nights, completeness 0.7 < 0.9.
 * - D: no plan at all (its input could not be planned).
 * Requested 10 + 6 + 8 + 12 = 36 h; needed (feasible) 10 + 6 + 12 = 28 h; infeasible 8 h;
 * least: A on its cheaper node (6 h) + C (12 h) = 18 h. Feasible targets A and C: 2 of 4 = 0.5.
 * At risk: B, C, D.
 */
const WORKED: AssessmentInput = {
  targets: [
    { id: 1, name: 'Star A' },
    { id: 2, name: 'Star B' },
    { id: 3, name: 'Star C' },
    { id: 4, name: 'Star D' },
  ],
  plans: [
    plan({ targetId: 1, nodeId: 11, nodeCode: 'N1', nodeHours: 10 }),
    plan({ targetId: 1, nodeId: 12, nodeCode: 'N2', nodeHours: 6 }),
    plan({
      targetId: 2,
      nodeId: 11,
      nodeCode: 'N1',
      feasible: false,
      nodeHours: 8,
      amplitudePpm: 500,
      perVisitPrecisionPpm: 800,
      baselineDays: 45,
      usableNights: 20,
      reasons: ['only 20 nights can hold 1 visit, but the cadence needs 45 nights'],
    }),
    plan({ targetId: 3, nodeId: 12, nodeCode: 'N2', nodeHours: 12, longestPeriodDays: 75, completeness: 0.7 }),
  ],
  campaignDays: 60,
  completenessGoal: 0.9,
};

describe('assessProposal', () => {
  it('worked example (by hand in this test): shares, node-hours and risks with their nodes', () => {
    const a = assessProposal(WORKED);
    expect(a.targetCount).toBe(4);
    expect(a.feasibleTargets).toBe(2);
    expect(a.feasibleShare).toBe(0.5);
    expect(a.requestedNodeHours).toBe(36);
    expect(a.neededNodeHours).toBe(28);
    expect(a.infeasibleNodeHours).toBe(8);
    expect(a.leastNodeHours).toBe(18);
    expect(a.targetsAtRisk.map((t) => [t.targetName, t.feasibleSomewhere, t.risks.map((r) => [r.kind, r.nodeCodes])])).toEqual([
      [
        'Star B',
        false,
        [
          ['skyWindowShort', ['N1']],
          ['amplitudeBelowPrecision', ['N1']],
        ],
      ],
      [
        'Star C',
        true,
        [
          ['periodBeyondCampaign', ['N2']],
          ['completenessUnreachable', ['N2']],
        ],
      ],
      ['Star D', false, [['notPlanned', []]]],
    ]);
    const b = a.targetsAtRisk[0].risks;
    expect(b[0].detail).toBe('observable on 20 nights, but a visit night every 1 night over 45 d needs 45');
    expect(b[1].detail).toContain('500 ppm is below the 800 ppm');
    expect(a.targetsAtRisk[1].risks[1].detail).toBe('the plan recovers the period with 70 % probability, below the 90 % the proposal asks');
  });

  it('worked example: every number has a plain one-line explanation with the figure in it', () => {
    const a = assessProposal(WORKED);
    expect(a.explanations.feasibleShare).toBe('2 of 4 targets can be observed as planned on at least one of the requested nodes.');
    expect(a.explanations.requestedNodeHours).toContain('36 node-hours');
    expect(a.explanations.neededNodeHours).toContain('28 node-hours');
    expect(a.explanations.infeasibleNodeHours).toContain('8 node-hours');
    expect(a.explanations.leastNodeHours).toContain('18 node-hours');
    expect(a.explanations.targetsAtRisk).toContain('3 targets');
    for (const line of Object.values(a.explanations)) expect(line).not.toContain('\n');
  });

  it('a risk on two nodes is listed once, naming both nodes', () => {
    const a = assessProposal({
      targets: [{ id: 1, name: 'Star A' }],
      plans: [
        plan({ targetId: 1, nodeId: 11, nodeCode: 'N1', longestPeriodDays: 90 }),
        plan({ targetId: 1, nodeId: 12, nodeCode: 'N2', longestPeriodDays: 90 }),
      ],
      campaignDays: 60,
      completenessGoal: 0.9,
    });
    expect(a.targetsAtRisk[0].risks).toEqual([
      {
        kind: 'periodBeyondCampaign',
        nodeCodes: ['N1', 'N2'],
        detail: 'the longest plausible period, 90 d, is longer than the 60-night campaign',
      },
    ]);
  });

  it('reads the worker’s flags and reasons: amplitudeBelowFloor means the completeness is unreachable; a season reason marks a short sky window', () => {
    const a = assessProposal({
      targets: [{ id: 1, name: 'Star A' }],
      plans: [
        plan({ targetId: 1, nodeId: 11, nodeCode: 'N1', flagCodes: ['amplitudeBelowFloor'], completeness: null }),
        plan({
          targetId: 1,
          nodeId: 12,
          nodeCode: 'N2',
          feasible: false,
          usableNights: 200,
          reasons: ['a baseline of 90 days does not fit in one observing season: the target’s longest season from this site is 50 days'],
        }),
      ],
      campaignDays: 200,
      completenessGoal: 0.9,
    });
    const kinds = a.targetsAtRisk[0].risks.map((r) => [r.kind, r.nodeCodes]);
    expect(kinds).toEqual([
      ['amplitudeBelowPrecision', ['N1']],
      ['completenessUnreachable', ['N1']],
      ['skyWindowShort', ['N2']],
    ]);
  });

  it('a feasible plan is never called short of sky, and completeness within half a point of the goal counts as reached', () => {
    const a = assessProposal({
      targets: [{ id: 1, name: 'Star A' }],
      plans: [plan({ targetId: 1, nodeId: 11, nodeCode: 'N1', usableNights: 5, completeness: 0.896 })],
      campaignDays: 60,
      completenessGoal: 0.9,
    });
    expect(a.targetsAtRisk).toEqual([]);
    expect(a.explanations.targetsAtRisk).toBe('No target carries a risk on the requested nodes.');
  });

  it('without targets: share null and zero node-hours', () => {
    const a = assessProposal({ targets: [], plans: [], campaignDays: 60, completenessGoal: 0.9 });
    expect(a.feasibleShare).toBeNull();
    expect(a.requestedNodeHours).toBe(0);
    expect(summarizeAssessment(a).line).toBe('No targets');
  });
});

describe('summarizeAssessment', () => {
  it('worked example (by hand in this test): the table’s one line', () => {
    const s = summarizeAssessment(assessProposal(WORKED));
    expect(s).toEqual({
      targetCount: 4,
      feasibleTargets: 2,
      feasibleShare: 0.5,
      requestedNodeHours: 36,
      neededNodeHours: 28,
      targetsAtRisk: 3,
      line: '2 of 4 targets feasible; 28 of 36 node-hours needed; 3 targets at risk',
    });
  });
});
