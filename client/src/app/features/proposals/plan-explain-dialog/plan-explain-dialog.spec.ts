import { explainRows } from './plan-explain-dialog';

describe('explainRows', () => {
  it('labels known quantities in the order of the computation, then the rest; money from minor units', () => {
    const rows = explainRows(
      {
        feeMinor: { value: 19400, unit: 'eur minor units', why: 'Node-hours times the rate.', source: 'rate card', tag: 'choice' },
        somethingNew: { value: 0.5, unit: '1', why: 'A later addition.', source: 'Spincycle', tag: 'choice' },
        periodDays: { value: 10.23456, unit: 'd', why: 'Expected period.', source: 'Barnes (2007), ApJ 669, 1167, eqs. 1–3', tag: 'paper' },
        baselineForPrecisionDays: { value: null, unit: 'd', why: 'No precision asked.', source: 'Spincycle', tag: 'choice' },
      },
      'en-US',
      'eur',
    );
    expect(rows.map((r) => r.label)).toEqual(['Expected rotation period', 'Baseline for the period precision', 'Fee', 'Something new']);
    expect(rows[0]).toEqual(expect.objectContaining({ value: '10.23', unit: 'd', tagLabel: 'from the paper' }));
    expect(rows[1].value).toBe('—');
    expect(rows[2]).toEqual(expect.objectContaining({ value: '€194.00', unit: '' }));
    expect(rows[3]).toEqual(expect.objectContaining({ unit: '', tagLabel: 'our choice' }));
  });
});
