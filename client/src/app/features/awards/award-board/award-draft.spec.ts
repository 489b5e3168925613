import { ROW_AWARDED, ROW_UNDECIDED, testBoard } from '../testing/award-fixtures';
import { AwardDraft, draftFieldErrors, draftRequest, nodesLeft, sameTargets } from './award-draft';

const NODES = testBoard().nodes;

describe('AwardDraft', () => {
  it('starts from the stored decision, hours as text', () => {
    const draft = new AwardDraft(ROW_AWARDED);
    expect(draft.baseVersion).toBe(3);
    expect(draft.outcome()).toBe('awarded');
    expect([...draft.hours()]).toEqual([
      [1, '400'],
      [2, '500'],
    ]);
    expect(draft.state()).toBe('idle');
  });

  it('Awarded fills only empty fields, with the request', () => {
    const draft = new AwardDraft({ ...ROW_AWARDED, award: null });
    draft.setHours(2, '120');
    draft.chooseOutcome('awarded', { ...ROW_AWARDED, award: null }, NODES);
    expect(draft.hours().get(1)).toBe('400');
    expect(draft.hours().get(2)).toBe('120');
    expect(draft.state()).toBe('dirty');
  });

  it('a partial award still chosen fills in what its saved targets need', () => {
    const row = {
      ...ROW_UNDECIDED,
      requests: [{ nodeId: 1, requestedHours: 117.5, neededForAwardedTargets: 80 }],
      award: { ...ROW_AWARDED.award!, outcome: 'reserve' as const, nodes: [], targetIds: [101], version: 2 },
    };
    const draft = new AwardDraft(row);
    draft.chooseOutcome('awarded', row, NODES);
    expect(draft.hours().get(1)).toBe('80');
  });
});

describe('draftRequest', () => {
  it('not awarded sends no node and no targets, whatever was typed', () => {
    const draft = new AwardDraft(ROW_AWARDED);
    draft.setTargets([101]);
    draft.chooseOutcome('not_awarded', ROW_AWARDED, NODES);
    expect(draftRequest(draft, ROW_AWARDED, NODES).input).toEqual({
      version: 3,
      outcome: 'not_awarded',
      nodes: [],
      targetIds: null,
      overrideReason: null,
    });
  });

  it('reserve keeps its hours and targets, leaving out empty and zero fields', () => {
    const draft = new AwardDraft(ROW_AWARDED);
    draft.chooseOutcome('reserve', ROW_AWARDED, NODES);
    draft.setTargets([101]);
    draft.setHours(2, '0');
    expect(draftRequest(draft, ROW_AWARDED, NODES).input).toMatchObject({ nodes: [{ nodeId: 1, nodeHours: 400 }], targetIds: [101] });
  });

  it('refuses a missing outcome, an award without hours and text that is not a number', () => {
    const draft = new AwardDraft(ROW_UNDECIDED);
    expect(draftRequest(draft, ROW_UNDECIDED, NODES).errors).toEqual({ outcome: 'Choose an outcome first.' });
    draft.outcome.set('awarded');
    expect(draftRequest(draft, ROW_UNDECIDED, NODES).errors).toEqual({ outcome: 'An award needs node-hours on at least one node.' });
    draft.setHours(1, 'ten');
    expect(draftRequest(draft, ROW_UNDECIDED, NODES).errors).toEqual({ 'node:1': 'Enter node-hours as a number, or leave it empty.' });
    draft.setHours(1, '200000');
    expect(draftRequest(draft, ROW_UNDECIDED, NODES).errors?.['node:1']).toContain('at most 100,000');
  });
});

describe('nodesLeft', () => {
  it('an award counts; a reserve as if promoted; no outcome takes nothing', () => {
    const draft = new AwardDraft(ROW_UNDECIDED);
    // Worked by hand: KRG-50 has 220 remaining.
    expect(nodesLeft(draft, ROW_UNDECIDED, NODES)).toEqual([{ nodeId: 1, code: 'KRG-50', offeredHours: 620, leftHours: 220 }]);
    draft.chooseOutcome('reserve', ROW_UNDECIDED, NODES);
    draft.setHours(1, '20');
    expect(nodesLeft(draft, ROW_UNDECIDED, NODES)[0].leftHours).toBe(200);
    draft.chooseOutcome('awarded', ROW_UNDECIDED, NODES);
    expect(nodesLeft(draft, ROW_UNDECIDED, NODES)[0].leftHours).toBe(200);
  });

  it('not awarded gives back what the stored award held', () => {
    const draft = new AwardDraft(ROW_AWARDED);
    draft.chooseOutcome('not_awarded', ROW_AWARDED, NODES);
    // Worked by hand: 220 + 400 on KRG-50, −20 + 500 on VHM-40.
    expect(nodesLeft(draft, ROW_AWARDED, NODES).map((n) => n.leftHours)).toEqual([620, 480]);
  });
});

describe('draftFieldErrors', () => {
  it('maps nodes.<i> to the node sent at that place, other fields by name', () => {
    const sent = {
      version: 0,
      outcome: 'awarded' as const,
      nodes: [
        { nodeId: 2, nodeHours: 5 },
        { nodeId: 1, nodeHours: 7 },
      ],
      targetIds: [9],
      overrideReason: null,
    };
    expect(
      draftFieldErrors({ 'nodes.1.nodeHours': ['too many'], targetIds: ['not a target of the proposal'], version: ['stale'] }, sent),
    ).toEqual({ 'node:1': 'too many', targetIds: 'not a target of the proposal', row: 'stale' });
  });
});

describe('sameTargets', () => {
  it('null only equals null; lists compare as sets', () => {
    expect(sameTargets(null, null)).toBe(true);
    expect(sameTargets(null, [])).toBe(false);
    expect(sameTargets([1, 2], [2, 1])).toBe(true);
    expect(sameTargets([1, 2], [1, 3])).toBe(false);
  });
});
