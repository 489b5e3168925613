import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { signal } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import { provideRouter, Router } from '@angular/router';
import type { SubmissionCheck } from '@spincycle/shared/proposals/proposal-schemas';
import { Clock } from '../../../../core/time/clock';
import { formatLocalInstant } from '../../../../ui/time/date-format';
import { ProposalStore } from '../../proposal-store';
import { testMember, testProposal } from '../../testing/fixtures';
import ProposalSubmit from './proposal-submit';

const NOW = Date.parse('2027-01-10T12:00:00Z');
const READY: SubmissionCheck = { ready: true, problems: [], warnings: [] };

describe('ProposalSubmit', () => {
  let fixture: ComponentFixture<ProposalSubmit>;
  let loader: HarnessLoader;
  let root: HarnessLoader;
  let backend: HttpTestingController;

  async function render(check: SubmissionCheck, proposal = testProposal()): Promise<void> {
    TestBed.configureTestingModule({
      imports: [ProposalSubmit],
      providers: [
        ProposalStore,
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: Clock, useValue: { now: signal(NOW) } },
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    TestBed.inject(ProposalStore).id.set(5);
    fixture = TestBed.createComponent(ProposalSubmit);
    loader = TestbedHarnessEnvironment.loader(fixture);
    root = TestbedHarnessEnvironment.documentRootLoader(fixture);
    TestBed.tick();
    backend.expectOne('/api/proposals/5').flush(proposal);
    backend.expectOne('/api/proposals/5/readiness').flush(check);
    await fixture.whenStable();
  }

  afterEach(() => backend.verify());

  const el = () => fixture.nativeElement as HTMLElement;

  it('not ready: lists each problem with a link to the tab that fixes it, and Submit stays off', async () => {
    await render({
      ready: false,
      problems: [
        { field: 'abstract', message: 'write an abstract of at least 200 characters (it has 35)' },
        { field: 'justification', message: 'upload the justification PDF' },
        { field: 'plans', message: 'the target plans are out of date: recompute them' },
      ],
      warnings: [],
    });
    const items = Array.from(el().querySelectorAll('[data-testid=problems] li'));
    expect(items.map((li) => li.querySelector('span')?.textContent)).toEqual([
      'write an abstract of at least 200 characters (it has 35)',
      'upload the justification PDF',
      'the target plans are out of date: recompute them',
    ]);
    expect(items.map((li) => li.querySelector('a')?.getAttribute('href'))).toEqual(['/overview', '/justification', '/plans']);
    expect(items.map((li) => li.querySelector('a')?.textContent?.trim())).toEqual(['Go to Overview', 'Go to Justification', 'Go to Plans']);
    expect(await (await loader.getHarness(MatButtonHarness.with({ text: 'Submit proposal' }))).isDisabled()).toBe(true);
  });

  it('cautions: infeasible targets and the fee terms; the printable summary link', async () => {
    await render({ ...READY, warnings: [{ field: 'plans', message: '1 of 2 target plans are infeasible as they stand (see the plans)' }] });
    expect(el().querySelector('[data-testid=infeasible-caution]')?.textContent).toContain('1 of 2 target plans are infeasible');
    expect(el().textContent).toContain("the consortium's own terms and local tax rules");
    const summary = Array.from(el().querySelectorAll('a')).find((a) => a.textContent?.includes('Printable summary (PDF)'));
    expect(summary?.getAttribute('href')).toBe('/api/proposals/5/summary.pdf');
  });

  it("capacity: a request above the cycle's capacity is a caution of its own, apart from the infeasible targets, and Submit stays on", async () => {
    await render({
      ...READY,
      warnings: [
        {
          field: 'request',
          message:
            '809.68 node-hours are requested on KRG-50, more than the 620 the cycle offers there; it can be submitted, and the panel sees the overrun',
        },
        { field: 'plans', message: '3 of 120 target plans are infeasible as they stand (see the plans)' },
      ],
    });
    const capacity = el().querySelector('[data-testid=capacity-caution]') as HTMLElement;
    expect(capacity.textContent).toContain("Over the cycle's capacity");
    expect(capacity.textContent).toContain('809.68 node-hours are requested on KRG-50, more than the 620 the cycle offers there');
    expect(capacity.querySelector('a')?.getAttribute('href')).toBe('/overview');
    const infeasible = el().querySelector('[data-testid=infeasible-caution]') as HTMLElement;
    expect(infeasible.textContent).toContain('3 of 120 target plans are infeasible');
    expect(infeasible.textContent).not.toContain('KRG-50');
    expect(await (await loader.getHarness(MatButtonHarness.with({ text: 'Submit proposal' }))).isDisabled()).toBe(false);
  });

  it('capacity: when the cycle blocks overruns, the overrun is on the checklist and Submit stays off', async () => {
    await render({
      ready: false,
      problems: [
        {
          field: 'request',
          message:
            "809.68 node-hours are requested on KRG-50, more than the 620 the cycle offers there; this cycle accepts no request above a node's capacity",
        },
      ],
      warnings: [],
    });
    const item = el().querySelector('[data-testid=problems] li') as HTMLElement;
    expect(item.textContent).toContain('809.68 node-hours are requested on KRG-50');
    expect(item.querySelector('a')?.getAttribute('href')).toBe('/overview');
    expect(el().querySelector('[data-testid=capacity-caution]')).toBeNull();
    expect(await (await loader.getHarness(MatButtonHarness.with({ text: 'Submit proposal' }))).isDisabled()).toBe(true);
  });

  it('submit: amber call to action, confirmation naming the deadline in UTC, then the submitted state', async () => {
    await render(READY);
    // The deadline line: UTC once, then the person's own time only when it reads differently.
    const deadline = (el().querySelector('[data-testid=deadline] span')?.textContent ?? '').replace(/\s+/g, ' ').trim();
    const localLine = formatLocalInstant('2027-01-15T23:59:00Z', 'en-US');
    expect(deadline).toBe(`The call of 2027A closes on 15 Jan 2027, 23:59 UTC${localLine && ` (your time: ${localLine})`}.`);
    const submit = await loader.getHarness(MatButtonHarness.with({ text: 'Submit proposal' }));
    expect(await (await submit.host()).hasClass('cta')).toBe(true);
    await submit.click();
    const dialog = await root.getHarness(MatDialogHarness);
    const local = formatLocalInstant('2027-01-15T23:59:00Z', 'en-US');
    expect(await dialog.getContentText()).toContain(`until the call closes on 15 Jan 2027, 23:59 UTC${local && ` (your time: ${local})`}.`);
    backend.expectNone('/api/proposals/5/submit');
    await (await root.getHarness(MatButtonHarness.with({ text: 'Submit', selector: 'mat-dialog-actions button' }))).click();

    const post = backend.expectOne('/api/proposals/5/submit');
    expect(post.request.method).toBe('POST');
    post.flush(testProposal({ state: 'submitted', editable: false, submittedAt: '2027-01-10T12:00:05Z' }));
    TestBed.tick();
    backend.expectOne('/api/proposals/5/readiness').flush(READY);
    await fixture.whenStable();
    expect(el().querySelector('[data-testid=submitted-state]')?.textContent).toContain('Submitted on');
    expect(el().querySelector('[data-testid=submitted-state]')?.textContent).toContain('10 Jan 2027, 12:00 UTC');
    expect(el().querySelector('[data-testid=submitted-state]')?.textContent?.match(/12:00/g)).toHaveLength(1);
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: 'Submit proposal' }))).toHaveLength(0);
    expect(await loader.getHarness(MatButtonHarness.with({ text: 'Withdraw' }))).toBeTruthy();
  });

  it('422 call_closed: shows the server message with the deadline, and the proposal stays a draft', async () => {
    await render(READY);
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Submit proposal' }))).click();
    await (await root.getHarness(MatButtonHarness.with({ text: 'Submit', selector: 'mat-dialog-actions button' }))).click();
    const message = 'The call for 2027A closed at 15 Jan 2027 23:59 UTC: submissions are no longer accepted';
    backend
      .expectOne('/api/proposals/5/submit')
      .flush({ code: 'call_closed', message, fieldErrors: { callClosesAt: [message] } }, { status: 422, statusText: 'Unprocessable' });
    TestBed.tick();
    backend.expectOne('/api/proposals/5/readiness').flush(READY);
    await fixture.whenStable();
    expect(el().querySelector('[data-testid=action-error]')?.textContent?.trim()).toBe(message);
    expect(el().querySelector('[data-testid=submitted-state]')).toBeNull();
    expect(TestBed.inject(ProposalStore).proposal()?.state).toBe('draft');
  });

  it('a co-investigator sees the checklist but no Submit button', async () => {
    await render(READY, testProposal({ myRole: 'coi', team: [testMember(1, { role: 'pi' }), testMember(2)] }));
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: 'Submit proposal' }))).toHaveLength(0);
    expect(el().textContent).toContain('Only the PI submits the proposal.');
  });

  it('delete draft: after confirming, DELETEs the proposal and goes back to the list', async () => {
    await render(READY);
    const navigateByUrl = jest.spyOn(TestBed.inject(Router), 'navigateByUrl').mockResolvedValue(true);
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Delete draft' }))).click();
    backend.expectNone('/api/proposals/5');
    await (await root.getHarness(MatButtonHarness.with({ text: 'Delete draft', selector: 'mat-dialog-actions button' }))).click();
    const del = backend.expectOne((req) => req.method === 'DELETE' && req.url === '/api/proposals/5');
    del.flush(null, { status: 204, statusText: 'No Content' });
    await fixture.whenStable();
    expect(navigateByUrl).toHaveBeenCalledWith('/proposals');
  });
});
