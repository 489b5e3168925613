import fc from 'fast-check';
import type { NodeSpec, SiteSpec } from '../facility/facility-types';
import { ScienceInputError } from './science-input-error';
import { PLAN_DEFAULTS, type TargetPlanTarget, computeTargetPlan, defaultRelationFor } from './target-plan';
import { TYPICAL_NODE, TYPICAL_SITE } from '../cli/typical-node';

// The command line's typical 0.5 m node (illustrative values).
const NODE: NodeSpec = TYPICAL_NODE;
const SITE: SiteSpec = TYPICAL_SITE;
const STAR: TargetPlanTarget = {
  name: 'Star A-17',
  colour: { value: 1.1, system: 'BPRP' },
  ageMyr: 800,
  ageUncertaintyMyr: 100,
  magnitude: { value: 11.5, band: 'G' },
};

describe('computeTargetPlan', () => {
  it('explains every quantity with a finite value, a unit, a why line and a source', () => {
    const plan = computeTargetPlan(STAR, NODE, SITE);
    for (const [key, q] of Object.entries(plan.quantities)) {
      if (q.value !== null) expect([key, Number.isFinite(q.value)]).toEqual([key, true]);
      expect(q.unit.length).toBeGreaterThan(0);
      expect(q.why.length).toBeGreaterThan(5);
      expect(q.source.length).toBeGreaterThan(3);
      expect(['paper', 'derived', 'memory', 'practice', 'choice', 'facility']).toContain(q.tag);
    }
    expect(plan).toMatchObject({
      targetName: 'Star A-17',
      relation: 'angus2019',
      turnoverScale: 'noyes1984',
      currency: 'eur',
      feasible: true,
    });
  });

  it('chains the numbers consistently', () => {
    const { quantities: q } = computeTargetPlan(STAR, NODE, SITE);
    expect(q.shortestPeriodDays.value).toBeLessThan(q.periodDays.value);
    expect(q.longestPeriodDays.value).toBeGreaterThan(q.periodDays.value);
    expect(q.baselineDays.value).toBeGreaterThanOrEqual(3 * q.longestPeriodDays.value);
    expect(q.visits.value).toBeGreaterThanOrEqual(q.visitsForCadence.value);
    expect(q.visits.value).toBe(q.visitsPerNight.value * q.visitNights.value);
    const k = q.exposuresPerVisit.value;
    expect(q.visitSeconds.value).toBeCloseTo(
      k * q.exposureSeconds.value + (k - 1) * PLAN_DEFAULTS.readoutSeconds + NODE.overheadSeconds,
      9,
    );
    expect(q.nodeHoursClear.value).toBeCloseTo((q.visits.value * q.visitSeconds.value) / 3600, 9);
    expect(q.nodeHours.value).toBeGreaterThanOrEqual(q.nodeHoursClear.value / (1 - NODE.weatherLossFraction) - 1e-9);
    expect(Number.isInteger(q.feeMinor.value)).toBe(true);
    expect(q.feeMinor.value).toBe(Math.round(q.nodeHours.value * NODE.rateMinorPerHour));
    expect(q.completeness.value).toBeGreaterThanOrEqual(0.9 - 1e-9);
    expect(q.visitsForCompleteness50.value!).toBeLessThanOrEqual(q.visitsForCompleteness90.value!);
    expect(q.visitsForCompleteness90.value!).toBeLessThanOrEqual(q.visitsForCompleteness99.value!);
    // Samples per cycle of the shortest plausible period ≥ 10.
    expect((q.visitsPerNight.value * q.shortestPeriodDays.value) / q.nightStepDays.value).toBeGreaterThanOrEqual(10);
  });

  it('defaults to Angus 2019 for BP−RP and Barnes 2007 for B−V', () => {
    expect(defaultRelationFor('BPRP')).toBe('angus2019');
    expect(computeTargetPlan({ ...STAR, colour: { value: 0.9, system: 'BV' } }, NODE, SITE).relation).toBe('barnes2007');
  });

  it('extends the baseline for a requested period precision, and then reaches it', () => {
    const plain = computeTargetPlan(STAR, NODE, SITE);
    const precise = computeTargetPlan({ ...STAR, periodPrecisionDays: 0.05 }, NODE, SITE);
    expect(precise.quantities.baselineDays.value).toBeGreaterThan(plain.quantities.baselineDays.value);
    expect(precise.quantities.expectedPeriodPrecisionDays.value).toBeLessThanOrEqual(0.05 * 1.0001);
    expect(precise.quantities.baselineForPrecisionDays.value).not.toBeNull();
    expect(plain.quantities.baselineForPrecisionDays.value).toBeNull();
  });

  it('asks for several visits per night for short periods (SCIENCE.md §6)', () => {
    const young = computeTargetPlan({ ...STAR, colour: { value: 0.75, system: 'BPRP' }, ageMyr: 300, ageUncertaintyMyr: 50 }, NODE, SITE);
    expect(young.quantities.shortestPeriodDays.value).toBeLessThan(5);
    expect(young.quantities.visitsPerNight.value).toBeGreaterThanOrEqual(3);
  });

  it('marks a star that saturates at the shortest exposure as not feasible', () => {
    const plan = computeTargetPlan({ ...STAR, magnitude: { value: 4, band: 'V' } }, NODE, SITE);
    expect(plan.feasible).toBe(false);
    expect(plan.flags.find((f) => f.code === 'saturatesAtMinExposure')?.severity).toBe('blocking');
  });

  it('costs more node-hours on a node with more weather loss, other things equal', () => {
    const a = computeTargetPlan(STAR, NODE, SITE).quantities.nodeHours.value;
    const b = computeTargetPlan(STAR, { ...NODE, weatherLossFraction: 0.5 }, SITE).quantities.nodeHours.value;
    expect(b).toBeGreaterThan(a);
  });

  it('never returns NaN over a wide range of targets (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.6, max: 3.3, noNaN: true }),
        fc.double({ min: 50, max: 12000, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.double({ min: 3, max: 20, noNaN: true }),
        fc.constantFrom('B', 'V', 'R', 'I', 'G' as const),
        (bprp, ageMyr, relErr, mag, band) => {
          const plan = computeTargetPlan(
            { colour: { value: bprp, system: 'BPRP' }, ageMyr, ageUncertaintyMyr: relErr * ageMyr, magnitude: { value: mag, band } },
            { ...NODE, band },
            SITE,
          );
          for (const q of Object.values(plan.quantities)) if (q.value !== null) expect(Number.isFinite(q.value)).toBe(true);
        },
      ),
      { numRuns: 200 },
    );
  });

  it.each([
    ['target.ageMyr', { ...STAR, ageMyr: -1 }, {}],
    ['target.ageMyr', { ...STAR, ageMyr: Number.NaN }, {}],
    ['target.colour.value', { ...STAR, colour: { value: 4, system: 'BPRP' as const } }, {}],
    ['target.colour.system', { ...STAR, colour: { value: 1, system: 'UB' as never } }, {}],
    ['target.magnitude.value', { ...STAR, magnitude: { value: Number.NaN, band: 'G' as const } }, {}],
    ['target.periodPrecisionDays', { ...STAR, periodPrecisionDays: 0 }, {}],
    ['target.reddeningEbvMag', { ...STAR, reddeningEbvMag: -0.2 }, {}],
    ['options.falseAlarmProbability', STAR, { falseAlarmProbability: 1.5 }],
    ['options.samplesPerCycle', STAR, { samplesPerCycle: 0 }],
    ['options.relation', STAR, { relation: 'nope' as never }],
    ['options.amplitudeModel.anchorRossby', STAR, { amplitudeModel: { anchorRossby: -1 } }],
    ['options.photometry.apertureRadiusFwhm', STAR, { photometry: { apertureRadiusFwhm: 0 } }],
  ])('rejects bad input naming %s', (field, target, options) => {
    let err: unknown;
    try {
      computeTargetPlan(target as TargetPlanTarget, NODE, SITE, options as never);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(ScienceInputError);
    expect((err as ScienceInputError).field).toBe(field);
  });

  describe('with a fixed exposure (options.exposureSeconds)', () => {
    it('honours the exposure and says it is your input', () => {
      const plan = computeTargetPlan(STAR, NODE, SITE, { exposureSeconds: 42 });
      expect(plan.quantities.exposureSeconds.value).toBe(42);
      expect(plan.quantities.exposureSeconds.why).toMatch(/^your input \(the node allows \d+–\d+ s\)/);
      expect(plan.quantities.exposureSeconds.source).toBe("your input, within the node's exposure range");
      expect(plan.quantities.exposureSeconds.tag).toBe('choice');
      expect(plan.quantities.visitSeconds.value).toBeCloseTo(42 + NODE.overheadSeconds, 9);
      expect(plan.precision.exposureSeconds).toBe(42);
    });

    it('a longer fixed exposure improves the per-visit precision', () => {
      const short = computeTargetPlan(STAR, NODE, SITE, { exposureSeconds: 5 });
      const long = computeTargetPlan(STAR, NODE, SITE, { exposureSeconds: 60 });
      expect(long.quantities.perVisitPrecisionPpm.value).toBeLessThan(short.quantities.perVisitPrecisionPpm.value);
      expect(long.quantities.visitsForCompleteness90.value!).toBeLessThanOrEqual(short.quantities.visitsForCompleteness90.value!);
    });

    it.each([1, 301, Number.NaN])('rejects %p s outside the node range, naming options.exposureSeconds', (exposureSeconds) => {
      let err: unknown;
      try {
        computeTargetPlan(STAR, NODE, SITE, { exposureSeconds });
      } catch (e) {
        err = e;
      }
      expect(err).toBeInstanceOf(ScienceInputError);
      expect((err as ScienceInputError).field).toBe('options.exposureSeconds');
    });

    it('a saturating fixed exposure gives a blocking flag and finite numbers', () => {
      // A bright star: the automatic choice stays below saturation, 300 s does not.
      const bright = { ...STAR, magnitude: { value: 8.5, band: 'V' as const } };
      const auto = computeTargetPlan(bright, NODE, SITE);
      expect(auto.feasible).toBe(true);
      expect(auto.quantities.saturationLimitSeconds.value).toBeLessThan(300);
      const plan = computeTargetPlan(bright, NODE, SITE, { exposureSeconds: 300 });
      expect(plan.feasible).toBe(false);
      const saturation = plan.flags.find((f) => f.code === 'saturatesAtChosenExposure');
      expect(saturation?.severity).toBe('blocking');
      expect(saturation?.message).toMatch(/saturates at the chosen exposure of 300 s/);
      for (const q of Object.values(plan.quantities)) if (q.value !== null) expect(Number.isFinite(q.value)).toBe(true);
    });

    it('a star that saturates even at the node minimum keeps the existing flag', () => {
      const plan = computeTargetPlan({ ...STAR, magnitude: { value: 4, band: 'V' } }, NODE, SITE, { exposureSeconds: 10 });
      expect(plan.feasible).toBe(false);
      expect(plan.flags.map((f) => f.code)).toContain('saturatesAtMinExposure');
    });
  });

  it('rejects a bad node or site naming the field', () => {
    expect(() => computeTargetPlan(STAR, { ...NODE, saturationE: 0 }, SITE)).toThrow(/node.saturationE/);
    expect(() => computeTargetPlan(STAR, NODE, { ...SITE, skyBrightnessMagPerArcsec2: Number.NaN })).toThrow(
      /site.skyBrightnessMagPerArcsec2/,
    );
  });
});

describe('computeTargetPlan, exposures per visit', () => {
  // An old, bright G dwarf: small spot amplitude, and a saturation-capped single exposure
  // dominated by scintillation.
  const BRIGHT_OLD: TargetPlanTarget = {
    name: 'Star B-2',
    colour: { value: 0.65, system: 'BV' },
    ageMyr: 4000,
    ageUncertaintyMyr: 500,
    magnitude: { value: 9.6, band: 'V' },
  };

  it('stacks exposures when the single exposure is capped by saturation, and the visit gets more precise', () => {
    const plan = computeTargetPlan(BRIGHT_OLD, NODE, SITE);
    const single = computeTargetPlan(BRIGHT_OLD, NODE, SITE, { exposuresPerVisit: 1 });
    const q = plan.quantities;
    expect(q.exposuresPerVisit.value).toBeGreaterThan(1);
    expect(q.exposuresPerVisit.why).toMatch(/capped by saturation/);
    expect(q.perVisitPrecisionPpm.value).toBeLessThan(single.quantities.perVisitPrecisionPpm.value);
    // This star's spots are below what the node's floor lets any campaign detect at 90 %: both
    // plans are infeasible and keep the cadence's own campaign, whose completeness the more
    // precise visits raise (an unreachable plan is not priced at the largest campaign tried).
    for (const p of [plan, single]) {
      expect(p.feasible).toBe(false);
      expect(p.flags.map((f) => f.code)).toContain('amplitudeBelowFloor');
      expect(p.quantities.visitsForCompleteness90.value).toBeNull();
    }
    expect(q.visits.value).toBe(single.quantities.visits.value);
    expect(q.completeness.value).toBeGreaterThan(single.quantities.completeness.value);
    // The visit stays within the longest visit.
    expect(q.visitSeconds.value).toBeLessThanOrEqual(PLAN_DEFAULTS.maxVisitSeconds + 1e-9);
  });

  it('follows σ_visit² = (σ₁² − floor²)/k + floor²: stacking never beats the systematic floor', () => {
    const k = 16;
    const plan = computeTargetPlan(BRIGHT_OLD, NODE, SITE, { exposuresPerVisit: k });
    const c = plan.precision.components;
    const random2 = plan.precision.totalPpm ** 2 - c.floorPpm ** 2;
    expect(plan.quantities.perVisitPrecisionPpm.value).toBeCloseTo(Math.sqrt(random2 / k + c.floorPpm ** 2), 6);
    expect(plan.quantities.perVisitPrecisionPpm.value).toBeGreaterThan(c.floorPpm);
    expect(plan.quantities.exposuresPerVisit.tag).toBe('choice');
  });

  it('keeps one exposure per visit when a single exposure reaches the goal', () => {
    const loose = computeTargetPlan(STAR, NODE, SITE, { perVisitPrecisionPpm: 5000 });
    expect(loose.quantities.exposureSeconds.why).toMatch(/reaching the precision goal/);
    expect(loose.quantities.exposuresPerVisit.value).toBe(1);
  });

  it('does not stack a faint star whose exposure is capped by the node maximum (photon-limited: no node time saved)', () => {
    const faint = computeTargetPlan({ ...STAR, magnitude: { value: 14.5, band: 'G' } }, NODE, SITE);
    expect(faint.quantities.exposureSeconds.why).toBe("limited by the node's longest exposure");
    expect(faint.quantities.exposuresPerVisit.value).toBe(1);
  });

  it('refuses a fractional or zero exposuresPerVisit, naming the option', () => {
    expect(() => computeTargetPlan(STAR, NODE, SITE, { exposuresPerVisit: 0 })).toThrow(/options\.exposuresPerVisit/);
    expect(() => computeTargetPlan(STAR, NODE, SITE, { exposuresPerVisit: 2.5 })).toThrow(ScienceInputError);
  });
});

describe('computeTargetPlan, plans that reach the goal only at a price', () => {
  // A faint old G dwarf with a tight period precision on the typical node: the precision sets
  // a baseline of years and the floor makes each night's mean barely better with more visits.
  const FAINT_OLD: TargetPlanTarget = {
    name: 'Star C-3',
    colour: { value: 0.833, system: 'BPRP' },
    ageMyr: 5040,
    ageUncertaintyMyr: 480,
    magnitude: { value: 14.58, band: 'V' },
    periodPrecisionDays: 0.432,
  };

  it('flags visits beyond what the floor lets count, and nights the star would fill, with the cheaper ways out', () => {
    const plan = computeTargetPlan(FAINT_OLD, NODE, SITE);
    const q = plan.quantities;
    const beyond = plan.flags.find((f) => f.code === 'visitsBeyondFloor');
    expect(beyond?.severity).toBe('caution');
    expect(beyond?.message).toContain(`${q.visitsPerNight.value} visits a night`);
    expect(beyond?.message).toMatch(/looser period precision/);
    expect(beyond?.message).toContain(`50 % completeness needs ${q.visitsForCompleteness50.value} visits`);
    // It fires only when more visits a night are planned than the floor lets count.
    const useful = Number(/beyond (\d+) a night/.exec(beyond!.message)?.[1]);
    expect(q.visitsPerNight.value).toBeGreaterThan(useful);
    const filled = plan.flags.find((f) => f.code === 'nightsFilled');
    expect(filled?.severity).toBe('caution');
    expect((q.visitsPerNight.value * q.visitSeconds.value) / 3600).toBeGreaterThan(0.5 * PLAN_DEFAULTS.observableHoursPerNight);
  });

  it('gives an ordinary plan neither caution', () => {
    const plan = computeTargetPlan(STAR, NODE, SITE);
    expect(plan.flags.map((f) => f.code)).not.toContain('visitsBeyondFloor');
    expect(plan.flags.map((f) => f.code)).not.toContain('nightsFilled');
  });

  it('keeps the cadence campaign of a plan no campaign can make reach the goal, with the completeness it gives', () => {
    // An old, bright G dwarf: spots below what the floor lets any campaign detect at 90 %.
    const plan = computeTargetPlan(
      {
        name: 'Star B-2',
        colour: { value: 0.65, system: 'BV' },
        ageMyr: 4000,
        ageUncertaintyMyr: 500,
        magnitude: { value: 9.6, band: 'V' },
      },
      NODE,
      SITE,
    );
    const q = plan.quantities;
    expect(plan.feasible).toBe(false);
    const floor = plan.flags.find((f) => f.code === 'amplitudeBelowFloor');
    expect(floor?.message).toMatch(/The cadence's own \d+ visits give [\d.]+ % completeness/);
    // The cadence's own nights and visits a night, not the night full of visits of the longest baseline.
    expect(q.visits.value).toBe(q.visitsPerNight.value * (Math.floor(q.baselineDays.value / q.nightStepDays.value + 1e-9) + 1));
    expect(q.completeness.value).toBeLessThan(0.9);
    expect(q.visitsForCompleteness90.value).toBeNull();
    expect(q.visitsForCompleteness99.value).toBeNull();
  });
});

describe('computeTargetPlan, wording a user reads', () => {
  // Every string a plan carries (why lines, sources, flag messages and sources).
  const textsOf = (plan: ReturnType<typeof computeTargetPlan>): string[] => [
    ...Object.values(plan.quantities).flatMap((q) => [q.why, q.source]),
    ...plan.flags.flatMap((f) => [f.message, f.source ?? '']),
  ];
  // Maintainers' notes and code names (written with \s so that a search of the sources for the
  // notes finds only comments).
  const DEVELOPER_WORDS =
    /from\smemory|not re-read|verify|our\schoice|Spincycle['’]s|no (single )?source|derived\shere|\[derived\]|\bmaxExposure|\bminExposure|targetPrecision|saturationE|proposer|the user|chosen by|R_per|\bcA ±/i;
  const PLANS = [
    computeTargetPlan(STAR, NODE, SITE),
    computeTargetPlan(STAR, NODE, SITE, { exposureSeconds: 42, exposuresPerVisit: 2, turnoverScale: 'wright2018' }),
    computeTargetPlan({ ...STAR, colour: { value: 0.9, system: 'BV' }, reddeningEbvMag: 0.1, periodDays: 12 }, NODE, SITE),
    computeTargetPlan({ ...STAR, magnitude: { value: 14.5, band: 'G' } }, NODE, SITE),
    computeTargetPlan({ ...STAR, magnitude: { value: 6, band: 'V' } }, NODE, SITE),
    computeTargetPlan(
      { ...STAR, ageMyr: 4000, ageUncertaintyMyr: 400, periodPrecisionDays: 0.5 },
      { ...NODE, systematicFloorMmag: 0.25 },
      SITE,
    ),
  ];

  it('says no provenance note, code name or "the user" in any why line, source or flag', () => {
    for (const plan of PLANS) expect(textsOf(plan).filter((t) => DEVELOPER_WORDS.test(t))).toEqual([]);
  });

  it('tells one cadence story: sample interval, night step and visits a night in the same words', () => {
    // A K dwarf whose cadence asks for every 3rd night, sized to every night with more visits.
    const plan = computeTargetPlan(
      { colour: { value: 1.3, system: 'BPRP' }, ageMyr: 4000, ageUncertaintyMyr: 400, magnitude: { value: 12, band: 'G' } },
      { ...NODE, systematicFloorMmag: 0.25 },
      SITE,
    );
    const q = plan.quantities;
    expect(q.sampleIntervalDays.why).toMatch(
      /^the period needs a sample at least every 3\.\d+ d \(10 per rotation of the shortest plausible period, 3\d\.?\d* d\)$/,
    );
    expect(q.nightStepDays.value).toBe(1);
    expect(q.nightStepDays.why).toBe('every night: the cadence needs every 3rd night, 90 % completeness needs every night');
    expect(q.visitsPerNight.why).toBe(
      `${q.visitsPerNight.value} a night: the cadence needs 1, 90 % completeness needs ${q.visitsPerNight.value}`,
    );
    expect(q.visitNights.why).toMatch(/^\d+ nights: every night over \d+ d/);
    // The cadence alone (no sizing) says the same interval in the night step and visits.
    const cadence = computeTargetPlan(
      { ...STAR, colour: { value: 1.6, system: 'BPRP' }, ageMyr: 4000, ageUncertaintyMyr: 500, magnitude: { value: 12, band: 'G' } },
      NODE,
      SITE,
    ).quantities;
    expect(cadence.nightStepDays.why).toMatch(/^every 3rd night: a sample at least every 3\.\d+ d, in whole nights$/);
    expect(cadence.visitsPerNight.why).toMatch(/^1 a night: one visit per visit night keeps a sample at least every 3\.\d+ d$/);
  });

  it('names the exposure limit and the saturation level in words', () => {
    const faint = computeTargetPlan({ ...STAR, magnitude: { value: 14.5, band: 'G' } }, NODE, SITE).quantities;
    expect(faint.exposureSeconds.why).toBe("limited by the node's longest exposure");
    const bright = computeTargetPlan({ ...STAR, magnitude: { value: 4, band: 'V' } }, NODE, SITE);
    expect(bright.flags.find((f) => f.code === 'saturatesAtMinExposure')?.source).toBe(
      "peak pixel of a Gaussian star image against the node's saturation level",
    );
  });

  it('says the proposer-given period and the completeness setting are your input', () => {
    const plan = computeTargetPlan({ ...STAR, periodDays: 12 }, NODE, SITE);
    expect(plan.quantities.periodDays.source).toBe('your input');
    expect(plan.quantities.periodDays.why).toMatch(/^your input \(Angus et al\. \(2019\) gives [\d.]+ d\)$/);
    expect(plan.quantities.shortestPeriodDays.why).toBe('−1σ of your period');
    expect(plan.flags.find((f) => f.code === 'explicitPeriod')?.message).toBe(
      'your period 12 ± 1.2 d is used instead of Angus et al. (2019)',
    );
    expect(plan.quantities.requestedCompleteness.source).toBe("your input: the proposal's completeness setting");
  });

  it("reports a magnitude out of the noise model's range as typed, with the band it was converted to", () => {
    const err = (() => {
      try {
        computeTargetPlan({ ...STAR, magnitude: { value: 24.9, band: 'G' } }, NODE, SITE);
      } catch (e) {
        return e as ScienceInputError;
      }
      throw new Error('no error');
    })();
    expect(err.field).toBe('target.magnitude');
    expect(err.reason).toMatch(
      /^G 24\.9 is 25\.\d+ in the node's V band, outside what the noise model covers \(between −2 and 25 mag in V\)$/,
    );
    expect(() => computeTargetPlan({ ...STAR, magnitude: { value: -3, band: 'V' } }, NODE, SITE)).toThrow(
      'target.magnitude: V −3 is outside what the noise model covers (between −2 and 25 mag)',
    );
  });
});
