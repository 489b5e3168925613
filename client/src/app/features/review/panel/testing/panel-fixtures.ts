import type { CyclePressureReport } from '@spincycle/shared/review/pressure';
import type { PanelHeader, PanelStanding, PanelStatisticsReport, StatisticsRow } from '@spincycle/shared/review/standing';

/** An invented panel for the client tests. */
export const HEADER: PanelHeader = {
  id: 5,
  name: 'Panel Lantern',
  cycleId: 7,
  cycleCode: '2027A',
  reviewDeadline: '2027-02-01T12:00:00Z',
  panelStage: true,
  spreadThreshold: 3,
  triageFraction: 0,
  standingLockedAt: null,
  standingLockedBy: null,
  teamHidden: true,
  viewerRole: 'chair',
  version: 2,
};

function row(id: number, title: string, extra: Partial<StatisticsRow>): StatisticsRow {
  return {
    proposalId: id,
    title,
    state: 'in_review',
    team: null,
    notDiscussed: false,
    grades: [],
    gradeCount: 0,
    mean: null,
    median: null,
    normalisedMean: null,
    spread: null,
    flagged: false,
    ...extra,
  };
}

export const ROWS: StatisticsRow[] = [
  row(11, 'Spin-down of an invented cluster', {
    grades: [
      { reviewerId: 1, raw: 8, normalised: 1.2247 },
      { reviewerId: 2, raw: 9, normalised: 0 },
    ],
    gradeCount: 2,
    mean: 8.5,
    median: 8.5,
    normalisedMean: 0.6124,
    spread: 1,
  }),
  row(12, 'Field dwarfs, second season', {
    grades: [
      { reviewerId: 1, raw: 6, normalised: 0 },
      { reviewerId: 2, raw: 2, normalised: -1 },
    ],
    gradeCount: 2,
    mean: 4,
    median: 4,
    normalisedMean: -0.5,
    spread: 4,
    flagged: true,
    notDiscussed: true,
  }),
];

export const STATISTICS: PanelStatisticsReport = {
  panel: HEADER,
  reviewers: [
    { id: 1, displayName: 'Reviewer Ash', gradeCount: 2, meanGrade: 7, sdGrade: 1 },
    { id: 2, displayName: 'Reviewer Birch', gradeCount: 2, meanGrade: 5.5, sdGrade: 3.5 },
  ],
  proposals: ROWS,
};

export const STANDING: PanelStanding = {
  panel: HEADER,
  entries: ROWS.map((proposal, i) => ({ position: i + 1, proposal })),
  moves: [
    {
      id: 1,
      proposalId: 12,
      proposalTitle: 'Field dwarfs, second season',
      fromPosition: 1,
      toPosition: 2,
      reason: 'Weaker plan',
      movedBy: 'Reviewer Ash',
      movedAt: '2027-02-02T10:00:00Z',
    },
  ],
  locked: false,
};

export const PRESSURE: CyclePressureReport = {
  cycleId: 7,
  cycleCode: '2027A',
  campaignStart: '2027-03-01',
  campaignEnd: '2027-04-29',
  proposalCount: 2,
  nodes: [{ nodeId: 1, nodeCode: 'KRG-50', requestedNodeHours: 80, availableNodeHours: 100, pressure: 0.8 }],
  raBins: Array.from({ length: 12 }, (_, bin) => ({
    bin,
    startHours: bin * 2,
    endHours: bin * 2 + 2,
    requestedNodeHours: bin === 0 ? 30 : 0,
    darkHours: bin === 0 ? 10 : 5,
    pressure: bin === 0 ? 3 : 0,
  })),
};
