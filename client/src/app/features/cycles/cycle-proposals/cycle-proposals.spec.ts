import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import { provideRouter } from '@angular/router';
import type { CycleProposalsReport } from '@spincycle/shared/cycles/cycle-proposals';
import type { CycleSummary } from '@spincycle/shared/facility/facility-types';
import { formatLocalInstant } from '../../../ui/time/date-format';
import CycleProposals from './cycle-proposals';

const CYCLE: CycleSummary = {
  id: 7,
  code: '2027A',
  title: 'Lantern season',
  callOpensAt: '2026-11-01T12:00:00Z',
  callClosesAt: '2027-01-16T00:00:00Z',
  campaignStart: '2027-03-01',
  campaignEnd: '2027-08-31',
  anonymousReview: true,
  capacityOverrun: 'warn',
  categories: ['Open clusters'],
  version: 3,
  status: 'open',
  nodes: [
    { nodeId: 1, nodeCode: 'KRG-50', nodeHoursAvailable: 620 },
    { nodeId: 2, nodeCode: 'VHM-40', nodeHoursAvailable: 480 },
  ],
};

const REPORT: CycleProposalsReport = {
  cycle: CYCLE,
  draftCount: 2,
  nodes: [
    {
      nodeId: 1,
      nodeCode: 'KRG-50',
      nodeHoursAvailable: 620,
      requestedNodeHours: 905.18,
      infeasibleNodeHours: 41.2,
      proposals: 2,
      pressure: 1.46,
    },
    {
      nodeId: 2,
      nodeCode: 'VHM-40',
      nodeHoursAvailable: 480,
      requestedNodeHours: 212.5,
      infeasibleNodeHours: 0,
      proposals: 1,
      pressure: 0.443,
    },
  ],
  proposals: [
    {
      id: 11,
      title: 'Lantern cluster rotation survey',
      piName: 'Mara Quillfeather',
      state: 'submitted',
      submittedAt: '2026-12-02T09:30:00Z',
      totalNodeHours: 1022.18,
      overCapacity: true,
      request: [
        {
          nodeId: 1,
          nodeCode: 'KRG-50',
          nodeHours: 809.68,
          infeasibleNodeHours: 41.2,
          targets: 60,
          infeasibleTargets: 3,
          nodeHoursAvailable: 620,
          overCapacity: true,
        },
        {
          nodeId: 2,
          nodeCode: 'VHM-40',
          nodeHours: 212.5,
          infeasibleNodeHours: 0,
          targets: 60,
          infeasibleTargets: 0,
          nodeHoursAvailable: 480,
          overCapacity: false,
        },
      ],
    },
    {
      id: 12,
      title: 'Spot lifetimes in young K dwarfs',
      piName: 'Rhea Tallowmere',
      state: 'submitted',
      submittedAt: '2026-12-01T08:00:00Z',
      totalNodeHours: 95.5,
      overCapacity: false,
      request: [
        {
          nodeId: 1,
          nodeCode: 'KRG-50',
          nodeHours: 95.5,
          infeasibleNodeHours: 0,
          targets: 8,
          infeasibleTargets: 0,
          nodeHoursAvailable: 620,
          overCapacity: false,
        },
      ],
    },
  ],
};

describe('CycleProposals', () => {
  let fixture: ComponentFixture<CycleProposals>;
  let backend: HttpTestingController;

  function render(id = '7'): void {
    TestBed.configureTestingModule({
      imports: [CycleProposals],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(CycleProposals);
    fixture.componentRef.setInput('id', id);
    TestBed.tick();
  }

  afterEach(() => backend.verify());

  const el = () => fixture.nativeElement as HTMLElement;
  const text = (selector: string) => (el().querySelector(selector)?.textContent ?? '').replace(/\s+/g, ' ').trim();

  it('loading: a progress bar until the report arrives', async () => {
    render();
    // Not whenStable: the pending request keeps the application unstable until it is answered.
    fixture.detectChanges();
    expect(el().querySelector('mat-progress-bar')).not.toBeNull();
    backend.expectOne('/api/cycles/7/proposals').flush(REPORT);
    await fixture.whenStable();
    expect(el().querySelector('mat-progress-bar')).toBeNull();
  });

  it('pressure per node: requested of offered, the percentage, over-capacity flagged, infeasible hours apart, drafts not counted', async () => {
    render();
    backend.expectOne('/api/cycles/7/proposals').flush(REPORT);
    await fixture.whenStable();
    expect(text('h1')).toBe('Proposals of 2027A');
    // UTC once, the person's own time only when it reads differently.
    const local = formatLocalInstant('2027-01-16T00:00:00Z', 'en-US');
    expect(text('.page-lead')).toContain(`closes on 16 Jan 2027, 00:00 UTC${local && ` (your time: ${local})`}. Requests`);
    const krg = text('[data-testid=pressure-KRG-50]');
    expect(krg).toContain('905.18 of 620 node-hours');
    expect(krg).toContain('146%');
    expect(krg).toContain('Over capacity');
    expect(krg).toContain('+ 41.2 node-hours of infeasible targets, not requested');
    const vhm = text('[data-testid=pressure-VHM-40]');
    expect(vhm).toContain('212.5 of 480 node-hours');
    expect(vhm).toContain('44%');
    expect(vhm).not.toContain('Over capacity');
    expect(text('.pressure .hint')).toContain('2 drafts are not counted');
    expect(text('.pressure .caution')).toContain("the consortium's own allocation rules");
    // Bars on one scale: the most pressed node fills the track, the capacity mark at 1/1.46 of it.
    const mark = el().querySelector('[data-testid=pressure-KRG-50] .mark') as HTMLElement;
    expect(parseFloat(mark.style.insetInlineStart)).toBeCloseTo(100 / 1.46, 1);
  });

  it('the table: title, PI, state, request per node against capacity with the overrun flagged, total, submitted at (UTC), earliest first', async () => {
    render();
    backend.expectOne('/api/cycles/7/proposals').flush(REPORT);
    await fixture.whenStable();
    const table = await TestbedHarnessEnvironment.loader(fixture).getHarness(MatTableHarness);
    const columns = await table.getCellTextByColumnName();
    expect(columns['title'].text).toEqual(['Spot lifetimes in young K dwarfs', 'Lantern cluster rotation survey']);
    expect(columns['pi'].text).toEqual(['Rhea Tallowmere', 'Mara Quillfeather']);
    expect(columns['state'].text).toEqual(['Submitted', 'Submitted']);
    expect(columns['request'].text[1]).toMatch(/KRG-50\s*809\.68 \/ 620\s*warning\s*Over capacity\s*\+ 41\.2 infeasible/);
    expect(columns['request'].text[1]).toMatch(/VHM-40\s*212\.50 \/ 480/);
    expect(columns['request'].text[0]).not.toContain('Over capacity');
    expect(columns['total'].text).toEqual(['95.50', '1,022.18']);
    expect(columns['submittedAt'].text).toEqual(['1 Dec 2026, 08:00', '2 Dec 2026, 09:30']);
    expect(el().querySelectorAll('tr.over-row')).toHaveLength(1);
  });

  it('empty: the empty message, and the pressure still shows the offered capacity', async () => {
    render();
    backend.expectOne('/api/cycles/7/proposals').flush({
      ...REPORT,
      proposals: [],
      draftCount: 0,
      nodes: REPORT.nodes.map((n) => ({ ...n, requestedNodeHours: 0, infeasibleNodeHours: 0, proposals: 0, pressure: 0 })),
    });
    await fixture.whenStable();
    expect(el().textContent).toContain('No proposal has been submitted to this cycle yet.');
    expect(el().querySelector('[data-testid=cycle-proposals-table]')).toBeNull();
    expect(text('[data-testid=pressure-KRG-50]')).toContain('0 of 620 node-hours');
  });

  it('error: the message and a retry', async () => {
    render();
    backend
      .expectOne('/api/cycles/7/proposals')
      .flush({ code: 'cycle_not_found', message: 'No cycle 7' }, { status: 404, statusText: 'Not Found' });
    await fixture.whenStable();
    expect(text('[role=alert]')).toContain('The proposals of this cycle could not be loaded. No cycle 7');
  });

  it('a malformed address asks for nothing and says so', async () => {
    render('abc');
    await fixture.whenStable();
    expect(text('[role=alert]')).toContain('There is no cycle at this address.');
  });
});
