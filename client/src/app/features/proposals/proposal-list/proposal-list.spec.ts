import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { signal } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import { provideRouter, Router } from '@angular/router';
import { Clock } from '../../../core/time/clock';
import { seedSession, testUser } from '../../../../testing/session';
import { testCycle, testProposal, testSummary } from '../testing/fixtures';
import ProposalList from './proposal-list';

const NOW = Date.parse('2027-01-03T12:00:00Z');

describe('ProposalList', () => {
  let fixture: ComponentFixture<ProposalList>;
  let loader: HarnessLoader;
  let root: HarnessLoader;
  let backend: HttpTestingController;
  let navigate: jest.SpyInstance;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [ProposalList],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: Clock, useValue: { now: signal(NOW) } },
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    navigate = jest.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    await seedSession(testUser(['proposer']));
    fixture = TestBed.createComponent(ProposalList);
    loader = TestbedHarnessEnvironment.loader(fixture);
    root = TestbedHarnessEnvironment.documentRootLoader(fixture);
    TestBed.tick();
  });

  afterEach(() => backend.verify());

  it('renders each proposal with its state in our words, role, numbers and the countdown to the call', async () => {
    backend.expectOne('/api/proposals').flush([
      testSummary(1, { title: 'Lantern cluster spin-down', state: 'draft', updatedAt: '2027-01-02T09:00:00Z' }),
      testSummary(2, {
        title: 'Field dwarfs at high latitude',
        state: 'in_review',
        myRole: 'coi',
        requestedNodeHours: 80,
        updatedAt: '2026-12-01T09:00:00Z',
      }),
      testSummary(3, { title: 'Old call', state: 'not_awarded', callClosesAt: '2026-06-01T12:00:00Z', updatedAt: '2026-05-01T09:00:00Z' }),
    ]);
    await fixture.whenStable();
    const columns = await (await loader.getHarness(MatTableHarness)).getCellTextByColumnName();
    expect(columns['title'].text.map((t) => t.split('PI:')[0].trim())).toEqual([
      'Lantern cluster spin-down',
      'Field dwarfs at high latitude',
      'Old call',
    ]);
    expect(columns['state'].text).toEqual(['Draft', 'In review', 'Not awarded']);
    expect(columns['role'].text).toEqual(['PI', 'Co-investigator', 'PI']);
    expect(columns['hours'].text).toEqual(['12.25', '80.00', '12.25']);
    expect(columns['closes'].text[0]).toBe('in 12 days');
    expect(columns['closes'].text[2]).toMatch(/^Closed .* ago$/);
    const link = fixture.nativeElement.querySelector('td.mat-column-title a') as HTMLAnchorElement;
    expect(link.getAttribute('href')).toBe('/proposals/1');
  });

  it('no proposals: the empty message', async () => {
    backend.expectOne('/api/proposals').flush([]);
    await fixture.whenStable();
    expect(fixture.nativeElement.textContent).toContain('You have no proposal yet.');
  });

  it('new proposal: offers only open cycles, posts the cycle and title, then opens the editor', async () => {
    backend.expectOne('/api/proposals').flush([]);
    await fixture.whenStable();
    (fixture.nativeElement.querySelector('.page-head button') as HTMLButtonElement).click();
    TestBed.tick();
    backend
      .expectOne('/api/cycles')
      .flush([
        testCycle({ id: 11 }),
        testCycle({ id: 12, code: '2026B', status: 'closed' }),
        testCycle({ id: 13, code: '2027B', title: 'Ember season' }),
      ]);
    await fixture.whenStable();

    const select = await root.getHarness(MatSelectHarness);
    await select.open();
    const options = await select.getOptions();
    expect(await Promise.all(options.map((o) => o.getText()))).toEqual(['2027A — Lantern season', '2027B — Ember season']);
    await select.clickOptions({ text: '2027B — Ember season' });
    await (await root.getHarness(MatInputHarness.with({ selector: '[formControlName=title]' }))).setValue('  Ember K dwarfs  ');
    await (await root.getHarness(MatButtonHarness.with({ text: 'Create draft' }))).click();

    const post = backend.expectOne((req) => req.method === 'POST' && req.url === '/api/proposals');
    expect(post.request.body).toEqual({ cycleId: 13, title: 'Ember K dwarfs' });
    post.flush(testProposal({ id: 42 }), { status: 201, statusText: 'Created' });
    await fixture.whenStable();
    expect(navigate).toHaveBeenCalledWith(['/proposals', 42]);
  });

  it('new proposal refused (422 call_not_open): the dialog stays open with the message', async () => {
    backend.expectOne('/api/proposals').flush([]);
    await fixture.whenStable();
    (fixture.nativeElement.querySelector('.page-head button') as HTMLButtonElement).click();
    TestBed.tick();
    backend.expectOne('/api/cycles').flush([testCycle({ id: 11 })]);
    await fixture.whenStable();
    await (await root.getHarness(MatInputHarness.with({ selector: '[formControlName=title]' }))).setValue('Late idea');
    await (await root.getHarness(MatButtonHarness.with({ text: 'Create draft' }))).click();
    const post = backend.expectOne((req) => req.method === 'POST' && req.url === '/api/proposals');
    expect(post.request.body).toEqual({ cycleId: 11, title: 'Late idea' });
    post.flush(
      { code: 'call_not_open', message: 'The call of 2027A closed on 15 Jan 2027 at 23:59 UTC.' },
      { status: 422, statusText: 'Unprocessable' },
    );
    await fixture.whenStable();
    expect(document.querySelector('[data-testid=server-error]')?.textContent).toContain('closed on 15 Jan 2027');
    expect(navigate).not.toHaveBeenCalled();
    const title = await root.getHarness(MatFormFieldHarness.with({ floatingLabelText: 'Title' }));
    expect(await title.getTextErrors()).toEqual([]);
  });
});
