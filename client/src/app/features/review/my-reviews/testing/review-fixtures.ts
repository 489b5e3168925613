import type { MyReviewRow, MyReviews, ReviewProposal } from '@spincycle/shared/review/reviewing';
import { assessProposal } from '@spincycle/shared/review/technical-assessment';

/** One row of the grading table (invented proposal). */
export function reviewRow(overrides: Partial<MyReviewRow> = {}): MyReviewRow {
  return {
    proposalId: 41,
    title: 'Spin-down in an invented cluster',
    category: 'Open clusters',
    abstractShort: 'We measure rotation periods.',
    cycleId: 3,
    cycleCode: '2027A',
    reviewDeadline: '2027-03-01T12:00:00Z',
    locked: false,
    lockedBecause: null,
    grade: null,
    strengths: '',
    weaknesses: '',
    committeeNote: '',
    savedAt: null,
    submittedAt: null,
    version: 1,
    assessment: {
      targetCount: 4,
      feasibleTargets: 3,
      feasibleShare: 0.75,
      requestedNodeHours: 40,
      neededNodeHours: 30,
      targetsAtRisk: 1,
      line: '3 of 4 targets feasible; 30 of 40 node-hours needed; 1 target at risk',
    },
    team: null,
    ...overrides,
  };
}

/** Three rows of one cycle: ungraded, graded, and a locked (submitted) one of another cycle. */
export const MY_REVIEWS: MyReviews = {
  cycles: [
    {
      id: 3,
      code: '2027A',
      title: 'Lantern season',
      reviewDeadline: '2027-03-01T12:00:00Z',
      anonymousReview: true,
      assigned: 2,
      graded: 1,
      submitted: 0,
    },
    {
      id: 2,
      code: '2026B',
      title: 'Ember season',
      reviewDeadline: '2026-09-01T12:00:00Z',
      anonymousReview: false,
      assigned: 1,
      graded: 1,
      submitted: 1,
    },
  ],
  reviews: [
    reviewRow(),
    reviewRow({
      proposalId: 42,
      title: 'Flares of slow rotators',
      category: 'Field stars',
      grade: 6.5,
      version: 3,
      savedAt: '2027-01-20T10:00:00Z',
    }),
    reviewRow({
      proposalId: 17,
      title: 'Older submitted proposal',
      cycleId: 2,
      cycleCode: '2026B',
      grade: 8,
      locked: true,
      lockedBecause: 'submitted',
      submittedAt: '2026-08-30T10:00:00Z',
      team: { piName: 'Ilsabet Morrow-Fane', affiliations: ['Hollowcrest Observatory'] },
    }),
  ],
};

/** The reading page's answer for proposal 41 (one target at risk). */
export function reviewProposal(overrides: Partial<ReviewProposal> = {}): ReviewProposal {
  const assessment = assessProposal({
    targets: [
      { id: 1, name: 'Star A' },
      { id: 2, name: 'Star B' },
    ],
    plans: [
      {
        targetId: 1,
        nodeId: 5,
        nodeCode: 'N1',
        feasible: true,
        nodeHours: 12.5,
        amplitudePpm: 3000,
        perVisitPrecisionPpm: 1000,
        longestPeriodDays: 12,
        baselineDays: 40,
        cadenceDays: 1,
        usableNights: 50,
        completeness: 0.9,
        flagCodes: [],
        reasons: [],
      },
    ],
    campaignDays: 60,
    completenessGoal: 0.9,
  });
  return {
    review: reviewRow(),
    abstract: 'We measure rotation periods of invented stars.',
    completenessGoal: 0.9,
    nodes: [{ id: 5, code: 'N1', name: 'Node one' }],
    targets: [
      {
        id: 1,
        name: 'Star A',
        raDeg: 10,
        decDeg: 20,
        magnitude: 12,
        magnitudeBand: 'V',
        colour: 1.2,
        colourSystem: 'BPRP',
        reddeningEbv: null,
        ageMyr: 650,
        ageUncertaintyMyr: 60,
        plans: [
          {
            nodeId: 5,
            nodeCode: 'N1',
            feasible: true,
            reasons: [],
            skyVerdict: 'fits',
            periodDays: 8,
            amplitudePpm: 3000,
            perVisitPrecisionPpm: 1000,
            visits: 80,
            visitsPerNight: 2,
            cadenceDays: 1,
            baselineDays: 40,
            nodeHours: 12.5,
            completeness: 0.9,
          },
        ],
      },
      {
        id: 2,
        name: 'Star B',
        raDeg: 11,
        decDeg: 21,
        magnitude: 13,
        magnitudeBand: 'V',
        colour: 1.6,
        colourSystem: 'BPRP',
        reddeningEbv: null,
        ageMyr: 650,
        ageUncertaintyMyr: 60,
        plans: [],
      },
    ],
    assessment,
    justificationUrl: '/api/review/my/41/justification',
    team: null,
    ...overrides,
  };
}
