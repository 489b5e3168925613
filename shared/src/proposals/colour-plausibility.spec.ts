import { sequenceRange } from '../science/colour-sequence';
import { colourPlausibilityWarning, plausibleColourRange } from './colour-plausibility';

describe('colourPlausibilityWarning', () => {
  it('takes its spans from the science core’s dwarf sequence', () => {
    expect(plausibleColourRange('BV')).toEqual(sequenceRange('BV'));
    expect(plausibleColourRange('BPRP')).toEqual(sequenceRange('BPRP'));
    // Reddening moves the span redward by E(system) = ratio · E(B−V).
    expect(plausibleColourRange('BPRP', 0.1).min).toBeCloseTo(sequenceRange('BPRP').min + 0.1339, 6);
  });

  it('a plausible colour in its system: no warning', () => {
    expect(colourPlausibilityWarning(1.2, 'BPRP')).toBeNull();
    expect(colourPlausibilityWarning(1.2, 'BV')).toBeNull();
    expect(colourPlausibilityWarning(null, 'BV')).toBeNull();
  });

  it('a B−V above the M5 dwarfs that is a plausible BP−RP: says to check the system', () => {
    expect(colourPlausibilityWarning(2.5, 'BV')).toBe(
      'A B−V of 2.5 mag is outside the F5V–M5V dwarfs (between 0.44 and 1.83 mag), but a plausible BP−RP: check the colour system.',
    );
  });

  it('a BP−RP bluer than an F5 dwarf, implausible in both systems: says to check the value', () => {
    expect(colourPlausibilityWarning(0.2, 'BPRP')).toBe(
      'A BP−RP of 0.2 mag is outside the F5V–M5V dwarfs (between 0.59 and 3.35 mag): check the value.',
    );
  });

  it('a reddened colour is judged against the reddened span', () => {
    expect(colourPlausibilityWarning(1.9, 'BV')).not.toBeNull();
    expect(colourPlausibilityWarning(1.9, 'BV', 0.2)).toBeNull();
  });
});
