import type PgBoss from 'pg-boss';
import type { Logger } from 'pino';
import type { Config } from '../config';
import type { PhotometryJobData } from '../features/photometry/photometry-analysis';
import { createPgBoss } from './pg-boss-factory';

/**
 * Queue options of the photometry queue: one job per analysis run. No retry: a failed job marks
 * its run failed, and the team analyses again.
 */
export const PHOTOMETRY_QUEUE_OPTIONS = { policy: 'standard', retryLimit: 0, expireInSeconds: 30 * 60 } as const;

/** Creates the photometry queue if it does not exist (a lost race to create it is ignored). */
export async function ensurePhotometryQueue(boss: PgBoss, name: string): Promise<void> {
  try {
    await boss.createQueue(name, { name, ...PHOTOMETRY_QUEUE_OPTIONS });
  } catch (err) {
    if (!(await boss.getQueue(name))) throw err;
  }
}

/** Where the web process asks for a program's light curves to be analysed. */
export interface PhotometryQueue {
  enqueue(job: PhotometryJobData): Promise<void>;
  close(): Promise<void>;
}

/** The pg-boss photometry queue of the web process; pg-boss starts on the first enqueue. */
export function createPgBossPhotometryQueue(config: Config, logger: Logger): PhotometryQueue {
  let starting: Promise<PgBoss> | null = null;
  let closed = false;
  const boss = (): Promise<PgBoss> => {
    starting ??= (async () => {
      const b = createPgBoss(config, 'web');
      b.on('error', (err) => logger.error({ err }, 'pg-boss (web, photometry) error'));
      await b.start();
      await ensurePhotometryQueue(b, config.PHOTOMETRY_QUEUE);
      return b;
    })();
    return starting;
  };
  return {
    async enqueue(job) {
      if (closed) return;
      await (await boss()).send(config.PHOTOMETRY_QUEUE, job);
    },
    async close() {
      closed = true;
      if (!starting) return;
      const b = await starting.catch(() => null);
      await b?.stop({ graceful: false, close: true, wait: true, timeout: 5000 });
    },
  };
}
