import { existsSync } from 'node:fs';
import path from 'node:path';
import connectPgSimple from 'connect-pg-simple';
import cookieParser from 'cookie-parser';
import express, { type Express } from 'express';
import session from 'express-session';
import helmet from 'helmet';
import pg from 'pg';
import type { AppContext } from './app-context';
import { loadConfig, type Config, type ConfigOverrides } from './config';
import { createDb } from './db/knex';
import { createAccountRoutes } from './features/accounts/account-routes';
import { createMailOutboxRoutes } from './features/admin/mail-outbox-routes';
import { createAuthRoutes } from './features/auth/auth-routes';
import { createAwardRoutes } from './features/awards/award-routes';
import { createBillingRoutes, createPaymentWebhookRoutes } from './features/billing/billing-routes';
import { createCalendarFeedRoutes } from './features/night-plans/calendar-feed-routes';
import { createPassport } from './features/auth/passport-setup';
import { createCycleRoutes } from './features/cycles/cycle-routes';
import { createReviewRoutes } from './features/review/review-routes';
import { createFacilityRoutes } from './features/facility/facility-routes';
import { createHealthRoutes } from './features/health/health-routes';
import { createNightPlanRoutes } from './features/night-plans/night-plan-routes';
import { createProposalRoutes } from './features/proposals/proposal-routes';
import { createTargetListRoutes } from './features/proposals/targets/target-routes';
import { createInvitationRoutes } from './features/proposals/team/member-routes';
import { createSkyWindowsRoutes } from './features/sky-windows/sky-windows-routes';
import { createCsrf } from './http/csrf';
import { apiNotFound, errorHandler } from './http/error-handler';
import { createRequestLogger } from './http/request-logger';
import { endSessionsOlderThan, storeSignedInSessionsOnly, throttleSessionTouch } from './http/session-lifetime';
import { createPgBossNightPlanQueue } from './jobs/night-plan-queue';
import { createPgBossPlanQueue } from './jobs/plan-queue';
import { createPgBossPhotometryQueue } from './jobs/photometry-queue';
import { createPhotometryRoutes } from './features/photometry/photometry-routes';
import { createLogger } from './logger';
import { createSmtpMailer } from './mail/mailer';

export interface CreatedApp {
  app: Express;
  ctx: AppContext;
  /** Closes the database pools, the plan queue and the mail transport. */
  close(): Promise<void>;
}

/** Builds the Express application (no listen). Parts of the context can be replaced, e.g. by tests. */
export function createApp(overrides: { config?: ConfigOverrides; ctx?: Partial<AppContext> } = {}): CreatedApp {
  const config: Config = loadConfig(undefined, overrides.config);
  const logger = overrides.ctx?.logger ?? createLogger(config);
  const ctx: AppContext = {
    config,
    logger,
    db: overrides.ctx?.db ?? createDb(config, logger),
    mailer: overrides.ctx?.mailer ?? createSmtpMailer(config),
    planQueue: overrides.ctx?.planQueue ?? createPgBossPlanQueue(config, logger),
    nightPlanQueue: overrides.ctx?.nightPlanQueue ?? createPgBossNightPlanQueue(config, logger),
    photometryQueue: overrides.ctx?.photometryQueue ?? createPgBossPhotometryQueue(config, logger),
    now: overrides.ctx?.now ?? (() => new Date()),
  };
  const production = config.NODE_ENV === 'production';

  const sessionPool = new pg.Pool({
    host: config.PGHOST,
    port: config.PGPORT,
    user: config.PGUSER,
    password: config.PGPASSWORD,
    database: config.PGDATABASE,
    max: 5,
  });
  const PgStore = connectPgSimple(session);
  const store = new PgStore({
    pool: sessionPool,
    tableName: 'sessions',
    pruneSessionInterval: config.NODE_ENV === 'test' ? false : 15 * 60,
  });
  storeSignedInSessionsOnly(store, ctx.now);
  throttleSessionTouch(store, config.SESSION_TOUCH_SECONDS * 1000, ctx.now);

  const passport = createPassport(ctx);
  const csrf = createCsrf({ secureCookies: production, secret: config.sessionSecret });
  const app = express();
  app.disable('x-powered-by');
  // Only a configured proxy may set the client address (X-Forwarded-For); the login limiter keys on it.
  app.set('trust proxy', config.TRUST_PROXY);
  app.use(createRequestLogger(logger));
  app.use(helmet());
  // The payment provider's signed events: the raw body (what the signature covers), before the JSON
  // parser, the session and the CSRF check, none of which the provider has.
  app.use('/api/billing/webhook', createPaymentWebhookRoutes(ctx));
  app.use(express.json({ limit: '1mb' }));
  app.use(
    session({
      name: 'spincycle.sid',
      secret: config.sessionSecret,
      store,
      resave: false,
      saveUninitialized: false,
      rolling: true,
      cookie: { httpOnly: true, sameSite: 'lax', secure: production, maxAge: config.SESSION_MAX_AGE_HOURS * 3600_000 },
    }),
  );
  // After express-session, which reads its own cookie.
  app.use(cookieParser());
  app.use(endSessionsOlderThan(config.SESSION_ABSOLUTE_HOURS, ctx.now));
  app.use(passport.initialize());
  app.use(passport.session());

  app.use('/api/health', createHealthRoutes(ctx));
  // Calendar applications poll it without signing in: outside `api`, so no CSRF cookie is issued.
  app.use('/api/calendar-feeds', createCalendarFeedRoutes(ctx));
  const api = express.Router();
  api.use(csrf.issue, csrf.protect);
  api.use('/auth', createAuthRoutes(ctx, passport, csrf));
  api.use('/admin/accounts', createAccountRoutes(ctx));
  api.use('/admin/mail-outbox', createMailOutboxRoutes(ctx));
  api.use('/sky-windows', createSkyWindowsRoutes(ctx));
  api.use('/cycles', createCycleRoutes(ctx));
  api.use('/proposals/:id/photometry', createPhotometryRoutes(ctx));
  api.use('/proposals', createProposalRoutes(ctx));
  api.use('/invitations', createInvitationRoutes(ctx));
  api.use('/target-lists', createTargetListRoutes(ctx));
  api.use('/review', createReviewRoutes(ctx));
  api.use('/awards', createAwardRoutes(ctx));
  api.use('/night-plans', createNightPlanRoutes(ctx));
  api.use('/billing', createBillingRoutes(ctx));
  api.use('/', createFacilityRoutes(ctx));
  app.use('/api', api);
  app.use('/api', apiNotFound);

  const clientDir = config.CLIENT_DIST ?? path.resolve(__dirname, '../../dist/client/browser');
  if (existsSync(path.join(clientDir, 'index.html'))) {
    app.use(express.static(clientDir, { index: false, maxAge: '1h', setHeaders: noCacheForIndex }));
    // Every other path belongs to the single-page app's router.
    app.get('/{*splat}', (_req, res) => {
      res.setHeader('Cache-Control', 'no-cache');
      res.sendFile(path.join(clientDir, 'index.html'));
    });
  }

  app.use(errorHandler);

  return {
    app,
    ctx,
    async close() {
      ctx.mailer.close();
      await ctx.planQueue.close().catch((err) => logger.error({ err }, 'closing the plan queue failed'));
      await ctx.nightPlanQueue?.close().catch((err) => logger.error({ err }, 'closing the night-plan queue failed'));
      await ctx.photometryQueue?.close().catch((err) => logger.error({ err }, 'closing the photometry queue failed'));
      await Promise.allSettled([ctx.db.destroy(), sessionPool.end()]);
    },
  };
}

function noCacheForIndex(res: express.Response, filePath: string): void {
  if (filePath.endsWith('.html')) res.setHeader('Cache-Control', 'no-cache');
}
