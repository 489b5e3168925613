import { signal } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { By } from '@angular/platform-browser';
import { BaseChartDirective } from 'ng2-charts';
import { ColorScheme } from '../../../../core/layout/color-scheme';
import { OKABE_ITO } from '../../../../ui/charts/chart-palette';
import { PRESSURE } from '../testing/panel-fixtures';
import { PressureCharts } from './pressure-charts';

describe('PressureCharts', () => {
  let fixture: ComponentFixture<PressureCharts>;

  function render(dark: boolean): void {
    TestBed.configureTestingModule({
      imports: [PressureCharts],
      providers: [{ provide: ColorScheme, useValue: { isDark: signal(dark) } }],
    });
    fixture = TestBed.createComponent(PressureCharts);
    fixture.componentRef.setInput('report', PRESSURE);
    fixture.detectChanges();
  }

  /** The colours of each chart's datasets, as handed to Chart.js. */
  function colours(): string[][] {
    return fixture.debugElement
      .queryAll(By.directive(BaseChartDirective))
      .map((d) => (d.injector.get(BaseChartDirective).data?.datasets ?? []).map((s) => String(s.backgroundColor)));
  }

  it('light scheme: what is available in the darker blue, which stands out from a light ground', () => {
    render(false);
    expect(colours()).toEqual([
      [OKABE_ITO.vermillion, OKABE_ITO.blue],
      [OKABE_ITO.vermillion, OKABE_ITO.blue],
    ]);
  });

  it('dark scheme: what is available in the sky blue, which stands out from a dark ground', () => {
    render(true);
    expect(colours()).toEqual([
      [OKABE_ITO.vermillion, OKABE_ITO.skyBlue],
      [OKABE_ITO.vermillion, OKABE_ITO.skyBlue],
    ]);
  });
});
