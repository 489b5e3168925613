import { ComponentFixture, TestBed } from '@angular/core/testing';
import { computeSkyWindows } from '@spincycle/shared/sky/sky-windows';
import { skyLimitsForNode, toSkyWindowsReport } from '@spincycle/shared/sky/sky-windows-report';
import type { SkyPanel } from '../planner-store';
import { TEST_CYCLE, TEST_SITE, testNode } from '../planner-test-data';
import { PlannerSky } from './planner-sky';

const N1 = testNode(1, 'N1');
const REPORT = toSkyWindowsReport(
  computeSkyWindows({
    site: TEST_SITE,
    limits: skyLimitsForNode(N1),
    campaign: { firstNight: TEST_CYCLE.campaignStart, lastNight: TEST_CYCLE.campaignEnd },
    targets: [{ name: 'Star A-17', raDeg: 101.25, decDeg: -16.7 }],
  }),
);

function panel(nodeId: number, planNode: boolean): SkyPanel {
  return {
    nodeId,
    heading: `Node N${nodeId} (N${nodeId}) at Hollin Moor`,
    planNode,
    target: REPORT.targets[0],
    nights: REPORT.nights,
    assessment: null,
    feasible: false,
    reasons: ['The target is observable on too few nights.'],
    suggestions: [{ kind: 'other_node', message: 'Another node of the network may see this target longer in the campaign.' }],
    note: null,
  };
}

describe('PlannerSky', () => {
  let fixture: ComponentFixture<PlannerSky>;
  const host = () => fixture.nativeElement as HTMLElement;

  beforeEach(() => {
    fixture = TestBed.createComponent(PlannerSky);
  });

  it('before a position is given: the hint, no chart', async () => {
    fixture.componentRef.setInput('hint', 'Give the right ascension and declination to see the sky window from the node.');
    await fixture.whenStable();
    expect(host().textContent).toContain('Give the right ascension and declination');
    expect(host().querySelector('app-sky-window-chart')).toBeNull();
  });

  it('loading: a progress bar; an error: its message and a retry that emits', async () => {
    fixture.componentRef.setInput('loading', true);
    await fixture.whenStable();
    expect(host().querySelector('mat-progress-bar')).not.toBeNull();
    fixture.componentRef.setInput('loading', false);
    fixture.componentRef.setInput('error', 'The sky window could not be computed. Try later.');
    await fixture.whenStable();
    let retried = 0;
    fixture.componentInstance.retry.subscribe(() => retried++);
    const alert = host().querySelector('[role=alert]')!;
    expect(alert.textContent).toContain('Try later.');
    (alert.querySelector('button') as HTMLButtonElement).click();
    expect(retried).toBe(1);
  });

  it('one chart per node; the plan’s node sends its reasons to the summary, another node says its own once', async () => {
    fixture.componentRef.setInput('panels', [panel(1, true), panel(2, false)]);
    await fixture.whenStable();
    const panels = host().querySelectorAll('.sky-panel');
    expect(panels).toHaveLength(2);
    expect(host().querySelectorAll('app-sky-window-chart')).toHaveLength(2);
    expect(panels[0].textContent).toContain('in the summary above');
    expect(panels[0].querySelector('.suggestion')).toBeNull();
    expect(panels[1].querySelector('[data-testid=panel-infeasible]')?.textContent).toContain('The target is observable on too few nights.');
    expect(panels[1].querySelectorAll('.suggestion')).toHaveLength(1);
  });
});
