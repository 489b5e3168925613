import type { ImpliedAge } from '../../photometry/photometry';
import { fitClusterAge } from './cluster-age';
import { expectedPeriodFor, impliedAge } from './implied-age';

const age = (ageMyr: number | null, lowMyr: number | null, highMyr: number | null): ImpliedAge => ({
  relation: 'angus2019',
  relationLabel: 'Angus et al. (2019)',
  source: 'Angus et al. (2019), AJ 158, 173',
  ageMyr,
  lowMyr,
  highMyr,
  flags: ageMyr === null ? [{ code: 'noGyroAge', severity: 'blocking', message: 'no gyrochronological age: too blue' }] : [],
});

describe('fitClusterAge', () => {
  it('fits three measured members as worked by hand, leaving out tentative and age-less ones', () => {
    // Worked by hand in this test: σ of ln t = ln(high/low)/2 = ln(1.5625)/2 = 0.2231436 for all three;
    // equal weights → mean ln t = (ln 500 + ln 600 + ln 800)/3 = 6.4320498 → 621.4465 Myr;
    // χ² = Σ((ln t − μ)/σ)² = 2.2553721, reduced (÷2) 1.1276861 > 1 → σ = 0.2231436/√3 × √1.1276861
    // = 0.1368100 → 621.4465·e^∓0.1368100 = 541.9858 … 712.5569 Myr.
    const fit = fitClusterAge([
      { targetName: 'Star C-1', verdict: 'measured', age: age(500, 400, 625) },
      { targetName: 'Star C-2', verdict: 'measured', age: age(600, 480, 750) },
      { targetName: 'Star C-3', verdict: 'measured', age: age(800, 640, 1000) },
      { targetName: 'Star C-4', verdict: 'tentative', age: age(300, 200, 400) },
      { targetName: 'Star C-5', verdict: 'measured', age: age(null, null, null) },
      { targetName: 'Star C-6', verdict: 'not_detected', age: null },
    ])!;
    expect(fit.ageMyr).toBeCloseTo(621.4465, 3);
    expect(fit.reducedChiSquare!).toBeCloseTo(1.1276861, 6);
    expect(fit.lowMyr).toBeCloseTo(541.9858, 3);
    expect(fit.highMyr).toBeCloseTo(712.5569, 3);
    expect(fit.members).toBe(3);
    expect(fit.excluded).toEqual([
      { targetName: 'Star C-4', reason: 'its period is only tentative' },
      { targetName: 'Star C-5', reason: 'no gyrochronological age: too blue' },
      { targetName: 'Star C-6', reason: 'no period was detected' },
    ]);
    expect(fit.relation).toBe('angus2019');
    expect(fit.method).toMatch(/Weighted mean of the logarithm/);
  });

  it('does not shrink the uncertainty when members agree better than their errors (reduced χ² < 1)', () => {
    // Worked by hand: two members at 600 Myr, σ ln t = 0.2231436 each → σ = 0.2231436/√2 = 0.1577867.
    const fit = fitClusterAge([
      { targetName: 'Star C-1', verdict: 'measured', age: age(600, 480, 750) },
      { targetName: 'Star C-2', verdict: 'measured', age: age(600, 480, 750) },
    ])!;
    expect(fit.reducedChiSquare!).toBeCloseTo(0, 20);
    expect(Math.log(fit.highMyr / fit.ageMyr)).toBeCloseTo(0.1577867, 6);
  });

  it('needs two measured members', () => {
    expect(fitClusterAge([{ targetName: 'Star C-1', verdict: 'measured', age: age(600, 480, 750) }])).toBeNull();
  });
});

describe('implied age and expected period', () => {
  it('gives the expected period through the relation (SCIENCE.md §8 check 1: Barnes 2007, B−V 0.642, 4566 Myr → 26.09 d)', () => {
    const e = expectedPeriodFor({ colour: { value: 0.642, system: 'BV' }, relation: 'barnes2007' }, 4566, null)!;
    expect(e.periodDays).toBeCloseTo(26.09, 2);
    expect(e.lowDays).toBeLessThan(26.09);
    expect(e.highDays).toBeGreaterThan(26.09);
    expect(e.from).toBe('Barnes (2007) at 4566 Myr');
  });

  it('has no expected period where the relation gives none (too blue for Barnes 2007)', () => {
    expect(expectedPeriodFor({ colour: { value: 0.42, system: 'BV' }, relation: 'barnes2007' }, 600, 100)).toBeNull();
  });

  it('gives the age of SCIENCE.md §8 check 5 (Barnes 2007, P 26.09 d, B−V 0.642 → 4565 Myr)', () => {
    const a = impliedAge({ colour: { value: 0.642, system: 'BV' }, relation: 'barnes2007' }, 26.09, 0.3, 'measured', false)!;
    expect(a.ageMyr!).toBeCloseTo(4565, -1);
    expect(a.lowMyr!).toBeLessThan(4565);
  });

  it('flags a fully convective star (mass ≤ 0.35 M☉ on the dwarf sequence) and gives no age on the uncalibrated branch', () => {
    // Dwarf sequence (SCIENCE.md §4): BP−RP 2.9 lies between M3V (2.50, 0.36 M☉) and M4V (2.94, 0.24 M☉).
    const a = impliedAge({ colour: { value: 2.9, system: 'BPRP' }, relation: 'angus2019' }, 40, 1, 'measured', false)!;
    expect(a.flags.map((f) => f.code)).toContain('fullyConvective');
    expect(a.ageMyr).toBeNull();
  });

  it('adds cautions for a tentative or possibly aliased period, and has no age when not detected', () => {
    const star = { colour: { value: 0.8, system: 'BV' as const }, relation: 'barnes2007' as const };
    const a = impliedAge(star, 12, 0.5, 'tentative', true)!;
    expect(a.flags.map((f) => f.code)).toEqual(expect.arrayContaining(['tentativePeriod', 'possibleAlias']));
    expect(impliedAge(star, 12, 0.5, 'not_detected', false)).toBeNull();
  });

  it('gives a blocking flag instead of throwing for a colour outside every relation', () => {
    const a = impliedAge({ colour: { value: 0.3, system: 'BV' }, relation: 'barnes2007' }, 12, 0.5, 'measured', false)!;
    expect(a.ageMyr).toBeNull();
    expect(a.flags[0]).toMatchObject({ code: 'noGyroAge', severity: 'blocking' });
  });
});
