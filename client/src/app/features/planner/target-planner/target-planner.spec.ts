import { provideRouter } from '@angular/router';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatButtonToggleHarness } from '@angular/material/button-toggle/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { computeNodeTargetPlan } from '@spincycle/shared/planning/node-target-plan';
import { targetWindowsFromReport } from '@spincycle/shared/planning/sky-report-adapter';
import type { SkyWindowsResponse } from '@spincycle/shared/planning/sky-windows-request';
import { computeTargetPlan, type TargetPlanTarget } from '@spincycle/shared/science/target-plan';
import { computeSkyWindows } from '@spincycle/shared/sky/sky-windows';
import { skyLimitsForNode, toSkyWindowsReport } from '@spincycle/shared/sky/sky-windows-report';
import { formatValue } from '../plan-display';
import { PLANNER_DEFAULTS, RECOMPUTE_DEBOUNCE_MS } from '../planner-form';
import type { CycleSummary, TelescopeNode } from '@spincycle/shared/facility/facility-types';
import { TEST_CYCLE, TEST_SITE, testNode } from '../planner-test-data';
import TargetPlanner from './target-planner';

const SITE = TEST_SITE;
const node = testNode;

const N1 = node(1, 'N1');
const N2 = node(2, 'N2', { apertureM: 1.0, band: 'R' });

const CYCLE = TEST_CYCLE;

const DEFAULT_TARGET: TargetPlanTarget = {
  name: PLANNER_DEFAULTS.starName,
  colour: { value: PLANNER_DEFAULTS.colourValue, system: PLANNER_DEFAULTS.colourSystem },
  ageMyr: PLANNER_DEFAULTS.ageMyr,
  ageUncertaintyMyr: PLANNER_DEFAULTS.ageUncertaintyMyr,
  magnitude: { value: PLANNER_DEFAULTS.magnitude, band: PLANNER_DEFAULTS.band },
};
const DEFAULT_OPTIONS = {
  falseAlarmProbability: PLANNER_DEFAULTS.falseAlarmProbability,
  completeness: PLANNER_DEFAULTS.completenessPercent / 100,
};

describe('TargetPlanner', () => {
  let fixture: ComponentFixture<TargetPlanner>;
  let backend: HttpTestingController;
  let loader: HarnessLoader;

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [TargetPlanner],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(TargetPlanner);
    loader = TestbedHarnessEnvironment.loader(fixture);
    TestBed.tick();
  });

  afterEach(() => backend.verify());

  const host = () => fixture.nativeElement as HTMLElement;
  const text = () => host().textContent ?? '';
  const q = <T extends Element = HTMLElement>(selector: string) => host().querySelector(selector) as T | null;

  /** Waits out the recompute debounce and lets the view settle. */
  async function settle(): Promise<void> {
    await new Promise((resolve) => setTimeout(resolve, RECOMPUTE_DEBOUNCE_MS + 60));
    await fixture.whenStable();
  }

  async function load(nodes: TelescopeNode[] = [N1, N2], cycles: CycleSummary[] = [CYCLE]): Promise<void> {
    backend.expectOne('/api/nodes').flush(nodes);
    backend.expectOne('/api/cycles').flush(cycles);
    await fixture.whenStable();
    await settle();
  }

  async function type(testId: string, value: string): Promise<void> {
    const input = q<HTMLInputElement>(`[data-testid=${testId}]`)!;
    input.value = value;
    input.dispatchEvent(new Event('input'));
    input.dispatchEvent(new Event('blur'));
    await fixture.whenStable();
  }

  const keyValue = (key: string) => q(`[data-key=${key}] .value .num`)?.textContent?.trim();

  /** The response of POST /api/sky-windows for N1 and N2, computed by the shared core as the server does. */
  function skyResponse(): SkyWindowsResponse {
    const report = (n: TelescopeNode) =>
      toSkyWindowsReport(
        computeSkyWindows({
          site: SITE,
          limits: skyLimitsForNode(n),
          campaign: { firstNight: CYCLE.campaignStart, lastNight: CYCLE.campaignEnd },
          targets: [{ name: 'Star A-17', raDeg: 101.25, decDeg: -16.7 }],
        }),
      );
    // Through JSON, as the browser receives it.
    return JSON.parse(
      JSON.stringify({
        cycle: { id: 7, code: 'C7', campaignStart: CYCLE.campaignStart, campaignEnd: CYCLE.campaignEnd },
        nodes: [N1, N2].map((n) => ({
          nodeId: n.id,
          nodeCode: n.code,
          nodeName: n.name,
          siteName: SITE.name,
          weatherLossFraction: n.weatherLossFraction,
          report: report(n),
        })),
      }),
    );
  }

  it('while loading: a progress bar', async () => {
    expect(host().querySelectorAll('mat-progress-bar')).toHaveLength(1);
    await load();
  });

  it('default inputs: a real plan whose period is the science core’s own, in the plausible range', async () => {
    await load();
    const plan = computeTargetPlan(DEFAULT_TARGET, N1, SITE, DEFAULT_OPTIONS);
    const q0 = plan.quantities;
    expect(keyValue('periodDays')).toBe(formatValue(q0.periodDays.value, 'en-US'));
    expect(q0.periodDays.value).toBeGreaterThan(q0.shortestPeriodDays.value);
    expect(q0.periodDays.value).toBeLessThan(q0.longestPeriodDays.value);
    expect(q(`[data-key=periodDays] .alt`)?.textContent).toContain(
      `plausible ${formatValue(q0.shortestPeriodDays.value, 'en-US')}–${formatValue(q0.longestPeriodDays.value, 'en-US')} d`,
    );
    expect(keyValue('visits')).toBe(formatValue(q0.visits.value, 'en-US', { integer: true }));
    expect(q('[data-key=feeMinor] .value')?.textContent).toContain('€');
    // Each key row explains itself: a why line, a source and a tag chip.
    const row = q('[data-key=periodDays]')!;
    expect(row.querySelector('.why')?.textContent).toContain(q0.periodDays.why.slice(0, 20));
    expect(row.querySelector('.source')?.textContent).toContain('Angus et al. (2019)');
    expect(row.querySelector('.tag-chip')?.textContent?.trim()).toBe('Published relation');
    // The verdict is a live region; the summary gives the decision numbers.
    expect(q('[data-testid=verdict]')?.getAttribute('aria-live')).toBe('polite');
    const headline = q('[data-testid=headline]')!;
    expect(headline.textContent).toContain(plan.feasible ? 'Feasible on N1' : 'Not feasible on N1');
    expect(q('[data-testid=summary-figures] [data-key=visits] .num')?.textContent).toBe(
      formatValue(q0.visits.value, 'en-US', { integer: true }),
    );
    expect(q('[data-testid=summary-figures] [data-key=fee] .num')?.textContent).toBe('€517.50');
    // Explanations open on demand: collapsed panels whose headers are buttons.
    const header = row.querySelector('mat-expansion-panel-header')!;
    expect(header.getAttribute('role')).toBe('button');
    expect(header.getAttribute('aria-expanded')).toBe('false');
    // Completeness beside the visits, as a percentage; the price of other levels; the search band.
    expect(keyValue('completeness')).toBe(`${Math.round(q0.completeness.value * 100)} %`);
    expect(q('[data-key=completeness] .why')?.textContent).toContain(q0.completeness.why.slice(0, 20));
    expect(q('[data-key=completeness] .alt')?.textContent).toContain('asked for 90 %');
    const prices = q('[data-testid=completeness-prices]')!;
    expect(prices.querySelectorAll('tbody tr')).toHaveLength(3);
    expect(prices.querySelector('tr.current th')?.textContent).toContain('90 %');
    expect(prices.querySelector('[data-key=visitsForCompleteness99] td')?.textContent).toBe(
      formatValue(q0.visitsForCompleteness99.value, 'en-US', { integer: true }),
    );
    expect(q('[data-testid=search-band]')?.textContent).toContain(
      `Search the light curve for periods between ${formatValue(1 / plan.analysis.maxFrequencyPerDay, 'en-US')} and ${formatValue(1 / plan.analysis.minFrequencyPerDay, 'en-US')} d at false-alarm probability 0.01`,
    );
    expect(q('[data-key=skyBrightnessMagPerArcsec2] .num')?.textContent).toBe('21.6');
    // No period fields while the relation gives a period.
    expect(q('[data-testid=period-input]')).toBeNull();
    // Every number, and both gyrochronology charts.
    expect(host().querySelectorAll('[data-testid=all-numbers] tbody tr')).toHaveLength(Object.keys(q0).length);
    expect(q('app-gyrochrone-chart canvas')?.getAttribute('aria-label')).toContain('Expected rotation period against age');
    expect(q('app-period-colour-chart canvas')?.getAttribute('aria-label')).toContain('against intrinsic colour');
    expect(text()).not.toMatch(/NaN|Infinity|undefined/);
  });

  it('changing the age recomputes after the debounce', async () => {
    await load();
    const before = keyValue('periodDays');
    await type('age-input', '2500');
    expect(keyValue('periodDays')).toBe(before);
    await settle();
    const expected = computeTargetPlan({ ...DEFAULT_TARGET, ageMyr: 2500 }, N1, SITE, DEFAULT_OPTIONS).quantities.periodDays.value;
    expect(keyValue('periodDays')).toBe(formatValue(expected, 'en-US'));
    expect(keyValue('periodDays')).not.toBe(before);
  });

  it('bad input: the field shows the science core’s message and no NaN appears anywhere', async () => {
    await load();
    await type('age-input', '-5');
    await settle();
    expect(q('[data-testid=age-error]')?.textContent).toContain('Enter an age above 0 Myr (you typed -5).');
    expect(q('[data-testid=age-input]')?.getAttribute('aria-invalid')).toBe('true');
    expect(q('[data-testid=headline]')?.textContent).toContain('Age: Enter an age above 0 Myr (you typed -5).');
    expect(q('[data-testid=key-rows]')).toBeNull();
    expect(text()).not.toMatch(/NaN|Infinity/);

    await type('age-input', '800');
    await type('colour-input', '5');
    await settle();
    expect(q('[data-testid=colour-error]')?.textContent).toContain('Enter a BP−RP colour between 0.56 and 3.35 mag (you typed 5).');
    expect(text()).not.toMatch(/NaN|Infinity/);

    await type('colour-input', '');
    await settle();
    expect(q('[data-testid=colour-error]')?.textContent).toContain('Enter the BP−RP colour.');
    expect(text()).not.toMatch(/NaN|Infinity/);
  });

  it('completeness: 95 % plans for it; 30 % is refused under the field with the range in percent', async () => {
    await load();
    await type('completeness-input', '95');
    await settle();
    const plan95 = computeTargetPlan(DEFAULT_TARGET, N1, SITE, { ...DEFAULT_OPTIONS, completeness: 0.95 });
    expect(q('[data-key=completeness] .alt')?.textContent).toContain('asked for 95 %');
    expect(keyValue('visits')).toBe(formatValue(plan95.quantities.visits.value, 'en-US', { integer: true }));

    await type('completeness-input', '30');
    await settle();
    expect(q('[data-testid=completeness-error]')?.textContent).toContain('Enter a completeness between 50 and 99 % (you typed 30).');
    expect(q('[data-testid=completeness-input]')?.getAttribute('aria-invalid')).toBe('true');
    expect(q('[data-testid=headline]')?.textContent).toContain('Completeness: Enter a completeness between 50 and 99 %');
    expect(q('[data-testid=key-rows]')).toBeNull();
  });

  it('no expected period: the period row says so with the reason, the period field is offered and the proposer’s period is used', async () => {
    await load();
    await type('age-input', '14000');
    await settle();
    expect(keyValue('periodDays')).toBe('No expected period');
    expect(q('[data-key=periodDays] .alt')).toBeNull();
    expect(q('[data-key=periodDays] .why')?.textContent).toContain('The given age 14000 Myr exceeds the age of the universe');
    expect(q('[data-testid=headline]')?.textContent).toContain('Not feasible on N1: no expected period');
    expect(q('[data-testid=summary-reasons]')?.textContent).toContain('exceeds the age of the universe');
    expect(q('[data-testid=summary-way-out]')?.textContent).toContain('Period field');
    expect(q('[data-testid=search-band]')).toBeNull();
    expect(q('[data-testid=completeness-prices]')).toBeNull();
    expect(q('[data-testid=period-needed]')?.textContent).toContain('No relation gives this star a period');
    expect(q('[data-testid=period-input]')).not.toBeNull();
    expect(text()).not.toMatch(/NaN|Infinity/);

    await type('period-input', '30');
    await settle();
    const given = computeTargetPlan({ ...DEFAULT_TARGET, ageMyr: 14000, periodDays: 30 }, N1, SITE, DEFAULT_OPTIONS);
    expect(keyValue('periodDays')).toBe('30');
    expect(given.quantities.periodDays.why).toMatch(/^your input/);
    expect(q('[data-key=periodDays] .why')?.textContent).toMatch(/^your input \(Angus et al\. \(2019\) gives none\)/);
    // The field stays while it holds a value; the notice that a period is needed goes.
    expect(q('[data-testid=period-input]')).not.toBeNull();
    expect(q('[data-testid=period-needed]')).toBeNull();

    await type('period-input', '0.01');
    await settle();
    expect(q('[data-testid=period-error]')?.textContent).toContain('Enter a period between 0.05 and 1000 d (you typed 0.01).');
  });

  it('a fixed exposure outside the node range is refused under the exposure field', async () => {
    await load();
    await (await loader.getHarness(MatButtonToggleHarness.with({ text: 'Fixed' }))).check();
    await type('exposure-input', '1000');
    await settle();
    expect(q('[data-testid=exposure-error]')?.textContent).toContain('Enter an exposure between 2 and 300 s on N1 (you typed 1000).');
    await type('exposure-input', '60');
    await settle();
    expect(keyValue('exposureSeconds')).toBe('60');
    expect(q('[data-key=exposureSeconds] .why')?.textContent).toContain('your input');
  });

  it('a relation that does not cover the colour is reported as not calibrated for it', async () => {
    await load();
    await type('colour-input', '2.0');
    await settle();
    const list = q('[data-testid=uncovered-relations]')?.textContent ?? '';
    expect(list).toContain('Mamajek & Hillenbrand (2008): not calibrated for this colour');
    expect(list).toContain('Angus et al. (2015): not calibrated for this colour');
    expect(list).not.toContain('Angus et al. (2019)');
  });

  it('the star-type helper fills the colour in the chosen system', async () => {
    await load();
    await (await loader.getHarness(MatButtonToggleHarness.with({ text: 'B−V' }))).check();
    const select = await loader.getHarness(MatSelectHarness.with({ selector: '[data-testid=star-type]' }));
    await select.open();
    await select.clickOptions({ text: 'G2V' });
    expect(q<HTMLInputElement>('[data-testid=colour-input]')?.value).toBe('0.65');
    await settle();
    expect(q('[data-key=periodDays] .source')?.textContent).toContain('Barnes (2007)');
  });

  it('nodes fail to load: error state with a retry that asks again', async () => {
    backend
      .expectOne('/api/nodes')
      .flush({ code: 'unavailable', message: 'Down for maintenance.' }, { status: 503, statusText: 'Unavailable' });
    backend.expectOne('/api/cycles').flush([CYCLE]);
    await fixture.whenStable();
    expect(text()).toContain('The nodes could not be loaded.');
    expect(q('[data-testid=key-rows]')).toBeNull();
    const retry = Array.from(host().querySelectorAll('button')).find((b) => b.textContent?.includes('Try again'))!;
    retry.click();
    TestBed.tick();
    backend.expectOne('/api/nodes').flush([N1]);
    await fixture.whenStable();
    await settle();
    expect(q('[data-testid=key-rows]')).not.toBeNull();
  });

  it('no node in the network: says so, no plan', async () => {
    await load([], [CYCLE]);
    expect(text()).toContain('No node is defined in the network yet');
    expect(q('form')).toBeNull();
  });

  it('RA/Dec that cannot be read: the parser’s message under the field, no request', async () => {
    await load();
    await type('ra-input', '25h');
    await type('dec-input', '-20');
    await settle();
    expect(q('[data-testid=ra-error]')?.textContent).toContain(
      'Enter a right ascension between 0 and 24 h (or between 0° and 360°) (you typed 25h).',
    );
    backend.expectNone('/api/sky-windows');
  });

  it('RA/Dec and a cycle: asks for the sky windows on the ticked nodes and draws one chart per node with the plan’s verdict', async () => {
    await load();
    await type('ra-input', '6h45m');
    await type('dec-input', '-16.7');
    await settle();
    const compare = host().querySelectorAll('mat-checkbox input');
    (compare[1] as HTMLInputElement).click();
    await fixture.whenStable();
    await settle();
    const requests = backend.match('/api/sky-windows');
    expect(requests.length).toBeGreaterThanOrEqual(1);
    const request = requests[requests.length - 1];
    expect(request.request.method).toBe('POST');
    expect(request.request.body).toEqual({
      cycleId: 7,
      nodeIds: [1, 2],
      targets: [{ ra: '6h45m', dec: '-16.7' }],
      includeNights: true,
    });
    expect(q('.results mat-progress-bar')).not.toBeNull();

    const response = skyResponse();
    for (const stale of requests.slice(0, -1)) expect(stale.cancelled).toBe(true);
    request.flush(response);
    await fixture.whenStable();

    const charts = host().querySelectorAll('app-sky-window-chart');
    expect(charts).toHaveLength(2);
    const windows = targetWindowsFromReport(response.nodes[0].report.targets[0]);
    const expected = computeNodeTargetPlan(DEFAULT_TARGET, N1, SITE, windows, DEFAULT_OPTIONS).sky.verdict;
    expect(charts[0].querySelector('[data-testid=sky-verdict]')?.textContent).toContain(expected);
    expect(charts[0].querySelectorAll('[data-testid=sky-window-table] tbody tr')).toHaveLength(response.nodes[0].report.nights.length);
    expect(q('[data-testid=headline]')?.textContent).toContain('Sky window from Hollin Moor');
    expect(q('.results mat-progress-bar')).toBeNull();
    expect(q('[data-key=worstSkyBrightnessMagPerArcsec2]')).not.toBeNull();

    // A younger star asks for another cadence: the verdict follows the plan, without asking the server again.
    await type('age-input', '150');
    await settle();
    backend.expectNone('/api/sky-windows');
    const verdict = computeNodeTargetPlan({ ...DEFAULT_TARGET, ageMyr: 150 }, N1, SITE, windows, DEFAULT_OPTIONS).sky.verdict;
    expect(verdict).not.toBe(expected);
    expect(host().querySelector('app-sky-window-chart [data-testid=sky-verdict]')?.textContent).toContain(verdict);
  });

  it('with the sky windows loaded: the plan is the proposal’s (moonlit sky of the usable nights), not the site’s dark sky', async () => {
    await load();
    await type('ra-input', '6h45m');
    await type('dec-input', '-16.7');
    await settle();
    // Before the windows arrive: the site's dark sky, and the row says so.
    expect(q('[data-key=skyBrightnessMagPerArcsec2] .num')?.textContent).toBe(formatValue(SITE.skyBrightnessMagPerArcsec2, 'en-US'));
    expect(q('[data-key=skyBrightnessMagPerArcsec2] .why')?.textContent).toContain("the site's dark sky");

    const response = skyResponse();
    backend.expectOne('/api/sky-windows').flush(response);
    await fixture.whenStable();

    const windows = targetWindowsFromReport(response.nodes[0].report.targets[0]);
    const onSky = computeNodeTargetPlan(DEFAULT_TARGET, N1, SITE, windows, DEFAULT_OPTIONS);
    const sky = onSky.plan.quantities.skyBrightnessMagPerArcsec2;
    // The campaign has full Moons: the moonlit median is brighter than the dark sky.
    expect(sky.value).toBeLessThan(SITE.skyBrightnessMagPerArcsec2);
    expect(q('[data-key=skyBrightnessMagPerArcsec2] .num')?.textContent).toBe(formatValue(sky.value, 'en-US'));
    const why = q('[data-key=skyBrightnessMagPerArcsec2] .why')?.textContent ?? '';
    expect(why).toContain(
      `median sky with the Moon over the ${windows.usableHoursByNight.filter((h) => h > 0).length} nights the target is observable`,
    );
    expect(why).not.toContain('no sky windows given');
    expect(q('[data-key=skyBrightnessMagPerArcsec2] .source')?.textContent).toContain('Krisciunas & Schaefer (1991)');
    expect(q('[data-key=worstSkyBrightnessMagPerArcsec2] .num')?.textContent).toBe(
      formatValue(onSky.plan.quantities.worstSkyBrightnessMagPerArcsec2.value, 'en-US'),
    );
    // The headline and key rows give the proposal's numbers.
    const qs = onSky.plan.quantities;
    expect(keyValue('visits')).toBe(formatValue(qs.visits.value, 'en-US', { integer: true }));
    expect(q('[data-testid=summary-figures] [data-key=visits] .num')?.textContent).toBe(
      formatValue(qs.visits.value, 'en-US', { integer: true }),
    );
    expect(q('[data-testid=summary-figures] [data-key=baseline] .num')?.textContent).toBe(
      formatValue(qs.baselineDays.value, 'en-US', { integer: true }),
    );
    expect(q('[data-testid=headline]')?.textContent).toContain(onSky.feasible ? 'Feasible on N1' : 'Not feasible on N1');
    expect(text()).not.toMatch(/NaN|Infinity|undefined/);
  });

  it('a sky-window report without the Moon’s altitude (older server): the plan keeps the site’s dark sky and says the Moon could not be counted', async () => {
    await load();
    await type('ra-input', '6h45m');
    await type('dec-input', '-16.7');
    await settle();
    const response = skyResponse();
    for (const entry of response.nodes) {
      for (const t of entry.report.targets) t.nights = t.nights?.map(({ moonAltitudeDeg: _absent, ...night }) => night);
    }
    backend.expectOne('/api/sky-windows').flush(response);
    await fixture.whenStable();
    expect(host().querySelectorAll('app-sky-window-chart')).toHaveLength(2);
    expect(q('[data-key=skyBrightnessMagPerArcsec2] .num')?.textContent).toBe(formatValue(SITE.skyBrightnessMagPerArcsec2, 'en-US'));
    expect(q('[data-key=skyBrightnessMagPerArcsec2] .why')?.textContent).toContain('the Moon could not be counted');
    expect(q('[data-testid=headline]')?.textContent).toContain('Sky window from Hollin Moor');
    expect(text()).not.toMatch(/NaN|Infinity|undefined/);
  });

  it('a 400 from the sky windows puts its field errors under RA/Dec', async () => {
    await load();
    await type('ra-input', '101.25');
    await type('dec-input', '-16.7');
    await settle();
    backend.expectOne('/api/sky-windows').flush(
      {
        code: 'validation_failed',
        message: 'Check the targets.',
        fieldErrors: { 'targets.0.dec': ['declination is not accepted here'] },
      },
      { status: 400, statusText: 'Bad Request' },
    );
    await fixture.whenStable();
    expect(q('[data-testid=dec-error]')?.textContent).toContain('Declination is not accepted here.');
    expect(text()).toContain('The sky window could not be computed');
  });

  it('several bad fields: every one marked at once, in the numbers typed, and the summary lists them', async () => {
    await load();
    await type('colour-input', '5');
    await type('age-input', '-5');
    await type('magnitude-input', '30');
    await type('ra-input', '25h');
    await type('dec-input', '95.2');
    await settle();
    expect(q('[data-testid=colour-error]')?.textContent).toContain('(you typed 5)');
    expect(q('[data-testid=age-error]')?.textContent).toContain('(you typed -5)');
    expect(q('[data-testid=magnitude-error]')?.textContent).toContain('Enter a magnitude between −2 and 25 mag (you typed 30).');
    expect(q('[data-testid=ra-error]')?.textContent).toContain('(you typed 25h)');
    expect(q('[data-testid=dec-error]')?.textContent).toContain('Enter a declination between −90° and 90° (you typed 95.2).');
    for (const id of ['colour-input', 'age-input', 'magnitude-input', 'ra-input', 'dec-input']) {
      expect(q(`[data-testid=${id}]`)?.getAttribute('aria-invalid')).toBe('true');
    }
    expect(q('[data-testid=headline]')?.textContent).toContain(
      'Fix the 5 fields marked in red: Colour, Age, Magnitude, Right ascension, Declination.',
    );
    backend.expectNone('/api/sky-windows');
  });

  it('an old, faint star: not feasible, its reason and ways out each said once in the summary, not repeated in the notices', async () => {
    await load();
    await type('age-input', '4000');
    await type('magnitude-input', '15');
    await settle();
    const headline = q('[data-testid=headline]')!;
    expect(headline.getAttribute('data-tone')).toBe('infeasible');
    expect(headline.textContent).toContain('Not feasible on N1');
    const reasons = host().querySelectorAll('[data-testid=summary-reasons] li');
    expect(reasons).toHaveLength(1);
    expect(reasons[0].textContent).toMatch(/^The expected semi-amplitude/);
    const ways = Array.from(host().querySelectorAll('[data-testid=summary-way-out] li')).map((li) => li.textContent?.trim());
    expect(ways.length).toBeGreaterThan(0);
    expect(new Set(ways).size).toBe(ways.length);
    expect(q('[data-testid=flags] [data-code=amplitudeBelowFloor]')).toBeNull();
  });
});
