import type { Logger } from 'pino';
import type { Config } from './config';
import type { Db } from './db/knex';
import type { NightPlanQueue } from './jobs/night-plan-queue';
import type { PhotometryQueue } from './jobs/photometry-queue';
import type { PlanQueue } from './jobs/plan-queue';
import type { Mailer } from './mail/mailer';

/** What every feature's routes need, built once by createApp (tests may pass their own parts). */
export interface AppContext {
  config: Config;
  db: Db;
  mailer: Mailer;
  logger: Logger;
  /** Where plan computations are queued (pg-boss; the worker process runs them). */
  planQueue: PlanQueue;
  /**
   * Where night-plan builds queue their node jobs (pg-boss; the worker process runs them).
   * createApp always sets it; contexts built by hand (benchmarks) may leave it out, and a build
   * asked for then answers 503.
   */
  nightPlanQueue?: NightPlanQueue;
  /** Where light-curve analyses are queued (pg-boss; the worker runs them); left out as nightPlanQueue may be (503). */
  photometryQueue?: PhotometryQueue;
  /**
   * The server's clock. Deadlines (a cycle's call closing instant) are judged against it; tests
   * replace it to stand one second before or after a deadline.
   */
  now: () => Date;
}
