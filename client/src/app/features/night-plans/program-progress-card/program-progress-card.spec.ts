import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { ProgramProgress } from '@spincycle/shared/night-plans/night-plans';
import type { ProgramPhotometry } from '@spincycle/shared/photometry/photometry';
import { testProgram as testPhotometry } from '../../photometry/testing/photometry-fixtures';
import { testCompleteProgram, testProgram } from '../testing/night-plan-fixtures';
import { ProgramProgressCard } from './program-progress-card';

describe('ProgramProgressCard', () => {
  let fixture: ComponentFixture<ProgramProgressCard>;
  let backend: HttpTestingController;
  const el = () => fixture.nativeElement as HTMLElement;
  const text = (sel: string) => el().querySelector(sel)?.textContent?.replace(/\s+/g, ' ').trim() ?? null;

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [ProgramProgressCard],
      providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([])],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ProgramProgressCard);
    fixture.componentRef.setInput('proposalId', 21);
    TestBed.tick();
  });
  afterEach(() => backend.verify());

  /** Answers the program, then the photometry the card asks for once it knows the program exists. */
  async function show(
    program: ProgramProgress,
    photometry: ProgramPhotometry | { status: number; body: object } = testPhotometry({ proposalId: 21 }),
  ) {
    backend.expectOne('/api/night-plans/programs/21').flush(program);
    // The card asks for the photometry once the program has arrived (a macrotask later).
    await new Promise((resolve) => setTimeout(resolve));
    TestBed.tick();
    const request = backend.expectOne('/api/proposals/21/photometry');
    if ('status' in photometry) request.flush(photometry.body, { status: photometry.status, statusText: 'Error' });
    else request.flush(photometry);
    await fixture.whenStable();
  }

  it('shows visits done, planned and required, the recovery with its explanation, and the targets at risk', async () => {
    await show(testProgram());
    expect(text('h2')).toBe('Program progress');
    expect(text('[data-testid=program-state-chip]')).toBe('Observing');
    expect(text('[data-testid=program-state] .visually-hidden')).toBe('Program state:');
    expect(text('[data-testid=program-state] .muted')).toBe('The facility plans your visits night by night on its nodes.');
    expect(el().querySelector('[data-testid=program-completion]')).toBeNull();
    // 34 planned of 40 required: 6 could not be fitted (worked by hand in this test).
    expect(text('[data-testid=program-visits]')).toBe(
      '6 of 34 planned visits done so far. Your targets need 40 visits in all; 6 could not be fitted into the nights awarded.',
    );
    expect(text('[data-testid=recovery-value]')).toBe('81 %');
    expect(el().querySelector('[data-testid=program-recovery-explanation]')).toBeNull();
    (el().querySelector('[data-testid=program-recovery-why]') as HTMLButtonElement).click();
    await fixture.whenStable();
    expect(text('[data-testid=program-recovery-explanation]')).toContain(
      'how likely the planned visits are to reveal a target’s rotation period',
    );
    expect(text('[data-testid=program-risks]')).toContain(
      'Quill-1 (KRG-50): A gap of 9 nights is longer than the 8 nights the cadence allows.',
    );
  });

  it('every visit planned and no target at risk: says so plainly', async () => {
    await show(testProgram({ visitsPlanned: 40, targets: testProgram().targets.map((t) => ({ ...t, atRisk: [] })) }));
    expect(text('[data-testid=program-visits]')).toContain('Your targets need 40 visits in all, and all of them are planned.');
    expect(text('[data-testid=program-risks]')).toBe("None: every target's visits keep their cadence as planned.");
  });

  it('complete by its visits: a Complete chip, why, what was done, and no targets at risk any more', async () => {
    await show(testCompleteProgram('visits'));
    expect(text('[data-testid=program-state-chip]')).toBe('Complete');
    expect(el().querySelector('[data-testid=program-state-chip]')!.classList).toContain('complete');
    expect(text('[data-testid=program-completion]')).toBe(
      'Your program is complete: every target has the visit nights its plan needs. No more visits are planned for it.',
    );
    expect(text('[data-testid=program-visits]')).toBe("36 visits were done; your targets' plans asked for 40.");
    expect(el().querySelector('[data-testid=program-risks]')).toBeNull();
    expect(el().textContent).not.toContain('Targets at risk');
    // The recovery estimate still shows.
    expect(text('[data-testid=recovery-value]')).toBe('81 %');
  });

  it('complete because the campaign ended: says so with the date of its last night', async () => {
    await show(testCompleteProgram('campaign'));
    expect(text('[data-testid=program-state-chip]')).toBe('Complete');
    // The last night 2027-04-15, written as the `day` pipe writes days (worked by hand in this test).
    expect(text('[data-testid=program-completion]')).toBe(
      'Your program is complete: the campaign ended on 15 Apr 2027. No more visits are planned for it.',
    );
    expect(text('[data-testid=program-visits]')).toBe("20 visits were done; your targets' plans asked for 40.");
  });

  it('complete with no recorded reason: says it is complete, nothing more', async () => {
    await show(testCompleteProgram('visits', { completion: null }));
    expect(text('[data-testid=program-completion]')).toBe('Your program is complete. No more visits are planned for it.');
  });

  it('the light curves: how many targets are analysed and measured, with a link to them', async () => {
    await show(testProgram());
    // testPhotometry: 3 of 4 targets analysed, 1 measured (photometry fixtures).
    expect(text('[data-testid=program-photometry]')).toBe(
      '3 of 4 targets analysed, 1 with a measured period. Upload and read the light curves',
    );
    expect(el().querySelector('[data-testid=program-photometry-link]')!.getAttribute('href')).toBe('/proposals/21/photometry');
  });

  it('the light curves before any upload, read by someone who may not upload: says none yet, links to read them', async () => {
    const none = testPhotometry({ proposalId: 21, canUpload: false });
    await show(testProgram(), {
      ...none,
      progress: { ...none.progress, targetsWithPhotometry: 0, targetsAnalysed: 0, targetsMeasured: 0 },
    });
    expect(text('[data-testid=program-photometry]')).toBe('No light curve uploaded yet. Read the light curves');
  });

  it('the light curves answer 409 (no program for them yet): no line and no error', async () => {
    await show(testProgram(), { status: 409, body: { code: 'no_program', message: 'No program yet.' } });
    expect(el().querySelector('[data-testid=program-photometry]')).toBeNull();
    expect(el().querySelector('[data-testid=program-photometry-error]')).toBeNull();
    // The rest of the card stays.
    expect(text('h2')).toBe('Program progress');
  });

  it('the light curves fail otherwise: a quiet line says so, the rest of the card stays', async () => {
    await show(testProgram(), { status: 500, body: { code: 'x', message: 'Broken.' } });
    expect(text('[data-testid=program-photometry-error]')).toBe('The progress of the light curves could not be loaded.');
    expect(text('[data-testid=program-visits]')).toContain('6 of 34 planned visits done so far.');
  });

  it('404 (no plan yet): shows nothing', async () => {
    backend
      .expectOne('/api/night-plans/programs/21')
      .flush({ code: 'not_found', message: 'No program.' }, { status: 404, statusText: 'Not Found' });
    await fixture.whenStable();
    expect(el().querySelector('[data-testid=program-progress-card]')).toBeNull();
    expect(el().querySelector('[role=alert]')).toBeNull();
  });

  it('another failure: a small error state', async () => {
    backend
      .expectOne('/api/night-plans/programs/21')
      .flush({ code: 'x', message: 'Database asleep.' }, { status: 503, statusText: 'Unavailable' });
    await fixture.whenStable();
    expect(text('[role=alert]')).toContain('The progress of your program could not be loaded.');
  });
});
