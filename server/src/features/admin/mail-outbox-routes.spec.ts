import { randomUUID } from 'node:crypto';
import type { OutboxMail, OutboxPage } from '@spincycle/shared/mail/mail-outbox';
import { Browser, createAccount, signedIn, startHarness, type Harness } from '../../../../test/support/api-harness';
import { enqueueMail } from '../../mail/outbox';
import { requestPasswordReset } from '../auth/auth-service';

/**
 * The administrator's view of the mail outbox. The test database is shared with suites running
 * in parallel, so lists are searched for this file's own mails (recipients tagged with `tag`).
 */
let h: Harness;
let admin: Browser;
const tag = randomUUID().slice(0, 8);
let serial = 0;

beforeAll(async () => {
  h = await startHarness({ LOGIN_RATE_LIMIT: 10_000 });
  admin = (await signedIn(h, ['administrator'])).browser;
});
afterAll(async () => {
  await h.close();
});

const db = () => h.created.ctx.db;

/** A mail written as a feature would (not delivered), then put in the given state. */
async function mailIn(state: 'pending' | 'failed' | 'sent', lastError: string | null = null): Promise<{ id: number; to: string }> {
  const to = `admin-outbox-${tag}-${++serial}@test.example`;
  const id = await db().transaction((trx) =>
    enqueueMail(trx, { to, subject: `Outbox list ${tag} #${serial}`, text: 'Body text that the list never shows.' }, 'submission'),
  );
  if (state === 'failed') await db()('mail_outbox').where({ id }).update({ state, attempts: 8, last_error: lastError });
  if (state === 'sent') await db()('mail_outbox').where({ id }).update({ state, attempts: 1, sent_at: db().fn.now() });
  return { id, to };
}

async function list(query: string): Promise<OutboxPage> {
  const res = await admin.get(`/api/admin/mail-outbox?${query}`);
  expect(res.status).toBe(200);
  return res.body as OutboxPage;
}

const mine = (page: OutboxPage) => page.items.filter((m) => m.to.some((t) => t.includes(tag)));

describe('GET /api/admin/mail-outbox', () => {
  it('by default lists the mails not sent (waiting and failed, with the reason), newest first, without bodies', async () => {
    const waiting = await mailIn('pending');
    const failed = await mailIn('failed', 'The mail server could not be reached (it refused the connection).');
    const sent = await mailIn('sent');
    const page = await list('pageSize=200');
    const ids = mine(page).map((m) => m.id);
    expect(ids).toContain(waiting.id);
    expect(ids).toContain(failed.id);
    expect(ids).not.toContain(sent.id);
    expect(ids.indexOf(failed.id)).toBeLessThan(ids.indexOf(waiting.id));
    const row = page.items.find((m) => m.id === failed.id)!;
    expect(row).toEqual<OutboxMail>({
      id: failed.id,
      createdAt: expect.any(String),
      kind: 'submission',
      to: [failed.to],
      subject: `Outbox list ${tag} #${serial - 1}`,
      state: 'failed',
      attempts: 8,
      nextAttemptAt: null,
      lastError: 'The mail server could not be reached (it refused the connection).',
      sentAt: null,
    });
    expect(page.items.find((m) => m.id === waiting.id)!.nextAttemptAt).toEqual(expect.any(String));
    expect(JSON.stringify(page)).not.toContain('Body text');
    expect(page.total).toBeGreaterThanOrEqual(2);
  });

  it('filters by one state, or all; pages with page and pageSize', async () => {
    const sent = await mailIn('sent');
    const failed = await mailIn('failed', 'Sending failed: relay down');
    expect(mine(await list('state=sent&pageSize=200')).map((m) => m.id)).toContain(sent.id);
    expect(mine(await list('state=sent&pageSize=200')).map((m) => m.id)).not.toContain(failed.id);
    expect(mine(await list('state=failed&pageSize=200')).map((m) => m.id)).toContain(failed.id);
    const all = mine(await list('state=all&pageSize=200')).map((m) => m.id);
    expect(all).toEqual(expect.arrayContaining([sent.id, failed.id]));
    const first = await list('state=all&page=1&pageSize=1');
    const second = await list('state=all&page=2&pageSize=1');
    expect(first.items).toHaveLength(1);
    expect(second.items).toHaveLength(1);
    expect(second.items[0].id).not.toBe(first.items[0].id);
  });

  it('never shows a password-reset link: the list has no bodies, and the stored body is blanked once sent', async () => {
    const account = await createAccount(h, ['proposer']);
    await requestPasswordReset(h.created.ctx, account.email);
    const mail = await h.mail.waitFor((m) => m.to.includes(account.email));
    const token = /reset-password\?token=([A-Za-z0-9_-]+)/.exec(mail.text)![1];
    const res = await admin.get('/api/admin/mail-outbox?state=all&pageSize=200');
    const row = (res.body as OutboxPage).items.find((m) => m.to.includes(account.email))!;
    expect(row).toMatchObject({ kind: 'password_reset', subject: 'Reset your Spincycle password', state: 'sent' });
    expect(res.text).not.toContain(token);
    const stored = await db()('mail_outbox').where({ id: row.id }).first('text_body', 'holds_secret');
    expect(stored.holds_secret).toBe(true);
    expect(stored.text_body).not.toContain(token);
  });

  it('refuses an unknown state or page size with 400 naming the field', async () => {
    const bad = await admin.get('/api/admin/mail-outbox?state=lost');
    expect(bad.status).toBe(400);
    expect(bad.body.fieldErrors).toHaveProperty('state');
    const size = await admin.get('/api/admin/mail-outbox?pageSize=0');
    expect(size.status).toBe(400);
    expect(size.body.fieldErrors).toHaveProperty('pageSize');
  });
});

describe('POST /api/admin/mail-outbox/:id/resend', () => {
  it('a failed mail goes out again at once: 200 with the mail sent, received once', async () => {
    const failed = await mailIn('failed', 'The mail server did not answer in time.');
    const res = await admin.post(`/api/admin/mail-outbox/${failed.id}/resend`);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ id: failed.id, state: 'sent', attempts: 1, lastError: null, sentAt: expect.any(String) });
    const { message_id } = await db()('mail_outbox').where({ id: failed.id }).first('message_id');
    await h.mail.waitFor((m) => m.messageId === message_id);
    expect(h.mail.messages().filter((m) => m.messageId === message_id)).toHaveLength(1);
    // Sent now: a second press is refused.
    const again = await admin.post(`/api/admin/mail-outbox/${failed.id}/resend`);
    expect(again.status).toBe(409);
    expect(again.body).toMatchObject({ code: 'mail_not_failed', message: expect.stringContaining('sent already') });
  });

  it('with the relay still down: 200, the mail waits for its next attempt with the reason', async () => {
    const failed = await mailIn('failed', 'The mail server did not answer in time.');
    const real = h.created.ctx.mailer;
    h.created.ctx.mailer = { send: () => Promise.reject(new Error('connect ECONNREFUSED 127.0.0.1:2525')), close: () => undefined };
    let res;
    try {
      res = await admin.post(`/api/admin/mail-outbox/${failed.id}/resend`);
    } finally {
      h.created.ctx.mailer = real;
    }
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({
      state: 'pending',
      attempts: 1,
      lastError: 'The mail server could not be reached (it refused the connection).',
    });
  });

  it('409 for a mail on its way, 404 for an unknown one, 400 for a malformed id', async () => {
    const waiting = await mailIn('pending');
    const res = await admin.post(`/api/admin/mail-outbox/${waiting.id}/resend`);
    expect(res.status).toBe(409);
    expect(res.body).toMatchObject({ code: 'mail_not_failed', message: expect.stringContaining('waiting') });
    expect((await db()('mail_outbox').where({ id: waiting.id }).first('state')).state).toBe('pending');
    const unknown = await admin.post('/api/admin/mail-outbox/2147483600/resend');
    expect(unknown.status).toBe(404);
    expect(unknown.body.code).toBe('mail_not_found');
    const malformed = await admin.post('/api/admin/mail-outbox/abc/resend');
    expect(malformed.status).toBe(400);
    expect(malformed.body.fieldErrors).toHaveProperty('id');
  });
});

describe('access', () => {
  it('signed out 401; every role but administrator 403, and nothing is sent again', async () => {
    const failed = await mailIn('failed', 'Sending failed: relay down');
    expect((await new Browser(h).get('/api/admin/mail-outbox')).status).toBe(401);
    expect((await new Browser(h).post(`/api/admin/mail-outbox/${failed.id}/resend`)).status).toBe(401);
    for (const role of ['proposer', 'reviewer', 'facility_manager', 'billing_contact'] as const) {
      const { browser } = await signedIn(h, [role]);
      expect((await browser.get('/api/admin/mail-outbox')).status).toBe(403);
      const res = await browser.post(`/api/admin/mail-outbox/${failed.id}/resend`);
      expect(res.status).toBe(403);
      expect(res.body.code).toBe('forbidden');
    }
    expect((await db()('mail_outbox').where({ id: failed.id }).first('state')).state).toBe('failed');
  });
});
