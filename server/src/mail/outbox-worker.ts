import type PgBoss from 'pg-boss';
import type { Logger } from 'pino';
import type { Config } from '../config';
import type { Db } from '../db/knex';
import { createPgBoss } from '../jobs/pg-boss-factory';
import { createSmtpMailer } from './mailer';
import { sweepOutbox, type OutboxDeps } from './outbox';

/**
 * Queue options of the mail sweep. `stately` without a key: at most one sweep job queued and one
 * running across every worker process; a failed sweep is not retried (the next one comes within
 * MAIL_SWEEP_SECONDS anyway).
 */
export const MAIL_QUEUE_OPTIONS = { policy: 'stately', retryLimit: 0, expireInSeconds: 15 * 60 } as const;

/** Creates the mail queue if it does not exist (several processes may race; the loser's error is ignored). */
export async function ensureMailQueue(boss: PgBoss, name: string): Promise<void> {
  try {
    await boss.createQueue(name, { name, ...MAIL_QUEUE_OPTIONS });
  } catch (err) {
    if (!(await boss.getQueue(name))) throw err;
  }
}

export interface MailOutboxWorker {
  /** Stops asking for sweeps, lets a running sweep finish (up to `timeoutMs`), closes pg-boss's pool and the SMTP transport. */
  stop(timeoutMs?: number): Promise<void>;
}

/**
 * Works the mail queue: every MAIL_SWEEP_SECONDS each worker process asks for a sweep job (pg-boss
 * keeps one queued at most, and one per interval), and whichever process takes it delivers the
 * outbox's due mails (outbox.ts). The rows' own claims keep two sweeps that overlap anyway (a
 * long one and the next) from sending a mail twice.
 */
export async function startMailOutboxWorker(deps: { config: Config; db: Db; logger: Logger }): Promise<MailOutboxWorker> {
  const { config, db } = deps;
  const logger = deps.logger.child({ part: 'mail-outbox' });
  const boss = createPgBoss(config, 'worker');
  boss.on('error', (err) => logger.error({ err }, 'pg-boss (mail outbox) error'));
  await boss.start();
  await ensureMailQueue(boss, config.MAIL_QUEUE);
  const mailer = createSmtpMailer(config);
  const outbox: OutboxDeps = { db, mailer, logger, config };
  await boss.work(config.MAIL_QUEUE, { batchSize: 1, pollingIntervalSeconds: Math.min(2, config.MAIL_SWEEP_SECONDS) }, async () => {
    const r = await sweepOutbox(outbox);
    if (r.sent.length || r.retrying.length || r.failed.length) {
      logger.info({ sent: r.sent.length, retrying: r.retrying.length, failed: r.failed.length }, 'mail outbox swept');
    }
  });
  const askForSweep = () =>
    boss
      .send(config.MAIL_QUEUE, {}, { singletonSeconds: config.MAIL_SWEEP_SECONDS })
      .catch((err) => logger.error({ err }, 'a mail sweep could not be queued'));
  await askForSweep();
  const timer = setInterval(() => void askForSweep(), config.MAIL_SWEEP_SECONDS * 1000);
  logger.info({ queue: config.MAIL_QUEUE, everySeconds: config.MAIL_SWEEP_SECONDS }, 'mail outbox worker ready');
  return {
    async stop(timeoutMs = 30_000) {
      clearInterval(timer);
      await boss.stop({ graceful: true, close: true, wait: true, timeout: timeoutMs });
      mailer.close();
    },
  };
}
