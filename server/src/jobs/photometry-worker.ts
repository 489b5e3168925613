import type { Logger } from 'pino';
import type { Config } from '../config';
import type { Db } from '../db/knex';
import { runPhotometryJob, type PhotometryJobData } from '../features/photometry/photometry-analysis';
import { createPgBoss } from './pg-boss-factory';
import { ensurePhotometryQueue } from './photometry-queue';

export interface PhotometryWorker {
  stop(timeoutMs?: number): Promise<void>;
}

/** Works the photometry queue: one analysis run at a time per worker process (CPU-bound). */
export async function startPhotometryWorker(deps: { config: Config; db: Db; logger: Logger }): Promise<PhotometryWorker> {
  const { config, db, logger } = deps;
  const boss = createPgBoss(config, 'worker');
  boss.on('error', (err) => logger.error({ err }, 'pg-boss (photometry worker) error'));
  await boss.start();
  await ensurePhotometryQueue(boss, config.PHOTOMETRY_QUEUE);
  await boss.work<PhotometryJobData>(
    config.PHOTOMETRY_QUEUE,
    { batchSize: 1, pollingIntervalSeconds: config.PLAN_WORKER_POLL_SECONDS },
    async ([job]) => {
      await runPhotometryJob(db, job.data, logger.child({ jobId: job.id }));
    },
  );
  logger.info({ queue: config.PHOTOMETRY_QUEUE }, 'photometry worker ready');
  return {
    async stop(timeoutMs = 30_000) {
      await boss.stop({ graceful: true, close: true, wait: true, timeout: timeoutMs });
    },
  };
}
