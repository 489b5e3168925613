import { MAX_RATE_MINOR_PER_HOUR, nodeUpdateSchema } from './node-schemas';

describe('nodeUpdateSchema', () => {
  it('takes a whole rate in minor units, 0 and the column maximum included, and null to clear it', () => {
    for (const value of [0, 7760, MAX_RATE_MINOR_PER_HOUR, null]) {
      expect(nodeUpdateSchema.parse({ externalRateMinorPerHour: value })).toEqual({ externalRateMinorPerHour: value });
    }
  });

  it.each([
    ['a fraction of a cent', 77.6],
    ['a negative rate', -5],
    ['a number as text', '7760'],
    ['one past the integer column', MAX_RATE_MINOR_PER_HOUR + 1],
    ['not a number at all', Number.NaN],
  ])('refuses %s on the field externalRateMinorPerHour', (_what, value) => {
    const result = nodeUpdateSchema.safeParse({ externalRateMinorPerHour: value });
    expect(result.success).toBe(false);
    expect(result.error?.issues.map((i) => i.path)).toEqual([['externalRateMinorPerHour']]);
  });

  it('refuses an empty change and a field it does not change (the academic rate), naming the fields', () => {
    expect(nodeUpdateSchema.safeParse({}).error?.issues[0].message).toContain('externalRateMinorPerHour');
    expect(nodeUpdateSchema.safeParse({ externalRateMinorPerHour: 1, rateMinorPerHour: 1 }).error?.issues[0].message).toContain(
      'rateMinorPerHour',
    );
  });
});
