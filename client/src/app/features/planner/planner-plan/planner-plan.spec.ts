import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { computeTargetPlan } from '@spincycle/shared/science/target-plan';
import { plainFlag } from '../../../ui/text/plan-wording';
import { TEST_SITE, testNode } from '../planner-test-data';
import { PlannerPlan } from './planner-plan';

const N1 = testNode(1, 'N1');
const PLAN = computeTargetPlan(
  { colour: { value: 1.1, system: 'BPRP' }, ageMyr: 800, ageUncertaintyMyr: 100, magnitude: { value: 11.5, band: 'G' } },
  N1,
  TEST_SITE,
);

describe('PlannerPlan', () => {
  let fixture: ComponentFixture<PlannerPlan>;
  const host = () => fixture.nativeElement as HTMLElement;
  const q = (selector: string) => host().querySelector(selector) as HTMLElement | null;

  beforeEach(async () => {
    TestBed.configureTestingModule({ providers: [provideRouter([])] });
    fixture = TestBed.createComponent(PlannerPlan);
    fixture.componentRef.setInput('plan', PLAN);
    fixture.componentRef.setInput('nodeCode', 'N1');
    fixture.componentRef.setInput('notices', PLAN.flags.filter((f) => f.severity !== 'blocking').map(plainFlag));
    await fixture.whenStable();
  });

  it('one collapsed panel per decision number, the cadence told once in one panel', () => {
    const keys = Array.from(host().querySelectorAll('mat-expansion-panel.explanation')).map((p) => p.getAttribute('data-key'));
    expect(keys).toEqual([
      'periodDays',
      'rossbyNumber',
      'amplitudeRperPpm',
      'perVisitPrecisionPpm',
      'exposureSeconds',
      'visits',
      'completeness',
      'cadence',
      'baselineDays',
      'skyBrightnessMagPerArcsec2',
      'worstSkyBrightnessMagPerArcsec2',
      'nodeHours',
      'feeMinor',
    ]);
    const cadence = q('[data-key=cadence]')!;
    expect(cadence.querySelector('.num')?.textContent).toBe('Every night');
    expect(cadence.querySelector('.alt')?.textContent).toContain('visits per night');
    expect(cadence.querySelector('.why')?.textContent).toContain('sample interval of 1.02 d');
    expect(q('[data-key=amplitudeRperPpm] mat-panel-title')?.textContent).toBe('Spot amplitude (Rₚₑᵣ)');
  });

  it('every panel links to the section of the Methods page that derives its number', () => {
    const link = (key: string) => q(`[data-key=${key}] .methods-link a`)?.getAttribute('href');
    expect(link('completeness')).toBe('/methods#completeness');
    expect(link('cadence')).toBe('/methods#cadence');
    expect(link('periodDays')).toBe('/methods#gyrochronology');
    for (const panel of Array.from(host().querySelectorAll('mat-expansion-panel.explanation'))) {
      expect(panel.querySelector('.methods-link a')?.textContent).toContain('How this is computed');
    }
  });

  it('a panel opens from the keyboard and shows the reason, the formula and source, and the kind of source', async () => {
    const header = q('[data-key=periodDays] mat-expansion-panel-header')!;
    expect(header.getAttribute('aria-expanded')).toBe('false');
    header.focus();
    header.dispatchEvent(new KeyboardEvent('keydown', { key: 'Enter', keyCode: 13, bubbles: true }));
    await fixture.whenStable();
    expect(header.getAttribute('aria-expanded')).toBe('true');
    const panel = q('[data-key=periodDays]')!;
    expect(panel.querySelector('.why')?.textContent).toContain('Angus et al. (2019) at BP−RP 1.1 and 800 Myr');
    expect(panel.querySelector('.source')?.textContent).toContain('Angus et al. (2019), AJ 158, 173');
    expect(panel.querySelector('.tag-chip')?.textContent).toBe('Published relation');
  });

  it('no developer wording anywhere: provenance notes, code names, raw citation keys, minor units', () => {
    const text = host().textContent ?? '';
    expect(text).not.toMatch(
      /from memory|our choice|Spincycle['’]s choice|no source|\[derived|maxExposure|minor units|young1967|R_per|NaN/,
    );
    expect(q('[data-key=nodeHours] .tag-chip')?.textContent).toBe('Spincycle assumption');
    expect(q('[data-key=feeMinor] .tag-chip')?.textContent).toBe('Node parameter');
    expect(q('[data-key=feeMinor] .num')?.textContent).toBe('€517.50');
  });

  it('the notices, the price of certainty, the search band and every number on demand', () => {
    expect(host().querySelectorAll('[data-testid=flags] li').length).toBe(PLAN.flags.filter((f) => f.severity !== 'blocking').length);
    expect(host().querySelectorAll('[data-testid=completeness-prices] tbody tr')).toHaveLength(3);
    expect(q('[data-testid=search-band]')?.textContent).toContain('Search the light curve for periods between');
    expect(host().querySelectorAll('[data-testid=all-numbers] tbody tr')).toHaveLength(Object.keys(PLAN.quantities).length);
  });
});
