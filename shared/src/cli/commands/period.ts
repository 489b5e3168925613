/** `spincycle period`: rotation period from colour and age by a gyrochronology relation. */
import { predictPeriod, type GyroRelationId, type PeriodPrediction, type TurnoverScale } from '../../science/index';
import { defaultRelationFor } from '../../science/target-plan';
import { type CliCommand, COLOUR_OPTIONS, colourOption, numberOption, parseCommandArgs, relationOption } from '../cli-command';

const usage = `Usage: spincycle period (--bv X | --bprp X) --age MYR [options]

Rotation period from colour and age, with its range and flags.

Options:
  --bv X              observed B−V colour, mag
  --bprp X            observed Gaia BP−RP colour, mag
  --ebv X             reddening E(B−V), mag (default 0)
  --age MYR           age, Myr
  --age-error MYR     1σ age uncertainty, Myr (default 0)
  --relation NAME     barnes2007 | mh2008 | angus2015 | angus2019
                      (default angus2019 for --bprp, barnes2007 for --bv)
  --sigma K           width of the period range in σ (default 1)
  --tau-scale NAME    τ scale of the Rossby number: noyes1984 (default) | cranmerSaar2011 |
                      wright2011 | wright2018
  -h, --help          this text

When the relation has no period for the star (colour outside its calibration, above the
Kraft break, age above the age of the universe…), "periodDays" is null, "reason" says why,
and the range is left out; the exit code stays 0.

Example:
  spincycle period --bv 0.642 --age 4566 --age-error 500 --relation barnes2007
`;

export const command: CliCommand = {
  name: 'period',
  summary: 'rotation period (and range) from colour and age',
  usage,
  async run(argv) {
    const { values } = parseCommandArgs(argv, {
      ...COLOUR_OPTIONS,
      age: { type: 'string' },
      'age-error': { type: 'string' },
      sigma: { type: 'string' },
      'tau-scale': { type: 'string' },
    });
    const colour = colourOption(values);
    return withoutHiddenPeriod(
      predictPeriod({
        relation: (relationOption(values.relation) ?? defaultRelationFor(colour.system)) as GyroRelationId,
        colour,
        reddeningEbvMag: numberOption(values.ebv, 'ebv', 'reddeningEbvMag'),
        ageMyr: numberOption(values.age, 'age', 'ageMyr', true) as number,
        ageUncertaintyMyr: numberOption(values['age-error'], 'age-error', 'ageUncertaintyMyr'),
        rangeSigma: numberOption(values.sigma, 'sigma', 'rangeSigma'),
        turnoverScale: values['tau-scale'] as TurnoverScale | undefined,
      }),
    );
  },
};

/**
 * The prediction as printed: when the relation has no period (`noResult`), the period and
 * every number derived from it (range, ln σ, contributions, Rossby number) give way to
 * `periodDays: null` and the reason.
 */
function withoutHiddenPeriod(p: PeriodPrediction) {
  if (!p.noResult) return p;
  return {
    relation: p.relation,
    relationLabel: p.relationLabel,
    source: p.source,
    periodDays: null,
    reason: p.noResult.reason,
    noResult: p.noResult,
    ageMyr: p.ageMyr,
    ageUncertaintyMyr: p.ageUncertaintyMyr,
    colour: p.colour,
    relationColour: p.relationColour,
    flags: p.flags,
  };
}
