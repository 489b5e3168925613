import type { Logger } from 'pino';
import type { Config } from '../config';
import type { Db } from '../db/knex';
import { completeProgramsOfEndedCampaigns } from '../features/night-plans/program-completion';
import { createPgBoss } from './pg-boss-factory';

/** The queue of the daily sweep (one per database: every worker shares it). */
export const PROGRAM_COMPLETION_QUEUE = 'program-completion';

/**
 * Every day at 00:10 UTC: campaigns end at 00:00 UTC (program-completion.ts), so a program whose
 * campaign ended is complete some ten minutes later.
 */
export const PROGRAM_COMPLETION_CRON = '10 0 * * *';

/**
 * Queue options: a sweep that fails is tried again twice, a minute apart; a sweep is a few
 * UPDATEs, so one still running after ten minutes has stalled.
 */
export const PROGRAM_COMPLETION_QUEUE_OPTIONS = { policy: 'standard', retryLimit: 2, retryDelay: 60, expireInSeconds: 10 * 60 } as const;

/** A job's payload: empty for the daily sweep of every cycle; `cycleIds` sweeps those cycles only. */
export interface ProgramCompletionJobData {
  cycleIds?: number[];
}

export interface ProgramCompletionJob {
  /** Stops working the queue (a running sweep may finish, up to `timeoutMs`) and closes pg-boss's pool. The schedule stays. */
  stop(timeoutMs?: number): Promise<void>;
}

/** The sweep of one job (exported for tests): the programs of cycles whose campaign is over become complete. */
export async function runProgramCompletionJob(
  db: Db,
  data: ProgramCompletionJobData | null | undefined,
  now: Date,
  logger?: Logger,
): Promise<number> {
  const cycleIds = Array.isArray(data?.cycleIds) ? data.cycleIds.filter((id) => Number.isInteger(id)) : undefined;
  const completed = await completeProgramsOfEndedCampaigns(db, now, { cycleIds });
  logger?.info(
    { completed: completed.length, cycles: [...new Set(completed.map((c) => c.cycleId))] },
    'programs of ended campaigns made complete',
  );
  return completed.length;
}

/**
 * Registers the daily campaign-end sweep in a worker process: creates its queue, schedules it
 * (pg-boss cron, stored in the database: `schedule` is an upsert, so every worker may register
 * it and it still runs once a day), works the queue, and queues one sweep at once so that a
 * worker that was stopped at 00:10 UTC catches up when it starts.
 *
 * It has a pg-boss instance of its own (role 'worker-schedule' in pg-boss-factory.ts): cron needs
 * pg-boss's timekeeper, which the other instances do not run. pg-boss takes care that among several processes one sends each due job.
 *
 * `now` is the clock the sweep judges campaign ends by (tests move it); `queue`, `cron` and
 * `data` (the payload of the scheduled and the start-up sweeps) default to the production ones
 * (`data` {}: every cycle; a test limits it to its own cycles, as the test database is shared).
 */
export async function startProgramCompletionJob(deps: {
  config: Config;
  db: Db;
  logger: Logger;
  now?: () => Date;
  queue?: string;
  cron?: string;
  data?: ProgramCompletionJobData;
}): Promise<ProgramCompletionJob> {
  const { config, db, logger } = deps;
  const now = deps.now ?? (() => new Date());
  const queue = deps.queue ?? PROGRAM_COMPLETION_QUEUE;
  const cron = deps.cron ?? PROGRAM_COMPLETION_CRON;
  const data = deps.data ?? {};
  const boss = createPgBoss(config, 'worker-schedule');
  boss.on('error', (err) => logger.error({ err }, 'pg-boss (program completion) error'));
  await boss.start();
  try {
    await boss.createQueue(queue, { name: queue, ...PROGRAM_COMPLETION_QUEUE_OPTIONS });
  } catch (err) {
    // Several workers starting at once race to create it; the loser's error is ignored when it exists.
    if (!(await boss.getQueue(queue))) throw err;
  }
  await boss.schedule(queue, cron, data, { tz: 'UTC' });
  await boss.work<ProgramCompletionJobData>(
    queue,
    { batchSize: 1, pollingIntervalSeconds: config.PLAN_WORKER_POLL_SECONDS },
    async ([job]) => {
      await runProgramCompletionJob(db, job.data, now(), logger.child({ jobId: job.id }));
    },
  );
  await boss.send(queue, data, { singletonKey: 'at-start', singletonSeconds: 60 });
  logger.info({ queue, cron }, 'program completion job scheduled');
  return {
    async stop(timeoutMs = 20_000) {
      await boss.stop({ graceful: true, close: true, wait: true, timeout: timeoutMs });
    },
  };
}
