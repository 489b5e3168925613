import { jsonWithRawMember } from './raw-json';

describe('jsonWithRawMember', () => {
  it('gives the same JSON as stringifying the whole object', () => {
    const rows = [
      { a: 1, b: 'x"y' },
      { a: 2, b: null },
    ];
    const text = jsonWithRawMember({ page: 1, run: { state: 'done' } }, 'plans', JSON.stringify(rows));
    expect(JSON.parse(text)).toEqual({ page: 1, run: { state: 'done' }, plans: rows });
  });

  it('adds the member to an empty object and refuses to shadow an existing one', () => {
    expect(JSON.parse(jsonWithRawMember({}, 'plans', '[]'))).toEqual({ plans: [] });
    expect(() => jsonWithRawMember({ plans: 1 }, 'plans', '[]')).toThrow(/already a member/);
  });
});
