import type { Logger } from 'pino';
import type { Config } from '../config';
import type { Db } from '../db/knex';
import { listUnfinishedPlanRuns } from '../features/proposals/plans/plan-repository';
import { runPlanJob } from '../features/proposals/plans/plan-service';
import { createPgBoss, ensurePlanQueue, type PlanJobData } from './pg-boss-factory';

export interface PlanWorker {
  /** Stops fetching, lets a running job finish (up to `timeoutMs`), closes pg-boss's pool. */
  stop(timeoutMs?: number): Promise<void>;
}

/**
 * Works the plan queue: one job at a time per worker (the computation is CPU-bound; run more
 * worker processes, on any machine reaching the database, for more throughput). At start it
 * queues again every run left `queued` or `running` (by a worker that stopped, or a web
 * process that could not reach the queue), so that no proposal stays stale for good.
 */
export async function startPlanWorker(deps: { config: Config; db: Db; logger: Logger }): Promise<PlanWorker> {
  const { config, db, logger } = deps;
  const boss = createPgBoss(config, 'worker');
  boss.on('error', (err) => logger.error({ err }, 'pg-boss (worker) error'));
  await boss.start();
  await ensurePlanQueue(boss, config.PLAN_QUEUE);

  const leftover = await listUnfinishedPlanRuns(db);
  for (const proposalId of leftover) {
    const data: PlanJobData = { proposalId };
    await boss.send(config.PLAN_QUEUE, data, { singletonKey: String(proposalId) });
  }
  if (leftover.length) logger.info({ count: leftover.length }, 'queued unfinished plan runs again');

  await boss.work<PlanJobData>(
    config.PLAN_QUEUE,
    { batchSize: 1, pollingIntervalSeconds: config.PLAN_WORKER_POLL_SECONDS },
    async ([job]) => {
      await runPlanJob(db, job.data.proposalId, logger);
    },
  );
  logger.info({ queue: config.PLAN_QUEUE }, 'plan worker ready');

  return {
    async stop(timeoutMs = 30_000) {
      await boss.stop({ graceful: true, close: true, wait: true, timeout: timeoutMs });
    },
  };
}
