import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting, TestRequest } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatDialog } from '@angular/material/dialog';
import { provideRouter } from '@angular/router';
import type { NightPlanBuildStatus } from '@spincycle/shared/night-plans/night-plans';
import { CalendarLinkDialog } from '../calendar-link-dialog/calendar-link-dialog';
import { NightDialog } from '../night-dialog/night-dialog';
import { NIGHT_PLAN_POLL_MS } from '../night-plans-api';
import { testBuild, testOverview, testTimeline } from '../testing/night-plan-fixtures';
import NightPlanPage from './night-plan-page';

const OVERVIEW = '/api/night-plans/cycles/7';
const LATEST = '/api/night-plans/cycles/7/builds/latest';
const isTimeline = (r: { url: string }) => r.url === '/api/night-plans/cycles/7/nodes/3/timeline';

describe('NightPlanPage', () => {
  let fixture: ComponentFixture<NightPlanPage>;
  let backend: HttpTestingController;
  const el = () => fixture.nativeElement as HTMLElement;
  const text = (sel: string) => el().querySelector(sel)?.textContent?.replace(/\s+/g, ' ').trim() ?? null;
  /** One turn of the event loop: the poll's timer (0 ms in these tests) fires. */
  const turn = () => new Promise((resolve) => setTimeout(resolve));

  async function render(): Promise<void> {
    TestBed.configureTestingModule({
      imports: [NightPlanPage],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: NIGHT_PLAN_POLL_MS, useValue: 0 },
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(NightPlanPage);
    fixture.componentRef.setInput('cycleId', '7');
    TestBed.tick();
  }
  afterEach(() => backend.verify());

  /** Not whenStable: a pending read (the timeline's) holds it off until answered. */
  async function settle(): Promise<void> {
    await turn();
    TestBed.tick();
    await turn();
    TestBed.tick();
  }

  it('renders the overview: last build, the node with its timeline, the programs and the exports', async () => {
    await render();
    backend.expectOne(OVERVIEW).flush(testOverview());
    await settle();
    backend.expectOne(isTimeline).flush(testTimeline());
    await settle();
    expect(text('h1')).toBe('Night plans of 2027A');
    expect(text('[data-testid=build-last]')).toContain('Last built 20 Feb 2027, 09:00 UTC.');
    expect(text('[data-testid=build-button]')).toContain('Build the night plans again');
    expect(text('[data-testid=node-summary-3]')).toContain(
      '46 nights (1 lost); 14 of 120 planned visits done; 210.5 h of visits in 402 h of darkness.',
    );
    expect(el().querySelectorAll('app-node-timeline button.night')).toHaveLength(3);
    expect(el().querySelector('[data-testid=program-21]')).not.toBeNull();
    expect(el().querySelector('[data-testid=program-22]')).not.toBeNull();
    expect(el().querySelector('[data-testid=export-csv-3]')?.getAttribute('href')).toBe('/api/night-plans/cycles/7/nodes/3/plan.csv');
    expect(el().querySelector('[data-testid=export-ics-3]')?.getAttribute('href')).toBe('/api/night-plans/cycles/7/nodes/3/plan.ics');
    expect(text('[data-testid=exports-hint]')).toContain(
      "subscribe in your calendar application with the node's subscription link: the calendar then updates itself",
    );
    expect(text('[data-testid=calendar-link-3]')).toBe('calendar_add_on Subscription link of KRG-50');
    expect(el().querySelector('[data-testid=build-progress]')).toBeNull();
  });

  it('no build yet: says so, offers "Build night plans", and shows no nights', async () => {
    await render();
    backend.expectOne(OVERVIEW).flush(testOverview({ build: null }));
    await settle();
    expect(text('[data-testid=build-none]')).toContain('No night plans have been built for this cycle yet.');
    expect(text('[data-testid=build-button]')).toBe('auto_mode Build night plans');
    expect(el().querySelector('[data-testid=nodes-section]')).toBeNull();
  });

  it('build: the bar follows the polled statuses as percentages and words, then the page reads the plans again', async () => {
    await render();
    backend.expectOne(OVERVIEW).flush(testOverview({ build: null }));
    await settle();
    (el().querySelector('[data-testid=build-button]') as HTMLButtonElement).click();
    const post = backend.expectOne('/api/night-plans/cycles/7/builds');
    expect(post.request.method).toBe('POST');
    const queued: NightPlanBuildStatus = testBuild({ id: 41, state: 'queued', done: 0, total: 0, startedAt: null, finishedAt: null });
    post.flush(queued);
    await settle();
    expect(text('[data-testid=build-words]')).toBe('Building the night plans: waiting to start.');
    expect(text('[data-testid=build-percent]')).toBe('0 %');
    expect((el().querySelector('[data-testid=build-button]') as HTMLButtonElement).disabled).toBe(true);

    const poll = async (status: Partial<NightPlanBuildStatus>): Promise<TestRequest> => {
      await settle();
      const req = backend.expectOne(LATEST);
      expect(req.request.method).toBe('GET');
      req.flush({ ...queued, ...status });
      await settle();
      return req;
    };
    // 120 of 300 = 40 %; 291 of 300 = 97 % (floored) — worked by hand in this test.
    await poll({ state: 'running', done: 120, total: 300 });
    expect(text('[data-testid=build-percent]')).toBe('40 %');
    expect(el().querySelector('[data-testid=build-progress]')?.getAttribute('aria-valuenow')).toBe('40');
    expect(text('[data-testid=build-words]')).toBe('Building the night plans: 120 of 300 steps done (40 %).');
    await poll({ state: 'running', done: 291, total: 300 });
    expect(text('[data-testid=build-percent]')).toBe('97 %');
    await poll({ state: 'done', done: 300, total: 300, finishedAt: '2027-02-21T08:00:00Z' });

    // Done: no bar, the time of the build, and the overview read again.
    expect(el().querySelector('[data-testid=build-progress]')).toBeNull();
    expect(text('[data-testid=build-last]')).toContain('Last built 21 Feb 2027, 08:00 UTC.');
    backend.expectOne(OVERVIEW).flush(testOverview({ build: testBuild({ id: 41, finishedAt: '2027-02-21T08:00:00Z' }) }));
    await settle();
    backend.expectOne(isTimeline).flush(testTimeline());
    await settle();
    backend.expectNone(LATEST);
  });

  it('a failed build says why in plain words', async () => {
    await render();
    backend.expectOne(OVERVIEW).flush(testOverview({ build: testBuild({ state: 'running', done: 10, total: 300, finishedAt: null }) }));
    await settle();
    backend.expectOne(isTimeline).flush(testTimeline());
    expect(text('[data-testid=build-percent]')).toBe('3 %');
    await settle();
    backend.expectOne(LATEST).flush(
      testBuild({
        state: 'failed',
        done: 10,
        total: 300,
        finishedAt: '2027-02-20T09:01:00Z',
        error: 'Node KRG-50 has no sky windows for April.',
      }),
    );
    await settle();
    expect(text('[data-testid=build-failed]')).toContain(
      'The build requested 20 Feb 2027, 09:00 UTC failed: Node KRG-50 has no sky windows for April.',
    );
    expect((el().querySelector('[data-testid=build-button]') as HTMLButtonElement).disabled).toBe(false);
  });

  it('a refused build start shows the server’s words', async () => {
    await render();
    backend.expectOne(OVERVIEW).flush(testOverview({ build: null }));
    await settle();
    (el().querySelector('[data-testid=build-button]') as HTMLButtonElement).click();
    backend
      .expectOne('/api/night-plans/cycles/7/builds')
      .flush({ code: 'busy', message: 'A build is already running.' }, { status: 409, statusText: 'Conflict' });
    await settle();
    expect(text('[data-testid=build-error]')).toBe('The build was not started. A build is already running.');
  });

  it('choosing a night opens its plan in a dialog; a re-plan it starts shows its progress bar', async () => {
    await render();
    backend.expectOne(OVERVIEW).flush(testOverview());
    await settle();
    backend.expectOne(isTimeline).flush(testTimeline());
    await settle();
    const open = jest.spyOn(TestBed.inject(MatDialog), 'open').mockReturnValue({} as never);
    (el().querySelector('[data-testid=night-2027-03-02]') as HTMLButtonElement).click();
    expect(open).toHaveBeenCalledWith(
      NightDialog,
      expect.objectContaining({ data: expect.objectContaining({ cycleId: 7, nodeId: 3, date: '2027-03-02' }) }),
    );
    const data = open.mock.calls[0][1]!.data as { replanned: (b: NightPlanBuildStatus) => void };
    data.replanned(
      testBuild({ id: 42, kind: 'replan', state: 'running', done: 30, total: 120, fromNight: '2027-03-02', finishedAt: null }),
    );
    await settle();
    // The timeline reads its month again (the lost night), and the re-plan's bar shows 30 of 120 = 25 %.
    backend.expectOne(isTimeline).flush(testTimeline());
    expect(text('[data-testid=build-words]')).toBe('Re-planning from the night of 2027-03-02: 30 of 120 steps done (25 %).');
    await settle();
    backend.expectOne(LATEST).flush(testBuild({ id: 42, kind: 'replan', state: 'done', done: 120, total: 120, fromNight: '2027-03-02' }));
    await settle();
    backend.expectOne(OVERVIEW).flush(testOverview());
    await settle();
    backend.expectOne(isTimeline).flush(testTimeline());
    await settle();
  });

  it('a node’s "Subscription link" opens its calendar link dialog', async () => {
    await render();
    backend.expectOne(OVERVIEW).flush(testOverview());
    await settle();
    backend.expectOne(isTimeline).flush(testTimeline());
    await settle();
    const open = jest.spyOn(TestBed.inject(MatDialog), 'open').mockReturnValue({} as never);
    (el().querySelector('[data-testid=calendar-link-3]') as HTMLButtonElement).click();
    expect(open).toHaveBeenCalledWith(CalendarLinkDialog, expect.objectContaining({ data: { cycleId: 7, nodeId: 3, nodeCode: 'KRG-50' } }));
  });

  it('error: the message, with a retry', async () => {
    await render();
    backend.expectOne(OVERVIEW).flush({ code: 'not_found', message: 'No such cycle.' }, { status: 404, statusText: 'Not Found' });
    await settle();
    expect(text('[role=alert]')).toContain('The night plans could not be loaded. No such cycle.');
  });
});
