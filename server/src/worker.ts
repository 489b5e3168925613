import { loadConfig } from './config';
import { createDb } from './db/knex';
import { instanceId } from './features/health/instance-id';
import { startNightPlanWorker } from './jobs/night-plan-worker';
import { startPlanWorker } from './jobs/plan-worker';
import { createLogger } from './logger';

/**
 * The background worker process: computes target plans and night plans (one job per node of a
 * build) from the pg-boss queues in the application's database (PLAN_WORKER=off: night plans only). Started by `npm start` beside the web server; any number may run,
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
  const plans = config.PLAN_WORKER === 'on' ? await startPlanWorker({ config, db, logger }) : null;
  const nightPlans = await startNightPlanWorker({ config, db, logger });
  const worker = {
    stop: (timeoutMs: number) => Promise.all([plans?.stop(timeoutMs), nightPlans.stop(timeoutMs)]),
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
