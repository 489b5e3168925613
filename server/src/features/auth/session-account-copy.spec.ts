import { Browser, createAccount, signedIn, startHarness, type Harness } from '../../../../test/support/api-harness';
import { toStoredSessionUser } from './passport-setup';

/*
 * A signed-in session keeps a copy of its account (migration 20270110000200) so that a request
 * reads one row. These tests change accounts behind the API's back, as an operator's SQL or a
 * future feature would, and check that the next request sees the account as it is.
 */
let h: Harness;
beforeAll(async () => {
  h = await startHarness();
});
afterAll(() => h.close());

const sessionOf = async (accountId: number) =>
  (await h.created.ctx.db('sessions').whereRaw('session_account_id(sess) = ?', [accountId]).select('sid', 'sess')) as {
    sid: string;
    sess: { passport?: { user?: unknown } };
  }[];

describe('the account copy in a session', () => {
  it('is the account with its roles, written at sign-in', async () => {
    const { account, browser } = await signedIn(h, ['reviewer', 'proposer']);
    const [row] = await sessionOf(account.id);
    expect(row.sess.passport?.user).toEqual({
      id: account.id,
      email: account.email,
      displayName: expect.any(String),
      affiliation: 'Test Station',
      roles: ['proposer', 'reviewer'],
    });
    expect((await browser.get('/api/auth/session')).body.user).toMatchObject({ id: account.id, roles: ['proposer', 'reviewer'] });
  });

  it('follows a change of name, affiliation or roles made in the database, at the next request', async () => {
    const { account, browser } = await signedIn(h, ['proposer']);
    const db = h.created.ctx.db;
    await db('accounts').where({ id: account.id }).update({ display_name: 'Renamed Tester', affiliation: 'Other Station' });
    await db('account_roles').insert({ account_id: account.id, role: 'administrator' });
    const user = (await browser.get('/api/auth/session')).body.user;
    expect(user).toMatchObject({ displayName: 'Renamed Tester', affiliation: 'Other Station', roles: ['proposer', 'administrator'] });
    expect((await browser.get('/api/admin/accounts')).status).toBe(200);
    await db('account_roles').where({ account_id: account.id, role: 'administrator' }).del();
    expect((await browser.get('/api/admin/accounts')).status).toBe(403);
  });

  it('cannot be forged or left stale by a write of the session: the database copies the account on every write', async () => {
    const { account, browser } = await signedIn(h, ['proposer']);
    const db = h.created.ctx.db;
    const [row] = await sessionOf(account.id);
    const forged = { ...row.sess, passport: { user: { ...(row.sess.passport!.user as object), roles: ['administrator'] } } };
    await db('sessions')
      .where({ sid: row.sid })
      .update({ sess: JSON.stringify(forged) });
    expect((await browser.get('/api/auth/session')).body.user.roles).toEqual(['proposer']);
    expect((await browser.get('/api/admin/accounts')).status).toBe(403);
  });

  it('deletes the sessions of an account disabled in the database, and a session stored with the bare id still works', async () => {
    const { account, browser } = await signedIn(h, ['proposer']);
    const db = h.created.ctx.db;
    const [{ sid }] = await sessionOf(account.id);
    await db('accounts').where({ id: account.id }).update({ disabled_at: db.fn.now() });
    expect(await db('sessions').where({ sid })).toEqual([]);
    expect((await browser.get('/api/auth/session')).body.user).toBeNull();
    // A session of a disabled account is not stored again (a sign-in is refused before that anyway).
    await db('sessions').insert({
      sid: `disabled-${account.id}`,
      sess: JSON.stringify({ cookie: {}, passport: { user: account.id } }),
      expire: new Date(Date.now() + 3600_000),
    });
    expect(await db('sessions').where({ sid: `disabled-${account.id}` })).toEqual([]);

    const other = await createAccount(h, ['reviewer']);
    const otherBrowser = await new Browser(h).signIn(other.email);
    const [row] = await sessionOf(other.id);
    // As stored before the copy existed: passport.user = the id. The trigger turns it into the copy on write…
    await db('sessions')
      .where({ sid: row.sid })
      .update({ sess: JSON.stringify({ ...row.sess, passport: { user: other.id } }) });
    const [rewritten] = await sessionOf(other.id);
    expect(rewritten.sess.passport?.user).toMatchObject({ id: other.id, roles: ['reviewer'] });
    // …and a bare id read by the web process (a row the migration has not rewritten) loads the account.
    await db.raw(`ALTER TABLE sessions DISABLE TRIGGER sessions_copy_account`);
    try {
      await db('sessions')
        .where({ sid: row.sid })
        .update({ sess: JSON.stringify({ ...row.sess, passport: { user: other.id } }) });
      expect((await otherBrowser.get('/api/auth/session')).body.user).toMatchObject({ id: other.id, roles: ['reviewer'] });
    } finally {
      await db.raw(`ALTER TABLE sessions ENABLE TRIGGER sessions_copy_account`);
    }
  });
});

describe('toStoredSessionUser', () => {
  it('accepts the copy (roles in their usual order) and refuses anything else', () => {
    const copy = { id: 3, email: 'a@b.example', displayName: 'A', affiliation: '', roles: ['reviewer', 'bogus', 'proposer'] };
    expect(toStoredSessionUser(copy)).toEqual({ ...copy, roles: ['proposer', 'reviewer'] });
    expect(toStoredSessionUser(null)).toBeUndefined();
    expect(toStoredSessionUser({ id: '3' })).toBeUndefined();
    expect(toStoredSessionUser({ ...copy, roles: 'proposer' })).toBeUndefined();
  });
});
