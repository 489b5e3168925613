import { loadConfig } from './config';
import { createDb } from './db/knex';
import { instanceId } from './features/health/instance-id';
import { startNightPlanWorker } from './jobs/night-plan-worker';
import { startPhotometryWorker } from './jobs/photometry-worker';
import { startPlanWorker } from './jobs/plan-worker';
import { startProgramCompletionJob } from './jobs/program-completion-job';
import { createLogger } from './logger';
import { startMailOutboxWorker } from './mail/outbox-worker';

/**
 * The background worker process: computes target plans and night plans (one job per node of a
 * build), sweeps the mail outbox and, daily at 00:10 UTC, makes the programs of ended campaigns
 * complete, and analyses returned light curves, from the pg-boss queues in the application's database (PLAN_WORKER=off: night plans
 * only, no target plans, no mail and no daily completion sweep). Started by `npm start` beside the web server; any number may run,
 * on any machine that reaches the database. SIGINT/SIGTERM let a running job finish first
 * (pg-boss graceful stop, up to 20 s; a job cut off then is queued again at the next start).
 * Started with an IPC channel (by `npm start` or the browser suite), it reports
 * `{ type: 'ready', instanceId }` once it works the queue, and stops when its launcher goes away.
 */
const config = loadConfig();
const logger = createLogger(config).child({ process: 'worker' });
const db = createDb(config, logger);

let stopping = false;
async function main(): Promise<void> {
  const full = config.PLAN_WORKER === 'on';
  // One line per part of the worker; each has stop(timeoutMs).
  const parts = [
    full ? await startPlanWorker({ config, db, logger }) : null,
    await startNightPlanWorker({ config, db, logger }),
    full ? await startPhotometryWorker({ config, db, logger }) : null,
    full ? await startMailOutboxWorker({ config, db, logger }) : null,
    full ? await startProgramCompletionJob({ config, db, logger }) : null,
  ];
  const worker = {
    stop: (timeoutMs: number) => Promise.all(parts.map((part) => part?.stop(timeoutMs))),
  };
  const shutdown = (signal: string) => {
    if (stopping) return;
    stopping = true;
    logger.info({ signal }, 'worker shutting down');
    worker
      .stop(20_000)
      .catch((err) => logger.error({ err }, 'worker stop failed'))
      .finally(() => db.destroy().finally(() => process.exit(0)));
    setTimeout(() => process.exit(0), 25_000).unref();
  };
  process.on('SIGINT', () => shutdown('SIGINT'));
  process.on('SIGTERM', () => shutdown('SIGTERM'));
  if (process.send) {
    // The launcher's channel closes when it exits, even killed: do not run on without it.
    process.on('disconnect', () => shutdown('launcher gone'));
    process.send({ type: 'ready', instanceId });
  }
}

process.on('unhandledRejection', (err) => logger.error({ err }, 'unhandled promise rejection'));
process.on('uncaughtException', (err) => {
  logger.fatal({ err }, 'uncaught exception');
  process.exit(1);
});

main().catch((err) => {
  logger.fatal({ err }, 'the worker could not start');
  process.exit(1);
});
