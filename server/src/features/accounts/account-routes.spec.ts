import { Browser, createAccount, signedIn, startHarness, TEST_PASSWORD, type Harness } from '../../../../test/support/api-harness';

let h: Harness;
beforeAll(async () => {
  h = await startHarness();
});
afterAll(() => h.close());

describe('/api/admin/accounts', () => {
  it('GET lists accounts with roles, searches by name and e-mail, filters by role, pages', async () => {
    const { browser } = await signedIn(h, ['administrator']);
    const tag = `zq${Date.now()}`;
    const mine = await createAccount(h, ['reviewer'], { displayName: `Reviewer ${tag}` });
    await createAccount(h, ['proposer'], { displayName: `Proposer ${tag}` });
    const all = await browser.get(`/api/admin/accounts?search=${tag}`);
    expect(all.status).toBe(200);
    expect(all.body.total).toBe(2);
    const reviewers = await browser.get(`/api/admin/accounts?search=${tag}&role=reviewer`);
    expect(reviewers.body.items.map((a: { id: number }) => a.id)).toEqual([mine.id]);
    expect(reviewers.body.items[0]).toMatchObject({ roles: ['reviewer'], disabled: false, lastSignInAt: null });
    const page2 = await browser.get(`/api/admin/accounts?search=${tag}&pageSize=1&page=2`);
    expect(page2.body).toMatchObject({ total: 2, items: [expect.objectContaining({ displayName: `Reviewer ${tag}` })] });
  });

  it('GET with a bad query answers 400 naming the field', async () => {
    const { browser } = await signedIn(h, ['administrator']);
    const res = await browser.get('/api/admin/accounts?role=emperor&pageSize=0');
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.fieldErrors).sort()).toEqual(['pageSize', 'role']);
  });

  it('PATCH grants and removes roles; the person sees them at their next request', async () => {
    const { browser } = await signedIn(h, ['administrator']);
    const target = await createAccount(h, ['proposer']);
    const targetBrowser = await new Browser(h).signIn(target.email);
    const res = await browser.patch(`/api/admin/accounts/${target.id}`, { roles: ['proposer', 'facility_manager'] });
    expect(res.status).toBe(200);
    expect(res.body.roles).toEqual(['proposer', 'facility_manager']);
    expect((await targetBrowser.get('/api/auth/session')).body.user.roles).toEqual(['proposer', 'facility_manager']);
    const back = await browser.patch(`/api/admin/accounts/${target.id}`, { roles: ['reviewer'] });
    expect(back.body.roles).toEqual(['reviewer']);
  });

  it('PATCH disabled ends the account’s sessions and blocks sign-in; enabling restores it', async () => {
    const { browser } = await signedIn(h, ['administrator']);
    const target = await createAccount(h);
    const targetBrowser = await new Browser(h).signIn(target.email);
    expect((await browser.patch(`/api/admin/accounts/${target.id}`, { disabled: true })).body.disabled).toBe(true);
    expect((await targetBrowser.get('/api/auth/session')).body.user).toBeNull();
    expect((await new Browser(h).post('/api/auth/sign-in', { email: target.email, password: TEST_PASSWORD })).status).toBe(403);
    expect((await browser.patch(`/api/admin/accounts/${target.id}`, { disabled: false })).body.disabled).toBe(false);
    expect((await new Browser(h).post('/api/auth/sign-in', { email: target.email, password: TEST_PASSWORD })).status).toBe(200);
  });

  it('PATCH refuses to let administrators lock themselves out (409) and changes nothing', async () => {
    const { account, browser } = await signedIn(h, ['administrator', 'reviewer']);
    const drop = await browser.patch(`/api/admin/accounts/${account.id}`, { roles: ['reviewer'] });
    expect(drop.status).toBe(409);
    expect(drop.body.code).toBe('cannot_change_self');
    const disable = await browser.patch(`/api/admin/accounts/${account.id}`, { disabled: true });
    expect(disable.status).toBe(409);
    expect((await browser.get('/api/auth/session')).body.user.roles).toEqual(['reviewer', 'administrator']);
  });

  it('PATCH validates: unknown role, empty body, unknown account, bad id', async () => {
    const { browser } = await signedIn(h, ['administrator']);
    const target = await createAccount(h);
    const bad = await browser.patch(`/api/admin/accounts/${target.id}`, { roles: ['proposer', 'wizard'] });
    expect(bad.status).toBe(400);
    expect(bad.body.fieldErrors['roles.1']).toBeDefined();
    expect((await browser.patch(`/api/admin/accounts/${target.id}`, {})).status).toBe(400);
    expect((await browser.patch('/api/admin/accounts/99999999', { disabled: true })).status).toBe(404);
    const badId = await browser.patch('/api/admin/accounts/abc', { disabled: true });
    expect(badId.status).toBe(400);
    expect(badId.body.fieldErrors.id).toBeDefined();
  });
});
