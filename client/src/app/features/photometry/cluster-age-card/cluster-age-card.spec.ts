import { ComponentFixture, TestBed } from '@angular/core/testing';
import { By } from '@angular/platform-browser';
import type { ClusterAgeFit, PhotometryTargetRow } from '@spincycle/shared/photometry/photometry';
import { periodFromAge } from '@spincycle/shared/science/gyrochronology';
import { BaseChartDirective } from 'ng2-charts';
import { testAliasRow, testNotDetectedRow, testRow } from '../testing/photometry-fixtures';
import { ClusterAgeCard } from './cluster-age-card';
import { clusterAgeSeries } from './cluster-age-series';

const FIT: ClusterAgeFit = {
  ageMyr: 640,
  lowMyr: 590,
  highMyr: 700,
  members: 2,
  excluded: [{ targetName: 'Lantern-31', reason: 'tentative period' }],
  reducedChiSquare: 2.4,
  method: 'Weighted fit of log age over the members’ periods, Barnes (2007).',
  relation: 'barnes2007',
  relationLabel: 'Barnes (2007)',
};

const rows = (): PhotometryTargetRow[] => [
  testRow(14),
  testRow(15, { colour: 1.05, periodDays: 11.2 }),
  testNotDetectedRow(),
  testAliasRow(),
];

describe('clusterAgeSeries', () => {
  it('places members with a period at their colour, by verdict, with their 1σ range; not-detected targets stay out', () => {
    const s = clusterAgeSeries({ ageMyr: 600, colourSystem: 'BV', fit: FIT }, rows());
    expect(s.members.map((m) => [m.name, m.verdict])).toEqual([
      ['Lantern-14', 'measured'],
      ['Lantern-15', 'measured'],
      ['Lantern-31', 'tentative'],
    ]);
    expect(s.members[0]).toMatchObject({ x: 0.82, y: 8.214, lowDays: 8.214 - 0.034, highDays: 8.214 + 0.034 });
    expect(s.axisLabel).toBe('Intrinsic colour (B−V) (mag)');
  });

  it('draws the relation at the given and the fitted age, the band from the fitted range', () => {
    const s = clusterAgeSeries({ ageMyr: 600, colourSystem: 'BV', fit: FIT }, rows());
    // The sequence is the relation itself: compare one point with the science core (same function, same inputs).
    const point = s.expected[40];
    expect(point.y).toBeCloseTo(periodFromAge('barnes2007', point.x, 600), 10);
    const fitted = s.fitted!.find((p) => Math.abs(p.x - point.x) < 1e-12)!;
    expect(fitted.y).toBeCloseTo(periodFromAge('barnes2007', point.x, 640), 10);
    // Older spins slower: the fitted (640 Myr) sequence lies above the given (600 Myr) one.
    expect(fitted.y).toBeGreaterThan(point.y);
    expect(s.fittedBand!.high[10].y).toBeGreaterThan(s.fittedBand!.low[10].y);
  });

  it('places a reddened member at its intrinsic colour: (B−V)0 = (B−V) − E(B−V)', () => {
    // E(B−V) is the reddening of B−V itself (its definition; common practice, no source).
    const s = clusterAgeSeries({ ageMyr: 600, colourSystem: 'BV', fit: FIT }, [testRow(31, { colour: 0.92, reddeningEbv: 0.1 })]);
    expect(s.members[0].x).toBeCloseTo(0.82, 10);
    expect(s.axisLabel).toBe('Intrinsic colour (B−V) (mag)');
  });

  it('without a fit: no fitted sequence, the default relation of the colour system', () => {
    const s = clusterAgeSeries({ ageMyr: 600, colourSystem: 'BPRP', fit: null }, []);
    expect(s.fitted).toBeNull();
    expect(s.relation).toBe('angus2019');
    expect(s.expected.length).toBeGreaterThan(10);
  });
});

describe('ClusterAgeCard', () => {
  let fixture: ComponentFixture<ClusterAgeCard>;
  const el = () => fixture.nativeElement as HTMLElement;
  const text = (sel: string) => el().querySelector(sel)?.textContent?.replace(/\s+/g, ' ').trim() ?? null;

  async function render(fit: ClusterAgeFit | null, targets = rows()) {
    TestBed.configureTestingModule({ imports: [ClusterAgeCard] });
    fixture = TestBed.createComponent(ClusterAgeCard);
    fixture.componentRef.setInput('cluster', { ageMyr: 600, colourSystem: 'BV', fit });
    fixture.componentRef.setInput('targets', targets);
    await fixture.whenStable();
  }
  const chart = () => fixture.debugElement.query(By.directive(BaseChartDirective)).injector.get(BaseChartDirective);

  it('with a fit: the age with its range, members, reduced χ² with what it means, method and those left out; the chart with both sequences', async () => {
    await render(FIT);
    expect(text('[data-testid=cluster-fitted-age]')).toBe('640 Myr (590–700)');
    expect(text('[data-testid=cluster-members]')).toBe('2');
    expect(text('[data-testid=cluster-chi-square]')).toBe('2.4 (the members scatter more than their uncertainties allow)');
    expect(text('[data-testid=cluster-method]')).toContain('Weighted fit of log age');
    expect(el().textContent).toContain('1 target was left out of the fit');
    const labels = (chart().data?.datasets ?? []).map((d) => d.label);
    expect(labels).toEqual([
      'Fitted age range',
      '',
      'Expected at 600 Myr (Barnes (2007))',
      'Fitted: 640 Myr',
      'Lantern-14 (range)',
      'Lantern-15 (range)',
      'Lantern-31 (range)',
      'Member: period measured',
      'Member: period tentative',
    ]);
    const canvas = el().querySelector('[data-testid=cluster-age-chart] canvas')!;
    expect(canvas.getAttribute('aria-label')).toBe(
      "Rotation period against Intrinsic colour (B−V) (mag) for 3 members with a period (2 measured, 1 tentative). Barnes (2007) sequence at the cluster's given age of 600 Myr, and at the fitted age of 640 Myr (590–700).",
    );
    const scales = chart().options?.scales as Record<string, { type: string; title: { text: string } }>;
    expect(scales['y'].type).toBe('logarithmic');
    expect(scales['y'].title.text).toBe('Rotation period (d)');
  });

  it('without a fit: says why (fewer than two measured members), and draws the expected sequence', async () => {
    await render(null, [testRow(14), testNotDetectedRow()]);
    expect(text('[data-testid=cluster-no-fit]')).toContain('fitted once at least two members have a measured period; one has so far');
    expect(el().querySelector('[data-testid=cluster-fitted-age]')).toBeNull();
    expect((chart().data?.datasets ?? []).map((d) => d.label)).toContain('Expected at 600 Myr (Barnes (2007))');
  });
});
