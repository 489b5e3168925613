import { Browser, createAccount, startHarness, TEST_PASSWORD, type Harness } from '../../../../test/support/api-harness';

let h: Harness;
beforeAll(async () => {
  h = await startHarness();
});
afterAll(() => h.close());

describe('POST /api/auth/sign-in', () => {
  it('with the right password signs in, returns the user with roles, and the session persists', async () => {
    const a = await createAccount(h, ['proposer', 'reviewer']);
    const b = new Browser(h);
    const res = await b.post('/api/auth/sign-in', { email: a.email.toUpperCase(), password: TEST_PASSWORD });
    expect(res.status).toBe(200);
    expect(res.body.user).toMatchObject({ id: a.id, email: a.email, roles: ['proposer', 'reviewer'] });
    expect(res.body.user.passwordHash).toBeUndefined();
    const session = await b.get('/api/auth/session');
    expect(session.body.user.id).toBe(a.id);
    // Session is stored in PostgreSQL: a second app instance (new process) still knows it.
    const other = await startHarness();
    try {
      const cookie = res.headers['set-cookie'] as unknown as string[];
      const sid = cookie.find((c) => c.startsWith('spincycle.sid='))!.split(';')[0];
      const again = await (await import('supertest')).default(other.created.app).get('/api/auth/session').set('Cookie', sid);
      expect(again.body.user.id).toBe(a.id);
    } finally {
      await other.close();
    }
  });

  it('with a wrong password answers 401 invalid_credentials and no session', async () => {
    const a = await createAccount(h);
    const b = new Browser(h);
    const res = await b.post('/api/auth/sign-in', { email: a.email, password: 'not the password' });
    expect(res.status).toBe(401);
    expect(res.body).toEqual({ code: 'invalid_credentials', message: expect.stringContaining('password') });
    expect((await b.get('/api/auth/session')).body.user).toBeNull();
  });

  it('with an unknown e-mail answers exactly like a wrong password', async () => {
    const res = await new Browser(h).post('/api/auth/sign-in', { email: 'nobody-here@test.example', password: 'whatever it is' });
    expect(res.status).toBe(401);
    expect(res.body.code).toBe('invalid_credentials');
  });

  it('with a malformed body answers 400 naming the field', async () => {
    const res = await new Browser(h).post('/api/auth/sign-in', { email: 'not-an-email', password: '' });
    expect(res.status).toBe(400);
    expect(res.body.code).toBe('validation_failed');
    expect(Object.keys(res.body.fieldErrors)).toEqual(expect.arrayContaining(['email', 'password']));
    expect(res.body.message).toMatch(/^email: /);
  });

  it('into a disabled account answers 403 account_disabled', async () => {
    const a = await createAccount(h);
    await h.created.ctx.db('accounts').where({ id: a.id }).update({ disabled_at: new Date() });
    const res = await new Browser(h).post('/api/auth/sign-in', { email: a.email, password: TEST_PASSWORD });
    expect(res.status).toBe(403);
    expect(res.body.code).toBe('account_disabled');
  });

  it('without the CSRF header is refused with 403 csrf_failed', async () => {
    const a = await createAccount(h);
    const b = await new Browser(h).ready();
    const res = await b.agent.post('/api/auth/sign-in').send({ email: a.email, password: TEST_PASSWORD });
    expect(res.status).toBe(403);
    expect(res.body.code).toBe('csrf_failed');
  });

  it('after too many failures for one address answers 429 with a message', async () => {
    const limited = await startHarness({ LOGIN_RATE_LIMIT: 3 });
    try {
      const a = await createAccount(limited);
      const b = new Browser(limited);
      const codes: number[] = [];
      for (let i = 0; i < 4; i++) codes.push((await b.post('/api/auth/sign-in', { email: a.email, password: 'wrong password' })).status);
      expect(codes).toEqual([401, 401, 401, 429]);
      const res = await b.post('/api/auth/sign-in', { email: a.email, password: TEST_PASSWORD });
      expect(res.status).toBe(429);
      expect(res.body).toEqual({ code: 'too_many_attempts', message: expect.stringContaining('Wait') });
    } finally {
      await limited.close();
    }
  });
});

describe('POST /api/auth/sign-out', () => {
  it('ends the session: the next session read is anonymous and protected routes answer 401', async () => {
    const a = await createAccount(h);
    const b = await new Browser(h).signIn(a.email);
    expect((await b.get('/api/nodes')).status).toBe(200);
    expect((await b.post('/api/auth/sign-out')).status).toBe(204);
    expect((await b.get('/api/auth/session')).body.user).toBeNull();
    expect((await b.get('/api/nodes')).status).toBe(401);
  });
});

describe('POST /api/auth/sign-up', () => {
  it('answers 202 without a session, creates a proposer (only) and mails a welcome; the same address again gets the same answer and a notice mail', async () => {
    const email = `new-${Date.now()}@test.example`;
    const b = new Browser(h);
    const res = await b.post('/api/auth/sign-up', {
      email,
      password: 'long enough password',
      displayName: 'New Person',
      affiliation: 'Somewhere',
    });
    expect(res.status).toBe(202);
    expect(res.body).toEqual({ message: expect.stringContaining('Check your inbox') });
    expect((await b.get('/api/auth/session')).body.user).toBeNull();
    const welcome = await h.mail.waitFor((m) => m.to.includes(email));
    expect(welcome.subject).toMatch(/welcome/i);
    const signedInAs = (await new Browser(h).signIn(email, 'long enough password').then((x) => x.get('/api/auth/session'))).body.user;
    expect(signedInAs).toMatchObject({ email, displayName: 'New Person', roles: ['proposer'] });

    h.mail.clear();
    const again = await new Browser(h).post('/api/auth/sign-up', {
      email: email.toUpperCase(),
      password: 'another long password',
      displayName: 'Copy',
    });
    expect(again.status).toBe(202);
    expect(again.body).toEqual(res.body);
    const notice = await h.mail.waitFor((m) => m.to.includes(email));
    expect(notice.subject).toMatch(/tried to sign up/i);
    expect(notice.text).toContain('http://spincycle.test/forgot-password');
    // The existing account is untouched.
    expect((await new Browser(h).post('/api/auth/sign-in', { email, password: 'another long password' })).status).toBe(401);
    expect((await new Browser(h).post('/api/auth/sign-in', { email, password: 'long enough password' })).status).toBe(200);
  });

  it('with a short password and no name answers 400 with both fields', async () => {
    const res = await new Browser(h).post('/api/auth/sign-up', { email: 'short@test.example', password: 'short', displayName: '  ' });
    expect(res.status).toBe(400);
    expect(res.body.fieldErrors.password[0]).toMatch(/at least 10/);
    expect(res.body.fieldErrors.displayName).toBeDefined();
  });

  it('ignores a roles field: self-registration cannot grant itself roles', async () => {
    const email = `sneaky-${Date.now()}@test.example`;
    const res = await new Browser(h).post('/api/auth/sign-up', {
      email,
      password: 'long enough password',
      displayName: 'Sneaky',
      roles: ['administrator'],
    });
    expect(res.status).toBe(202);
    await h.mail.waitFor((m) => m.to.includes(email));
    const b = await new Browser(h).signIn(email, 'long enough password');
    expect((await b.get('/api/auth/session')).body.user.roles).toEqual(['proposer']);
  });
});

describe('password reset through the SMTP fake', () => {
  const linkIn = (text: string) => /https?:\/\/\S+reset-password\?token=([A-Za-z0-9_-]+)/.exec(text);

  it('mails a single-use link; the new password works, the old one and the old sessions do not', async () => {
    const a = await createAccount(h);
    const oldSession = await new Browser(h).signIn(a.email);
    const b = new Browser(h);
    const res = await b.post('/api/auth/password-reset', { email: a.email });
    expect(res.status).toBe(202);
    const mail = await h.mail.waitFor((m) => m.to.includes(a.email));
    expect(mail.subject).toMatch(/reset/i);
    const match = linkIn(mail.text);
    expect(match?.[0]).toMatch(/^http:\/\/spincycle\.test\/reset-password\?token=/);
    const token = match![1];

    expect((await b.post('/api/auth/password-reset/confirm', { token, password: 'brand new password' })).status).toBe(204);
    const reuse = await b.post('/api/auth/password-reset/confirm', { token, password: 'another new password' });
    expect(reuse.status).toBe(400);
    expect(reuse.body.code).toBe('invalid_reset_link');

    expect((await new Browser(h).post('/api/auth/sign-in', { email: a.email, password: TEST_PASSWORD })).status).toBe(401);
    expect((await new Browser(h).post('/api/auth/sign-in', { email: a.email, password: 'brand new password' })).status).toBe(200);
    expect((await oldSession.get('/api/auth/session')).body.user).toBeNull();
  });

  it('refuses an expired link', async () => {
    const a = await createAccount(h);
    await new Browser(h).post('/api/auth/password-reset', { email: a.email });
    const mail = await h.mail.waitFor((m) => m.to.includes(a.email));
    await h.created.ctx
      .db('password_reset_tokens')
      .where({ account_id: a.id })
      .update({ expires_at: new Date(Date.now() - 1000) });
    const res = await new Browser(h).post('/api/auth/password-reset/confirm', {
      token: linkIn(mail.text)![1],
      password: 'brand new password',
    });
    expect(res.status).toBe(400);
    expect(res.body.message).toMatch(/expired/);
  });

  it('answers 202 for an unknown address and sends nothing', async () => {
    const before = h.mail.messages().length;
    const res = await new Browser(h).post('/api/auth/password-reset', { email: 'ghost@test.example' });
    expect(res.status).toBe(202);
    await new Promise((r) => setTimeout(r, 200));
    expect(h.mail.messages().length).toBe(before);
  });
});
