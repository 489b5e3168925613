import { isIP } from 'node:net';
import { z } from 'zod';

/**
 * `TRUST_PROXY`: which hops may set X-Forwarded-For (Express's `trust proxy`). Off unless set:
 * trusting a header any client can send would let it choose the address the login limiter sees.
 * `false`/`off`/`0` or unset → off; a whole number → that many proxy hops; otherwise a
 * comma-separated list of addresses, CIDR ranges or `loopback`, `linklocal`, `uniquelocal`.
 */
const trustProxySchema = z
  .string()
  .trim()
  .optional()
  .transform((v, ctx): false | number | string[] => {
    if (v === undefined || v === '' || /^(false|off|no|0)$/i.test(v)) return false;
    if (/^\d+$/.test(v)) return Number(v);
    const entries = v
      .split(',')
      .map((e) => e.trim())
      .filter(Boolean);
    const bad = entries.filter((e) => !['loopback', 'linklocal', 'uniquelocal'].includes(e) && !isIP(e.replace(/\/\d+$/, '')));
    if (bad.length || !entries.length) {
      ctx.addIssue({
        code: 'custom',
        message: `expected a hop count, or addresses/CIDR ranges/loopback/linklocal/uniquelocal separated by commas (not ${bad.join(', ') || 'nothing'}); "true" is refused because it trusts every client`,
      });
      return z.NEVER;
    }
    return entries;
  });

/**
 * Environment, parsed once with zod; a bad value stops the process at start with its name.
 * Every setting the server, the worker and the database scripts read is declared here and read
 * from the parsed result, never from process.env elsewhere (config.spec.ts checks).
 */
const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  HOST: z.string().default('127.0.0.1'),
  PORT: z.coerce.number().int().min(0).max(65535).default(4300),
  PUBLIC_URL: z.string().url().optional(),
  // PostgreSQL connection of every Knex, session pool and pg-boss (server, worker, database/
  // setup.ts, seeds, tests): these defaults are the only ones; `npm start`'s cluster listens there.
  PGHOST: z.string().default('127.0.0.1'),
  PGPORT: z.coerce.number().int().min(1).max(65535).default(54329),
  PGUSER: z.string().default('spincycle'),
  PGPASSWORD: z.string().default('spincycle-local'),
  PGDATABASE: z.string().default('spincycle'),
  /** Most connections one Knex pool opens (the web server's, the worker's, a script's). */
  PG_POOL_MAX: z.coerce.number().int().min(1).max(100).default(10),
  SESSION_SECRET: z.string().min(16).optional(),
  /** Rolling lifetime of a session: it ends after this many hours without a request. */
  SESSION_MAX_AGE_HOURS: z.coerce.number().positive().default(12),
  /** Absolute lifetime of a session from sign-in, however active it stays (7 days). */
  SESSION_ABSOLUTE_HOURS: z.coerce.number().positive().default(168),
  /** The stored expiry of a session is renewed at most this often (the cookie on every answer), seconds. */
  SESSION_TOUCH_SECONDS: z.coerce.number().min(0).max(3600).default(60),
  TRUST_PROXY: trustProxySchema,
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().default(2525),
  MAIL_FROM: z.string().default('Spincycle <no-reply@spincycle.test>'),
  /** pg-boss queue of the mail outbox's sweep jobs (server/src/mail/outbox-worker.ts). */
  MAIL_QUEUE: z
    .string()
    .regex(/^[A-Za-z0-9_.-]+$/)
    .default('mail-outbox'),
  /** How often the worker sweeps the mail outbox for due mails, seconds. */
  MAIL_SWEEP_SECONDS: z.coerce.number().min(1).max(3600).default(30),
  /**
   * Wait after a mail's first failed attempt, seconds; it doubles with each further failure up to
   * MAIL_RETRY_MAX_SECONDS (0: retry at once, for tests).
   */
  MAIL_RETRY_BASE_SECONDS: z.coerce.number().min(0).max(3600).default(30),
  /** Longest wait between two attempts of one mail, seconds. */
  MAIL_RETRY_MAX_SECONDS: z.coerce.number().min(0).max(86_400).default(3600),
  /** Attempts of one mail before it is marked failed for an administrator to send again. */
  MAIL_MAX_ATTEMPTS: z.coerce.number().int().min(1).max(50).default(8),
  /** A mail claimed for sending longer ago than this (its process stopped) is tried again, seconds. */
  MAIL_CLAIM_STALE_SECONDS: z.coerce.number().min(1).max(86_400).default(300),
  /**
   * The card payment provider's API, reached through its official SDK (host, port and protocol
   * options): in development and tests the local fake in fakes/payments.
   */
  PAYMENT_API_URL: z.url().default('http://127.0.0.1:4397'),
  /** The provider's secret API key (the fake's test key outside production). */
  PAYMENT_SECRET_KEY: z.string().min(8).default('sk_test_spincycle_local_fake_key'),
  /** The signing secret of the provider's events to /api/billing/webhook. */
  PAYMENT_WEBHOOK_SECRET: z.string().min(8).default('whsec_spincycle_local_fake_secret'),
  CLIENT_DIST: z.string().optional(),
  LOGIN_RATE_LIMIT: z.coerce.number().int().positive().default(10),
  LOGIN_RATE_WINDOW_MINUTES: z.coerce.number().positive().default(15),
  RESET_TOKEN_MINUTES: z.coerce.number().int().positive().default(60),
  /** pg-boss queue of the target-plan jobs (tests use their own name to keep their jobs apart). */
  PLAN_QUEUE: z
    .string()
    .regex(/^[A-Za-z0-9_.-]+$/)
    .default('proposal-plans'),
  /**
   * Whether the worker process works the target-plan queue (`on`, the default). `off` runs only
   * the night-plan worker: for a test that spawns worker processes on the shared test database,
   * whose plan worker would otherwise queue again (and compute) other suites' unfinished plan runs.
   */
  PLAN_WORKER: z.enum(['on', 'off']).default('on'),
  /** pg-boss queue of the night-plan node jobs (tests use their own name to keep their jobs apart). */
  NIGHT_PLAN_QUEUE: z
    .string()
    .regex(/^[A-Za-z0-9_.-]+$/)
    .default('night-plans'),
  /** pg-boss queue of the photometry analysis runs (tests use their own name to keep their jobs apart). */
  PHOTOMETRY_QUEUE: z
    .string()
    .regex(/^[A-Za-z0-9_.-]+$/)
    .default('photometry'),
  /** How often an idle plan worker looks for new jobs, seconds. */
  PLAN_WORKER_POLL_SECONDS: z.coerce.number().min(0.5).max(60).default(1),
  /**
   * scrypt cost of new password hashes, as log2 N (N = 2^17 is the OWASP minimum for scrypt).
   * Stored hashes keep the cost they were made with; tests lower it to stay quick.
   */
  SCRYPT_LOG_N: z.coerce.number().int().min(10).max(20).default(17),
  /**
   * This process's id in GET /api/health and the worker's ready message, given by a launcher so
   * that it can tell its own child from a stale process on the same port; unset (or empty) → random.
   */
  SPINCYCLE_INSTANCE_ID: z.preprocess(
    (v) => (v === '' ? undefined : v),
    z
      .string()
      .regex(/^[A-Za-z0-9_.:-]{1,128}$/, 'expected 1 to 128 letters, digits, or _ . : -')
      .optional(),
  ),
});

/** Every setting, parsed; what database code needs (it does not run the web server). */
export type Settings = z.infer<typeof envSchema>;

export type Config = Settings & { publicUrl: string; sessionSecret: string };

const DEV_SESSION_SECRET = 'spincycle-local-development-secret-not-for-production';

export type ConfigOverrides = Partial<Settings>;

/**
 * Parses the environment into the settings, without the web server's own requirements (a
 * migration or a seed needs no SESSION_SECRET); `overrides` (tests) replace parsed values.
 * A bad value throws, naming the setting.
 */
export function loadSettings(env: NodeJS.ProcessEnv = process.env, overrides: ConfigOverrides = {}): Settings {
  const parsed = envSchema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`invalid environment:\n${lines.join('\n')}`);
  }
  return { ...parsed.data, ...overrides };
}

/** Parses the environment; `overrides` (tests) replace parsed values before derived ones are computed. */
export function loadConfig(env: NodeJS.ProcessEnv = process.env, overrides: ConfigOverrides = {}): Config {
  const c = loadSettings(env, overrides);
  if (c.NODE_ENV === 'production' && !c.SESSION_SECRET) throw new Error('SESSION_SECRET must be set in production');
  if (
    c.NODE_ENV === 'production' &&
    (c.PAYMENT_SECRET_KEY.startsWith('sk_test_spincycle') || c.PAYMENT_WEBHOOK_SECRET.startsWith('whsec_spincycle'))
  ) {
    throw new Error("PAYMENT_SECRET_KEY and PAYMENT_WEBHOOK_SECRET must be set in production (the defaults are the local fake's)");
  }
  return {
    ...c,
    publicUrl: (c.PUBLIC_URL ?? `http://${c.HOST}:${c.PORT}`).replace(/\/$/, ''),
    sessionSecret: c.SESSION_SECRET ?? DEV_SESSION_SECRET,
  };
}
