import { ComponentFixture, TestBed } from '@angular/core/testing';
import { By } from '@angular/platform-browser';
import type { CadenceAssessment } from '@spincycle/shared/sky/cadence-assessment';
import type { NightDarkReport, TargetWindowsReport } from '@spincycle/shared/sky/sky-windows-report';
import { BaseChartDirective } from 'ng2-charts';
import { skyWindowNights, summaryVerdict } from './sky-window-series';
import { SkyWindowChart } from './sky-window-chart';

const NIGHTS = 30;

function date(i: number): string {
  return new Date(Date.UTC(2026, 2, 1 + i)).toISOString().slice(0, 10);
}

function report(): { target: TargetWindowsReport; nights: NightDarkReport[] } {
  const nights: NightDarkReport[] = Array.from({ length: NIGHTS }, (_, i) => ({
    nightDate: date(i),
    darkness: 'partial',
    darkStartUtc: `${date(i)}T23:40:00Z`,
    darkEndUtc: `${date(i + 1)}T09:10:00Z`,
    darkHours: 9.5,
    moonIllumination: Math.abs(Math.cos((Math.PI * i) / 29.5)),
  }));
  const target: TargetWindowsReport = {
    name: 'Star A-17',
    raDeg: 187.5,
    decDeg: -20,
    summary: {
      firstUsableNight: date(2),
      lastUsableNight: date(29),
      usableNights: 26,
      totalNights: NIGHTS,
      totalUsableHours: 130.25,
      maxNightlyUsableHours: 6.4,
      longestGapNights: 3,
      visibility: 'rises-and-sets',
    },
    nights: nights.map((night, i) => ({
      nightDate: night.nightDate,
      darkStartUtc: night.darkStartUtc,
      darkEndUtc: night.darkEndUtc,
      usableHours: i < 2 || i === 10 || i === 11 ? 0 : 5,
      intervals: [],
      altitudeAtMidDarkDeg: 55,
      moonSeparationDeg: 80,
      moonIllumination: night.moonIllumination,
      ...(i === 20 ? { moonExcluded: true as const } : {}),
    })),
  };
  return { target, nights };
}

describe('SkyWindowChart', () => {
  let fixture: ComponentFixture<SkyWindowChart>;

  async function render(assessment: CadenceAssessment | null = null): Promise<HTMLElement> {
    const { target, nights } = report();
    TestBed.configureTestingModule({ imports: [SkyWindowChart] });
    fixture = TestBed.createComponent(SkyWindowChart);
    fixture.componentRef.setInput('target', target);
    fixture.componentRef.setInput('nights', nights);
    fixture.componentRef.setInput('heading', 'Node N1 at Hollin Moor');
    fixture.componentRef.setInput('assessment', assessment);
    await fixture.whenStable();
    return fixture.nativeElement as HTMLElement;
  }

  const chart = () => fixture.debugElement.query(By.directive(BaseChartDirective)).injector.get(BaseChartDirective);

  it('without an assessment: the verdict comes from the summary, one bar per night', async () => {
    const host = await render();
    expect(host.querySelector('[data-testid=sky-verdict]')?.textContent).toContain('observable on 26 of 30 nights; longest gap 3 nights');
    const data = chart().data!;
    expect(data.labels).toHaveLength(NIGHTS);
    for (const dataset of data.datasets) expect(dataset.data).toHaveLength(NIGHTS);
    expect(data.datasets.map((d) => d.label)).toEqual(['Dark hours (h)', 'Usable hours (h)', 'Moon illuminated (%)']);
  });

  it('with an assessment: shows its verdict and whether the cadence fits', async () => {
    const verdict =
      '26 of 30 nights can hold the visit; longest gap 3 nights; cadence does not fit: a gap of 3 nights without the target is longer than the cadence allows';
    const host = await render({ fits: false, verdict } as CadenceAssessment);
    const line = host.querySelector('[data-testid=sky-verdict]')!;
    expect(line.textContent).toContain(verdict);
    expect(line.classList).toContain('misfit');
  });

  it('axes carry titles with units, Moon on a 0–100 % second axis', async () => {
    await render();
    const scales = chart().options!.scales as Record<string, { title?: { text?: string }; min?: number; max?: number }>;
    expect(scales['x'].title?.text).toMatch(/Night/);
    expect(scales['y'].title?.text).toBe('Hours per night (h)');
    expect(scales['moon'].title?.text).toBe('Moon illuminated (%)');
    expect([scales['moon'].min, scales['moon'].max]).toEqual([0, 100]);
  });

  it('is accessible: labelled canvas, a text summary and a data table with one row per night', async () => {
    const host = await render();
    const canvas = host.querySelector('canvas')!;
    expect(canvas.getAttribute('role')).toBe('img');
    expect(canvas.getAttribute('aria-label')).toContain('usable hours per night over 30 nights');
    expect(host.querySelector('.summary')?.textContent).toContain('130 usable hours in all');
    expect(host.querySelectorAll('[data-testid=sky-window-table] tbody tr')).toHaveLength(NIGHTS);
    expect(host.querySelector('[data-testid=sky-window-table]')?.textContent).toContain('Moon too close');
  });
});

describe('sky-window-series', () => {
  it('joins darkness and Moon by night date and turns the fraction into percent', () => {
    const { target, nights } = report();
    const rows = skyWindowNights(target, [...nights].reverse());
    expect(rows[0]).toEqual({ nightDate: date(0), usableHours: 0, darkHours: 9.5, moonPercent: 100, moonExcluded: false });
    expect(rows[20].moonExcluded).toBe(true);
  });

  it('says "no gap" for consecutive nights and nothing about gaps with one night (gap = nights missed in between)', () => {
    const { target } = report();
    expect(summaryVerdict({ ...target, summary: { ...target.summary, usableNights: 30, longestGapNights: 0 } })).toBe(
      'observable on 30 of 30 nights; no gap',
    );
    expect(summaryVerdict({ ...target, summary: { ...target.summary, usableNights: 1, longestGapNights: null } })).toBe(
      'observable on 1 of 30 nights',
    );
  });

  it('a target never observable says so', () => {
    const { target } = report();
    expect(summaryVerdict({ ...target, summary: { ...target.summary, usableNights: 0, longestGapNights: null } })).toBe(
      'never observable in the 30 nights of the campaign',
    );
  });
});
