/**
 * The worker's part: pg-boss sweep jobs on a queue of this test's own deliver due mails, and
 * stop cleanly. Also the mail settings of config.ts.
 */
import { randomUUID } from 'node:crypto';
import pino from 'pino';
import { startHarness, type Harness } from '../../../test/support/api-harness';
import { loadConfig } from '../config';
import { enqueueMail } from './outbox';
import { startMailOutboxWorker } from './outbox-worker';

let h: Harness;
const queue = `mail-outbox-test-${randomUUID().slice(0, 8)}`;

beforeAll(async () => {
  h = await startHarness();
});
afterAll(async () => {
  await h.created.ctx.db.raw('DELETE FROM pgboss.job WHERE name = ?', [queue]).catch(() => undefined);
  await h.close();
});

it('the worker sweeps the outbox from its pg-boss queue: a due mail goes out without any web process', async () => {
  const db = h.created.ctx.db;
  const to = `outbox-worker-${randomUUID().slice(0, 8)}@test.example`;
  const id = await db.transaction((trx) => enqueueMail(trx, { to, subject: 'Swept by the worker', text: 'Hello' }, 'welcome'));
  // As if the web process that wrote it stopped before delivering it: due now.
  await db('mail_outbox').where({ id }).update({ next_attempt_at: db.fn.now() });

  const worker = await startMailOutboxWorker({
    config: { ...h.created.ctx.config, MAIL_QUEUE: queue, MAIL_SWEEP_SECONDS: 1 },
    db,
    logger: pino({ level: 'silent' }),
  });
  try {
    const received = await h.mail.waitFor((m) => m.to.includes(to), 20_000);
    expect(received.subject).toBe('Swept by the worker');
    // The relay has it; the worker records it sent right after.
    let row = await db('mail_outbox').where({ id }).first('state', 'message_id');
    for (let i = 0; i < 50 && row.state !== 'sent'; i++) {
      await new Promise((resolve) => setTimeout(resolve, 100));
      row = await db('mail_outbox').where({ id }).first('state', 'message_id');
    }
    expect(row.state).toBe('sent');
    expect(received.messageId).toBe(row.message_id);
  } finally {
    await worker.stop(5000);
  }
  // The sweeps ran as jobs of this queue.
  const { rows } = await db.raw("SELECT count(*)::int AS n FROM pgboss.job WHERE name = ? AND state = 'completed'", [queue]);
  expect(rows[0].n).toBeGreaterThan(0);
}, 40_000);

describe('mail settings', () => {
  it('with none set, uses the documented defaults', () => {
    expect(loadConfig({})).toMatchObject({
      MAIL_QUEUE: 'mail-outbox',
      MAIL_SWEEP_SECONDS: 30,
      MAIL_RETRY_BASE_SECONDS: 30,
      MAIL_RETRY_MAX_SECONDS: 3600,
      MAIL_MAX_ATTEMPTS: 8,
      MAIL_CLAIM_STALE_SECONDS: 300,
    });
  });

  it.each([
    ['MAIL_SWEEP_SECONDS', '0'],
    ['MAIL_RETRY_BASE_SECONDS', '-1'],
    ['MAIL_MAX_ATTEMPTS', '0'],
    ['MAIL_MAX_ATTEMPTS', '2.5'],
    ['MAIL_CLAIM_STALE_SECONDS', 'soon'],
    ['MAIL_QUEUE', 'two words'],
  ])('with %s=%j, refuses to start, naming the setting', (name, value) => {
    expect(() => loadConfig({ [name]: value })).toThrow(new RegExp(`^invalid environment:\\n  ${name}: `, 'm'));
  });
});
