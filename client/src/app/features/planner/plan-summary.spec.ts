import type { NodeSpec, SiteSpec } from '@spincycle/shared/facility/facility-types';
import type { NodeTargetPlan } from '@spincycle/shared/planning/node-target-plan';
import { computeTargetPlan, type TargetPlanTarget } from '@spincycle/shared/science/target-plan';
import { formatValue } from './plan-display';
import { buildPlanSummary, cadenceStory, invalidSummary, uniqueSentences } from './plan-summary';

const NODE: NodeSpec = {
  apertureM: 0.4,
  obstructionFraction: 0.35,
  throughput: 0.6,
  band: 'V',
  readNoiseE: 9,
  darkCurrentEPerS: 0.02,
  gainEPerAdu: 1.3,
  saturationE: 60000,
  pixelScaleArcsec: 1.2,
  seeingFwhmArcsec: 1.6,
  systematicFloorMmag: 1.5,
  scintillationModel: 'young1967',
  overheadSeconds: 60,
  minExposureSeconds: 2,
  maxExposureSeconds: 300,
  altitudeLimitDeg: 30,
  sunAltitudeLimitDeg: -12,
  weatherLossFraction: 0.25,
  rateMinorPerHour: 4850,
  currency: 'eur',
};
const SITE: SiteSpec = { latitudeDeg: 28.76, longitudeDeg: -17.88, elevationM: 2326, timeZone: 'UTC', skyBrightnessMagPerArcsec2: 21.6 };
const SUMMARY_NODE = { ...NODE, code: 'N1', site: { name: 'Hollin Moor' } };
const star = (over: Partial<TargetPlanTarget> = {}): TargetPlanTarget => ({
  colour: { value: 1.1, system: 'BPRP' },
  ageMyr: 800,
  ageUncertaintyMyr: 100,
  magnitude: { value: 11.5, band: 'G' },
  ...over,
});
const summaryOf = (target: TargetPlanTarget, combined: NodeTargetPlan | null = null) =>
  buildPlanSummary({
    plan: combined?.plan ?? computeTargetPlan(target, NODE, SITE),
    node: SUMMARY_NODE,
    combined,
    skyStatus: 'Sky window not checked yet.',
    locale: 'en-US',
  });

describe('plan-summary', () => {
  it('a K dwarf: feasible, with the decision numbers in order and the fee as money', () => {
    const plan = computeTargetPlan(star(), NODE, SITE);
    const s = summaryOf(star());
    expect(s.tone).toBe('feasible');
    expect(s.title).toBe('Feasible on N1');
    expect(s.figures.map((f) => f.key)).toEqual([
      'period',
      'amplitude',
      'precision',
      'visits',
      'cadence',
      'baseline',
      'nodeHours',
      'fee',
      'completeness',
    ]);
    const q = plan.quantities;
    const fig = (key: string) => s.figures.find((f) => f.key === key)!;
    expect(fig('period').value).toBe(formatValue(q.periodDays.value, 'en-US'));
    expect(fig('period').detail).toBe(
      `plausible ${formatValue(q.shortestPeriodDays.value, 'en-US')}–${formatValue(q.longestPeriodDays.value, 'en-US')} d`,
    );
    expect(fig('visits').value).toBe(formatValue(q.visits.value, 'en-US', { integer: true }));
    expect(fig('fee').value).toBe('€517.50');
    expect(fig('fee').detail).toBe('at €48.50 per node-hour');
    expect(fig('completeness').value).toBe('90 %');
    expect(s.reasons).toEqual([]);
    expect(s.sky).toBe('Sky window not checked yet.');
    expect(JSON.stringify(s)).not.toMatch(/minor units|NaN|undefined/);
  });

  it('cadence: one story, the same words in the summary tile and the explanation', () => {
    const plan = computeTargetPlan(star(), NODE, SITE);
    const story = cadenceStory(plan, 'en-US');
    expect(story.visitNights).toBe('Every night');
    expect(story.detail).toBe(`2 visits per night · ${plan.quantities.visitNights.value} visit nights · sample interval 1.02 d`);
    expect(story.why).toContain('sample interval of 1.02 d');
    expect(story.why).toContain('Visit nights every night, 2 visits per night');
    const tile = summaryOf(star()).figures.find((f) => f.key === 'cadence')!;
    expect(tile).toMatchObject({ label: 'Cadence', value: 'Every night', detail: '2 visits per night · sample interval 1.02 d' });
  });

  it('an old, faint star whose spots the node cannot detect: not feasible, the reason and the ways out each said once', () => {
    const s = summaryOf(star({ ageMyr: 4000, magnitude: { value: 15, band: 'G' } }));
    expect(s.tone).toBe('infeasible');
    expect(s.title).toBe('Not feasible on N1');
    expect(s.reasons).toHaveLength(1);
    expect(s.reasons[0]).toMatch(/^The expected semi-amplitude/);
    expect(s.wayOut.length).toBeGreaterThan(0);
    expect(new Set(s.wayOut).size).toBe(s.wayOut.length);
  });

  it('a feasible but costly plan carries a warning and the cheaper completeness as the first way out', () => {
    const plan = computeTargetPlan(star(), NODE, SITE);
    // The same plan with many visits per night (as a sizing at the node's limit would give).
    plan.quantities.visitsPerNight = { ...plan.quantities.visitsPerNight, value: 60 };
    plan.quantities.visits = { ...plan.quantities.visits, value: 6180 };
    const s = buildPlanSummary({ plan, node: SUMMARY_NODE, combined: null, skyStatus: null, locale: 'en-US' });
    expect(s.tone).toBe('warning');
    expect(s.title).toBe('Feasible on N1 only at a high cost');
    expect(s.warnings).toHaveLength(2);
    expect(s.wayOut[0]).toMatch(/^Ask for 50 % completeness: \d+ visits, about [\d.]+ node-hours\.$/);
  });

  it('a bright star that saturates: not feasible, and its thousands of visits carry a warning too', () => {
    const s = summaryOf(star({ magnitude: { value: 8, band: 'G' } }));
    expect(s.tone).toBe('infeasible');
    expect(s.reasons.join(' ')).toContain('saturates even at the shortest exposure');
    expect(s.warnings.join(' ')).toMatch(/^[\d,]+ visits \([\d.]+ node-hours\) for one star/);
    expect(s.wayOut.join(' ')).toContain('smaller aperture or a redder band');
  });

  it('a caution of the core that the plan holds the node for most nights: a warning, its cheaper options said once among the ways out', () => {
    const plan = computeTargetPlan(star(), NODE, SITE);
    plan.flags.push({
      code: 'nightsFilled',
      severity: 'caution',
      message:
        'the visits fill 4.1 h of the 6 observable hours on each of 103 nights: this one star would hold the node for most of its nights; 50 % completeness needs 118 visits (6.12 node-hours)',
    });
    const s = buildPlanSummary({ plan, node: SUMMARY_NODE, combined: null, skyStatus: null, locale: 'en-US' });
    expect(s.tone).toBe('warning');
    expect(s.warnings).toEqual([
      'The visits fill 4.1 h of the 6 observable hours on each of 103 nights: this one star would hold the node for most of its nights.',
    ]);
    expect(s.wayOut[0]).toMatch(/^Ask for 50 % completeness: 118 visits/);
  });

  it('no expected period: not feasible, no visits or fee stated, the period asked for', () => {
    const s = summaryOf(star({ ageMyr: 14000 }));
    expect(s.tone).toBe('infeasible');
    expect(s.title).toBe('Not feasible on N1: no expected period');
    expect(s.figures.map((f) => f.key)).toEqual(['period']);
    expect(s.reasons[0]).toContain('exceeds the age of the universe');
    expect(s.wayOut[0]).toContain('Period field');
  });

  it('uniqueSentences: the same sentence once, whatever its case and final stop', () => {
    expect(uniqueSentences(['the star saturates', 'The star saturates.', 'other'])).toEqual(['The star saturates.', 'Other.']);
    expect(invalidSummary('Fix it.')).toMatchObject({ tone: 'invalid', title: 'No plan yet', lead: 'Fix it.', figures: [] });
  });
});
