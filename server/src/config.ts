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
    const entries = v.split(',').map((e) => e.trim()).filter(Boolean);
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
  /** Rolling lifetime of a session: it ends after this many hours without a request. */
  SESSION_MAX_AGE_HOURS: z.coerce.number().positive().default(12),
  /** Absolute lifetime of a session from sign-in, however active it stays (7 days). */
  SESSION_ABSOLUTE_HOURS: z.coerce.number().positive().default(168),
  TRUST_PROXY: trustProxySchema,
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().default(2525),
  MAIL_FROM: z.string().default('Spincycle <no-reply@spincycle.test>'),
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
