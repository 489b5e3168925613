import { ComponentFixture, TestBed } from '@angular/core/testing';
import { gyrochroneSeries, periodColourSeries } from '../gyro-curves';
import { PlannerCharts } from './planner-charts';

describe('PlannerCharts', () => {
  let fixture: ComponentFixture<PlannerCharts>;
  const q = (selector: string) => (fixture.nativeElement as HTMLElement).querySelector(selector);

  beforeEach(() => {
    fixture = TestBed.createComponent(PlannerCharts);
  });

  it('without series: the heading only', async () => {
    await fixture.whenStable();
    expect(q('h2')?.textContent).toBe('Gyrochronology');
    expect(q('app-gyrochrone-chart')).toBeNull();
    expect(q('app-period-colour-chart')).toBeNull();
  });

  it('with series: both charts, each with its accessible description', async () => {
    fixture.componentRef.setInput('gyrochrone', gyrochroneSeries({ colour: { value: 1.1, system: 'BPRP' }, relation: 'angus2019', star: null }));
    fixture.componentRef.setInput('periodColour', periodColourSeries({ system: 'BPRP', ageMyr: 800, relation: 'angus2019', star: null }));
    await fixture.whenStable();
    expect(q('app-gyrochrone-chart canvas')?.getAttribute('aria-label')).toContain('Expected rotation period against age');
    expect(q('app-period-colour-chart canvas')?.getAttribute('aria-label')).toContain('against intrinsic colour');
  });
});
