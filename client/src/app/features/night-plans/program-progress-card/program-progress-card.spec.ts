import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { testCompleteProgram, testProgram } from '../testing/night-plan-fixtures';
import { ProgramProgressCard } from './program-progress-card';

describe('ProgramProgressCard', () => {
  let fixture: ComponentFixture<ProgramProgressCard>;
  let backend: HttpTestingController;
  const el = () => fixture.nativeElement as HTMLElement;
  const text = (sel: string) => el().querySelector(sel)?.textContent?.replace(/\s+/g, ' ').trim() ?? null;

  beforeEach(() => {
    TestBed.configureTestingModule({ imports: [ProgramProgressCard], providers: [provideHttpClient(), provideHttpClientTesting()] });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ProgramProgressCard);
    fixture.componentRef.setInput('proposalId', 21);
    TestBed.tick();
  });
  afterEach(() => backend.verify());

  it('shows visits done, planned and required, the recovery with its explanation, and the targets at risk', async () => {
    backend.expectOne('/api/night-plans/programs/21').flush(testProgram());
    await fixture.whenStable();
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
    backend
      .expectOne('/api/night-plans/programs/21')
      .flush(testProgram({ visitsPlanned: 40, targets: testProgram().targets.map((t) => ({ ...t, atRisk: [] })) }));
    await fixture.whenStable();
    expect(text('[data-testid=program-visits]')).toContain('Your targets need 40 visits in all, and all of them are planned.');
    expect(text('[data-testid=program-risks]')).toBe("None: every target's visits keep their cadence as planned.");
  });

  it('complete by its visits: a Complete chip, why, what was done, and no targets at risk any more', async () => {
    backend.expectOne('/api/night-plans/programs/21').flush(testCompleteProgram('visits'));
    await fixture.whenStable();
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
    backend.expectOne('/api/night-plans/programs/21').flush(testCompleteProgram('campaign'));
    await fixture.whenStable();
    expect(text('[data-testid=program-state-chip]')).toBe('Complete');
    // The last night 2027-04-15, written as the `day` pipe writes days (worked by hand in this test).
    expect(text('[data-testid=program-completion]')).toBe(
      'Your program is complete: the campaign ended on 15 Apr 2027. No more visits are planned for it.',
    );
    expect(text('[data-testid=program-visits]')).toBe("20 visits were done; your targets' plans asked for 40.");
  });

  it('complete with no recorded reason: says it is complete, nothing more', async () => {
    backend.expectOne('/api/night-plans/programs/21').flush(testCompleteProgram('visits', { completion: null }));
    await fixture.whenStable();
    expect(text('[data-testid=program-completion]')).toBe('Your program is complete. No more visits are planned for it.');
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
