import { sortRows } from './sort-rows';

interface Row {
  code: string;
  rate: number | null;
}
const rows: Row[] = [
  { code: 'N10', rate: 900 },
  { code: 'N2', rate: null },
  { code: 'N1', rate: 12000 },
];
const valueOf = (row: Row, column: string) => (column === 'code' ? row.code : row.rate);

describe('sortRows', () => {
  it('numbers compare numerically, empty values last, in both directions', () => {
    expect(sortRows(rows, { active: 'rate', direction: 'asc' }, valueOf).map((r) => r.code)).toEqual(['N10', 'N1', 'N2']);
    expect(sortRows(rows, { active: 'rate', direction: 'desc' }, valueOf).map((r) => r.code)).toEqual(['N1', 'N10', 'N2']);
  });

  it('text uses numeric collation (N2 before N10)', () => {
    expect(sortRows(rows, { active: 'code', direction: 'asc' }, valueOf).map((r) => r.code)).toEqual(['N1', 'N2', 'N10']);
  });

  it('no direction: a copy in the original order', () => {
    const result = sortRows(rows, { active: 'code', direction: '' }, valueOf);
    expect(result).toEqual(rows);
    expect(result).not.toBe(rows);
  });
});
