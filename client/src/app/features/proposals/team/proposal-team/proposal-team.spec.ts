import { CUSTOM_ELEMENTS_SCHEMA } from '@angular/core';
import { TeamReviewerCard } from '../../../review/team-reviewer/team-reviewer-card';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import type { Proposal } from '@spincycle/shared/proposals/proposal-schemas';
import { ProposalStore } from '../../proposal-store';
import { testMember, testProposal } from '../../testing/fixtures';
import ProposalTeam from './proposal-team';

const TEAM = [
  testMember(1, { role: 'pi', displayName: 'Orla Venn', email: 'orla.venn@example.org' }),
  testMember(2, { displayName: 'Bram Oakes', email: 'bram.oakes@example.org' }),
];

describe('ProposalTeam', () => {
  let fixture: ComponentFixture<ProposalTeam>;
  let loader: HarnessLoader;
  let root: HarnessLoader;
  let backend: HttpTestingController;

  async function render(proposal: Proposal): Promise<void> {
    // The team-reviewer card (distributed review) has its own spec; here it is left out.
    TestBed.overrideComponent(ProposalTeam, { remove: { imports: [TeamReviewerCard] }, add: { schemas: [CUSTOM_ELEMENTS_SCHEMA] } });
    TestBed.configureTestingModule({
      imports: [ProposalTeam],
      providers: [
        ProposalStore,
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    TestBed.inject(ProposalStore).id.set(5);
    fixture = TestBed.createComponent(ProposalTeam);
    loader = TestbedHarnessEnvironment.loader(fixture);
    root = TestbedHarnessEnvironment.documentRootLoader(fixture);
    TestBed.tick();
    backend.expectOne('/api/proposals/5').flush(proposal);
    await fixture.whenStable();
  }

  afterEach(() => backend.verify());

  it('PI: lists members with role and status, invites by e-mail and shows the invited member', async () => {
    await render(testProposal({ team: TEAM }));
    const columns = await (await loader.getHarness(MatTableHarness)).getCellTextByColumnName();
    expect(columns['role'].text).toEqual(['PI', 'Co-investigator']);
    expect(columns['status'].text).toEqual(['On the team', 'On the team']);

    await (await loader.getHarness(MatInputHarness.with({ selector: '[type=email]' }))).setValue('  Tamsin.Rook@Example.org ');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Send invitation' }))).click();
    const post = backend.expectOne('/api/proposals/5/members');
    expect(post.request.body).toEqual({ email: 'tamsin.rook@example.org' });
    post.flush(testMember(3, { accountId: null, displayName: null, email: 'tamsin.rook@example.org', status: 'invited' }), {
      status: 201,
      statusText: 'Created',
    });
    await fixture.whenStable();
    const after = await (await loader.getHarness(MatTableHarness)).getCellTextByColumnName();
    expect(after['status'].text).toEqual(['On the team', 'On the team', 'Invited, not yet joined']);
    expect(fixture.nativeElement.textContent).toContain('Invitation sent to tamsin.rook@example.org.');
    // The field is empty again, without an error on it.
    const field = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: "Co-investigator's e-mail" }));
    expect(await field.getTextErrors()).toEqual([]);
    expect(await (await loader.getHarness(MatInputHarness.with({ selector: '[type=email]' }))).getValue()).toBe('');
  });

  it('invite refused: the server message appears under the e-mail field', async () => {
    await render(testProposal({ team: TEAM }));
    await (await loader.getHarness(MatInputHarness.with({ selector: '[type=email]' }))).setValue('bram.oakes@example.org');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Send invitation' }))).click();
    backend.expectOne('/api/proposals/5/members').flush(
      {
        code: 'already_member',
        message: 'bram.oakes@example.org is already on the team',
        fieldErrors: { email: ['already on the team'] },
      },
      { status: 409, statusText: 'Conflict' },
    );
    await fixture.whenStable();
    const field = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: "Co-investigator's e-mail" }));
    expect(await field.getTextErrors()).toEqual(['already on the team']);
  });

  it('PI removes a co-investigator after confirming; the PI row has no Remove', async () => {
    await render(testProposal({ team: TEAM }));
    expect(fixture.nativeElement.querySelector('[data-testid=remove-1]')).toBeNull();
    await (await loader.getHarness(MatButtonHarness.with({ selector: '[data-testid=remove-2]' }))).click();
    await (await root.getHarness(MatButtonHarness.with({ text: 'Remove', selector: 'mat-dialog-actions button' }))).click();
    const del = backend.expectOne('/api/proposals/5/members/2');
    expect(del.request.method).toBe('DELETE');
    del.flush(null, { status: 204, statusText: 'No Content' });
    await fixture.whenStable();
    const columns = await (await loader.getHarness(MatTableHarness)).getCellTextByColumnName();
    expect(columns['member'].text).toHaveLength(1);
  });

  it('co-investigator: no invite form and no Remove buttons', async () => {
    await render(testProposal({ team: TEAM, myRole: 'coi' }));
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: 'Send invitation' }))).toHaveLength(0);
    expect(fixture.nativeElement.querySelector('[data-testid^=remove-]')).toBeNull();
    expect(fixture.nativeElement.textContent).toContain('Only the PI can invite or remove team members.');
  });

  it('PI invites a reviewer: the conflict warning shows above the table and on the row; the invitation is sent all the same', async () => {
    await render(testProposal({ team: TEAM }));
    const message =
      "ines.marl@example.org is a reviewer in Spincycle. On this team they would have a conflict of interest in the review of cycle 2027A: they could not grade this proposal, and the facility may have to change its panels. The invitation has been sent; whether a reviewer may also propose in the same cycle is for the facility's own rules, so check them before they join.";
    await (await loader.getHarness(MatInputHarness.with({ selector: '[type=email]' }))).setValue('ines.marl@example.org');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Send invitation' }))).click();
    backend.expectOne('/api/proposals/5/members').flush(
      {
        ...testMember(3, { accountId: null, displayName: null, email: 'ines.marl@example.org', status: 'invited' }),
        warnings: [{ code: 'reviewer_conflict', message }],
      },
      { status: 201, statusText: 'Created' },
    );
    await fixture.whenStable();
    const host = fixture.nativeElement as HTMLElement;
    const caution = host.querySelector('[data-testid=reviewer-conflict]')!;
    expect(caution.getAttribute('role')).toBe('note');
    expect(caution.textContent).toContain('Conflict of interest: ines.marl@example.org');
    expect(caution.textContent).toContain(message);
    expect(host.textContent).toContain(`Invitation sent to ines.marl@example.org. ${message}`);
    const columns = await (await loader.getHarness(MatTableHarness)).getCellTextByColumnName();
    expect(columns['status'].text.slice(0, 2)).toEqual(['On the team', 'On the team']);
    expect(host.querySelector('[data-testid=conflict-flag]')!.textContent!.trim()).toMatch(/Reviewer: conflict of interest$/);
    // The team row itself carries no warnings.
    expect(TestBed.inject(ProposalStore).proposal()!.team[2]).not.toHaveProperty('warnings');

    await (await loader.getHarness(MatButtonHarness.with({ text: /^Dismiss/ }))).click();
    expect(host.querySelector('[data-testid=reviewer-conflict]')).toBeNull();
    expect(host.querySelector('[data-testid=conflict-flag]')).toBeNull();
  });

  it('PI invites someone who is not a reviewer: no warning', async () => {
    await render(testProposal({ team: TEAM }));
    await (await loader.getHarness(MatInputHarness.with({ selector: '[type=email]' }))).setValue('tamsin.rook@example.org');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Send invitation' }))).click();
    backend
      .expectOne('/api/proposals/5/members')
      .flush(
        { ...testMember(3, { accountId: null, displayName: null, email: 'tamsin.rook@example.org', status: 'invited' }), warnings: [] },
        { status: 201, statusText: 'Created' },
      );
    await fixture.whenStable();
    expect(fixture.nativeElement.querySelector('[data-testid=reviewer-conflict]')).toBeNull();
    expect(fixture.nativeElement.textContent).toContain('Invitation sent to tamsin.rook@example.org.');
  });

  it('a fresh link to a pending reviewer replaces the row (no duplicate) and keeps one warning; removing the row clears it', async () => {
    const pending = testMember(3, { accountId: null, displayName: null, email: 'ines.marl@example.org', status: 'invited' });
    await render(testProposal({ team: [...TEAM, pending] }));
    await (await loader.getHarness(MatInputHarness.with({ selector: '[type=email]' }))).setValue('ines.marl@example.org');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Send invitation' }))).click();
    backend
      .expectOne('/api/proposals/5/members')
      .flush(
        { ...pending, warnings: [{ code: 'reviewer_conflict', message: 'ines.marl@example.org is a reviewer in Spincycle.' }] },
        { status: 200, statusText: 'OK' },
      );
    await fixture.whenStable();
    const host = fixture.nativeElement as HTMLElement;
    expect((await (await loader.getHarness(MatTableHarness)).getCellTextByColumnName())['member'].text).toHaveLength(3);
    expect(host.querySelectorAll('[data-testid=reviewer-conflict]')).toHaveLength(1);

    await (await loader.getHarness(MatButtonHarness.with({ selector: '[data-testid=remove-3]' }))).click();
    await (await root.getHarness(MatButtonHarness.with({ text: 'Remove', selector: 'mat-dialog-actions button' }))).click();
    backend.expectOne('/api/proposals/5/members/3').flush(null, { status: 204, statusText: 'No Content' });
    await fixture.whenStable();
    expect(host.querySelector('[data-testid=reviewer-conflict]')).toBeNull();
  });
});
