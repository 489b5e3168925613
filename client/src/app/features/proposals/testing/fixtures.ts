/**
 * Invented data for the proposal feature's unit tests (imported by specs only; the
 * application never imports this file, so it stays out of the bundles).
 */
import type { CycleSummary } from '@spincycle/shared/facility/facility-types';
import type { TargetPlanRow } from '@spincycle/shared/proposals/plan-types';
import type { Proposal, ProposalMember, ProposalSummary } from '@spincycle/shared/proposals/proposal-schemas';
import type { TargetRow } from '@spincycle/shared/proposals/target-schemas';

export function testCycle(overrides: Partial<CycleSummary> = {}): CycleSummary {
  return {
    id: 11,
    code: '2027A',
    title: 'Lantern season',
    callOpensAt: '2026-11-01T12:00:00Z',
    callClosesAt: '2027-01-15T23:59:00Z',
    campaignStart: '2027-03-01',
    campaignEnd: '2027-08-31',
    anonymousReview: false,
    categories: ['Open clusters', 'Field stars'],
    version: 1,
    status: 'open',
    nodes: [
      { nodeId: 1, nodeCode: 'KRG-50', nodeHoursAvailable: 400 },
      { nodeId: 2, nodeCode: 'VHM-40', nodeHoursAvailable: 250 },
    ],
    ...overrides,
  };
}

export function testMember(id: number, overrides: Partial<ProposalMember> = {}): ProposalMember {
  return {
    id,
    accountId: id,
    email: `member${id}@example.org`,
    displayName: `Member ${id}`,
    role: 'coi',
    status: 'active',
    invitedAt: '2026-11-03T10:00:00Z',
    ...overrides,
  };
}

export function testProposal(overrides: Partial<Proposal> = {}): Proposal {
  return {
    id: 5,
    cycle: testCycle(),
    title: 'Spin-down of the Lantern cluster',
    abstract: 'Rotation periods of forty K dwarfs.',
    category: 'Open clusters',
    state: 'draft',
    version: 3,
    nodeIds: [1],
    completeness: 0.9,
    team: [testMember(1, { role: 'pi', displayName: 'Orla Venn', email: 'orla.venn@example.org' })],
    justification: null,
    targetCount: 2,
    request: [
      {
        nodeId: 1,
        nodeCode: 'KRG-50',
        nodeHours: 42.5,
        feeMinor: 206125,
        currency: 'eur',
        targets: 2,
        infeasibleTargets: 1,
        infeasibleNodeHours: 18.25,
      },
    ],
    myRole: 'pi',
    editable: true,
    submittedAt: null,
    createdAt: '2026-11-02T09:00:00Z',
    updatedAt: '2026-11-04T09:00:00Z',
    ...overrides,
  };
}

export function testSummary(id: number, overrides: Partial<ProposalSummary> = {}): ProposalSummary {
  return {
    id,
    cycleId: 11,
    cycleCode: '2027A',
    callClosesAt: '2027-01-15T23:59:00Z',
    title: `Proposal ${id}`,
    state: 'draft',
    piName: 'Orla Venn',
    myRole: 'pi',
    targetCount: 3,
    requestedNodeHours: 12.25,
    submittedAt: null,
    updatedAt: '2026-11-04T09:00:00Z',
    ...overrides,
  };
}

export function testTarget(id: number, overrides: Partial<TargetRow> = {}): TargetRow {
  return {
    id,
    position: id,
    version: 1,
    name: `Lantern ${id}`,
    raDeg: 56.75,
    decDeg: 24.1167,
    magnitude: 12.4,
    magnitudeBand: 'V',
    colour: 0.95,
    colourSystem: 'BV',
    reddeningEbv: 0.04,
    ageMyr: 650,
    ageUncertaintyMyr: 50,
    periodPrecisionDays: null,
    periodDays: null,
    periodUncertaintyDays: null,
    notes: '',
    ...overrides,
  };
}

export function testPlanRow(targetId: number, nodeId: number, overrides: Partial<TargetPlanRow> = {}): TargetPlanRow {
  return {
    targetId,
    targetName: `Lantern ${targetId}`,
    nodeId,
    nodeCode: nodeId === 1 ? 'KRG-50' : 'VHM-40',
    feasible: true,
    reasons: [],
    suggestions: [],
    skyVerdict: '112 of 184 nights can hold the 2 visits; longest gap 9 nights; cadence fits',
    periodDays: 10.2,
    shortestPeriodDays: 9.1,
    longestPeriodDays: 11.4,
    amplitudePpm: 4200,
    perVisitPrecisionPpm: 1500,
    exposureSeconds: 60,
    visits: 120,
    completeness: 0.91,
    visitsPerNight: 1,
    cadenceDays: 0.91,
    baselineDays: 34.2,
    usableNights: 112,
    nodeHours: 4,
    feeMinor: 19400,
    currency: 'eur',
    why: {
      periodDays: 'Expected period at this colour and age.',
      visits: 'The larger of the detection and cadence needs.',
    },
    flags: [],
    relationLabel: 'Barnes (2007)',
    ...overrides,
  };
}
