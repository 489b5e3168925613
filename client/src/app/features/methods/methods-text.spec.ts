import { forReaders } from './methods-text';

describe('forReaders', () => {
  it('keeps the label of a quantity and drops its code key, also across a line break', () => {
    expect(forReaders('Quantities: **Visits** (`visits`), **Completeness delivered**\n(`completeness`).')).toBe(
      'Quantities: **Visits**, **Completeness delivered**.',
    );
  });

  it('leaves formulas in code spans alone', () => {
    expect(forReaders('`Pd = Q1(sqrt(λ), sqrt(2·z0))` with `z0 = (m/2)·Z0/(1 − Z0)`')).toBe(
      '`Pd = Q1(sqrt(λ), sqrt(2·z0))` with `z0 = (m/2)·Z0/(1 − Z0)`',
    );
  });
});
