import { auditActionText, auditValueText } from './audit-wording';

const CODES = new Map([
  [1, 'KRG-50'],
  [2, 'VHM-40'],
]);

describe('auditActionText', () => {
  it('known actions by what they changed; others written out from their key', () => {
    expect(auditActionText({ entity: 'award', action: 'decided' })).toBe('Decided');
    expect(auditActionText({ entity: 'award', action: 'released' })).toBe('Released to the team');
    expect(auditActionText({ entity: 'program', action: 'created' })).toBe('Created the program');
    expect(auditActionText({ entity: 'release', action: 'released' })).toBe('Released the decisions');
    expect(auditActionText({ entity: 'award', action: 'mail_resent' })).toBe('Mail resent');
  });
});

describe('auditValueText', () => {
  it('a decision: its outcome, hours per node by code and a partial award', () => {
    expect(auditValueText({ outcome: 'awarded', nodes: [{ nodeId: 2, nodeHours: 12.25 }], targetIds: [4] }, CODES, 'en-GB')).toBe(
      'Awarded: 12.25 h on VHM-40 (1 target only)',
    );
    expect(auditValueText({ outcome: 'not_awarded', nodes: [], targetIds: null }, CODES, 'en-GB')).toBe('Not awarded');
  });

  it('a proposal state and its program, the counts of a release', () => {
    expect(auditValueText({ proposalState: 'ranked' }, CODES, 'en-GB')).toBe('Proposal ranked');
    expect(auditValueText({ proposalState: 'awarded', program: 'scheduled' }, CODES, 'en-GB')).toBe('Proposal awarded; program scheduled');
    expect(auditValueText({ state: 'scheduled', proposalState: 'awarded' }, CODES, 'en-GB')).toBe('Program scheduled');
    expect(auditValueText({ awarded: 2, reserve: 1, notAwarded: 0, programsCreated: 2 }, CODES, 'en-GB')).toBe(
      '2 awarded, 1 on reserve, 0 not awarded; 2 programs created',
    );
  });

  it('a program state, other counts, nothing', () => {
    expect(auditValueText({ state: 'observing' }, CODES, 'en-GB')).toBe('Program observing');
    expect(auditValueText({ mailed: 3, mailFailures: 1 }, CODES, 'en-GB')).toBe('Mailed 3; mail failures 1');
    expect(auditValueText(null, CODES, 'en-GB')).toBe('nothing');
    expect(auditValueText('scheduled', CODES, 'en-GB')).toBe('Scheduled');
  });
});
