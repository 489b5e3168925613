import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { connect } from 'node:net';
import { networkInterfaces } from 'node:os';
import nodemailer from 'nodemailer';
import request from 'supertest';
import { startMailFake, type MailFake } from '../../fakes/mail/mail-fake';
import { startHarness, type Harness } from '../support/api-harness';

/** Review finding 1: the development mailbox was served (and proxied) by the app itself. */

const SECRET_SUBJECT = 'Reset link mbx-7f3a (secret)';

async function sendTo(mail: MailFake, subject: string): Promise<void> {
  const transport = nodemailer.createTransport({ host: '127.0.0.1', port: mail.smtpPort, secure: false, ignoreTLS: true });
  try {
    await transport.sendMail({
      from: 'app@spincycle.test',
      to: 'someone@test.example',
      subject,
      text: 'http://spincycle.test/reset-password?token=abc',
    });
  } finally {
    transport.close();
  }
}

describe('the app and the development mailbox', () => {
  let fake: MailFake;
  let other: Server;
  let otherPort: number;
  let h: Harness;

  beforeAll(async () => {
    fake = await startMailFake({ smtpPort: 0, httpPort: 0 });
    await sendTo(fake, SECRET_SUBJECT);
    // Another host on the network, which an open proxy would let anyone read through the app.
    other = createServer((_req, res) => res.end('answer of another host'));
    await new Promise<void>((resolve) => other.listen(0, '127.0.0.1', resolve));
    otherPort = (other.address() as AddressInfo).port;
    // As `npm start` configured it before: the app knew where the mailbox was.
    process.env.MAILBOX_URL = `http://127.0.0.1:${fake.httpPort}`;
    h = await startHarness({ CLIENT_DIST: '/nonexistent-client-dist' });
  });
  afterAll(async () => {
    delete process.env.MAILBOX_URL;
    await h.close();
    await fake.close();
    await new Promise((resolve) => other.close(resolve));
  });

  it('GET /dev/mailbox on the app answers 404 and shows no mail', async () => {
    for (const path of ['/dev/mailbox', '/dev/mailbox/', '/dev/mailbox/api/messages']) {
      const res = await request(h.created.app).get(path);
      expect(res.status).toBe(404);
      expect(res.text).not.toContain('mbx-7f3a');
    }
  });

  it('a path naming another host is not fetched (no open proxy): 404', async () => {
    const res = await request(h.created.app).get(`/dev/mailbox//127.0.0.1:${otherPort}/`);
    expect(res.status).toBe(404);
    expect(res.text).not.toContain('answer of another host');
  });
});

describe('the mail fake’s mailbox page', () => {
  let fake: MailFake;
  beforeAll(async () => {
    fake = await startMailFake({ smtpPort: 0, httpPort: 0 });
    await sendTo(fake, SECRET_SUBJECT);
  });
  afterAll(() => fake.close());

  it('without the token answers 403 for the page and the JSON list, and shows no mail', async () => {
    const base = `http://127.0.0.1:${fake.httpPort}`;
    for (const path of [
      '/',
      '/api/messages',
      '/?to=someone@test.example',
      '/?token=',
      '/?token=not-the-token-at-all',
      '/api/messages?token=wrong',
    ]) {
      const res = await fetch(base + path);
      expect({ path, status: res.status }).toEqual({ path, status: 403 });
      expect(await res.text()).not.toContain('mbx-7f3a');
    }
  });

  it('with the token from mailboxUrl answers 200 with the mail, without scripts or referers', async () => {
    expect(fake.mailboxUrl).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/\?token=[\w-]{16,}$/);
    const page = await fetch(fake.mailboxUrl!);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain('mbx-7f3a');
    expect(page.headers.get('content-security-policy')).toContain("default-src 'none'");
    expect(page.headers.get('referrer-policy')).toBe('no-referrer');
    const list = await fetch(fake.mailboxUrl!.replace('/?', '/api/messages?'));
    expect(list.status).toBe(200);
    expect((await list.json())[0].subject).toBe(SECRET_SUBJECT);
  });

  it('two starts get different tokens; a given token is used as is', async () => {
    const second = await startMailFake({ smtpPort: 0, httpPort: 0 });
    const chosen = await startMailFake({ smtpPort: 0, httpPort: 0, token: 'a-chosen-token-of-some-length' });
    try {
      expect(new URL(second.mailboxUrl!).searchParams.get('token')).not.toBe(new URL(fake.mailboxUrl!).searchParams.get('token'));
      expect(new URL(chosen.mailboxUrl!).searchParams.get('token')).toBe('a-chosen-token-of-some-length');
      expect((await fetch(fake.mailboxUrl!.replace(/:\d+\//, `:${second.httpPort}/`))).status).toBe(403);
    } finally {
      await second.close();
      await chosen.close();
    }
  });

  it('binds 127.0.0.1 only: another address is refused, and the port is closed on the other interfaces', async () => {
    await expect(startMailFake({ smtpPort: 0, httpPort: 0, host: '0.0.0.0' })).rejects.toThrow(/loopback only/);
    const external = Object.values(networkInterfaces())
      .flat()
      .filter((i) => i && i.family === 'IPv4' && !i.internal)
      .map((i) => i!.address);
    for (const address of external) {
      const outcome = await new Promise<string>((resolve) => {
        const socket = connect({ host: address, port: fake.httpPort! });
        socket.once('connect', () => (socket.destroy(), resolve('connected')));
        socket.once('error', (err: NodeJS.ErrnoException) => resolve(err.code ?? 'error'));
      });
      expect({ address, outcome }).toEqual({ address, outcome: 'ECONNREFUSED' });
    }
  });
});
