/**
 * Golden output of the science plan: every explained quantity of `computeTargetPlan` for a
 * fixed set of targets and nodes (F to M dwarfs, both colour systems, with and without the
 * moonlit sky of the sky windows, a proposer-given period, completeness 0.5 and 0.99),
 * rounded to 6 significant figures, compared with test/fixtures/target-plan-golden.json.
 *
 * Why: the server stores plans with a hash of their inputs that includes
 * TARGET_PLAN_MODEL_VERSION (shared/src/science/target-plan.ts). A change that makes the same
 * inputs give other numbers without raising that version leaves every stored plan marked
 * "current" although it is not. This test fails in that case; and it fails when the version
 * moved but the fixture did not, so the two always move together.
 *
 * After raising TARGET_PLAN_MODEL_VERSION, regenerate the fixture with:
 *
 *   UPDATE_GOLDEN=1 npx jest --selectProjects shared -- target-plan-golden
 *
 * and commit the JSON with the version change. Regenerating refuses to write numbers that
 * differ from the fixture's under the same version (raise the version first); adding or
 * removing a case under the same version is allowed when the other cases are unchanged.
 */
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import type { NodeSpec, SiteSpec } from '../facility/facility-types';
import { TYPICAL_NODE, TYPICAL_SITE } from '../cli/typical-node';
import { computeTargetPlan, TARGET_PLAN_MODEL_VERSION, type TargetPlanOptions, type TargetPlanTarget } from './target-plan';

const FIXTURE = path.resolve(__dirname, '../../../test/fixtures/target-plan-golden.json');
const REGENERATE = 'UPDATE_GOLDEN=1 npx jest --selectProjects shared -- target-plan-golden';
const SIGNIFICANT = 6;

/** A 1.0 m node in R at a darker southern site, with the other scintillation model. */
const LARGE_NODE: NodeSpec = {
  ...TYPICAL_NODE,
  apertureM: 1.0,
  throughput: 0.55,
  band: 'R',
  saturationE: 120000,
  pixelScaleArcsec: 0.8,
  seeingFwhmArcsec: 1.4,
  scintillationModel: 'young1967',
  altitudeLimitDeg: 25,
  sunAltitudeLimitDeg: -18,
  rateMinorPerHour: 12000,
};
const DARK_SITE: SiteSpec = {
  latitudeDeg: -27.45,
  longitudeDeg: -69.95,
  elevationM: 2380,
  timeZone: 'UTC',
  skyBrightnessMagPerArcsec2: 21.8,
};
/** A moonlit sky as the sky windows would report it. */
const MOONLIT = { medianMagPerArcsec2: 20.4, worstMagPerArcsec2: 18.9, usableNights: 41, source: 'golden fixture (invented sky)' };

interface GoldenCase {
  name: string;
  target: TargetPlanTarget;
  node: NodeSpec;
  site: SiteSpec;
  options?: TargetPlanOptions;
}

const CASES: GoldenCase[] = [
  {
    name: 'F dwarf, BP-RP, typical node, defaults',
    target: { colour: { value: 0.62, system: 'BPRP' }, ageMyr: 1000, ageUncertaintyMyr: 150, magnitude: { value: 10.5, band: 'G' } },
    node: TYPICAL_NODE,
    site: TYPICAL_SITE,
  },
  {
    name: 'G dwarf, B-V, moonlit sky',
    target: { colour: { value: 0.65, system: 'BV' }, ageMyr: 650, ageUncertaintyMyr: 60, magnitude: { value: 12, band: 'V' } },
    node: TYPICAL_NODE,
    site: TYPICAL_SITE,
    options: { sky: MOONLIT },
  },
  {
    name: 'K dwarf, BP-RP, reddened, completeness 0.5',
    target: {
      colour: { value: 1.2, system: 'BPRP' },
      reddeningEbvMag: 0.05,
      ageMyr: 800,
      ageUncertaintyMyr: 100,
      magnitude: { value: 13, band: 'V' },
    },
    node: TYPICAL_NODE,
    site: TYPICAL_SITE,
    options: { completeness: 0.5 },
  },
  {
    name: 'K dwarf, BP-RP, completeness 0.99, 1.0 m node in R',
    target: { colour: { value: 1.2, system: 'BPRP' }, ageMyr: 800, ageUncertaintyMyr: 100, magnitude: { value: 13, band: 'V' } },
    node: LARGE_NODE,
    site: DARK_SITE,
    options: { completeness: 0.99 },
  },
  {
    name: 'late K dwarf, B-V, period precision asked, moonlit sky on the 1.0 m node',
    target: {
      colour: { value: 1.15, system: 'BV' },
      ageMyr: 2000,
      ageUncertaintyMyr: 300,
      magnitude: { value: 14.2, band: 'V' },
      periodPrecisionDays: 0.1,
    },
    node: LARGE_NODE,
    site: DARK_SITE,
    options: { sky: MOONLIT },
  },
  {
    name: 'early M dwarf, BP-RP, 1.0 m node, defaults',
    target: { colour: { value: 2.1, system: 'BPRP' }, ageMyr: 650, ageUncertaintyMyr: 60, magnitude: { value: 14.5, band: 'G' } },
    node: LARGE_NODE,
    site: DARK_SITE,
  },
  {
    name: 'M dwarf, proposer-given period 0.8 ± 0.05 d (fast rotator)',
    target: {
      colour: { value: 2.6, system: 'BPRP' },
      ageMyr: 120,
      ageUncertaintyMyr: 20,
      magnitude: { value: 13.5, band: 'I' },
      periodDays: 0.8,
      periodUncertaintyDays: 0.05,
    },
    node: TYPICAL_NODE,
    site: TYPICAL_SITE,
  },
  {
    name: 'M dwarf, proposer-given period 15 d (default uncertainty), moonlit sky, completeness 0.99',
    target: {
      colour: { value: 2.4, system: 'BPRP' },
      ageMyr: 1500,
      ageUncertaintyMyr: 200,
      magnitude: { value: 12.8, band: 'R' },
      periodDays: 15,
    },
    node: LARGE_NODE,
    site: DARK_SITE,
    options: { sky: MOONLIT, completeness: 0.99 },
  },
];

type Values = Record<string, number | boolean | null>;
interface Fixture {
  modelVersion: number;
  significantFigures: number;
  regenerate: string;
  cases: Record<string, Values>;
}

const round = (v: number) => (v === 0 ? 0 : Number(v.toPrecision(SIGNIFICANT)));

/** Every quantity's value (rounded), plus whether the plan is feasible. */
function valuesOf(c: GoldenCase): Values {
  const plan = computeTargetPlan(c.target, c.node, c.site, c.options);
  const out: Values = { feasible: plan.feasible };
  for (const key of Object.keys(plan.quantities).sort()) {
    const v = plan.quantities[key as keyof typeof plan.quantities].value;
    out[key] = v === null ? null : round(v);
  }
  return out;
}

/**
 * Same value, allowing one unit in the last kept figure: a last-ulp difference of a Math
 * function across Node versions may flip a rounding, a change of the model does not hide there.
 */
function same(a: number | boolean | null | undefined, b: number | boolean | null | undefined): boolean {
  if (typeof a !== 'number' || typeof b !== 'number') return a === b;
  if (a === b) return true;
  const scale = Math.max(Math.abs(a), Math.abs(b));
  return Math.abs(a - b) <= scale * 10 ** (1 - SIGNIFICANT);
}

/** Lines "case › quantity: fixture → now" for every difference in the cases both hold. */
function differences(fixture: Fixture['cases'], now: Fixture['cases']): string[] {
  const lines: string[] = [];
  for (const [name, values] of Object.entries(now)) {
    const old = fixture[name];
    if (!old) continue;
    for (const key of new Set([...Object.keys(old), ...Object.keys(values)])) {
      if (!(key in old)) lines.push(`${name} › ${key}: (absent) → ${values[key]}`);
      else if (!(key in values)) lines.push(`${name} › ${key}: ${old[key]} → (absent)`);
      else if (!same(old[key], values[key])) lines.push(`${name} › ${key}: ${old[key]} → ${values[key]}`);
    }
  }
  return lines;
}

function readFixture(): Fixture | null {
  return existsSync(FIXTURE) ? (JSON.parse(readFileSync(FIXTURE, 'utf8')) as Fixture) : null;
}

describe('target plan golden output (TARGET_PLAN_MODEL_VERSION guard)', () => {
  const now: Fixture['cases'] = Object.fromEntries(CASES.map((c) => [c.name, valuesOf(c)]));

  if (process.env.UPDATE_GOLDEN === '1') {
    it(`writes ${path.relative(process.cwd(), FIXTURE)} for model version ${TARGET_PLAN_MODEL_VERSION}`, () => {
      const old = readFixture();
      if (old && old.modelVersion === TARGET_PLAN_MODEL_VERSION) {
        const changed = differences(old.cases, now);
        if (changed.length) {
          throw new Error(
            `Refusing to regenerate: plan numbers changed under the same TARGET_PLAN_MODEL_VERSION (${TARGET_PLAN_MODEL_VERSION}). ` +
              `Raise TARGET_PLAN_MODEL_VERSION in shared/src/science/target-plan.ts first, then run ${REGENERATE}\n` +
              changed.slice(0, 40).join('\n'),
          );
        }
      }
      const fixture: Fixture = {
        modelVersion: TARGET_PLAN_MODEL_VERSION,
        significantFigures: SIGNIFICANT,
        regenerate: REGENERATE,
        cases: now,
      };
      writeFileSync(FIXTURE, `${JSON.stringify(fixture, null, 2)}\n`);
    });
    return;
  }

  const fixture = readFixture();

  it('has a fixture made with the current TARGET_PLAN_MODEL_VERSION', () => {
    if (!fixture) throw new Error(`No golden fixture at ${FIXTURE}: create it with ${REGENERATE}`);
    if (fixture.modelVersion !== TARGET_PLAN_MODEL_VERSION) {
      throw new Error(
        `TARGET_PLAN_MODEL_VERSION is ${TARGET_PLAN_MODEL_VERSION} but the golden fixture was made with ${fixture.modelVersion}: ` +
          `regenerate the fixture with ${REGENERATE} and commit it with the version change.`,
      );
    }
  });

  it('covers every case of this file (and no other)', () => {
    if (!fixture) return; // reported above
    expect(Object.keys(fixture.cases).sort()).toEqual(Object.keys(now).sort());
  });

  it.each(CASES.map((c) => c.name))('%s: every quantity as in the fixture', (name) => {
    if (!fixture) return; // reported above
    const changed = differences({ [name]: fixture.cases[name] ?? {} }, { [name]: now[name] });
    if (!changed.length) return;
    if (fixture.modelVersion === TARGET_PLAN_MODEL_VERSION) {
      throw new Error(
        `plan numbers changed: raise TARGET_PLAN_MODEL_VERSION (now ${TARGET_PLAN_MODEL_VERSION}, in shared/src/science/target-plan.ts) ` +
          `and regenerate the fixture with ${REGENERATE}\n${changed.join('\n')}`,
      );
    }
    throw new Error(
      `the fixture is of model version ${fixture.modelVersion}, the code of ${TARGET_PLAN_MODEL_VERSION}: regenerate it with ${REGENERATE}\n${changed.join('\n')}`,
    );
  });
});
