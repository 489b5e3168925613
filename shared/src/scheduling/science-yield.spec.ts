import { TYPICAL_NODE, TYPICAL_SITE } from '../cli/typical-node';
import { computeTargetPlan } from '../science/target-plan';
import { scienceYield } from './science-yield';

const plan = computeTargetPlan(
  { name: 'K, 1 Gyr', colour: { value: 1.1, system: 'BPRP' }, ageMyr: 1000, ageUncertaintyMyr: 120, magnitude: { value: 12, band: 'V' } },
  TYPICAL_NODE,
  TYPICAL_SITE,
);

/** Three visits a night, 1.5 h apart around the middle of the night, every night for `nights` nights. */
const everyNight = (nights: number) => Array.from({ length: nights * 3 }, (_, i) => Math.floor(i / 3) + ((i % 3) - 1) * (1.5 / 24));

describe('scienceYield (injection–recovery on planned visit times)', () => {
  it('a well-sampled sinusoid well above the noise is recovered in every trial (worked by hand in this test)', () => {
    // 90 nights × 3 visits against a period of about ten days: many cycles, dense phase coverage; a 2 %
    // semi-amplitude stands far above the per-visit precision, so every trial must find it.
    expect(plan.quantities.periodDays.value).toBeGreaterThan(3);
    const y = scienceYield(plan, everyNight(90), { trials: 20, seed: 7, weatherLossFraction: 0.3, semiAmplitudePpm: 20_000 });
    expect(y).toMatchObject({ trials: 20, recovered: 20, fraction: 1, visitNights: 90, visits: 270 });
    expect(y.explanation).toContain('20 (100 %)');
  });

  it('pure noise is almost never taken for the period (a 1 % false-alarm level and a 10 % window: common practice, no source)', () => {
    const y = scienceYield(plan, everyNight(90), { trials: 60, seed: 11, weatherLossFraction: 0.2, semiAmplitudePpm: 0 });
    expect(y.recovered).toBeLessThanOrEqual(2);
  });

  it('never drops the nights already observed for weather; the nights still to come are', () => {
    const times = everyNight(90);
    const options = { trials: 20, seed: 5, weatherLossFraction: 0.97, semiAmplitudePpm: 20_000 };
    // With 97 % of nights lost, about 3 of 90 nights remain: too few for the period in most trials.
    expect(scienceYield(plan, times, options).recovered).toBeLessThan(10);
    const observed = scienceYield(plan, times, { ...options, observedTimesDays: times });
    expect(observed.recovered).toBe(20);
    expect(observed.explanation).toContain('not the 90 already observed');
  });

  it('is reproducible with a seed', () => {
    const options = { trials: 15, seed: 20261203, weatherLossFraction: 0.25 };
    const times = everyNight(40).filter((_, i) => i % 2 === 0);
    expect(scienceYield(plan, times, options)).toEqual(scienceYield(plan, times, options));
  });

  it('says so when nothing is planned', () => {
    expect(scienceYield(plan, [], { trials: 10, seed: 1, weatherLossFraction: 0.2 })).toMatchObject({ fraction: null, trials: 0 });
  });
});
