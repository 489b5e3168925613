import type { AuditEntry, AwardBoard, AwardBoardRow, AwardDecision, TeamDecision } from '@spincycle/shared/awards/awards';

/**
 * An invented cycle for the client tests. Numbers worked by hand in this file:
 * KRG-50 offers 620 node-hours with 20 % weather loss (496 clear); row 12 holds 400 of them,
 * so 220 remain; row 13 is on reserve for 50. VHM-40 offers 480 with 30 % loss (336 clear);
 * row 12 holds 500 there by override, 20 past capacity. Row 11 asks 117.5 on KRG-50: awarding
 * it leaves 220 − 117.5 = 102.5.
 */
export function testDecision(overrides: Partial<AwardDecision> = {}): AwardDecision {
  return {
    outcome: 'awarded',
    nodes: [],
    targetIds: null,
    overrideReason: null,
    decidedAt: '2027-03-02T09:00:00Z',
    decidedBy: 'Ines Farrow',
    version: 1,
    mailedAt: null,
    ...overrides,
  };
}

export function testRow(proposalId: number, overrides: Partial<AwardBoardRow> = {}): AwardBoardRow {
  return {
    proposalId,
    title: `Proposal ${proposalId}`,
    piName: 'Mara Quillfeather',
    panelId: 5,
    panelName: 'Panel Lantern',
    position: 1,
    meanZ: 0.5,
    state: 'ranked',
    targetCount: 3,
    feasibleTargets: 2,
    targets: [
      { id: 101, name: 'Star Alder 1', feasible: true },
      { id: 102, name: 'Star Alder 2', feasible: true },
      { id: 103, name: 'Star Alder 3', feasible: false },
    ],
    requests: [],
    award: null,
    programState: null,
    ...overrides,
  };
}

export const ROW_UNDECIDED = testRow(11, {
  title: 'Spin-down of an invented cluster',
  position: 1,
  meanZ: 0.6124,
  requests: [{ nodeId: 1, requestedHours: 117.5, neededForAwardedTargets: 117.5 }],
});

export const ROW_AWARDED = testRow(12, {
  title: 'Field dwarfs, second season',
  piName: 'Rhea Tallowmere',
  position: 2,
  meanZ: -0.5,
  requests: [
    { nodeId: 1, requestedHours: 400, neededForAwardedTargets: 400 },
    { nodeId: 2, requestedHours: 500, neededForAwardedTargets: 500 },
  ],
  award: testDecision({
    nodes: [
      { nodeId: 1, nodeHours: 400 },
      { nodeId: 2, nodeHours: 500 },
    ],
    overrideReason: 'Long baseline agreed by the consortium',
    version: 3,
  }),
});

export const ROW_RESERVE = testRow(13, {
  title: 'Spot cycles of young K dwarfs',
  panelId: 6,
  panelName: 'Panel Ember',
  position: 1,
  meanZ: 0.1,
  requests: [{ nodeId: 1, requestedHours: 50, neededForAwardedTargets: 50 }],
  award: testDecision({ outcome: 'reserve', nodes: [{ nodeId: 1, nodeHours: 50 }], version: 1 }),
});

export function testBoard(overrides: Partial<AwardBoard> = {}): AwardBoard {
  return {
    cycle: {
      id: 7,
      code: '2027A',
      title: 'Lantern season',
      campaignStart: '2027-03-01',
      campaignEnd: '2027-08-31',
      releasedAt: null,
    },
    nodes: [
      {
        nodeId: 1,
        code: 'KRG-50',
        name: 'Kestrel Ridge 50 cm',
        siteName: 'Kestrel Ridge',
        offeredHours: 620,
        weatherLossFraction: 0.2,
        clearHours: 496,
        awardedHours: 400,
        remainingHours: 220,
        reserveHours: 50,
        requestedHours: 567.5,
      },
      {
        nodeId: 2,
        code: 'VHM-40',
        name: 'Vale Hollow 40 cm',
        siteName: 'Vale Hollow',
        offeredHours: 480,
        weatherLossFraction: 0.3,
        clearHours: 336,
        awardedHours: 500,
        remainingHours: -20,
        reserveHours: 0,
        requestedHours: 500,
      },
    ],
    panels: [
      { id: 6, name: 'Panel Ember', standingLocked: true, proposals: 1 },
      { id: 8, name: 'Panel Harbour', standingLocked: false, proposals: 4 },
      { id: 5, name: 'Panel Lantern', standingLocked: true, proposals: 2 },
    ],
    rows: [ROW_RESERVE, ROW_UNDECIDED, ROW_AWARDED],
    undecided: 1,
    ...overrides,
  };
}

export const AUDIT: AuditEntry[] = [
  {
    id: 1,
    at: '2027-03-02T09:00:00Z',
    actorName: 'Ines Farrow',
    entity: 'award',
    entityId: 12,
    proposalTitle: 'Field dwarfs, second season',
    action: 'decided',
    before: null,
    after: { outcome: 'reserve', nodes: [{ nodeId: 1, nodeHours: 400 }], targetIds: null },
    reason: null,
  },
  {
    id: 2,
    at: '2027-03-03T10:30:00Z',
    actorName: 'Ines Farrow',
    entity: 'award',
    entityId: 12,
    proposalTitle: 'Field dwarfs, second season',
    action: 'changed',
    before: { outcome: 'reserve', nodes: [{ nodeId: 1, nodeHours: 400 }], targetIds: null },
    after: {
      outcome: 'awarded',
      nodes: [
        { nodeId: 1, nodeHours: 400 },
        { nodeId: 2, nodeHours: 500 },
      ],
      targetIds: [101, 102],
    },
    reason: 'Long baseline agreed by the consortium',
  },
];

export function testTeamDecision(overrides: Partial<TeamDecision> = {}): TeamDecision {
  return {
    proposalId: 5,
    proposalTitle: 'Rotation periods of forty K dwarfs',
    cycleCode: '2027A',
    outcome: 'awarded',
    nodes: [{ nodeId: 1, nodeHours: 117.5, code: 'KRG-50', name: 'Kestrel Ridge 50 cm' }],
    awardedTargets: null,
    releasedAt: '2027-03-10T12:00:00Z',
    programState: 'scheduled',
    comments: [
      { reviewer: 'Reviewer 1', strengths: 'A clear cadence argument.', weaknesses: 'Few comparison stars.' },
      { reviewer: 'Reviewer 2', strengths: 'Well-chosen targets.', weaknesses: '' },
    ],
    ...overrides,
  };
}
