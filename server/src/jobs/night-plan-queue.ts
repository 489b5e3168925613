import type PgBoss from 'pg-boss';
import type { Logger } from 'pino';
import type { Config } from '../config';
import type { NightPlanJobData } from '../features/night-plans/night-plan-build';
import { createPgBoss } from './pg-boss-factory';

/**
 * Queue options of the night-plan queue: one job per node of a build, any worker process may
 * take any of them (several processes share a build). No retry: a failed node job marks the
 * build failed, and the manager asks for a new build.
 */
export const NIGHT_PLAN_QUEUE_OPTIONS = { policy: 'standard', retryLimit: 0, expireInSeconds: 30 * 60 } as const;

/**
 * Creates the night-plan queue if it does not exist. Several processes starting at once may
 * race to create a new queue; the loser's error is ignored when the queue exists afterwards.
 */
export async function ensureNightPlanQueue(boss: PgBoss, name: string): Promise<void> {
  try {
    await boss.createQueue(name, { name, ...NIGHT_PLAN_QUEUE_OPTIONS });
  } catch (err) {
    if (!(await boss.getQueue(name))) throw err;
  }
}

/** Where the web process asks for the node jobs of a night-plan build. */
export interface NightPlanQueue {
  /** Queues one job per node of the build. */
  enqueue(jobs: NightPlanJobData[]): Promise<void>;
  close(): Promise<void>;
}

/** The pg-boss night-plan queue of the web process; pg-boss starts on the first enqueue. */
export function createPgBossNightPlanQueue(config: Config, logger: Logger): NightPlanQueue {
  let starting: Promise<PgBoss> | null = null;
  let closed = false;
  const boss = (): Promise<PgBoss> => {
    starting ??= (async () => {
      const b = createPgBoss(config, 'web');
      b.on('error', (err) => logger.error({ err }, 'pg-boss (web, night plans) error'));
      await b.start();
      await ensureNightPlanQueue(b, config.NIGHT_PLAN_QUEUE);
      return b;
    })();
    return starting;
  };
  return {
    async enqueue(jobs) {
      if (closed || !jobs.length) return;
      const b = await boss();
      await b.insert(jobs.map((data) => ({ name: config.NIGHT_PLAN_QUEUE, data })));
    },
    async close() {
      closed = true;
      if (!starting) return;
      const b = await starting.catch(() => null);
      await b?.stop({ graceful: false, close: true, wait: true, timeout: 5000 });
    },
  };
}
