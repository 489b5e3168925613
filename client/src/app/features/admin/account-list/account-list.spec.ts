import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting, TestRequest } from '@angular/common/http/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSlideToggleHarness } from '@angular/material/slide-toggle/testing';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatRowHarness } from '@angular/material/table/testing';
import { provideRouter } from '@angular/router';
import { seedSession, testAccount, testUser } from '../../../../testing/session';
import { AccountPage } from '../account-api';
import AccountList, { SEARCH_DEBOUNCE_MS } from './account-list';

const SELF = testAccount(1, ['proposer', 'administrator'], { displayName: 'Orla Venn' });
const OTHER = testAccount(2, ['proposer'], { displayName: 'Bram Oakes', lastSignInAt: '2025-02-03T18:30:00.000Z' });

const isList = (req: { url: string; method: string }) => req.method === 'GET' && req.url === '/api/admin/accounts';

describe('AccountList', () => {
  let fixture: ComponentFixture<AccountList>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;
  let snackOpen: jest.Mock;

  beforeEach(async () => {
    snackOpen = jest.fn();
    TestBed.configureTestingModule({
      imports: [AccountList],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MatSnackBar, useValue: { open: snackOpen } },
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    await seedSession(testUser(['proposer', 'administrator'], { id: SELF.id }));
    fixture = TestBed.createComponent(AccountList);
    loader = TestbedHarnessEnvironment.loader(fixture);
    // Not whenStable(): the list request is a pending task until a test answers it.
    TestBed.tick();
  });

  afterEach(() => backend.verify());

  async function answerList(page: AccountPage): Promise<TestRequest> {
    const req = backend.expectOne(isList);
    req.flush(page);
    await fixture.whenStable();
    return req;
  }

  it('first load: asks for page 1 of 25 without empty filters and renders one row per account', async () => {
    const req = await answerList({ items: [SELF, OTHER], total: 2 });
    expect(req.request.params.get('page')).toBe('1');
    expect(req.request.params.get('pageSize')).toBe('25');
    expect(req.request.params.has('search')).toBe(false);
    expect(req.request.params.has('role')).toBe(false);

    const rows = await loader.getAllHarnesses(MatRowHarness);
    expect(rows).toHaveLength(2);
    const second = await rows[1].getCellTextByColumnName();
    expect(second['account']).toContain('Bram Oakes');
    expect(second['account']).toContain('person2@example.org');
    expect(second['status']).toBe('Active');
  });

  it('switching a role on: sends PATCH with the full role list and shows the returned row', async () => {
    await answerList({ items: [SELF, OTHER], total: 2 });
    const toggle = await loader.getHarness(MatSlideToggleHarness.with({ selector: '[data-testid=toggle-2-reviewer]' }));
    expect(await toggle.isChecked()).toBe(false);

    await toggle.toggle();
    const patch = backend.expectOne('/api/admin/accounts/2');
    expect(patch.request.method).toBe('PATCH');
    expect(patch.request.body).toEqual({ roles: ['proposer', 'reviewer'] });
    expect(await toggle.isDisabled()).toBe(true); // waits for the answer

    patch.flush({ ...OTHER, roles: ['proposer', 'reviewer'] });
    await fixture.whenStable();
    expect(await toggle.isChecked()).toBe(true);
    expect(await toggle.isDisabled()).toBe(false);
    expect(fixture.nativeElement.textContent).toContain('Reviewer role given to Bram Oakes.');
  });

  it('refused change: the switch returns to its old position and the reason is shown', async () => {
    await answerList({ items: [SELF, OTHER], total: 2 });
    const toggle = await loader.getHarness(MatSlideToggleHarness.with({ selector: '[data-testid=toggle-2-proposer]' }));
    await toggle.toggle();
    backend
      .expectOne('/api/admin/accounts/2')
      .flush({ code: 'conflict', message: 'The account changed meanwhile.' }, { status: 409, statusText: 'Conflict' });
    await fixture.whenStable();
    expect(await toggle.isChecked()).toBe(true);
    expect(snackOpen).toHaveBeenCalledWith('Bram Oakes was not changed: The account changed meanwhile.', 'Dismiss', expect.anything());
  });

  it('own account: the administrator switch and the disable button are locked', async () => {
    await answerList({ items: [SELF, OTHER], total: 2 });
    const ownAdmin = await loader.getHarness(MatSlideToggleHarness.with({ selector: '[data-testid=toggle-1-administrator]' }));
    const ownReviewer = await loader.getHarness(MatSlideToggleHarness.with({ selector: '[data-testid=toggle-1-reviewer]' }));
    const otherAdmin = await loader.getHarness(MatSlideToggleHarness.with({ selector: '[data-testid=toggle-2-administrator]' }));
    expect(await ownAdmin.isDisabled()).toBe(true);
    expect(await ownReviewer.isDisabled()).toBe(false);
    expect(await otherAdmin.isDisabled()).toBe(false);
    const ownDisable = await loader.getHarness(MatButtonHarness.with({ selector: '[data-testid=disable-1]' }));
    expect(await ownDisable.isDisabled()).toBe(true);
  });

  it('disable: asks for confirmation, then sends { disabled: true } and shows the account as disabled', async () => {
    await answerList({ items: [SELF, OTHER], total: 2 });
    await (await loader.getHarness(MatButtonHarness.with({ selector: '[data-testid=disable-2]' }))).click();
    backend.expectNone('/api/admin/accounts/2'); // nothing before the confirmation

    const root = TestbedHarnessEnvironment.documentRootLoader(fixture);
    await (await root.getHarness(MatButtonHarness.with({ text: 'Disable', selector: 'mat-dialog-actions button' }))).click();
    await fixture.whenStable();
    const patch = backend.expectOne('/api/admin/accounts/2');
    expect(patch.request.method).toBe('PATCH');
    expect(patch.request.body).toEqual({ disabled: true });
    patch.flush({ ...OTHER, disabled: true });
    await fixture.whenStable();

    const rows = await loader.getAllHarnesses(MatRowHarness);
    expect((await rows[1].getCellTextByColumnName())['status']).toBe('Disabled');
  });

  it('search: waits for typing to pause, then reloads from page 1 with the trimmed term', async () => {
    await answerList({ items: [SELF, OTHER], total: 60 });
    const search = await loader.getHarness(MatInputHarness.with({ selector: '[type=search]' }));
    await search.setValue('  oakes ');
    backend.expectNone(isList);
    await new Promise((resolve) => setTimeout(resolve, SEARCH_DEBOUNCE_MS + 50));
    TestBed.tick();
    const req = await answerList({ items: [OTHER], total: 1 });
    expect(req.request.params.get('search')).toBe('oakes');
    expect(req.request.params.get('page')).toBe('1');
    expect(await loader.getAllHarnesses(MatRowHarness)).toHaveLength(1);
  });

  it('no match: shows the empty message', async () => {
    await answerList({ items: [], total: 0 });
    expect(fixture.nativeElement.textContent).toContain('There are no accounts yet.');
    expect(await loader.getAllHarnesses(MatRowHarness)).toHaveLength(0);
  });
});
