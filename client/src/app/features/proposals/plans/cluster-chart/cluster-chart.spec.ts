import { ComponentFixture, TestBed } from '@angular/core/testing';
import { By } from '@angular/platform-browser';
import { BaseChartDirective } from 'ng2-charts';
import { testPlanRow, testTarget } from '../../testing/fixtures';
import { ClusterChart, ClusterPointSelection } from './cluster-chart';

describe('ClusterChart', () => {
  let fixture: ComponentFixture<ClusterChart>;

  async function render(
    targets = [testTarget(1, { colour: 0.8 }), testTarget(2, { colour: 1.2 })],
    plans = [testPlanRow(1, 1), testPlanRow(2, 1, { feasible: false }), testPlanRow(2, 2, { feasible: false })],
  ) {
    TestBed.configureTestingModule({ imports: [ClusterChart] });
    fixture = TestBed.createComponent(ClusterChart);
    fixture.componentRef.setInput('targets', targets);
    fixture.componentRef.setInput('plans', plans);
    await fixture.whenStable();
  }

  const chart = () => fixture.debugElement.query(By.directive(BaseChartDirective)).injector.get(BaseChartDirective);

  it('draws a line per relation, the default band and one point group per feasibility, with axis titles in units', async () => {
    await render();
    const labels = (chart().data?.datasets ?? []).map((d) => d.label);
    expect(labels).toEqual([
      'Barnes (2007) ±1σ',
      '',
      'Barnes (2007) (default)',
      'Mamajek & Hillenbrand (2008)',
      'Angus et al. (2015)',
      'Angus et al. (2019)',
      'Target: feasible on every planned node',
      'Target: infeasible on every node',
    ]);
    const scales = chart().options?.scales as Record<string, { title: { text: string } }>;
    expect(scales['x'].title.text).toBe('Intrinsic colour (B−V)₀ (mag)');
    expect(scales['y'].title.text).toBe('Expected rotation period (d)');
  });

  it("period on a log axis with 1–2–5 ticks, markers and legend in the charts' one style", async () => {
    await render();
    const options = chart().options!;
    const y = (options.scales as Record<string, { type: string; afterBuildTicks?: unknown; ticks: { callback: (v: number) => string } }>)[
      'y'
    ];
    expect(y.type).toBe('logarithmic');
    expect(y.afterBuildTicks).toEqual(expect.any(Function));
    expect([0.5, 1, 2, 3, 5, 10].map((v) => y.ticks.callback(v))).toEqual(['0.5', '1', '2', '', '5', '10']);
    expect(options.plugins?.legend?.position).toBe('bottom');
    expect(options.plugins?.legend?.labels?.usePointStyle).toBe(true);
    const datasets = (chart().data?.datasets ?? []) as {
      label?: string;
      pointStyle?: string;
      pointRadius?: number;
      borderDash?: number[];
    }[];
    const byLabel = (label: string) => datasets.find((d) => d.label === label)!;
    expect(byLabel('Target: feasible on every planned node')).toMatchObject({ pointStyle: 'circle', pointRadius: 6 });
    expect(byLabel('Target: infeasible on every node')).toMatchObject({ pointStyle: 'crossRot', pointRadius: 6 });
    // Other relations are thinner lines, not dashed: in the planner a dash means "outside the calibration".
    expect(byLabel('Angus et al. (2015)').borderDash).toEqual([]);
  });

  it('a click on a target marker asks for its sky window on the nodes it was planned on', async () => {
    await render();
    const selections: ClusterPointSelection[] = [];
    fixture.componentInstance.pointSelected.subscribe((s) => selections.push(s));
    const datasets = chart().data?.datasets ?? [];
    const infeasible = datasets.findIndex((d) => d.label === 'Target: infeasible on every node');
    chart().chartClick.emit({ active: [{ datasetIndex: infeasible, index: 0 }] });
    expect(selections).toEqual([{ targetId: 2, nodeIds: [1, 2] }]);

    // A click on a curve asks for nothing.
    chart().chartClick.emit({ active: [{ datasetIndex: 2, index: 10 }] });
    expect(selections).toHaveLength(1);
  });

  it('targets of different ages: nothing is drawn', async () => {
    await render([testTarget(1), testTarget(2, { ageMyr: 4000 })], []);
    expect(fixture.nativeElement.querySelector('canvas')).toBeNull();
  });
});
