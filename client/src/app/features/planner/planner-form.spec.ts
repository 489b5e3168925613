import { controlForScienceField, controlForSkyField, createPlannerForm, missingFields, sentence, toPlanInput } from './planner-form';

describe('planner-form', () => {
  it('defaults: nothing missing, automatic exposure, the core’s default relation', () => {
    const value = createPlannerForm().getRawValue();
    expect(missingFields(value)).toEqual({});
    const { target, options } = toPlanInput(value);
    expect(options).toEqual({ falseAlarmProbability: 0.01, completeness: 0.9 });
    expect(target.periodDays).toBeUndefined();
    expect(target).toMatchObject({ colour: { value: 1.1, system: 'BPRP' }, ageMyr: 800, ageUncertaintyMyr: 100 });
    expect(target.reddeningEbvMag).toBeUndefined();
  });

  it('a fixed exposure and a chosen relation go into the options', () => {
    const form = createPlannerForm();
    form.patchValue({ exposureMode: 'fixed', exposureSeconds: 45, relation: 'barnes2007', reddeningEbv: 0.05 });
    const { target, options } = toPlanInput(form.getRawValue());
    expect(options).toEqual({ falseAlarmProbability: 0.01, completeness: 0.9, exposureSeconds: 45, relation: 'barnes2007' });
    expect(target.reddeningEbvMag).toBe(0.05);
  });

  it('completeness: the percent field goes into options.completeness as a fraction', () => {
    const form = createPlannerForm();
    expect(form.controls.completenessPercent.value).toBe(90);
    form.patchValue({ completenessPercent: 99 });
    expect(missingFields(form.getRawValue())).toEqual({});
    expect(toPlanInput(form.getRawValue()).options.completeness).toBe(0.99);
    form.patchValue({ completenessPercent: 50 });
    expect(toPlanInput(form.getRawValue()).options.completeness).toBe(0.5);
  });

  it.each([30, 49, 99.5, 100])('completeness: %p %% is refused with the range in percent', (percent) => {
    const form = createPlannerForm();
    form.patchValue({ completenessPercent: percent });
    expect(missingFields(form.getRawValue())).toEqual({
      completenessPercent: `Enter a completeness between 50 % and 99 % (got ${percent} %)`,
    });
  });

  it('completeness: an empty field asks for it', () => {
    const form = createPlannerForm();
    form.patchValue({ completenessPercent: null });
    expect(missingFields(form.getRawValue()).completenessPercent).toBe('Enter a completeness between 50 % and 99 %');
  });

  it('the proposer’s period and its uncertainty go into the target; an uncertainty alone is refused', () => {
    const form = createPlannerForm();
    form.patchValue({ periodDays: 30, periodUncertaintyDays: 2 });
    expect(toPlanInput(form.getRawValue()).target).toMatchObject({ periodDays: 30, periodUncertaintyDays: 2 });
    form.patchValue({ periodDays: null });
    expect(Object.keys(missingFields(form.getRawValue()))).toEqual(['periodDays']);
  });

  it('missing numbers are named per field', () => {
    const form = createPlannerForm();
    form.patchValue({ ageMyr: null, exposureMode: 'fixed', exposureSeconds: null });
    expect(Object.keys(missingFields(form.getRawValue())).sort()).toEqual(['ageMyr', 'exposureSeconds']);
  });

  it.each([
    ['target.colour.value', 'colourValue'],
    ['target.colour.system', 'colourSystem'],
    ['target.ageMyr', 'ageMyr'],
    ['target.ageUncertaintyMyr', 'ageUncertaintyMyr'],
    ['target.magnitude', 'magnitude'],
    ['target.magnitude.value', 'magnitude'],
    ['target.reddeningEbvMag', 'reddeningEbv'],
    ['options.exposureSeconds', 'exposureSeconds'],
    ['options.falseAlarmProbability', 'falseAlarmProbability'],
    ['options.completeness', 'completenessPercent'],
    ['target.periodDays', 'periodDays'],
    ['target.periodUncertaintyDays', 'periodUncertaintyDays'],
    ['node.saturationE', 'nodeId'],
    ['options.samplesPerCycle', null],
  ])('science field %s → control %s', (field, control) => {
    expect(controlForScienceField(field)).toBe(control);
  });

  it('sky-window field errors map to RA, Dec and cycle', () => {
    expect(controlForSkyField('targets.0.ra')).toBe('ra');
    expect(controlForSkyField('targets.0.dec')).toBe('dec');
    expect(controlForSkyField('cycleId')).toBe('cycleId');
    expect(controlForSkyField('includeNights')).toBeNull();
  });

  it('sentence: capital first letter and a full stop', () => {
    expect(sentence('must be positive (got -5)')).toBe('Must be positive (got -5).');
    expect(sentence('Already a sentence.')).toBe('Already a sentence.');
  });
});
