import { Writable } from 'node:stream';
import request from 'supertest';
import { createApp, type CreatedApp } from '../../server/src/app';
import { redactUrl } from '../../server/src/http/request-logger';
import { createLogger } from '../../server/src/logger';
import { startMailFake, type MailFake } from '../../fakes/mail/mail-fake';

/** Review finding 3: reset and invitation tokens travel in URLs, and every URL was logged. */

const RESET_TOKEN = 'rst0a1b2c3d4e5f6SECRET';
const INVITE_TOKEN = 'inv9z8y7x6w5v4SECRET';

describe('request logging', () => {
  const lines: Record<string, unknown>[] = [];
  let mail: MailFake;
  let created: CreatedApp;

  beforeAll(async () => {
    const sink = new Writable({
      write(chunk, _enc, done) {
        for (const line of String(chunk).split('\n').filter(Boolean)) lines.push(JSON.parse(line));
        done();
      },
    });
    mail = await startMailFake({ smtpPort: 0, httpPort: null });
    const config = { SMTP_PORT: mail.smtpPort, PUBLIC_URL: 'http://spincycle.test', LOG_LEVEL: 'info' as const };
    created = createApp({ config, ctx: { logger: createLogger(config, sink) } });
  });
  afterAll(async () => {
    await created.close();
    await mail.close();
  });

  /** Makes one request and returns it with the request line it produced (the first new line with a status). */
  async function requestLine(url: string) {
    const seen = lines.length;
    const res = await request(created.app)
      .get(url)
      .set('Cookie', 'spincycle.sid=s%3Acookie-value-SECRET')
      .set('Referer', `http://spincycle.test/x?token=${RESET_TOKEN}`);
    const next = () => lines.slice(seen).find((l) => l.res);
    for (let i = 0; i < 50 && !next(); i++) await new Promise((r) => setTimeout(r, 10));
    const line = next();
    expect(line).toBeDefined();
    return { res, line: line! };
  }

  it('a reset link’s URL is logged without its token', async () => {
    const { line } = await requestLine(`/reset-password?token=${RESET_TOKEN}&x=1`);
    expect(JSON.stringify(line)).not.toContain(RESET_TOKEN);
    expect((line.req as { url: string }).url).toBe('/reset-password?token=[redacted]&x=1');
  });

  it('an invitation link’s path segment and a sign-up invite are logged without the token', async () => {
    const a = await requestLine(`/invitations/${INVITE_TOKEN}`);
    expect(JSON.stringify(a.line)).not.toContain(INVITE_TOKEN);
    expect((a.line.req as { url: string }).url).toBe('/invitations/[redacted]');
    const b = await requestLine(`/sign-up?invite=${INVITE_TOKEN}`);
    expect(JSON.stringify(b.line)).not.toContain(INVITE_TOKEN);
  });

  it('a line holds the request id, method, redacted URL, status and response time, and no headers', async () => {
    const { res, line } = await requestLine('/api/auth/session?token=abcSECRET');
    expect(line).toMatchObject({
      level: 30,
      req: { id: res.headers['x-request-id'], method: 'GET', url: '/api/auth/session?token=[redacted]' },
      res: { statusCode: 200 },
      responseTime: expect.any(Number),
    });
    expect(Object.keys(line.req as object).sort()).toEqual(['id', 'method', 'url']);
    expect(Object.keys(line.res as object)).toEqual(['statusCode']);
    const text = JSON.stringify(line);
    expect(text).not.toMatch(/SECRET|headers|cookie|referer|user-agent/i);
  });
});

describe('redactUrl', () => {
  it.each([
    ['/reset-password?token=abc', '/reset-password?token=[redacted]'],
    ['/reset/abc/more', '/reset/[redacted]/more'],
    ['/invitations/abc?x=1', '/invitations/[redacted]?x=1'],
    ['/sign-up?invite=abc&next=%2F', '/sign-up?invite=[redacted]&next=%2F'],
    ['/x?Access%5FToken=abc', '/x?Access%5FToken=[redacted]'],
    ['/api/invitations/accept', '/api/invitations/accept'],
    ['/api/calendar-feeds/Zm9vYmFyYmF6.ics', '/api/calendar-feeds/[redacted]'],
    ['/fees/contact-invitations/abc', '/fees/contact-invitations/[redacted]'],
    ['/api/billing/contact-invitations/abc', '/api/billing/contact-invitations/[redacted]'],
    ['/api/proposals/12/targets?page=2', '/api/proposals/12/targets?page=2'],
  ])('%s → %s', (url, logged) => {
    expect(redactUrl(url)).toBe(logged);
  });
});
