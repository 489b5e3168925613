/** `spincycle age`: gyrochronological age from colour and rotation period. */
import { estimateAge, type AgeEstimate, type GyroRelationId, type TurnoverScale } from '../../science/index';
import { defaultRelationFor } from '../../science/target-plan';
import { type CliCommand, COLOUR_OPTIONS, colourOption, numberOption, parseCommandArgs, relationOption } from '../cli-command';

const usage = `Usage: spincycle age (--bv X | --bprp X) --period DAYS [options]

Age from colour and rotation period, with its uncertainty. Barnes (2007) uses his eq. 16;
the other relations propagate their coefficients' (and the period's) uncertainties.

Options:
  --bv X                observed B−V colour, mag
  --bprp X              observed Gaia BP−RP colour, mag
  --ebv X               reddening E(B−V), mag (default 0)
  --period DAYS         rotation period, days
  --period-error DAYS   1σ period uncertainty, days (not used by barnes2007)
  --relation NAME       barnes2007 | mh2008 | angus2015 | angus2019
                        (default angus2019 for --bprp, barnes2007 for --bv)
  --sigma K             width of the age range in σ (default 1)
  --tau-scale NAME      τ scale of the Rossby number (default noyes1984)
  -h, --help            this text

When the relation has no age for the star (colour outside its calibration, above the
Kraft break, a period below the slow-rotator sequence, an age above the age of the
universe…), "ageMyr" is null, "reason" says why, and the range is left out; the exit
code stays 0.

Example:
  spincycle age --bv 0.642 --period 26.09 --relation barnes2007
`;

export const command: CliCommand = {
  name: 'age',
  summary: 'gyrochronological age (and uncertainty) from colour and period',
  usage,
  async run(argv) {
    const { values } = parseCommandArgs(argv, {
      ...COLOUR_OPTIONS,
      period: { type: 'string' },
      'period-error': { type: 'string' },
      sigma: { type: 'string' },
      'tau-scale': { type: 'string' },
    });
    const colour = colourOption(values);
    return withoutHiddenAge(
      estimateAge({
        relation: (relationOption(values.relation) ?? defaultRelationFor(colour.system)) as GyroRelationId,
        colour,
        reddeningEbvMag: numberOption(values.ebv, 'ebv', 'reddeningEbvMag'),
        periodDays: numberOption(values.period, 'period', 'periodDays', true) as number,
        periodUncertaintyDays: numberOption(values['period-error'], 'period-error', 'periodUncertaintyDays'),
        rangeSigma: numberOption(values.sigma, 'sigma', 'rangeSigma'),
        turnoverScale: values['tau-scale'] as TurnoverScale | undefined,
      }),
    );
  },
};

/**
 * The estimate as printed: when the relation has no age (`noResult`), the age and the numbers
 * derived from it (range, fractional uncertainty, contributions) give way to `ageMyr: null` and
 * the reason. The Rossby number stays: it comes from the measured period, not from the age.
 */
function withoutHiddenAge(a: AgeEstimate) {
  if (!a.noResult) return a;
  return {
    relation: a.relation,
    relationLabel: a.relationLabel,
    source: a.source,
    ageMyr: null,
    reason: a.noResult.reason,
    noResult: a.noResult,
    periodDays: a.periodDays,
    colour: a.colour,
    relationColour: a.relationColour,
    rossby: a.rossby,
    flags: a.flags,
  };
}
