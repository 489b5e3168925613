import PgBoss from 'pg-boss';
import type { Config } from '../config';

/** pg-boss keeps its tables in their own schema of the application's database. */
export const PG_BOSS_SCHEMA = 'pgboss';

/**
 * Queue options of the target-plan queue. `stately` allows at most one job per singleton key
 * (the proposal id) in each of the states created / retry / active: one computation of a
 * proposal runs at a time, and a change made while it runs queues exactly one more (further
 * changes fold into that queued job, which reads the latest targets when it starts).
 */
export const PLAN_QUEUE_OPTIONS = { policy: 'stately', retryLimit: 1, retryDelay: 5, expireInSeconds: 15 * 60 } as const;

/** The pg-boss payload of a plan job. */
export interface PlanJobData {
  proposalId: number;
}

/**
 * A pg-boss instance on the application's database. `role` decides what it does besides
 * sending: the web process only sends (no maintenance, no schedules); the worker supervises
 * (archives and expires jobs); the worker's scheduler keeps cron schedules (pg-boss's timekeeper).
 */
export function createPgBoss(config: Config, role: 'web' | 'worker' | 'worker-schedule'): PgBoss {
  return new PgBoss({
    host: config.PGHOST,
    port: config.PGPORT,
    user: config.PGUSER,
    password: config.PGPASSWORD,
    database: config.PGDATABASE,
    schema: PG_BOSS_SCHEMA,
    application_name: `spincycle-${role}`,
    max: role === 'worker' ? 4 : 2,
    supervise: role === 'worker',
    schedule: role === 'worker-schedule',
    migrate: true,
  });
}

/** Creates the plan queue if it does not exist (idempotent, safe from several processes). */
export async function ensurePlanQueue(boss: PgBoss, name: string): Promise<void> {
  await boss.createQueue(name, { name, ...PLAN_QUEUE_OPTIONS });
}
