import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatCheckboxHarness } from '@angular/material/checkbox/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatInputHarness } from '@angular/material/input/testing';
import { provideRouter } from '@angular/router';
import type { Proposal } from '@spincycle/shared/proposals/proposal-schemas';
import { testTeamDecision } from '../../awards/testing/award-fixtures';
import { testProgramBilling } from '../../fees/testing/fee-fixtures';
import { testProgram } from '../../night-plans/testing/night-plan-fixtures';
import { testProgram as testPhotometry } from '../../photometry/testing/photometry-fixtures';
import { AUTOSAVE_DEBOUNCE_MS, ProposalStore } from '../proposal-store';
import { testCycle, testProposal } from '../testing/fixtures';
import ProposalOverview, { requestRows } from './proposal-overview';

const pause = () => new Promise((resolve) => setTimeout(resolve, AUTOSAVE_DEBOUNCE_MS + 60));
const isPatch = (req: { method: string; url: string }) => req.method === 'PATCH' && req.url === '/api/proposals/5';

describe('ProposalOverview', () => {
  let fixture: ComponentFixture<ProposalOverview>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [ProposalOverview],
      providers: [
        ProposalStore,
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    TestBed.inject(ProposalStore).id.set(5);
    fixture = TestBed.createComponent(ProposalOverview);
    loader = TestbedHarnessEnvironment.loader(fixture);
    TestBed.tick();
    backend.expectOne('/api/proposals/5').flush(testProposal());
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  const abstract = () => loader.getHarness(MatInputHarness.with({ selector: 'textarea' }));
  const status = () => (fixture.nativeElement.querySelector('[data-testid=save-status]') as HTMLElement).textContent?.trim();

  it('shows the stored values and counts the abstract characters', async () => {
    expect(await (await abstract()).getValue()).toBe('Rotation periods of forty K dwarfs.');
    expect(fixture.nativeElement.querySelector('[data-testid=abstract-count]').textContent).toContain('35 / 4,000 characters');
    expect(await (await loader.getHarness(MatCheckboxHarness.with({ label: 'KRG-50' }))).isChecked()).toBe(true);
  });

  it('autosave: waits for typing to pause, then PATCHes only the changed field with the version read', async () => {
    await (await abstract()).setValue('Rotation periods of forty-two K dwarfs.');
    expect(status()).toBe('Unsaved changes');
    backend.expectNone(isPatch);
    await pause();
    const patch = backend.expectOne(isPatch);
    expect(patch.request.body).toEqual({ version: 3, abstract: 'Rotation periods of forty-two K dwarfs.' });
    expect(status()).toBe('Saving…');
    patch.flush(testProposal({ abstract: 'Rotation periods of forty-two K dwarfs.', version: 4 }));
    await fixture.whenStable();
    expect(status()).toMatch(/(^|\s)Saved \d\d:\d\d$/);

    // The next save names the version the server returned.
    await (await loader.getHarness(MatCheckboxHarness.with({ label: 'VHM-40' }))).check();
    await pause();
    const next = backend.expectOne(isPatch);
    expect(next.request.body).toEqual({ version: 4, nodeIds: [1, 2] });
    next.flush(testProposal({ nodeIds: [1, 2], version: 5 }));
    await fixture.whenStable();
  });

  it('completeness: shows the stored fraction in percent with its hint; a new value is autosaved as the fraction', async () => {
    const completeness = await loader.getHarness(MatInputHarness.with({ selector: '[data-testid=completeness]' }));
    expect(await completeness.getValue()).toBe('90');
    const field = fixture.nativeElement.querySelector('.completeness') as HTMLElement;
    expect(field.textContent).toContain('Completeness');
    expect(field.textContent).toContain('%');
    expect(field.textContent).toContain('Chance that the plan recovers each period; higher costs more visits');
    await completeness.setValue('95');
    await pause();
    const patch = backend.expectOne(isPatch);
    expect(patch.request.body).toEqual({ version: 3, completeness: 0.95 });
    patch.flush(testProposal({ completeness: 0.95, version: 4 }));
    await fixture.whenStable();
    expect(status()).toMatch(/Saved \d\d:\d\d$/);
    expect(await completeness.getValue()).toBe('95');
  });

  it('completeness out of range: the field says why (the shared message) and nothing is sent', async () => {
    const completeness = await loader.getHarness(MatInputHarness.with({ selector: '[data-testid=completeness]' }));
    await completeness.setValue('30');
    await completeness.blur();
    await pause();
    backend.expectNone(isPatch);
    expect(fixture.nativeElement.querySelector('[data-testid=error-completeness]')?.textContent).toContain(
      'completeness must be between 50 % and 99 %',
    );
    expect(status()).toContain('Completeness must be between 50 % and 99 % to save it.');
  });

  it('a 400 naming completeness shows the server message under the field', async () => {
    const completeness = await loader.getHarness(MatInputHarness.with({ selector: '[data-testid=completeness]' }));
    await completeness.setValue('80');
    await pause();
    backend.expectOne(isPatch).flush(
      {
        code: 'invalid_input',
        message: 'Check the highlighted fields',
        fieldErrors: { completeness: ['completeness refused by the server'] },
      },
      { status: 400, statusText: 'Bad Request' },
    );
    await fixture.whenStable();
    expect(fixture.nativeElement.querySelector('[data-testid=error-completeness]')?.textContent).toContain(
      'completeness refused by the server',
    );
  });

  it('409: shows the banner with the server message, keeps the typed text and sends nothing more', async () => {
    const typed = 'A new abstract that someone else did not see.';
    await (await abstract()).setValue(typed);
    await pause();
    backend
      .expectOne(isPatch)
      .flush({ code: 'version_conflict', message: 'Someone else saved this proposal at 14:01.' }, { status: 409, statusText: 'Conflict' });
    await fixture.whenStable();

    const banner = fixture.nativeElement.querySelector('[data-testid=conflict-banner]') as HTMLElement;
    expect(banner).not.toBeNull();
    expect(banner.getAttribute('role')).toBe('alert');
    expect(banner.textContent).toContain('Someone else saved this proposal at 14:01.');
    expect(banner.querySelector('button')?.textContent).toContain('Reload');
    expect(banner.querySelector('[aria-label*=ismiss], .close')).toBeNull();
    expect(await (await abstract()).getValue()).toBe(typed);
    expect(status()).toBe('Not saved');

    await (await abstract()).setValue(`${typed} More.`);
    await pause();
    backend.expectNone(isPatch);
    expect(await (await abstract()).getValue()).toBe(`${typed} More.`);
  });

  it('reload after a conflict: fetches the stored version, fills the form with it and offers the discarded text', async () => {
    await (await abstract()).setValue('Mine.');
    await pause();
    backend.expectOne(isPatch).flush({ code: 'version_conflict', message: 'Changed.' }, { status: 409, statusText: 'Conflict' });
    await fixture.whenStable();

    (fixture.nativeElement.querySelector('[data-testid=conflict-banner] button') as HTMLButtonElement).click();
    TestBed.tick();
    backend.expectOne('/api/proposals/5').flush(testProposal({ abstract: 'Theirs.', version: 4 }));
    await fixture.whenStable();
    expect(fixture.nativeElement.querySelector('[data-testid=conflict-banner]')).toBeNull();
    expect(await (await abstract()).getValue()).toBe('Theirs.');
    expect(fixture.nativeElement.textContent).toContain('Your text before the reload');

    await (await abstract()).setValue('Theirs, and mine.');
    await pause();
    expect(backend.expectOne(isPatch).request.body).toEqual({ version: 4, abstract: 'Theirs, and mine.' });
  });

  it('read-only after submission: the fields are disabled and nothing is sent', async () => {
    TestBed.inject(ProposalStore).replace(testProposal({ state: 'submitted', editable: false, submittedAt: '2027-01-10T10:00:00Z' }));
    await fixture.whenStable();
    expect(await (await abstract()).isDisabled()).toBe(true);
    expect(await (await loader.getHarness(MatCheckboxHarness.with({ label: 'KRG-50' }))).isDisabled()).toBe(true);
  });
});

describe('ProposalOverview request table', () => {
  let fixture: ComponentFixture<ProposalOverview>;
  let backend: HttpTestingController;

  /** The over-capacity case of the demo data: 809.68 node-hours asked of a node offering 620. */
  const OVER = testProposal({
    cycle: testCycle({
      nodes: [
        { nodeId: 1, nodeCode: 'KRG-50', nodeHoursAvailable: 620 },
        { nodeId: 2, nodeCode: 'VHM-40', nodeHoursAvailable: 480 },
      ],
    }),
    nodeIds: [1, 2],
    request: [
      {
        nodeId: 1,
        nodeCode: 'KRG-50',
        nodeHours: 809.68,
        feeMinor: 3643560,
        currency: 'eur',
        targets: 60,
        infeasibleTargets: 3,
        infeasibleNodeHours: 41.2,
      },
      {
        nodeId: 2,
        nodeCode: 'VHM-40',
        nodeHours: 212.5,
        feeMinor: 637500,
        currency: 'eur',
        targets: 60,
        infeasibleTargets: 0,
        infeasibleNodeHours: 0,
      },
    ],
  });

  async function render(proposal = OVER): Promise<void> {
    TestBed.configureTestingModule({
      imports: [ProposalOverview],
      providers: [
        ProposalStore,
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    TestBed.inject(ProposalStore).id.set(5);
    fixture = TestBed.createComponent(ProposalOverview);
    TestBed.tick();
    backend.expectOne('/api/proposals/5').flush(proposal);
    await fixture.whenStable();
  }

  afterEach(() => backend.verify());

  const el = () => fixture.nativeElement as HTMLElement;
  /** Cell texts without the icons' ligature names. */
  const cells = (code: string) =>
    Array.from(el().querySelectorAll(`[data-testid=request-${code}] td`)).map((td) => {
      const copy = td.cloneNode(true) as HTMLElement;
      copy.querySelectorAll('mat-icon').forEach((icon) => icon.remove());
      return copy.textContent?.replace(/\s+/g, ' ').trim();
    });

  it('flags the node whose request exceeds what the cycle offers, with the infeasible hours apart', async () => {
    await render();
    expect(cells('KRG-50')).toEqual(['809.68', '620', '131% Over capacity', '41.20 (3 targets)']);
    expect(el().querySelector('[data-testid=request-KRG-50]')?.classList).toContain('over');
    expect(cells('VHM-40')).toEqual(['212.50', '480', '44%', '—']);
    expect(el().querySelectorAll('[data-testid=over-capacity-flag]')).toHaveLength(1);
    const note = el().querySelector('[data-testid=over-capacity-note]')?.textContent?.replace(/\s+/g, ' ');
    expect(note).toContain('asks more node-hours on KRG-50 than the cycle offers there');
    expect(note).toContain('It can still be submitted');
    // The total stays the feasible request; the infeasible hours are named apart.
    expect(el().querySelector('.summary')?.textContent?.replace(/\s+/g, ' ')).toContain(
      '1,022.18 node-hours requested in the current target plans (and 41.2 node-hours of infeasible targets, not requested).',
    );
  });

  it('a cycle that blocks overruns says so', async () => {
    await render({ ...OVER, cycle: { ...OVER.cycle, capacityOverrun: 'block' } });
    expect(el().querySelector('[data-testid=over-capacity-note]')?.textContent).toContain('does not accept such a request');
  });

  it('within capacity: no flag and no note', async () => {
    await render(testProposal());
    expect(el().querySelector('[data-testid=overview-request-table]')).not.toBeNull();
    expect(el().querySelector('[data-testid=over-capacity-flag]')).toBeNull();
    expect(el().querySelector('[data-testid=over-capacity-note]')).toBeNull();
  });

  it('requestRows: share of capacity, none for a node the cycle no longer lists', () => {
    const rows = requestRows({ ...OVER, cycle: { ...OVER.cycle, nodes: [OVER.cycle.nodes[0]] } });
    expect(rows[0]).toMatchObject({ nodeCode: 'KRG-50', nodeHoursAvailable: 620, overCapacity: true });
    expect(rows[0].share).toBeCloseTo(1.306, 3);
    expect(rows[1]).toMatchObject({ nodeCode: 'VHM-40', nodeHoursAvailable: null, share: null, overCapacity: false });
  });
});

describe('ProposalOverview decision card', () => {
  let fixture: ComponentFixture<ProposalOverview>;
  let backend: HttpTestingController;

  async function render(state: Proposal['state']): Promise<void> {
    TestBed.configureTestingModule({
      imports: [ProposalOverview],
      providers: [
        ProposalStore,
        // The billing contacts card links to /fees.
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    TestBed.inject(ProposalStore).id.set(5);
    fixture = TestBed.createComponent(ProposalOverview);
    TestBed.tick();
    backend.expectOne('/api/proposals/5').flush(testProposal({ state, editable: false }));
    // Not whenStable: the decision's read, when there is one, holds it off until answered.
    await new Promise((resolve) => setTimeout(resolve));
    TestBed.tick();
  }

  afterEach(() => backend.verify());

  it('a released decision shows at the top of the overview', async () => {
    await render('awarded');
    backend.expectOne('/api/awards/proposals/5/decision').flush(testTeamDecision());
    backend
      .expectOne('/api/night-plans/programs/5')
      .flush({ code: 'not_found', message: 'No plan yet.' }, { status: 404, statusText: 'Not Found' });
    backend
      .expectOne('/api/billing/programs/5')
      .flush({ code: 'program_not_found', message: 'No program 5' }, { status: 404, statusText: 'Not Found' });
    await fixture.whenStable();
    // No program for billing yet (404): no billing card.
    expect(fixture.nativeElement.querySelector('[data-testid=billing-contacts-card]')).toBeNull();
    const card = fixture.nativeElement.querySelector('[data-testid=decision-card]') as HTMLElement;
    expect(card.textContent).toContain('Your proposal was awarded node-hours.');
    expect(fixture.nativeElement.firstElementChild?.tagName.toLowerCase()).toBe('app-decision-card');
  });

  it('an awarded proposal shows its program progress below the decision', async () => {
    await render('awarded');
    backend.expectOne('/api/awards/proposals/5/decision').flush(testTeamDecision());
    backend.expectOne('/api/night-plans/programs/5').flush(testProgram({ proposalId: 5 }));
    backend.expectOne('/api/billing/programs/5').flush(testProgramBilling());
    // The progress card asks for the light curves' progress once its program has arrived.
    await new Promise((resolve) => setTimeout(resolve));
    TestBed.tick();
    backend.expectOne('/api/proposals/5/photometry').flush(testPhotometry({ proposalId: 5 }));
    await fixture.whenStable();
    const card = fixture.nativeElement.querySelector('[data-testid=program-progress-card]') as HTMLElement;
    expect(card.textContent).toContain('6 of 34 planned visits done so far.');
    const order = [...(fixture.nativeElement as HTMLElement).children].map((c) => c.tagName.toLowerCase());
    expect(order.indexOf('app-program-progress-card')).toBe(order.indexOf('app-decision-card') + 1);
  });

  it("an awarded proposal shows its program's billing contacts below the progress", async () => {
    await render('awarded');
    backend.expectOne('/api/awards/proposals/5/decision').flush(testTeamDecision());
    backend.expectOne('/api/night-plans/programs/5').flush(testProgram({ proposalId: 5 }));
    backend.expectOne('/api/billing/programs/5').flush(testProgramBilling());
    // The progress card asks for the light curves' progress once its program has arrived.
    await new Promise((resolve) => setTimeout(resolve));
    TestBed.tick();
    backend.expectOne('/api/proposals/5/photometry').flush(testPhotometry({ proposalId: 5 }));
    await fixture.whenStable();
    const card = fixture.nativeElement.querySelector('[data-testid=billing-contacts-card]') as HTMLElement;
    expect(card.textContent).toContain('ledger@greyhollow.example');
    const order = [...(fixture.nativeElement as HTMLElement).children].map((c) => c.tagName.toLowerCase());
    expect(order.indexOf('app-billing-contacts-card')).toBe(order.indexOf('app-program-progress-card') + 1);
  });

  it('a reserve proposal has no program: its progress is not asked', async () => {
    await render('reserve');
    backend.expectOne('/api/awards/proposals/5/decision').flush(testTeamDecision({ outcome: 'reserve' }));
    await fixture.whenStable();
    backend.expectNone('/api/night-plans/programs/5');
    backend.expectNone('/api/billing/programs/5');
    expect(fixture.nativeElement.querySelector('app-program-progress-card')).toBeNull();
    expect(fixture.nativeElement.querySelector('app-billing-contacts-card')).toBeNull();
  });

  it('before the release (a ranked proposal) nothing is asked and no card shows', async () => {
    await render('ranked');
    await fixture.whenStable();
    backend.expectNone('/api/awards/proposals/5/decision');
    backend.expectNone('/api/night-plans/programs/5');
    expect(fixture.nativeElement.querySelector('app-decision-card')).toBeNull();
  });
});
