import { type HttpInterceptorFn, HttpRequest, HttpResponse, provideHttpClient, withInterceptors } from '@angular/common/http';
import { of } from 'rxjs';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatDialog } from '@angular/material/dialog';
import { provideRouter } from '@angular/router';
import type { PlanRunStatus, ProposalPlans as PlansBody, TargetPlanRow } from '@spincycle/shared/proposals/plan-types';
import { ProposalStore } from '../../proposal-store';
import { testPlanRow, testProposal, testTarget } from '../../testing/fixtures';
import ProposalPlans, { PLAN_POLL_MS, rowCompleteness } from './proposal-plans';

function run(overrides: Partial<PlanRunStatus> = {}): PlanRunStatus {
  return { state: 'idle', total: 4, done: 4, startedAt: null, finishedAt: null, error: null, current: true, ...overrides };
}

function body(overrides: Partial<PlansBody> = {}): PlansBody {
  const plans = overrides.plans ?? [];
  return {
    run: run(),
    plans,
    page: 1,
    pageSize: 25,
    matched: plans.length,
    counts: { plans: plans.length, infeasible: plans.filter((p) => !p.feasible).length },
    errors: [],
    ...overrides,
  };
}

const PLANS_URL = '/api/proposals/5/plans';
const MARKERS_URL = '/api/proposals/5/plans/markers';
/** The cluster chart's markers (every plan, unpaged) are answered here, and counted. */
let markerCalls = 0;
const markersStub: HttpInterceptorFn = (req, next) => {
  if (req.url !== MARKERS_URL) return next(req);
  markerCalls++;
  return of(new HttpResponse({ status: 200, body: [{ targetId: 1, nodeId: 1, feasible: true, periodDays: 10.2 }] }));
};
const STATUS_URL = '/api/proposals/5/plans/status';
/** Any request of the plans list, whatever its query. */
const plansList = (req: HttpRequest<unknown>) => req.url === PLANS_URL;

describe('ProposalPlans', () => {
  let fixture: ComponentFixture<ProposalPlans>;
  let backend: HttpTestingController;
  let dialogOpen: jest.Mock;

  function setUp(): void {
    markerCalls = 0;
    dialogOpen = jest.fn();
    TestBed.configureTestingModule({
      imports: [ProposalPlans],
      providers: [
        ProposalStore,
        provideRouter([]),
        provideHttpClient(withInterceptors([markersStub])),
        provideHttpClientTesting(),
        { provide: MatDialog, useValue: { open: dialogOpen } },
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    TestBed.inject(ProposalStore).id.set(5);
    fixture = TestBed.createComponent(ProposalPlans);
    TestBed.tick();
    backend.expectOne('/api/proposals/5').flush(testProposal());
  }

  afterEach(() => {
    backend.verify();
    jest.useRealTimers();
  });

  const el = () => fixture.nativeElement as HTMLElement;

  describe('with a computed set of plans', () => {
    beforeEach(async () => {
      setUp();
      backend.expectOne(plansList).flush(
        body({
          plans: [
            { ...testPlanRow(1, 1), completeness: 0.904 } as TargetPlanRow,
            testPlanRow(2, 1, {
              completeness: null,
              feasible: false,
              reasons: [
                'Only 12 clear nights carry the cadence; 30 are needed.',
                "no expected period: no expected period: the given age 14000 Myr exceeds the age of the universe, 13787 Myr. Give the star's expected period to plan it",
              ],
              suggestions: [{ kind: 'other_node', message: 'Another node of the network may see this target longer in the campaign.' }],
            }),
          ],
        }),
      );
      backend.expectOne('/api/proposals/5/targets').flush([testTarget(1), testTarget(2)]);
      await fixture.whenStable();
    });

    it('highlights the infeasible row and gives its reason and suggestion beneath it', () => {
      const rows = Array.from(el().querySelectorAll('[data-testid=plans-table] tbody tr.mat-mdc-row'));
      const main = rows.filter((row) => !row.classList.contains('detail-row'));
      expect(main).toHaveLength(2);
      expect(main[0].classList).not.toContain('infeasible');
      expect(main[1].classList).toContain('infeasible');
      expect(main[1].textContent).toContain('Infeasible:');
      const details = el().querySelectorAll('[data-testid=infeasible-detail]');
      expect(details).toHaveLength(1);
      expect(details[0].textContent).toContain('Only 12 clear nights carry the cadence; 30 are needed.');
      expect(details[0].textContent).toContain('Another node of the network may see this target longer in the campaign.');
      // Reasons read as sentences, a repeated lead-in said once.
      expect(details[0].textContent).toContain(
        "No expected period: the given age 14000 Myr exceeds the age of the universe, 13787 Myr. Give the star's expected period to plan it.",
      );
      expect(details[0].textContent).not.toMatch(/no expected period: no expected period/i);
    });

    it('fits 1440 px: icon buttons named after their plan, a "scroll sideways" caption in the box, target names cut with a tooltip', () => {
      const box = el().querySelector('[data-testid=plans-table]')!.parentElement!;
      expect(box.classList).toContain('table-fit');
      expect(box.querySelector(':scope > .table-scroll-hint')?.textContent).toContain('Scroll sideways for more columns');
      const actions = Array.from(el().querySelectorAll('[data-testid=plans-table] td.actions button')) as HTMLButtonElement[];
      expect(actions.map((b) => b.getAttribute('aria-label'))[0]).toMatch(/^Explain the plan of .+ on .+$/);
      expect(actions.map((b) => b.getAttribute('aria-label'))[1]).toMatch(/^Sky window of .+ from .+$/);
      expect(actions.every((b) => b.classList.contains('mat-mdc-tooltip-trigger'))).toBe(true);
      expect(el().querySelector('[data-testid=plans-table] td.target-cell .cell-truncate')).not.toBeNull();
    });

    it('shows the completeness of each plan as a percentage, a dash where the row does not carry it', () => {
      // A soft hyphen lets the header break as "Complete-/ness" (the table fits 1440 px).
      const headers = Array.from(el().querySelectorAll('[data-testid=plans-table] th')).map((th) =>
        th.textContent?.replace(/\u00ad/g, '').trim(),
      );
      expect(headers.indexOf('Completeness')).toBe(headers.indexOf('Visits') + 1);
      const cells = Array.from(el().querySelectorAll('[data-testid=completeness-cell]')).map((td) => td.textContent?.trim());
      expect(cells).toEqual(['90 %', '—']);
    });

    it('shows the request per node with its total and the fee caution', () => {
      const table = el().querySelector('[data-testid=request-table]') as HTMLElement;
      expect(table.textContent).toContain('KRG-50');
      expect(table.textContent).toContain('€2,061.25');
      expect(el().querySelector('[data-testid=total-hours]')?.textContent?.trim()).toBe('42.50');
      expect(el().textContent).toContain("the consortium's own terms and local tax rules govern");
    });

    it('the explain button opens the side panel with the row; the sky window button names target and node', () => {
      const buttons = Array.from(el().querySelectorAll('td.actions button')) as HTMLButtonElement[];
      buttons[0].click();
      expect(dialogOpen.mock.calls[0][1].data).toEqual({ proposalId: 5, row: expect.objectContaining({ targetId: 1, nodeId: 1 }) });
      buttons[3].click();
      expect(dialogOpen.mock.calls[1][1].data).toEqual(
        expect.objectContaining({
          proposalId: 5,
          targetId: 2,
          nodeId: 1,
          targetName: 'Lantern 2',
          nodes: [{ nodeId: 1, nodeCode: 'KRG-50' }],
        }),
      );
    });

    it('a target list of one age gets the cluster chart, from every plan (the markers), not from the list page', () => {
      expect(markerCalls).toBe(1);
      expect(el().querySelector('[data-testid=cluster-chart]')).not.toBeNull();
      expect(el().querySelector('[data-testid=cluster-summary]')?.textContent).toContain('2 targets of one age, 650 Myr');
      expect(el().querySelector('canvas')?.getAttribute('aria-label')).toContain(
        'expected rotation period in days against Intrinsic colour (B−V)₀ (mag) at 650 Myr',
      );
    });
  });

  it('opened after a run already finished (e.g. right after an upload): fetches the request per node again', async () => {
    setUp();
    backend.expectOne(plansList).flush(body({ run: run({ finishedAt: '2030-01-01T10:00:00Z' }), plans: [testPlanRow(1, 1)] }));
    backend.expectOne('/api/proposals/5/targets').flush([testTarget(1)]);
    await Promise.resolve();
    TestBed.tick();
    backend.expectOne('/api/proposals/5').flush(testProposal());
  });

  it('targets of different ages: no cluster chart', async () => {
    setUp();
    backend.expectOne(plansList).flush(body({ plans: [testPlanRow(1, 1), testPlanRow(2, 1)] }));
    backend.expectOne('/api/proposals/5/targets').flush([testTarget(1), testTarget(2, { ageMyr: 120 })]);
    await fixture.whenStable();
    expect(el().querySelector('[data-testid=plans-table]')).not.toBeNull();
    expect(el().querySelector('[data-testid=cluster-chart]')).toBeNull();
  });

  it('out of date: says so, and Recompute posts and starts following the run', async () => {
    setUp();
    backend.expectOne(plansList).flush(body({ run: run({ current: false }), plans: [testPlanRow(1, 1)] }));
    backend.expectOne('/api/proposals/5/targets').flush([testTarget(1)]);
    await fixture.whenStable();
    const stale = el().querySelector('[data-testid=plans-stale]') as HTMLElement;
    expect(stale.textContent).toContain('Plans are out of date');
    jest.useFakeTimers();
    (stale.querySelector('button') as HTMLButtonElement).click();
    const post = backend.expectOne('/api/proposals/5/plans/recompute');
    expect(post.request.method).toBe('POST');
    post.flush(run({ state: 'queued', done: 0, total: 1, current: false }));
    TestBed.tick();
    expect(el().querySelector('[data-testid=plan-progress]')?.textContent).toContain('0 of 1 done');
    jest.advanceTimersByTime(PLAN_POLL_MS);
    TestBed.tick();
    backend.expectNone(plansList);
    backend.expectOne(STATUS_URL).flush(run({ state: 'idle', done: 1, total: 1, current: true }));
    TestBed.tick();
    backend.expectOne(plansList).flush(body({ plans: [testPlanRow(1, 1)] }));
    await Promise.resolve();
    TestBed.tick();
    backend.expectOne('/api/proposals/5').flush(testProposal());
  });

  it('while the plans are computed: a determinate bar, the status polled every second, the list fetched once at the end, then no poll', async () => {
    jest.useFakeTimers();
    setUp();
    backend.expectOne('/api/proposals/5/targets').flush([testTarget(1), testTarget(2)]);
    backend.expectOne(plansList).flush(body({ run: run({ state: 'running', done: 1, total: 4, current: false }) }));
    await Promise.resolve();
    TestBed.tick();

    const bar = () => el().querySelector('[data-testid=plan-progress] mat-progress-bar');
    expect(el().querySelector('[data-testid=plan-progress]')?.textContent).toContain('1 of 4 done');
    expect(bar()?.getAttribute('aria-valuenow')).toBe('25');

    backend.expectNone(STATUS_URL);
    jest.advanceTimersByTime(PLAN_POLL_MS - 1);
    TestBed.tick();
    backend.expectNone(STATUS_URL);
    jest.advanceTimersByTime(1);
    TestBed.tick();
    backend.expectOne(STATUS_URL).flush(run({ state: 'running', done: 3, total: 4, current: false }));
    TestBed.tick();
    // The list is not asked for while the run is in progress: only its status.
    backend.expectNone(plansList);
    expect(bar()?.getAttribute('aria-valuenow')).toBe('75');

    // A failed poll is tried again after the same pause.
    jest.advanceTimersByTime(PLAN_POLL_MS);
    TestBed.tick();
    backend.expectOne(STATUS_URL).flush({ code: 'x', message: 'down' }, { status: 503, statusText: 'Unavailable' });
    TestBed.tick();
    backend.expectNone(plansList);

    jest.advanceTimersByTime(PLAN_POLL_MS);
    TestBed.tick();
    backend.expectOne(STATUS_URL).flush(run({ state: 'idle', done: 4, total: 4, finishedAt: '2030-01-01T10:00:00Z' }));
    TestBed.tick();
    // The run ended: the list once, with the plans.
    backend
      .expectOne(plansList)
      .flush(body({ run: run({ finishedAt: '2030-01-01T10:00:00Z' }), plans: [testPlanRow(1, 1), testPlanRow(2, 1)] }));
    await Promise.resolve();
    TestBed.tick();
    expect(el().querySelector('[data-testid=plan-progress]')).toBeNull();
    expect(el().querySelectorAll('[data-testid=plans-table] tbody tr.mat-mdc-row:not(.detail-row)')).toHaveLength(2);
    // The chart's markers are fetched again with the list (once at the start, once at the end).
    expect(markerCalls).toBe(2);
    // The request per node is fetched again, and polling stops.
    backend.expectOne('/api/proposals/5').flush(testProposal());
    jest.advanceTimersByTime(5 * PLAN_POLL_MS);
    TestBed.tick();
    backend.expectNone(STATUS_URL);
    backend.expectNone(plansList);
  });

  it('pages on the server: the paginator shows the match count and asks for the page; sort and filter go back to page 1', async () => {
    setUp();
    const first = backend.expectOne(plansList);
    expect(first.request.params.get('page')).toBe('1');
    expect(first.request.params.get('pageSize')).toBe('25');
    expect(first.request.params.has('sort')).toBe(false);
    const rows = Array.from({ length: 25 }, (_, i) => testPlanRow(i + 1, 1));
    first.flush(body({ plans: rows, matched: 60, counts: { plans: 60, infeasible: 7 } }));
    backend.expectOne('/api/proposals/5/targets').flush([testTarget(1)]);
    await fixture.whenStable();
    expect(el().querySelector('.mat-mdc-paginator-range-label')?.textContent?.trim()).toBe('1 – 25 of 60');
    expect(el().textContent).toContain('Only infeasible (7)');

    (el().querySelector('button.mat-mdc-paginator-navigation-next') as HTMLButtonElement).click();
    TestBed.tick();
    const second = backend.expectOne(plansList);
    expect(second.request.params.get('page')).toBe('2');
    expect(second.request.params.get('pageSize')).toBe('25');
    second.flush(body({ plans: rows.slice(0, 10), page: 2, matched: 60, counts: { plans: 60, infeasible: 7 } }));
    await fixture.whenStable();
    expect(el().querySelector('.mat-mdc-paginator-range-label')?.textContent?.trim()).toBe('26 – 50 of 60');

    // Sorting by node-hours, descending: back to page 1, sorted by the server.
    const header = Array.from(el().querySelectorAll('[data-testid=plans-table] th')).find((th) =>
      th.textContent?.includes('Node-hours'),
    ) as HTMLElement;
    ((header.querySelector('.mat-sort-header-container') as HTMLElement) ?? header).click();
    TestBed.tick();
    let sorted = backend.expectOne(plansList);
    expect(sorted.request.params.get('sort')).toBe('nodeHours');
    expect(sorted.request.params.get('page')).toBe('1');
    sorted.flush(body({ plans: rows, matched: 60, counts: { plans: 60, infeasible: 7 } }));
    await fixture.whenStable();
    ((header.querySelector('.mat-sort-header-container') as HTMLElement) ?? header).click();
    TestBed.tick();
    sorted = backend.expectOne(plansList);
    expect(sorted.request.params.get('sort')).toBe('-nodeHours');
    sorted.flush(body({ plans: rows, matched: 60, counts: { plans: 60, infeasible: 7 } }));
    await fixture.whenStable();

    // Only infeasible: the server filters.
    (el().querySelector('mat-slide-toggle button') as HTMLButtonElement).click();
    TestBed.tick();
    const infeasible = backend.expectOne(plansList);
    expect(infeasible.request.params.get('feasible')).toBe('false');
    expect(infeasible.request.params.get('page')).toBe('1');
    infeasible.flush(body({ plans: rows.slice(0, 7), matched: 7, counts: { plans: 60, infeasible: 7 } }));
    await fixture.whenStable();
    expect(el().querySelector('.mat-mdc-paginator-range-label')?.textContent?.trim()).toBe('1 – 7 of 7');
  });

  it('leaving the tab while the plans are computed stops the polling', async () => {
    jest.useFakeTimers();
    setUp();
    backend.expectOne('/api/proposals/5/targets').flush([]);
    backend.expectOne(plansList).flush(body({ run: run({ state: 'queued', done: 0, total: 4, current: false }) }));
    await Promise.resolve();
    TestBed.tick();
    fixture.destroy();
    jest.advanceTimersByTime(5 * PLAN_POLL_MS);
    TestBed.tick();
    backend.expectNone(plansList);
  });
});

describe('rowCompleteness', () => {
  it('reads the fraction when the row carries it, null otherwise', () => {
    expect(rowCompleteness({ ...testPlanRow(1, 1), completeness: 0.95 } as TargetPlanRow)).toBe(0.95);
    expect(rowCompleteness({ ...testPlanRow(1, 1), completeness: null })).toBeNull();
  });
});
