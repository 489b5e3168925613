import { ComponentFixture, TestBed } from '@angular/core/testing';
import { computeTargetPlan } from '@spincycle/shared/science/target-plan';
import { buildPlanSummary, invalidSummary } from '../plan-summary';
import { TEST_SITE, testNode } from '../planner-test-data';
import { PlannerHeadline } from './planner-headline';

const N1 = testNode(1, 'N1');
const summaryFor = (ageMyr: number, magnitude: number) =>
  buildPlanSummary({
    plan: computeTargetPlan(
      { colour: { value: 1.1, system: 'BPRP' }, ageMyr, ageUncertaintyMyr: 100, magnitude: { value: magnitude, band: 'G' } },
      N1,
      TEST_SITE,
    ),
    node: N1,
    combined: null,
    skyStatus: 'Sky window not checked yet.',
    locale: 'en-US',
  });

describe('PlannerHeadline', () => {
  let fixture: ComponentFixture<PlannerHeadline>;
  const q = (selector: string) => (fixture.nativeElement as HTMLElement).querySelector(selector);
  const all = (selector: string) => Array.from((fixture.nativeElement as HTMLElement).querySelectorAll(selector));

  beforeEach(() => {
    fixture = TestBed.createComponent(PlannerHeadline);
  });

  it('without a summary: an empty live region, nothing else', async () => {
    await fixture.whenStable();
    expect(q('[data-testid=verdict]')?.getAttribute('role')).toBe('status');
    expect(q('[data-testid=verdict]')?.textContent?.trim()).toBe('');
    expect(q('[data-testid=summary-figures]')).toBeNull();
  });

  it('a feasible plan: the verdict, the decision numbers with units, the sky line', async () => {
    fixture.componentRef.setInput('summary', summaryFor(800, 11.5));
    fixture.componentRef.setInput('nodeCode', 'N1');
    await fixture.whenStable();
    expect(q('[data-testid=headline]')?.getAttribute('data-tone')).toBe('feasible');
    expect(q('[data-testid=verdict]')?.textContent).toContain('Feasible on N1');
    expect(all('[data-testid=summary-figures] dt').map((dt) => dt.textContent?.trim())).toEqual([
      'Expected period',
      'Spot amplitude',
      'Per-visit precision',
      'Visits',
      'Cadence',
      'Baseline',
      'Node-hours',
      'Fee',
      'Completeness',
    ]);
    expect(q('[data-key=fee] .num')?.textContent).toBe('€517.50');
    expect(q('[data-key=period] .unit')?.textContent?.trim()).toBe('d');
    expect(q('[data-key=cadence] .num')?.textContent).toBe('Every night');
    expect(q('[data-testid=summary-sky]')?.textContent).toContain('Sky window not checked yet.');
    expect(q('[data-testid=summary-reasons]')).toBeNull();
  });

  it('an infeasible plan: the reasons, the warnings and the ways out, each once', async () => {
    fixture.componentRef.setInput('summary', summaryFor(800, 8));
    await fixture.whenStable();
    expect(q('[data-testid=headline]')?.getAttribute('data-tone')).toBe('infeasible');
    expect(q('[data-testid=verdict]')?.textContent).toContain('Not feasible on N1');
    expect(all('[data-testid=summary-reasons] li')).toHaveLength(1);
    expect(all('[data-testid=summary-warnings] li').length).toBeGreaterThan(0);
    const ways = all('[data-testid=summary-way-out] li').map((li) => li.textContent?.trim());
    expect(ways.length).toBeGreaterThan(0);
    expect(new Set(ways).size).toBe(ways.length);
  });

  it('an invalid form: what to fix, no numbers', async () => {
    fixture.componentRef.setInput('summary', invalidSummary('Fix the 2 fields marked in red: Colour, Age.'));
    await fixture.whenStable();
    expect(q('[data-testid=headline]')?.getAttribute('data-tone')).toBe('invalid');
    expect(q('[data-testid=verdict]')?.textContent).toContain('No plan yet');
    expect(q('[data-testid=verdict]')?.textContent).toContain('Fix the 2 fields marked in red: Colour, Age.');
    expect(q('[data-testid=summary-figures]')).toBeNull();
  });
});
