import { ComponentFixture, TestBed } from '@angular/core/testing';
import { By } from '@angular/platform-browser';
import type { ChartDataset, ChartOptions } from 'chart.js';
import { BaseChartDirective } from 'ng2-charts';
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
    fixture.componentRef.setInput(
      'gyrochrone',
      gyrochroneSeries({ colour: { value: 1.1, system: 'BPRP' }, relation: 'angus2019', star: null }),
    );
    fixture.componentRef.setInput('periodColour', periodColourSeries({ system: 'BPRP', ageMyr: 800, relation: 'angus2019', star: null }));
    await fixture.whenStable();
    expect(q('app-gyrochrone-chart canvas')?.getAttribute('aria-label')).toContain('Expected rotation period against age');
    expect(q('app-period-colour-chart canvas')?.getAttribute('aria-label')).toContain('against intrinsic colour');
  });

  it('both charts: period on a log axis with 1–2–5 ticks, the star as the one solid diamond, the shared legend style', async () => {
    const star = {
      ageMyr: 800,
      ageLowMyr: 600,
      ageHighMyr: 1000,
      periodDays: 9,
      periodLowDays: 7,
      periodHighDays: 11,
      colour: { value: 1.1, system: 'BPRP' as const },
    };
    fixture.componentRef.setInput('gyrochrone', gyrochroneSeries({ colour: { value: 1.1, system: 'BPRP' }, relation: 'angus2019', star }));
    fixture.componentRef.setInput('periodColour', periodColourSeries({ system: 'BPRP', ageMyr: 800, relation: 'angus2019', star }));
    await fixture.whenStable();
    const charts = fixture.debugElement.queryAll(By.directive(BaseChartDirective)).map((d) => d.injector.get(BaseChartDirective));
    expect(charts).toHaveLength(2);
    for (const chart of charts) {
      const options = chart.options as ChartOptions<'line'>;
      const y = options.scales!['y'] as { type: string; afterBuildTicks?: unknown; ticks: { callback: (v: number) => string } };
      expect(y.type).toBe('logarithmic');
      expect(y.afterBuildTicks).toEqual(expect.any(Function));
      expect([1, 2, 4, 5, 10, 20].map((v) => y.ticks.callback(v))).toEqual(['1', '2', '', '5', '10', '20']);
      expect(options.plugins?.legend?.position).toBe('bottom');
      expect(options.plugins?.legend?.labels?.usePointStyle).toBe(true);
      const marker = (chart.data!.datasets as ChartDataset<'line'>[]).find((d) => d.label?.startsWith('This star'))!;
      expect(marker).toMatchObject({ showLine: false, pointStyle: 'rectRot', pointRadius: 6, pointBorderWidth: 2 });
    }
    // The age axis is a log axis with the same ticks.
    const age = (charts[0].options as ChartOptions<'line'>).scales!['x'] as { type: string; afterBuildTicks?: unknown };
    expect(age.type).toBe('logarithmic');
    expect(age.afterBuildTicks).toEqual(expect.any(Function));
  });
});
