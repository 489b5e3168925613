import type { Logger } from 'pino';
import type { Config } from '../config';
import type { Db } from '../db/knex';
import { runNightPlanNodeJob, type NightPlanJobData } from '../features/night-plans/night-plan-build';
import { createPgBoss } from './pg-boss-factory';
import { ensureNightPlanQueue } from './night-plan-queue';

export interface NightPlanWorker {
  /** Stops fetching, lets a running job finish (up to `timeoutMs`), closes pg-boss's pool. */
  stop(timeoutMs?: number): Promise<void>;
}

/**
 * Works the night-plan queue: one node job at a time per worker process (CPU-bound); several
 * processes share a build's node jobs. The build's row counts finished node jobs in SQL, so the
 * last job to finish, in whichever process, sets the build done.
 */
export async function startNightPlanWorker(deps: { config: Config; db: Db; logger: Logger }): Promise<NightPlanWorker> {
  const { config, db, logger } = deps;
  const boss = createPgBoss(config, 'worker');
  boss.on('error', (err) => logger.error({ err }, 'pg-boss (night-plan worker) error'));
  await boss.start();
  await ensureNightPlanQueue(boss, config.NIGHT_PLAN_QUEUE);
  await boss.work<NightPlanJobData>(
    config.NIGHT_PLAN_QUEUE,
    { batchSize: 1, pollingIntervalSeconds: config.PLAN_WORKER_POLL_SECONDS },
    async ([job]) => {
      await runNightPlanNodeJob(db, job.data, logger.child({ jobId: job.id }));
    },
  );
  logger.info({ queue: config.NIGHT_PLAN_QUEUE }, 'night-plan worker ready');
  return {
    async stop(timeoutMs = 30_000) {
      await boss.stop({ graceful: true, close: true, wait: true, timeout: timeoutMs });
    },
  };
}
