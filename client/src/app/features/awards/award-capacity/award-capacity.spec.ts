import { niceStep } from './award-capacity';

describe('niceStep', () => {
  it('a round step of 1, 2, 2.5 or 5 × 10^k for about four intervals (common practice, no source)', () => {
    // Worked by hand: 620 / 4 = 155, and the first of 100, 200, 250, 500 at or past it is 200.
    expect(niceStep(620)).toBe(200);
    expect(niceStep(100)).toBe(25);
    expect(niceStep(3)).toBe(1);
    expect(niceStep(0)).toBe(1);
  });
});
