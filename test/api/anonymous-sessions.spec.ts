import request from 'supertest';
import { Browser, createAccount, startHarness, TEST_PASSWORD, type Harness } from '../support/api-harness';

/** Review finding 10: signed-out requests stored sessions, and sessions lived as long as they were used. */

let h: Harness;
beforeAll(async () => {
  h = await startHarness();
});
afterAll(() => h.close());

/** Rows of sessions without a signed-in account (what signed-out visitors used to leave behind). */
async function anonymousRows(): Promise<number> {
  const row = await h.created.ctx
    .db('sessions')
    .whereRaw("(sess -> 'passport' ->> 'user') is null")
    .count<{ count: string }[]>({ count: '*' })
    .first();
  return Number(row!.count);
}

/** The session id inside a `spincycle.sid` Set-Cookie (`s:<sid>.<signature>`), if any. */
function sessionIdOf(res: request.Response): string | undefined {
  const cookies = ([] as string[]).concat(res.headers['set-cookie'] ?? []);
  const sid = cookies.find((c) => c.startsWith('spincycle.sid='));
  return sid
    ? decodeURIComponent(sid.split(';')[0].slice('spincycle.sid='.length))
        .replace(/^s:/, '')
        .replace(/\.[^.]*$/, '')
    : undefined;
}

async function storedSession(sid: string) {
  return h.created.ctx.db('sessions').where({ sid }).first();
}

describe('signed-out requests', () => {
  it('20 anonymous GET /api/… calls set no session cookie and leave the session table unchanged', async () => {
    const before = await anonymousRows();
    const paths = ['/api/auth/session', '/api/cycles', '/api/nodes', '/api/sites', '/api/no-such-route'];
    const browser = new Browser(h);
    const sids: string[] = [];
    for (let i = 0; i < 20; i++) {
      // Half from one cookie-keeping browser, half as first-time visitors.
      const res = i % 2 ? await browser.get(paths[i % paths.length]) : await request(h.created.app).get(paths[i % paths.length]);
      expect(res.headers['set-cookie']?.toString() ?? '').toMatch(/^(XSRF-TOKEN=|$)/);
      const sid = sessionIdOf(res);
      if (sid) sids.push(sid);
    }
    expect(sids).toEqual([]);
    expect(await anonymousRows()).toBe(before);
    expect(browser.xsrf()).toBeTruthy();
  });

  it('can still sign in with the cookie-held token, and that stores one signed-in session', async () => {
    const a = await createAccount(h);
    const before = await anonymousRows();
    const b = await new Browser(h).ready();
    const res = await b.post('/api/auth/sign-in', { email: a.email, password: TEST_PASSWORD });
    expect(res.status).toBe(200);
    const row = await storedSession(sessionIdOf(res)!);
    expect(row.sess.passport.user).toMatchObject({ id: a.id });
    expect(typeof row.sess.createdAt).toBe('number');
    expect(await anonymousRows()).toBe(before);
  });

  it('sign-out deletes the session row and stores no empty one', async () => {
    const a = await createAccount(h);
    const b = new Browser(h);
    const signIn = await b.post('/api/auth/sign-in', { email: a.email, password: TEST_PASSWORD });
    const sid = sessionIdOf(signIn)!;
    const before = await anonymousRows();
    expect((await b.post('/api/auth/sign-out')).status).toBe(204);
    expect(await storedSession(sid)).toBeUndefined();
    expect(await anonymousRows()).toBe(before);
    // The next unsafe request works with the signed-out token that sign-out handed out.
    expect((await b.post('/api/auth/sign-in', { email: a.email, password: TEST_PASSWORD })).status).toBe(200);
  });
});

describe('CSRF protection', () => {
  it('refuses a signed-out POST without the token, with a header that differs from the cookie, and with a forged token', async () => {
    const a = await createAccount(h);
    const b = await new Browser(h).ready();
    const body = { email: a.email, password: TEST_PASSWORD };
    const missing = await b.agent.post('/api/auth/sign-in').send(body);
    expect(missing.status).toBe(403);
    expect(missing.body.code).toBe('csrf_failed');
    const other = await new Browser(h).ready();
    expect((await b.agent.post('/api/auth/sign-in').set('X-XSRF-TOKEN', other.xsrf()!).send(body)).status).toBe(403);
    const forged = 'AAAAAAAAAAAAAAAAAAAAAAAA.BBBBBBBBBBBBBBBBBBBBBBBBBBBBBBBBBBBBBBBBBBB';
    const planted = await request(h.created.app)
      .post('/api/auth/sign-in')
      .set('Cookie', `XSRF-TOKEN=${forged}`)
      .set('X-XSRF-TOKEN', forged)
      .send(body);
    expect(planted.status).toBe(403);
    for (const path of ['/api/auth/sign-up', '/api/auth/password-reset', '/api/auth/password-reset/confirm']) {
      expect((await b.agent.post(path).send({})).status).toBe(403);
    }
  });

  it('refuses a signed-in POST without the session’s token, and with the signed-out token of before', async () => {
    const a = await createAccount(h);
    const b = await new Browser(h).ready();
    const signedOutToken = b.xsrf()!;
    await b.signIn(a.email);
    expect(b.xsrf()).not.toBe(signedOutToken);
    const missing = await b.agent.post('/api/auth/sign-out');
    expect(missing.status).toBe(403);
    expect(missing.body.code).toBe('csrf_failed');
    const stale = await b.agent
      .post('/api/auth/sign-out')
      .set('Cookie', `XSRF-TOKEN=${signedOutToken}`)
      .set('X-XSRF-TOKEN', signedOutToken);
    expect(stale.status).toBe(403);
    expect((await b.post('/api/auth/sign-out')).status).toBe(204);
  });
});

describe('absolute session lifetime', () => {
  async function signedInWithCreatedAt(hoursAgo: number) {
    const a = await createAccount(h);
    const b = new Browser(h);
    const res = await b.post('/api/auth/sign-in', { email: a.email, password: TEST_PASSWORD });
    const sid = sessionIdOf(res)!;
    const createdAt = Date.now() - hoursAgo * 3600_000;
    await h.created.ctx.db.raw(
      `update sessions set sess = jsonb_set(sess::jsonb, '{createdAt}', to_jsonb(?::bigint))::json where sid = ?`,
      [createdAt, sid],
    );
    return { a, b, sid };
  }

  it('a session signed in longer ago than SESSION_ABSOLUTE_HOURS (7 days) is ended, however recently used', async () => {
    expect(h.created.ctx.config.SESSION_ABSOLUTE_HOURS).toBe(168);
    const { b, sid } = await signedInWithCreatedAt(168 + 1);
    expect((await b.get('/api/auth/session')).body.user).toBeNull();
    expect((await b.get('/api/nodes')).status).toBe(401);
    expect(await storedSession(sid)).toBeUndefined();
  });

  it('a session younger than the absolute lifetime still works', async () => {
    const { a, b } = await signedInWithCreatedAt(168 - 1);
    expect((await b.get('/api/auth/session')).body.user.id).toBe(a.id);
    expect((await b.get('/api/nodes')).status).toBe(200);
  });
});
