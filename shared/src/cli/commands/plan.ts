/** `spincycle plan`: every number of the target plan of one target on one node. */
import { readFileSync } from 'node:fs';
import type { NodeBand, NodeSpec, SiteSpec } from '../../facility/facility-types';
import { computeTargetPlan, type GyroRelationId, type TurnoverScale } from '../../science/index';
import { methodsAnchorFor } from '../../science/method-docs';
import { ScienceInputError } from '../../science/science-input-error';
import { type CliCommand, COLOUR_OPTIONS, colourOption, numberOption, parseCommandArgs, relationOption } from '../cli-command';
import { TYPICAL_NODE, TYPICAL_SITE } from '../typical-node';

const usage = `Usage: spincycle plan (--bv X | --bprp X) --age MYR --mag M [options]

The target plan of one target on one node: period and range, amplitude, exposure and
per-visit precision, cadence, baseline, visits, node-hours and fee — every number with its
unit, a "why" line and its source.

Target:
  --name TEXT              display name (e.g. "Star A-17")
  --bv X | --bprp X        observed colour, mag
  --ebv X                  reddening E(B−V), mag (default 0)
  --age MYR                age, Myr
  --age-error MYR          1σ age uncertainty, Myr (default 0)
  --mag M                  catalogue magnitude
  --band B                 band of --mag: B | V | R | I | G (default V)
  --period-precision DAYS  requested 1σ period precision, days (optional)
Plan options:
  --relation NAME          barnes2007 | mh2008 | angus2015 | angus2019
                           (default angus2019 for --bprp, barnes2007 for --bv)
  --tau-scale NAME         noyes1984 (default) | cranmerSaar2011 | wright2011 | wright2018
  --fap P                  false-alarm probability of the detection (default 0.01)
  --completeness C         chance of recovering the period, 0.5–0.99 (default 0.9)
  --samples-per-cycle N    samples per cycle of the shortest plausible period (default 10)
  --cycles N               rotations of the longest plausible period in the baseline (default 3)
  --precision-ppm S        per-visit precision goal, ppm (default: derived from the cadence)
  --altitude DEG           planning altitude, degrees (default max(45, node altitude limit))
Node and site (default: a typical 0.5 m node in V at a 2000 m site):
  --node FILE.json         NodeSpec fields (merged over the default), or {"node": {...}, "site": {...}}
  --site FILE.json         SiteSpec fields (merged over the default)
Output:
  --summary                only "value unit" per quantity (4 significant figures), the
                           analysis and the flags (default: every quantity with its value,
                           unit, why, source and tag)

The plan's "analysis" (series, search band, false-alarm level) is how the campaign must be
analysed for the plan's completeness to hold: "spincycle periodogram --plan FILE" reads it.
How each number is computed: docs/science.md (the app's Methods page); the full output's
"methods" names the section of each quantity, e.g. docs/science.md#completeness.
  -h, --help               this text

Example:
  spincycle plan --name "Star A-17" --bprp 1.1 --age 800 --age-error 100 --mag 11 --band G
`;

function readJson(path: string, field: string): Record<string, unknown> {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (err) {
    throw new ScienceInputError(field, `cannot read ${path}: ${(err as Error).message}`);
  }
  try {
    const v = JSON.parse(text) as unknown;
    if (typeof v !== 'object' || v === null || Array.isArray(v)) throw new Error('not a JSON object');
    return v as Record<string, unknown>;
  } catch (err) {
    throw new ScienceInputError(field, `${path} is not a JSON object: ${(err as Error).message}`);
  }
}

/** Four significant figures (integers as they are) for the summary view. */
function roundForSummary(v: number): string {
  return Number.isInteger(v) ? String(v) : String(Number(v.toPrecision(4)));
}

export const command: CliCommand = {
  name: 'plan',
  summary: 'target plan of one target on one node (every number explained)',
  usage,
  async run(argv) {
    const { values } = parseCommandArgs(argv, {
      ...COLOUR_OPTIONS,
      name: { type: 'string' },
      age: { type: 'string' },
      'age-error': { type: 'string' },
      mag: { type: 'string' },
      band: { type: 'string' },
      'period-precision': { type: 'string' },
      'tau-scale': { type: 'string' },
      fap: { type: 'string' },
      completeness: { type: 'string' },
      'samples-per-cycle': { type: 'string' },
      cycles: { type: 'string' },
      'precision-ppm': { type: 'string' },
      altitude: { type: 'string' },
      node: { type: 'string' },
      site: { type: 'string' },
      summary: { type: 'boolean' },
    });
    const colour = colourOption(values);
    let node: NodeSpec = { ...TYPICAL_NODE };
    let site: SiteSpec = { ...TYPICAL_SITE };
    if (values.node !== undefined) {
      const json = readJson(values.node, 'node');
      if (typeof json.node === 'object' && json.node !== null) {
        node = { ...node, ...(json.node as Partial<NodeSpec>) };
        if (typeof json.site === 'object' && json.site !== null) site = { ...site, ...(json.site as Partial<SiteSpec>) };
      } else {
        node = { ...node, ...(json as Partial<NodeSpec>) };
      }
    }
    if (values.site !== undefined) site = { ...site, ...(readJson(values.site, 'site') as Partial<SiteSpec>) };
    const plan = computeTargetPlan(
      {
        name: values.name,
        colour,
        reddeningEbvMag: numberOption(values.ebv, 'ebv', 'target.reddeningEbvMag'),
        ageMyr: numberOption(values.age, 'age', 'target.ageMyr', true) as number,
        ageUncertaintyMyr: numberOption(values['age-error'], 'age-error', 'target.ageUncertaintyMyr'),
        magnitude: {
          value: numberOption(values.mag, 'mag', 'target.magnitude.value', true) as number,
          band: (values.band ?? 'V') as NodeBand,
        },
        periodPrecisionDays: numberOption(values['period-precision'], 'period-precision', 'target.periodPrecisionDays'),
      },
      node,
      site,
      {
        relation: relationOption(values.relation) as GyroRelationId | undefined,
        turnoverScale: values['tau-scale'] as TurnoverScale | undefined,
        falseAlarmProbability: numberOption(values.fap, 'fap', 'options.falseAlarmProbability'),
        completeness: numberOption(values.completeness, 'completeness', 'options.completeness'),
        samplesPerCycle: numberOption(values['samples-per-cycle'], 'samples-per-cycle', 'options.samplesPerCycle'),
        baselineCycles: numberOption(values.cycles, 'cycles', 'options.baselineCycles'),
        perVisitPrecisionPpm: numberOption(values['precision-ppm'], 'precision-ppm', 'options.perVisitPrecisionPpm'),
        planningAltitudeDeg: numberOption(values.altitude, 'altitude', 'options.planningAltitudeDeg'),
      },
    );
    if (!values.summary) {
      const methods = Object.fromEntries(
        Object.keys(plan.quantities).map((k) => [k, `docs/science.md#${methodsAnchorFor(k) ?? 'overview'}`]),
      );
      return { ...plan, methods };
    }
    // Everything but the noise terms of one exposure; `analysis` stays exact (periodogram --plan reads it).
    const { quantities, precision: _precision, flags, ...head } = plan;
    return {
      ...head,
      quantities: Object.fromEntries(
        Object.entries(quantities).map(([k, q]) => [
          k,
          q.value === null ? null : q.unit === '1' ? roundForSummary(q.value) : `${roundForSummary(q.value)} ${q.unit}`,
        ]),
      ),
      flags: flags.map((f) => `${f.severity}: ${f.code}: ${f.message}`),
    };
  },
};
