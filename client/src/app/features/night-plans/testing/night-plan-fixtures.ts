import type {
  NightPlan,
  NightPlanBuildStatus,
  NightPlanNode,
  NightPlanOverview,
  NodeTimeline,
  ProgramProgress,
  TargetProgress,
} from '@spincycle/shared/night-plans/night-plans';

/**
 * An invented cycle for the client tests of the night plans. The node's site keeps UTC−3 all
 * year (`Etc/GMT+3`), so a visit at 02:00 UTC is at 23:00 site time (worked by hand in this
 * file). Cycle 7 runs its campaign from 1 March to 15 April 2027: the timeline's months are
 * March (1–31) and April (1–15).
 */
export function testBuild(overrides: Partial<NightPlanBuildStatus> = {}): NightPlanBuildStatus {
  return {
    id: 40,
    cycleId: 7,
    kind: 'build',
    state: 'done',
    total: 300,
    done: 300,
    fromNight: null,
    requestedAt: '2027-02-20T09:00:00Z',
    startedAt: '2027-02-20T09:00:02Z',
    finishedAt: '2027-02-20T09:00:09Z',
    error: null,
    ...overrides,
  };
}

export function testNode(overrides: Partial<NightPlanNode> = {}): NightPlanNode {
  return {
    nodeId: 3,
    code: 'KRG-50',
    name: 'Kestrel Ridge 50 cm',
    siteName: 'Kestrel Ridge',
    timeZone: 'Etc/GMT+3',
    nights: 46,
    lostNights: 1,
    visitsPlanned: 120,
    visitsDone: 14,
    plannedHours: 210.5,
    darkHours: 402,
    ...overrides,
  };
}

export function testTarget(overrides: Partial<TargetProgress> = {}): TargetProgress {
  return {
    targetId: 501,
    targetName: 'Quill-1',
    nodeId: 3,
    nodeCode: 'KRG-50',
    visitsRequired: 20,
    visitsPlanned: 18,
    visitsDone: 4,
    visitNightsRequired: 10,
    visitNightsPlanned: 9,
    stepNights: 6,
    toleranceNights: 2,
    medianGapNights: 6,
    largestGapNights: 9,
    recoveryFraction: 0.72,
    recoveryExplanation: 'Recovered in 72 of 100 simulated light curves at a 4.1-day period with the planned visits.',
    atRisk: ['A gap of 9 nights is longer than the 8 nights the cadence allows.'],
    ...overrides,
  };
}

export function testProgram(overrides: Partial<ProgramProgress> = {}): ProgramProgress {
  return {
    proposalId: 21,
    title: 'Spots on slow rotators',
    piName: 'Mara Quillfeather',
    programState: 'observing',
    position: 1,
    visitsRequired: 40,
    visitsPlanned: 34,
    visitsDone: 6,
    recoveryFraction: 0.81,
    completion: null,
    targets: [
      testTarget(),
      testTarget({
        targetId: 502,
        targetName: 'Quill-2',
        visitsRequired: 20,
        visitsPlanned: 16,
        visitsDone: 2,
        medianGapNights: 6,
        largestGapNights: 7,
        recoveryFraction: 0.9,
        recoveryExplanation: 'Recovered in 90 of 100 simulated light curves.',
        atRisk: [],
      }),
    ],
    ...overrides,
  };
}

export function testOverview(overrides: Partial<NightPlanOverview> = {}): NightPlanOverview {
  return {
    cycle: {
      id: 7,
      code: '2027A',
      title: 'Lantern season',
      campaignStart: '2027-03-01',
      campaignEnd: '2027-04-15',
      releasedAt: '2027-02-10T12:00:00Z',
    },
    build: testBuild(),
    nodes: [testNode()],
    programs: [
      testProgram(),
      testProgram({
        proposalId: 22,
        title: 'Flares in the young group',
        piName: 'Oren Vale',
        position: 2,
        visitsRequired: 12,
        visitsPlanned: 12,
        visitsDone: 1,
        recoveryFraction: 0.55,
        targets: [
          testTarget({
            targetId: 601,
            targetName: 'Ember-4',
            visitsRequired: 12,
            visitsPlanned: 12,
            visitsDone: 1,
            recoveryFraction: 0.55,
            atRisk: [],
          }),
        ],
      }),
    ],
    ...overrides,
  };
}

/**
 * A complete program: by its visits (every target's visit nights done on 2 April 2027, its
 * later planned visits removed: 36 visits planned and done), or, with `campaign`, by the
 * campaign's end (last night 15 April 2027; 20 of 34 planned visits done).
 */
export function testCompleteProgram(cause: 'visits' | 'campaign' = 'visits', overrides: Partial<ProgramProgress> = {}): ProgramProgress {
  const byCause: Partial<ProgramProgress> =
    cause === 'visits'
      ? { visitsPlanned: 36, visitsDone: 36, completion: { cause: 'visits_done', at: '2027-04-02T10:15:00Z', campaignEnd: null } }
      : {
          visitsPlanned: 34,
          visitsDone: 20,
          completion: { cause: 'campaign_ended', at: '2027-04-17T00:10:00Z', campaignEnd: '2027-04-15' },
        };
  return testProgram({ programState: 'complete', ...byCause, ...overrides });
}

/** March 1–3 of KRG-50: a night with a done and a missed visit, a lost night, a night with one planned visit. */
export function testTimeline(): NodeTimeline {
  return {
    node: testNode(),
    nights: [
      {
        date: '2027-03-01',
        darkStart: '2027-03-01T23:00:00Z',
        darkEnd: '2027-03-02T09:00:00Z',
        moonIllumination: 0.1,
        lost: null,
        visits: [
          {
            id: 101,
            targetId: 501,
            targetName: 'Quill-1',
            proposalId: 21,
            programTitle: 'Spots on slow rotators',
            start: '2027-03-02T02:00:00Z',
            end: '2027-03-02T03:00:00Z',
            status: 'done',
          },
          {
            id: 102,
            targetId: 601,
            targetName: 'Ember-4',
            proposalId: 22,
            programTitle: 'Flares in the young group',
            start: '2027-03-02T04:00:00Z',
            end: '2027-03-02T04:30:00Z',
            status: 'missed',
          },
        ],
      },
      {
        date: '2027-03-02',
        darkStart: '2027-03-02T23:01:00Z',
        darkEnd: '2027-03-03T08:59:00Z',
        moonIllumination: 0.45,
        lost: { reason: 'Cloud over the ridge', markedBy: 'Ines Farrow', markedAt: '2027-03-03T10:00:00Z' },
        visits: [],
      },
      {
        date: '2027-03-03',
        darkStart: '2027-03-03T23:02:00Z',
        darkEnd: '2027-03-04T08:58:00Z',
        moonIllumination: 0.8,
        lost: null,
        visits: [
          {
            id: 103,
            targetId: 502,
            targetName: 'Quill-2',
            proposalId: 21,
            programTitle: 'Spots on slow rotators',
            start: '2027-03-04T01:30:00Z',
            end: '2027-03-04T02:30:00Z',
            status: 'planned',
          },
        ],
      },
    ],
  };
}

/** The night of 3 March 2027 on KRG-50 (site times 3 h behind UTC). */
export function testNight(overrides: Partial<NightPlan> = {}): NightPlan {
  return {
    node: { nodeId: 3, code: 'KRG-50', name: 'Kestrel Ridge 50 cm', siteName: 'Kestrel Ridge', timeZone: 'Etc/GMT+3' },
    date: '2027-03-03',
    darkStart: '2027-03-03T23:02:00Z',
    darkEnd: '2027-03-04T08:58:00Z',
    darkStartLocal: '20:02',
    darkEndLocal: '05:58',
    moonIllumination: 0.8,
    lost: null,
    visits: [
      {
        id: 103,
        order: 1,
        targetId: 502,
        targetName: 'Quill-2',
        proposalId: 21,
        programTitle: 'Spots on slow rotators',
        start: '2027-03-04T01:30:00Z',
        end: '2027-03-04T02:30:00Z',
        startLocal: '22:30',
        endLocal: '23:30',
        status: 'planned',
        altitudeDeg: 62.4,
        airmass: 1.128,
      },
      {
        id: 104,
        order: 2,
        targetId: 601,
        targetName: 'Ember-4',
        proposalId: 22,
        programTitle: 'Flares in the young group',
        start: '2027-03-04T03:00:00Z',
        end: '2027-03-04T03:45:00Z',
        startLocal: '00:00',
        endLocal: '00:45',
        status: 'done',
        altitudeDeg: 41.0,
        airmass: 1.52,
      },
    ],
    plannedHours: 1.75,
    darkHours: 9.93,
    ...overrides,
  };
}
