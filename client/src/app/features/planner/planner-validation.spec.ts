import { createPlannerForm, type PlannerValue } from './planner-form';
import { between, colourSystemWarning, scienceErrorMessage, validatePlannerValue, validateRaDec } from './planner-validation';

const NODE = { code: 'N1', minExposureSeconds: 2, maxExposureSeconds: 300 };
const value = (over: Partial<PlannerValue> = {}): PlannerValue => ({ ...createPlannerForm().getRawValue(), nodeId: 1, ...over });

describe('planner-validation', () => {
  it('the defaults are valid', () => {
    expect(validatePlannerValue(value(), NODE)).toEqual({});
  });

  it('every bad field at once, each with the value the user typed and one range notation', () => {
    const errors = validatePlannerValue(
      value({
        colourValue: 5,
        ageMyr: -5,
        magnitude: 30,
        completenessPercent: 30,
        falseAlarmProbability: 0.7,
        reddeningEbv: 4,
        exposureMode: 'fixed',
        exposureSeconds: 1000,
      }),
      NODE,
    );
    expect(errors).toEqual({
      colourValue: 'Enter a BP−RP colour between 0.56 and 3.35 mag (you typed 5).',
      reddeningEbv: 'Enter an E(B−V) between 0 and 3 mag, or leave it empty (you typed 4).',
      ageMyr: 'Enter an age above 0 Myr (you typed -5).',
      magnitude: 'Enter a magnitude between −2 and 25 mag (you typed 30).',
      exposureSeconds: 'Enter an exposure between 2 and 300 s on N1 (you typed 1000).',
      falseAlarmProbability: 'Enter a false-alarm probability between 0 and 0.5, both excluded (you typed 0.7).',
      completenessPercent: 'Enter a completeness between 50 and 99 % (you typed 30).',
    });
  });

  it('the colour range follows the typed reddening, and the typed colour is reported, not the de-reddened one', () => {
    const errors = validatePlannerValue(value({ colourValue: 4, reddeningEbv: 0.2 }), NODE);
    expect(errors.colourValue).toBe('Enter a BP−RP colour between 0.83 and 3.62 mag with E(B−V) = 0.2 (you typed 4).');
  });

  it('missing numbers are asked for', () => {
    const errors = validatePlannerValue(
      value({ colourValue: null, ageMyr: null, magnitude: null, falseAlarmProbability: null, completenessPercent: null }),
      NODE,
    );
    expect(Object.keys(errors).sort()).toEqual(['ageMyr', 'colourValue', 'completenessPercent', 'falseAlarmProbability', 'magnitude']);
    expect(errors.colourValue).toBe('Enter the BP−RP colour.');
  });

  it('the colour system: a B−V that reads as a BP−RP is flagged beside the system', () => {
    expect(colourSystemWarning(value({ colourSystem: 'BV', colourValue: 2.5 }))).toBe(
      'A B−V of 2.5 mag is outside the F5V–M5V dwarfs (between 0.44 and 1.83 mag), but a plausible BP−RP: check the colour system.',
    );
    expect(colourSystemWarning(value({ colourSystem: 'BPRP', colourValue: 1.1 }))).toBeNull();
    expect(colourSystemWarning(value({ colourSystem: 'BPRP', colourValue: 9 }))).toBeNull();
  });

  it('RA and Dec are checked each on its own, both errors at once, in the range notation', () => {
    expect(validateRaDec('25h', '95.2')).toEqual({
      ra: 'Enter a right ascension between 0 and 24 h (or between 0° and 360°) (you typed 25h).',
      dec: 'Enter a declination between −90° and 90° (you typed 95.2).',
    });
    expect(validateRaDec('10:52:48', '')).toEqual({ dec: 'Enter the declination as well.' });
    expect(validateRaDec('', '')).toEqual({});
  });

  it('a range error of the science core is said without passing its converted value off as typed', () => {
    expect(scienceErrorMessage('must be between −2 and 25 (got 25.3)')).toBe(
      'Enter a value between −2 and 25; after conversion the plan got 25.3.',
    );
    expect(scienceErrorMessage('must be positive (got -5)')).toBe('Must be positive (got -5).');
    expect(between(-2, 25, 'mag')).toBe('between −2 and 25 mag');
  });
});
