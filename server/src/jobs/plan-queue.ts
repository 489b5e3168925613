import type PgBoss from 'pg-boss';
import type { Logger } from 'pino';
import type { Config } from '../config';
import { createPgBoss, ensurePlanQueue, type PlanJobData } from './pg-boss-factory';

/** Where the web process asks for a proposal's target plans to be (re)computed. */
export interface PlanQueue {
  /** Queues one computation of the proposal's plans (folded into an already queued one). */
  enqueue(proposalId: number): Promise<void>;
  close(): Promise<void>;
}

/**
 * The pg-boss plan queue of the web process. pg-boss starts on the first enqueue, so that an
 * app that never changes a target (most API tests) opens no extra connections.
 */
export function createPgBossPlanQueue(config: Config, logger: Logger): PlanQueue {
  let starting: Promise<PgBoss> | null = null;
  let closed = false;

  const boss = (): Promise<PgBoss> => {
    starting ??= (async () => {
      const b = createPgBoss(config, 'web');
      b.on('error', (err) => logger.error({ err }, 'pg-boss (web) error'));
      await b.start();
      await ensurePlanQueue(b, config.PLAN_QUEUE);
      return b;
    })();
    return starting;
  };

  return {
    async enqueue(proposalId) {
      if (closed) return;
      const data: PlanJobData = { proposalId };
      await (await boss()).send(config.PLAN_QUEUE, data, { singletonKey: String(proposalId) });
    },
    async close() {
      closed = true;
      if (!starting) return;
      const b = await starting.catch(() => null);
      await b?.stop({ graceful: false, close: true, wait: true, timeout: 5000 });
    },
  };
}
