import { z } from 'zod';

/** Environment, parsed once with zod; a bad value stops the process at start with its name. */
const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  HOST: z.string().default('127.0.0.1'),
  PORT: z.coerce.number().int().min(0).max(65535).default(4300),
  PUBLIC_URL: z.string().url().optional(),
  PGHOST: z.string().default('127.0.0.1'),
  PGPORT: z.coerce.number().int().default(54329),
  PGUSER: z.string().default('spincycle'),
  PGPASSWORD: z.string().default('spincycle-local'),
  PGDATABASE: z.string().default('spincycle'),
  SESSION_SECRET: z.string().min(16).optional(),
  SESSION_MAX_AGE_HOURS: z.coerce.number().positive().default(12),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().default(2525),
  MAIL_FROM: z.string().default('Spincycle <no-reply@spincycle.test>'),
  /** When set, `/dev/mailbox` shows the local SMTP fake's messages (only with the fakes on). */
  MAILBOX_URL: z.string().url().optional(),
  CLIENT_DIST: z.string().optional(),
  LOGIN_RATE_LIMIT: z.coerce.number().int().positive().default(10),
  LOGIN_RATE_WINDOW_MINUTES: z.coerce.number().positive().default(15),
  RESET_TOKEN_MINUTES: z.coerce.number().int().positive().default(60),
  /** pg-boss queue of the target-plan jobs (tests use their own name to keep their jobs apart). */
  PLAN_QUEUE: z.string().regex(/^[A-Za-z0-9_.-]+$/).default('proposal-plans'),
  /** How often an idle plan worker looks for new jobs, seconds. */
  PLAN_WORKER_POLL_SECONDS: z.coerce.number().min(0.5).max(60).default(1),
});

export type Config = z.infer<typeof envSchema> & { publicUrl: string; sessionSecret: string };

const DEV_SESSION_SECRET = 'spincycle-local-development-secret-not-for-production';

export type ConfigOverrides = Partial<z.infer<typeof envSchema>>;

/** Parses the environment; `overrides` (tests) replace parsed values before derived ones are computed. */
export function loadConfig(env: NodeJS.ProcessEnv = process.env, overrides: ConfigOverrides = {}): Config {
  const parsed = envSchema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`invalid environment:\n${lines.join('\n')}`);
  }
  const c = { ...parsed.data, ...overrides };
  if (c.NODE_ENV === 'production' && !c.SESSION_SECRET) throw new Error('SESSION_SECRET must be set in production');
  return {
    ...c,
    publicUrl: (c.PUBLIC_URL ?? `http://${c.HOST}:${c.PORT}`).replace(/\/$/, ''),
    sessionSecret: c.SESSION_SECRET ?? DEV_SESSION_SECRET,
  };
}
