import { targetInputSchema, targetUpdateSchema } from './target-schemas';

const valid = {
  name: 'Lantern 12',
  raDeg: 163.41,
  decDeg: 31.72,
  magnitude: 11.8,
  magnitudeBand: 'V',
  colour: 0.82,
  colourSystem: 'BPRP',
  ageMyr: 650,
};

const messages = (input: unknown) => {
  const result = targetInputSchema.safeParse(input);
  if (result.success) return {};
  const out: Record<string, string[]> = {};
  for (const issue of result.error.issues) (out[issue.path.join('.')] ??= []).push(issue.message);
  return out;
};

describe('targetInputSchema', () => {
  it('a valid row: optional fields default to empty', () => {
    const parsed = targetInputSchema.parse(valid);
    expect(parsed).toMatchObject({ reddeningEbv: null, periodDays: null, notes: '' });
  });

  it('every bad field at once, each with what was typed and one range notation', () => {
    expect(
      messages({
        ...valid,
        name: '  ',
        raDeg: 400,
        decDeg: -95,
        magnitude: 40,
        magnitudeBand: 'Q',
        colour: 'red',
        colourSystem: 'UBV',
        reddeningEbv: 5,
        ageMyr: 0,
        periodDays: 1200,
      }),
    ).toEqual({
      name: ['Give the target a name.'],
      raDeg: ['Enter a right ascension between 0° and 360°, 360° excluded (you typed 400).'],
      decDeg: ['Enter a declination between −90° and 90° (you typed −95).'],
      magnitude: ['Enter a magnitude between −2 and 22 mag (you typed 40).'],
      magnitudeBand: ['Choose the band of the magnitude: B, V, R, I, G (you typed Q).'],
      colour: ['Enter the colour index as a number (you typed red).'],
      colourSystem: ['Choose the colour system: BPRP for Gaia BP−RP or BV for B−V (you typed UBV).'],
      reddeningEbv: ['Enter an E(B−V) between 0 and 3 mag, or leave it empty (you typed 5).'],
      ageMyr: ['Enter an age above 0 Myr and at most 14000 Myr (you typed 0).'],
      periodDays: ['Enter a period between 0.05 and 1000 d, or leave it empty (you typed 1200).'],
    });
  });

  it('an empty required number asks for it; a negative one echoes a true minus sign', () => {
    expect(messages({ ...valid, magnitude: null, ageMyr: undefined })).toEqual({
      magnitude: ['Enter the magnitude.'],
      ageMyr: ['Enter the age.'],
    });
    expect(messages({ ...valid, ageUncertaintyMyr: -5 })).toEqual({
      ageUncertaintyMyr: ['Enter an age uncertainty of 0 Myr or more, or leave it empty (you typed −5).'],
    });
  });

  it('the typed value itself, never a rounded or converted one', () => {
    expect(messages({ ...valid, magnitude: 40.25327194 }).magnitude).toEqual([
      'Enter a magnitude between −2 and 22 mag (you typed 40.253272).',
    ]);
  });

  it('an uncertainty without a period is reported beside the other problems of the row', () => {
    expect(messages({ ...valid, magnitude: 30, periodUncertaintyDays: 0.3 })).toEqual({
      magnitude: ['Enter a magnitude between −2 and 22 mag (you typed 30).'],
      periodUncertaintyDays: ['Enter the period as well, or clear its uncertainty.'],
    });
  });

  it('over-long texts say the limit and the length', () => {
    expect(messages({ ...valid, name: 'x'.repeat(81), notes: 'y'.repeat(501) })).toEqual({
      name: ['Shorten the name to 80 characters at most (81 now).'],
      notes: ['Shorten the notes to 500 characters at most (501 now).'],
    });
  });

  it('targetUpdateSchema: the row’s problems keyed under target', () => {
    const result = targetUpdateSchema.safeParse({ version: 1, target: { ...valid, decDeg: 95 } });
    expect(result.success).toBe(false);
    expect(result.error!.issues.map((i) => i.path.join('.'))).toEqual(['target.decDeg']);
  });
});
