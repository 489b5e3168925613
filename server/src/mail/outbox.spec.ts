/**
 * The outbox's delivery against the real PostgreSQL and the SMTP fake: SMTP down then up,
 * concurrent sweeps and deliveries, a claim left by a stopped process, backoff and giving up.
 * The test database is shared with suites running in parallel: every check is about this file's
 * own rows (their ids and Message-IDs), and rows are made due by moving their next attempt to
 * now, as the passing of time would. A sweep here may also deliver other suites' due rows (to
 * this file's fake), which none of them waits for.
 */
import type { AddressInfo } from 'node:net';
import { createServer } from 'node:net';
import { randomUUID } from 'node:crypto';
import pino from 'pino';
import { startMailFake, type MailFake } from '../../../fakes/mail/mail-fake';
import { startHarness, type Harness } from '../../../test/support/api-harness';
import { createSmtpMailer, type Mailer, type OutgoingMail } from './mailer';
import {
  deliverMail,
  enqueueMail,
  FIRST_SWEEP_AFTER_SECONDS,
  MAX_ATTACHMENT_BYTES,
  plainSendError,
  retryDelaySeconds,
  sweepOutbox,
  type OutboxDeps,
} from './outbox';

let h: Harness;
const silent = pino({ level: 'silent' });
const tag = randomUUID().slice(0, 8);
let serial = 0;

beforeAll(async () => {
  h = await startHarness();
});
afterAll(async () => {
  await h.close();
});

const db = () => h.created.ctx.db;

const CONFIG: OutboxDeps['config'] = {
  MAIL_RETRY_BASE_SECONDS: 0,
  MAIL_RETRY_MAX_SECONDS: 0,
  MAIL_MAX_ATTEMPTS: 8,
  MAIL_CLAIM_STALE_SECONDS: 300,
};

/** Delivery through the given mailer, with retries due at once unless `config` says otherwise. */
function depsWith(mailer: Mailer, config: Partial<OutboxDeps['config']> = {}): OutboxDeps {
  return { db: db(), mailer, logger: silent, config: { ...CONFIG, ...config } };
}

const smtpTo = (port: number) =>
  createSmtpMailer({ SMTP_HOST: '127.0.0.1', SMTP_PORT: port, MAIL_FROM: 'Spincycle <no-reply@spincycle.test>' });

/** `n` mails written in one transaction, as a feature writes them; their ids. */
async function enqueue(n: number, extra: Partial<OutgoingMail> = {}): Promise<number[]> {
  return db().transaction(async (trx) => {
    const ids: number[] = [];
    for (let i = 0; i < n; i++) {
      const k = ++serial;
      ids.push(
        await enqueueMail(
          trx,
          { to: `outbox-${tag}-${k}@test.example`, subject: `Outbox test ${tag} #${k}`, text: `Mail ${k}`, ...extra },
          'welcome',
        ),
      );
    }
    return ids;
  });
}

/** As if the web process that wrote them had stopped before delivering: due for a sweep now. */
async function makeDue(ids: number[]): Promise<void> {
  await db()('mail_outbox').whereIn('id', ids).update({ next_attempt_at: db().fn.now() });
}

async function rowsOf(ids: number[]) {
  return db()('mail_outbox')
    .whereIn('id', ids)
    .orderBy('id')
    .select('id', 'state', 'attempts', 'last_error', 'sent_at', 'message_id', 'next_attempt_at');
}

async function messageIdsOf(ids: number[]): Promise<string[]> {
  return db()('mail_outbox').whereIn('id', ids).orderBy('id').pluck('message_id');
}

/** How many copies of each Message-ID the fake kept. */
function copies(fake: MailFake, messageIds: string[]): number[] {
  return messageIds.map((id) => fake.messages().filter((m) => m.messageId === id).length);
}

/** A loopback port with nothing listening on it (a mail relay that is down). */
async function closedPort(): Promise<number> {
  const server = createServer();
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as AddressInfo;
  await new Promise((resolve) => server.close(resolve));
  return port;
}

describe('enqueueMail', () => {
  it('writes a pending row with a Message-ID of its own, due for a sweep only after the web process’s turn', async () => {
    const [id] = await enqueue(1);
    const row = await db()('mail_outbox').where({ id }).first();
    expect(row).toMatchObject({ state: 'pending', attempts: 0, kind: 'welcome', to_addresses: [`outbox-${tag}-${serial}@test.example`] });
    expect(row.message_id).toMatch(new RegExp(`^<outbox-${id}-[0-9a-f]{16}@spincycle>$`));
    const { rows } = await db().raw('SELECT extract(epoch FROM next_attempt_at - now()) AS wait FROM mail_outbox WHERE id = ?', [id]);
    expect(rows[0].wait).toBeGreaterThan(FIRST_SWEEP_AFTER_SECONDS - 10);
    // Nothing to send yet for a sweep (the web process delivers it after its commit).
    const deps = depsWith(smtpTo(h.mail.smtpPort));
    const swept = await sweepOutbox(deps);
    deps.mailer.close();
    expect([...swept.sent, ...swept.retrying, ...swept.failed]).not.toContain(id);
    await deliverMail(h.created.ctx, [id]);
  });

  it('refuses outside a transaction, without recipients, and with attachments over the limit; a rolled-back transaction leaves no row', async () => {
    const mail = { to: `outbox-${tag}-refused@test.example`, subject: `Refused ${tag}`, text: 'x' };
    await expect(enqueueMail(db(), mail, 'welcome')).rejects.toThrow(/transaction/);
    await expect(db().transaction((trx) => enqueueMail(trx, { ...mail, to: [' '] }, 'welcome'))).rejects.toThrow(/recipient/);
    const big = { filename: 'big.pdf', contentType: 'application/pdf', content: Buffer.alloc(MAX_ATTACHMENT_BYTES + 1) };
    await expect(db().transaction((trx) => enqueueMail(trx, { ...mail, attachments: [big] }, 'invoice'))).rejects.toThrow(/attachments/);
    await expect(
      db().transaction(async (trx) => {
        await enqueueMail(trx, mail, 'welcome');
        throw new Error('the change failed after its mail was written');
      }),
    ).rejects.toThrow(/change failed/);
    expect(await db()('mail_outbox').where('subject', `Refused ${tag}`).count({ n: '*' })).toEqual([{ n: 0 }]);
  });

  it('keeps attachments and HTML through the outbox: the relay receives them as written', async () => {
    const pdf = Buffer.from('%PDF-1.4\n% an invoice\n%%EOF\n', 'latin1');
    const [id] = await enqueue(1, {
      html: '<p>Hello</p>',
      attachments: [{ filename: 'invoice-T1.pdf', contentType: 'application/pdf', content: pdf }],
    });
    const result = await deliverMail(h.created.ctx, [id]);
    expect(result.sent).toEqual([id]);
    const [messageId] = await messageIdsOf([id]);
    const got = await h.mail.waitFor((m) => m.messageId === messageId);
    expect(got.html).toContain('<p>Hello</p>');
    expect(got.attachments).toEqual([{ filename: 'invoice-T1.pdf', contentType: 'application/pdf', size: pdf.length }]);
  });
});

describe('SMTP down, then up', () => {
  it('nothing is lost: the sweeps keep the mails pending with their attempts, and once the relay is back each goes out exactly once', async () => {
    const port = await closedPort();
    const mailer = smtpTo(port);
    const deps = depsWith(mailer);
    const ids = await enqueue(5);
    const messageIds = await messageIdsOf(ids);

    // The web process tried right after the commit: the relay is down.
    const first = await deliverMail(deps, ids);
    expect(first.retrying).toEqual(ids);
    // A sweep while it is still down.
    const down = await sweepOutbox(deps);
    expect(down.retrying).toEqual(expect.arrayContaining(ids));
    expect(down.sent.filter((id) => ids.includes(id))).toEqual([]);
    for (const row of await rowsOf(ids)) {
      expect(row).toMatchObject({ state: 'pending', attempts: 2, sent_at: null });
      expect(row.last_error).toBe('The mail server could not be reached (it refused the connection).');
    }

    // The relay comes back on the same port.
    const fake = await startMailFake({ smtpPort: port, httpPort: null });
    try {
      const up = await sweepOutbox(deps);
      expect(up.sent).toEqual(expect.arrayContaining(ids));
      for (const row of await rowsOf(ids)) expect(row).toMatchObject({ state: 'sent', attempts: 3, last_error: null });
      expect(copies(fake, messageIds)).toEqual([1, 1, 1, 1, 1]);

      // A further sweep sends none of them again.
      const again = await sweepOutbox(deps);
      expect([...again.sent, ...again.retrying, ...again.failed].filter((id) => ids.includes(id))).toEqual([]);
      expect(copies(fake, messageIds)).toEqual([1, 1, 1, 1, 1]);
      expect(fake.droppedDuplicates().filter((m) => messageIds.includes(m))).toEqual([]);
    } finally {
      mailer.close();
      await fake.close();
    }
  });
});

describe('two processes at once', () => {
  /** A mailer to the harness's fake that takes a little while per mail and notes what it sent. */
  function slowMailer(sent: string[]): Mailer {
    const real = smtpTo(h.mail.smtpPort);
    return {
      async send(mail) {
        await new Promise((resolve) => setTimeout(resolve, 15));
        await real.send(mail);
        sent.push(mail.messageId!);
      },
      close: () => real.close(),
    };
  }

  it('two concurrent sweeps share the due mails: each is sent by one of them, once, and no claim takes more than its batch', async () => {
    const ids = await enqueue(20);
    const messageIds = await messageIdsOf(ids);
    await makeDue(ids);
    const sentByA: string[] = [];
    const sentByB: string[] = [];
    // At each send, how many of these rows are claimed: at most two batches (one per sweep).
    let mostClaimed = 0;
    const watching = (mailer: Mailer): Mailer => ({
      async send(mail) {
        const [{ n }] = await db()('mail_outbox').whereIn('id', ids).where('state', 'sending').count<{ n: number }[]>({ n: '*' });
        mostClaimed = Math.max(mostClaimed, n);
        await mailer.send(mail);
      },
      close: () => mailer.close(),
    });
    const a = depsWith(watching(slowMailer(sentByA)));
    const b = depsWith(watching(slowMailer(sentByB)));
    const [ra, rb] = await Promise.all([sweepOutbox(a, { batchSize: 4 }), sweepOutbox(b, { batchSize: 4 })]);
    expect(mostClaimed).toBeGreaterThan(0);
    expect(mostClaimed).toBeLessThanOrEqual(8);
    a.mailer.close();
    b.mailer.close();
    const mineA = ra.sent.filter((id) => ids.includes(id));
    const mineB = rb.sent.filter((id) => ids.includes(id));
    expect([...mineA, ...mineB].sort((x, y) => x - y)).toEqual(ids);
    expect(mineA.filter((id) => mineB.includes(id))).toEqual([]);
    // Both really worked at the same time (each took some of them).
    expect(mineA.length).toBeGreaterThan(0);
    expect(mineB.length).toBeGreaterThan(0);
    const handedOver = [...sentByA, ...sentByB].filter((m) => messageIds.includes(m));
    expect(handedOver.sort()).toEqual([...messageIds].sort());
    await h.mail.waitFor((m) => m.messageId === messageIds[messageIds.length - 1]);
    expect(copies(h.mail, messageIds)).toEqual(messageIds.map(() => 1));
    expect(h.mail.droppedDuplicates().filter((m) => messageIds.includes(m))).toEqual([]);
  });

  it('rows another process is claiming at that moment are skipped, not waited for and then claimed again', async () => {
    const ids = await enqueue(3);
    const sent: string[] = [];
    const deps = depsWith(slowMailer(sent));
    // Another process in the middle of its claim: the rows locked, marked as its own, not yet committed.
    const other = await db().transaction();
    let delivered: Awaited<ReturnType<typeof deliverMail>> | undefined;
    try {
      await other('mail_outbox').whereIn('id', ids).forUpdate().select('id');
      await other('mail_outbox')
        .whereIn('id', ids)
        .update({ state: 'sending', claim_token: 'other-process', claimed_at: other.fn.now(), attempts: 1 });
      const attempt = deliverMail(deps, ids).then((r) => (delivered = r));
      await new Promise((resolve) => setTimeout(resolve, 300));
      // Skipped at once (SKIP LOCKED), not blocked behind the other claim.
      expect(delivered).toEqual({ sent: [], retrying: [], failed: [] });
      await other.commit();
      await attempt;
    } finally {
      if (!other.isCompleted()) await other.rollback();
    }
    // Even after the other claim committed, nothing was claimed or sent twice.
    expect(sent).toEqual([]);
    expect((await rowsOf(ids)).map((r) => [r.state, r.attempts])).toEqual(ids.map(() => ['sending', 1]));
    await db()('mail_outbox').whereIn('id', ids).update({ state: 'failed', claim_token: null, claimed_at: null });
    deps.mailer.close();
  });

  it('two deliveries of the same ids at once (a web process and a resend): each mail is sent once', async () => {
    const ids = await enqueue(6);
    const messageIds = await messageIdsOf(ids);
    const sent: string[] = [];
    const deps = depsWith(slowMailer(sent));
    const [r1, r2] = await Promise.all([deliverMail(deps, ids), deliverMail(deps, ids)]);
    deps.mailer.close();
    expect([...r1.sent, ...r2.sent].sort((x, y) => x - y)).toEqual(ids);
    expect(sent.sort()).toEqual([...messageIds].sort());
  });
});

describe('a process that stopped while sending', () => {
  it('a claim older than MAIL_CLAIM_STALE_SECONDS is taken again and sent once; a recent claim is left to its process', async () => {
    const [stale, live] = await enqueue(2);
    await db()('mail_outbox')
      .where({ id: stale })
      .update({ state: 'sending', claim_token: 'stopped-process', attempts: 1, claimed_at: db().raw("now() - interval '10 minutes'") });
    await db()('mail_outbox')
      .where({ id: live })
      .update({ state: 'sending', claim_token: 'live-process', attempts: 1, claimed_at: db().raw("now() - interval '10 seconds'") });
    const [staleMessageId] = await messageIdsOf([stale]);

    const deps = depsWith(smtpTo(h.mail.smtpPort));
    const r = await sweepOutbox(deps);
    expect(r.sent).toContain(stale);
    expect(r.sent).not.toContain(live);
    const [s, l] = await rowsOf([stale, live]);
    expect(s).toMatchObject({ state: 'sent', attempts: 2 });
    expect(l).toMatchObject({ state: 'sending', attempts: 1 });
    await h.mail.waitFor((m) => m.messageId === staleMessageId);
    expect(copies(h.mail, [staleMessageId])).toEqual([1]);

    // The stopped process's late record of its attempt changes nothing: the claim is no longer its own.
    expect(await db()('mail_outbox').where({ id: stale, claim_token: 'stopped-process' }).update({ state: 'failed' })).toBe(0);
    // The live process finishes (here: gives up) under its own claim.
    await db()('mail_outbox')
      .where({ id: live, claim_token: 'live-process' })
      .update({ state: 'failed', claim_token: null, claimed_at: null });
    deps.mailer.close();
  });

  it('a stale claim on the last attempt fails, saying the mail may or may not have arrived', async () => {
    const [id] = await enqueue(1);
    await db()('mail_outbox')
      .where({ id })
      .update({ state: 'sending', claim_token: 'stopped-process', attempts: 3, claimed_at: db().raw("now() - interval '10 minutes'") });
    const deps = depsWith(smtpTo(h.mail.smtpPort), { MAIL_MAX_ATTEMPTS: 3 });
    const r = await sweepOutbox(deps);
    deps.mailer.close();
    expect(r.failed).toContain(id);
    const [row] = await rowsOf([id]);
    expect(row).toMatchObject({ state: 'failed', attempts: 3 });
    expect(row.last_error).toMatch(/may or may not have arrived/);
  });
});

describe('retries', () => {
  const failing = (err: unknown): Mailer => ({
    send: () => Promise.reject(err),
    close: () => undefined,
  });

  async function waitSeconds(id: number): Promise<number> {
    const { rows } = await db().raw('SELECT extract(epoch FROM next_attempt_at - now()) AS wait FROM mail_outbox WHERE id = ?', [id]);
    return Number(rows[0].wait);
  }

  it('waits 30 s, then 60 s, … after failures and gives up after MAIL_MAX_ATTEMPTS with the reason in words', async () => {
    // Worked by hand in this test: base 30 s doubling → 30, 60; the third attempt is the last.
    const deps = depsWith(failing(Object.assign(new Error('Greeting never received'), { code: 'ETIMEDOUT' })), {
      MAIL_RETRY_BASE_SECONDS: 30,
      MAIL_RETRY_MAX_SECONDS: 3600,
      MAIL_MAX_ATTEMPTS: 3,
    });
    const [id] = await enqueue(1);
    expect((await deliverMail(deps, [id])).retrying).toEqual([id]);
    expect(await waitSeconds(id)).toBeGreaterThan(25);
    expect(await waitSeconds(id)).toBeLessThanOrEqual(30);
    expect((await deliverMail(deps, [id])).retrying).toEqual([id]);
    expect(await waitSeconds(id)).toBeGreaterThan(55);
    expect(await waitSeconds(id)).toBeLessThanOrEqual(60);
    expect((await deliverMail(deps, [id])).failed).toEqual([id]);
    const [row] = await rowsOf([id]);
    expect(row).toMatchObject({ state: 'failed', attempts: 3, last_error: 'The mail server did not answer in time.' });
    // A failed mail waits for an administrator: neither a delivery nor a sweep takes it.
    await makeDue([id]);
    expect((await deliverMail(deps, [id])).failed).toEqual([]);
    expect((await rowsOf([id]))[0]).toMatchObject({ state: 'failed', attempts: 3 });
  });

  it('a permanent refusal (5xx) fails at once: no retry changes it', async () => {
    const refusal = Object.assign(new Error('Can\u2019t send mail - all recipients were rejected'), {
      code: 'EENVELOPE',
      responseCode: 550,
      response: '550 5.1.1 No such mailbox',
    });
    const [id] = await enqueue(1);
    expect((await deliverMail(depsWith(failing(refusal)), [id])).failed).toEqual([id]);
    expect((await rowsOf([id]))[0]).toMatchObject({
      state: 'failed',
      attempts: 1,
      last_error: 'The mail server refused the message for good: 550 5.1.1 No such mailbox',
    });
  });

  it('retryDelaySeconds doubles from the base and stops at the cap (worked by hand in this test)', () => {
    const c = { MAIL_RETRY_BASE_SECONDS: 30, MAIL_RETRY_MAX_SECONDS: 3600 };
    expect([1, 2, 3, 4, 5, 6, 7, 8, 9].map((n) => retryDelaySeconds(n, c))).toEqual([30, 60, 120, 240, 480, 960, 1920, 3600, 3600]);
  });

  it('plainSendError words the usual failures without stack traces and at most 500 characters', () => {
    expect(plainSendError(Object.assign(new Error('connect ECONNREFUSED 127.0.0.1:2525'), { code: 'ESOCKET' }))).toBe(
      'The mail server could not be reached (it refused the connection).',
    );
    expect(plainSendError(Object.assign(new Error('x'), { code: 'EENVELOPE', responseCode: 451, response: '451 4.3.0 Try later' }))).toBe(
      'The mail server asked us to try again later: 451 4.3.0 Try later',
    );
    expect(plainSendError(new Error('relay down'))).toBe('Sending failed: relay down');
    const long = plainSendError(new Error('y'.repeat(2000)));
    expect(long.length).toBeLessThanOrEqual(500);
    expect(long.endsWith('…')).toBe(true);
  });
});
