import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import type { TeamReviewerAnswer } from './team-reviewer-api';
import { TeamReviewerCard } from './team-reviewer-card';

const URL = '/api/review/proposals/7/team-reviewer';

/** Invented names and addresses. */
const REVIEWER = { id: 31, displayName: 'Orrin Vale-Tamsk', email: 'orrin@reviewers.example' };

function answer(overrides: Partial<TeamReviewerAnswer> = {}): TeamReviewerAnswer {
  return {
    proposalId: 7,
    reviewer: null,
    namedAt: null,
    reviewMode: 'distributed',
    reviewDeadline: '2027-03-01T12:00:00Z',
    deadlinePassed: false,
    myRole: 'pi',
    ...overrides,
  };
}

describe('TeamReviewerCard', () => {
  let fixture: ComponentFixture<TeamReviewerCard>;
  let backend: HttpTestingController;
  let loader: HarnessLoader;

  async function render(respond: (req: ReturnType<HttpTestingController['expectOne']>) => void): Promise<void> {
    TestBed.configureTestingModule({
      imports: [TeamReviewerCard],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(TeamReviewerCard);
    fixture.componentRef.setInput('proposalId', 7);
    loader = TestbedHarnessEnvironment.loader(fixture);
    TestBed.tick();
    fixture.detectChanges();
    // Nothing at all while the answer is on its way.
    expect(
      el()
        .innerHTML.replace(/<!--[\s\S]*?-->/g, '')
        .trim(),
    ).toBe('');
    respond(backend.expectOne(URL));
    await fixture.whenStable();
  }

  afterEach(() => backend.verify());

  const el = () => fixture.nativeElement as HTMLElement;
  const card = () => el().querySelector('[data-testid=team-reviewer-card]');
  const text = (id: string) => el().querySelector(`[data-testid=${id}]`)?.textContent?.replace(/\s+/g, ' ').trim() ?? '';
  const nameButton = () => loader.getHarness(MatButtonHarness.with({ text: 'Name reviewer' }));

  async function typeEmail(value: string): Promise<void> {
    await (await loader.getHarness(MatInputHarness.with({ selector: '[data-testid=team-reviewer-email]' }))).setValue(value);
  }

  it('shows nothing for a cycle reviewed by panels, whether or not the answer says so', async () => {
    // The server's answer today: no review mode at all (the same for both modes).
    await render((req) => req.flush({ proposalId: 7, reviewer: null, namedAt: null }));
    expect(card()).toBeNull();
    TestBed.resetTestingModule();
    await render((req) => req.flush(answer({ reviewMode: 'panel' })));
    expect(card()).toBeNull();
  });

  it('shows nothing outside the team (404) or when the answer fails', async () => {
    await render((req) => req.flush({ code: 'proposal_not_found', message: 'No proposal 7' }, { status: 404, statusText: 'Not Found' }));
    expect(card()).toBeNull();
    TestBed.resetTestingModule();
    await render((req) => req.flush({ code: 'x', message: 'Database down.' }, { status: 503, statusText: 'Unavailable' }));
    expect(card()).toBeNull();
  });

  it('distributed, nobody named yet: the deadline, the caution and the PI’s form', async () => {
    await render((req) => req.flush(answer()));
    expect(card()).not.toBeNull();
    expect(text('team-reviewer-name')).toBe('Not named yet');
    expect(text('team-reviewer-deadline')).toContain('2027');
    expect(text('team-reviewer-deadline')).toContain('UTC');
    expect(text('team-reviewer-caution')).toContain('must grade every proposal handed to them by the review deadline');
    expect(text('team-reviewer-caution')).toContain("may set your team's own proposal aside, as the cycle's rules say");
    expect(await (await nameButton()).isDisabled()).toBe(false);
  });

  it('no deadline yet says so', async () => {
    await render((req) => req.flush(answer({ reviewDeadline: null })));
    expect(text('team-reviewer-deadline')).toBe('The facility has not set the review deadline yet');
  });

  it('the PI names a reviewer: a bad address is caught before sending, a good one is sent and shown', async () => {
    await render((req) => req.flush(answer()));
    await typeEmail('not an address');
    await (await nameButton()).click();
    backend.expectNone(URL);
    const field = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: "Reviewer's e-mail" }));
    expect(await field.getTextErrors()).toEqual(['must be an e-mail address']);

    await typeEmail(' Orrin@Reviewers.example ');
    await (await nameButton()).click();
    const req = backend.expectOne(URL);
    expect(req.request.method).toBe('PUT');
    // An e-mail input drops the outer spaces; the server lowercases the address itself.
    expect(req.request.body).toEqual({ email: 'Orrin@Reviewers.example' });
    // The PUT answer as the server sends it today, without the cycle's facts: the card stays.
    req.flush({ proposalId: 7, reviewer: REVIEWER, namedAt: '2027-01-21T10:00:00Z' });
    await fixture.whenStable();
    expect(card()).not.toBeNull();
    expect(text('team-reviewer-name')).toContain('Orrin Vale-Tamsk (orrin@reviewers.example)');
    expect(text('team-reviewer-name')).toContain('named');
    expect(text('team-reviewer-notice')).toBe("Orrin Vale-Tamsk is now your team's reviewer.");
    expect(await (await loader.getHarness(MatInputHarness.with({ selector: '[data-testid=team-reviewer-email]' }))).getValue()).toBe('');
  });

  it('an address of no reviewer: the server’s words under the e-mail field', async () => {
    await render((req) => req.flush(answer()));
    await typeEmail('nobody@example.test');
    await (await nameButton()).click();
    backend.expectOne(URL).flush(
      {
        code: 'validation_failed',
        message: 'email: no reviewer account has this e-mail address',
        fieldErrors: { email: ['no reviewer account has this e-mail address'] },
      },
      { status: 400, statusText: 'Bad Request' },
    );
    await fixture.whenStable();
    const field = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: "Reviewer's e-mail" }));
    expect(await field.getTextErrors()).toEqual(['no reviewer account has this e-mail address']);
    expect(text('team-reviewer-refusal')).toBe('');
    expect(text('team-reviewer-name')).toBe('Not named yet');
  });

  it('a refusal without a field (deadline passed meanwhile, not the PI) shows the server’s message', async () => {
    await render((req) => req.flush(answer({ reviewer: REVIEWER, namedAt: '2027-01-20T09:00:00Z' })));
    await typeEmail('other@reviewers.example');
    await (await nameButton()).click();
    backend
      .expectOne(URL)
      .flush(
        { code: 'deadline_passed', message: 'The review deadline has passed; the team’s reviewer can no longer change' },
        { status: 409, statusText: 'Conflict' },
      );
    await fixture.whenStable();
    expect(text('team-reviewer-refusal')).toBe('The review deadline has passed; the team’s reviewer can no longer change');
    expect(text('team-reviewer-name')).toContain('Orrin Vale-Tamsk');

    await (await nameButton()).click();
    backend
      .expectOne(URL)
      .flush({ code: 'pi_only', message: 'Only the PI can name the team’s reviewer' }, { status: 403, statusText: 'Forbidden' });
    await fixture.whenStable();
    expect(text('team-reviewer-refusal')).toBe('Only the PI can name the team’s reviewer');
  });

  it('a co-investigator sees the name read-only, without the form', async () => {
    await render((req) => req.flush(answer({ myRole: 'coi', reviewer: REVIEWER, namedAt: '2027-01-20T09:00:00Z' })));
    expect(text('team-reviewer-name')).toContain('Orrin Vale-Tamsk');
    expect(el().querySelector('form')).toBeNull();
    expect(el().textContent).toContain("Only the team's PI can name the reviewer.");
  });

  it('after the deadline nobody gets the form', async () => {
    await render((req) => req.flush(answer({ deadlinePassed: true, reviewer: REVIEWER })));
    expect(el().querySelector('form')).toBeNull();
    expect(el().textContent).toContain("The review deadline has passed; the team's reviewer can no longer change.");
  });
});
