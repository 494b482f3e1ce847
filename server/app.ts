/**
 * Builds the Express app; index.ts alone listens. Tests call createApp() with a test database.
 */
import { ExpressAuth } from '@auth/express';
import express, { type Express } from 'express';
import rateLimit from 'express-rate-limit';
import helmet from 'helmet';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { createAuthConfig } from './auth/auth-config';
import { createUserResolver } from './auth/current-user';
import type { DbHandle } from './db/client';
import { readiness } from './db/readiness';
import type { Env } from './env';
import { buildOpenApiDocument, createRegistry } from './http/openapi';
import type { RouteContext } from './http/route';
import { NotFoundError, TooManyRequestsError } from './lib/errors';
import type { Mailer } from './mail/mailer';
import { errorHandler } from './middleware/error-handler';
import { registerAccountRoutes } from './routes/account.routes';
import { registerAdminRoutes } from './routes/admin.routes';
import { registerCalcRoutes } from './routes/calc.routes';
import { registerCoastRoutes } from './routes/coasts.routes';
import { registerImportRoutes } from './routes/imports.routes';
import { registerLeaseRoutes } from './routes/leases.routes';
import { registerMonitoringRoutes } from './routes/monitoring.routes';
import { registerRiverRoutes } from './routes/rivers.routes';
import { registerScreeningRoutes } from './routes/screening.routes';
import { registerSharingRoutes } from './routes/sharing.routes';
import { registerInboxRoutes } from './routes/inbox.routes';
import { registerOverviewRoutes } from './routes/overview.routes';
import { createInboxService } from './services/inbox.service';
import { registerClientRoutes } from './routes/clients.routes';
import { createClientsService } from './services/clients.service';
import { registerZoneRoutes } from './routes/zones.routes';
import { createZonesService } from './services/zones.service';
import { createInlineScreeningJobs, type ScreeningJobs } from './jobs/screening-jobs';
import { createRiversService } from './services/rivers.service';
import { createScreeningService } from './services/screening.service';
import { createSweepService } from './services/sweep.service';
import { createAccountsService } from './services/accounts.service';
import { createImportsService } from './services/imports.service';
import { createLeasesService } from './services/leases.service';
import { createMonitoringService } from './services/monitoring.service';
import { createSharingService } from './services/sharing.service';
import { DEFAULT_UPLOAD_LIMITS, type UploadLimits } from '#shared/geometry/upload-limits';
import { type AlertJobs, createInlineAlertJobs } from './jobs/alert-jobs';
import { registerAlertRoutes } from './routes/alerts.routes';
import { mountBillingWebhook, registerBillingRoutes } from './routes/billing.routes';
import { registerGaugeRoutes } from './routes/gauges.routes';
import { createAlertsService } from './services/alerts.service';
import { createBillingService } from './services/billing.service';
import { createGaugesService } from './services/gauges.service';

export interface AppDeps {
  env: Env;
  db: DbHandle;
  mailer: Mailer;
  /** Requests per window for sign-in, sign-up and reset, per client address. */
  authRateLimit?: { limit: number; windowMs: number };
  calcRateLimit?: { limit: number; windowMs: number };
  uploadLimits?: Partial<UploadLimits>;
  /** Background screening; inline (at once, in the request) when not given. */
  jobs?: ScreeningJobs;
  /** Alert evaluation, alert e-mails and the gauge feed poll (pg-boss); inline (after each commit) when not given. */
  alertJobs?: AlertJobs;
}

const API_BASE = '/api/v1';

export function createApp(deps: AppDeps): Express {
  const { env, mailer } = deps;
  const db = deps.db.db;
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          defaultSrc: ["'self'"],
          // The optional basemap's tile server is the one outside origin a page may load images from.
          imgSrc: ["'self'", 'data:', 'blob:', ...(env.BASEMAP_URL ? [new URL(env.BASEMAP_URL.replace(/\{[a-z]\}/g, '0')).origin] : [])],
          styleSrc: ["'self'", "'unsafe-inline'"],
          workerSrc: ["'self'", 'blob:'],
          connectSrc: ["'self'"],
          fontSrc: ["'self'", 'data:'],
          objectSrc: ["'none'"],
          upgradeInsecureRequests: null,
        },
      },
    }),
  );

  const limited = (o: { limit: number; windowMs: number }, message: string) =>
    rateLimit({
      ...o,
      standardHeaders: 'draft-8',
      legacyHeaders: false,
      handler: (_req, _res, next) => next(new TooManyRequestsError(message)),
    });
  const authLimiter = limited(
    deps.authRateLimit ?? { limit: 60, windowMs: 10 * 60_000 },
    'Too many sign-in attempts from this address. Wait ten minutes, then try again.',
  );
  const calcLimiter = limited(deps.calcRateLimit ?? { limit: 300, windowMs: 60_000 }, 'Too many calculator requests. Wait a minute, then try again.');

  const authConfig = createAuthConfig({
    db,
    mailer,
    secret: env.AUTH_SECRET,
    appUrl: env.APP_URL,
    sessionMaxAgeSeconds: env.SESSION_MAX_AGE_SECONDS,
    maxFailures: env.SIGN_IN_MAX_FAILURES,
    windowMinutes: env.SIGN_IN_WINDOW_MINUTES,
    mailFrom: env.MAIL_FROM,
  });
  // Auth.js must be mounted at '/auth' exactly on Express 5 (stack.md gotcha 7).
  app.use(['/auth/callback', '/auth/signin'], authLimiter);
  app.use('/auth', express.urlencoded({ extended: false }), express.json(), ExpressAuth(authConfig));

  app.get('/api/health', async (_req, res) => {
    const database = await deps.db.pool
      .query('select 1')
      .then(() => 'ok' as const)
      .catch(() => 'unreachable' as const);
    const smtp = (await mailer.verify()) ? ('ok' as const) : ('unreachable' as const);
    const status = database === 'ok' && smtp === 'ok' ? 'ok' : 'degraded';
    res.status(status === 'ok' ? 200 : 503).json({ status, database, smtp, time: new Date().toISOString() });
  });

  // Readiness (load balancers): the database answers and this build's migrations are applied.
  app.get('/api/ready', async (_req, res) => {
    const ready = await readiness(deps.db.pool);
    res.status(ready.status === 'ready' ? 200 : 503).json(ready);
  });

  const router = express.Router();
  router.use(express.json({ limit: '2mb' }));
  router.use('/invitations', authLimiter);
  // The sign-in limiter guards sign-up and resets; reading who you are (GET /account/me, asked on every page)
  // is not an attempt at anything and must not use up the allowance.
  router.use('/account', (req, res, next) => (req.method === 'GET' ? next() : authLimiter(req, res, next)));
  router.use('/calc', calcLimiter);
  const registry = createRegistry();
  const ctx: RouteContext = { router, registry, basePath: API_BASE, resolveUser: createUserResolver(db, env.AUTH_SECRET) };
  const accounts = createAccountsService({ db, mailer, appUrl: env.APP_URL });
  registerAccountRoutes(ctx, accounts);
  registerAdminRoutes(ctx, db, accounts);
  registerCalcRoutes(ctx);
  const uploadLimits = { ...DEFAULT_UPLOAD_LIMITS, ...Object.fromEntries(Object.entries(deps.uploadLimits ?? {}).filter(([, v]) => v !== undefined)) };
  const screening = createScreeningService({ db });
  const jobs = deps.jobs ?? createInlineScreeningJobs(db, screening);
  const leasesChanged = (ids: string[]) => jobs.enqueueLeases(ids);
  registerImportRoutes(ctx, db, createImportsService({ db, limits: uploadLimits, onLeasesChanged: leasesChanged }), uploadLimits.maxCompressedBytes);
  registerSharingRoutes(ctx, createSharingService(db));
  registerLeaseRoutes(ctx, createLeasesService(db, { onLeasesChanged: leasesChanged }));
  const rivers = createRiversService({ db, onRiverChanged: async (riverId) => void (await jobs.enqueueRiver(riverId)) });
  registerRiverRoutes(ctx, rivers, jobs);
  registerCoastRoutes(ctx, db);
  registerInboxRoutes(ctx, createInboxService(db));
  registerOverviewRoutes(ctx, db, { basemapUrl: env.BASEMAP_URL ?? null, basemapAttribution: env.BASEMAP_ATTRIBUTION });
  registerClientRoutes(ctx, createClientsService({ db, mailer, appUrl: env.APP_URL }));
  registerScreeningRoutes(ctx, db, rivers, screening, createSweepService({ db, screening }));
  registerMonitoringRoutes(ctx, createMonitoringService({ db, onRiverChanged: async (riverId) => void (await jobs.enqueueRiver(riverId)) }));
  // Paid alerts plan: billing (its webhook reads the raw body, so it is mounted before the API router), gauges, alerts.
  const billing = createBillingService({
    db,
    config: { apiUrl: env.PAYMENT_API_URL, secretKey: env.PAYMENT_SECRET_KEY, webhookSecret: env.PAYMENT_WEBHOOK_SECRET, priceLookupKey: env.PAYMENT_PRICE_LOOKUP_KEY, appUrl: env.APP_URL },
  });
  mountBillingWebhook(app, ctx, billing);
  registerBillingRoutes(ctx, billing);
  const alertJobs = deps.alertJobs ?? createInlineAlertJobs(deps.db.pool);
  const gauges = createGaugesService({ db, jobs: alertJobs, feedUrl: env.GAUGE_FEED_URL });
  registerGaugeRoutes(ctx, gauges);
  const alerts = createAlertsService({ db, pool: deps.db.pool, jobs: alertJobs, billing, sweeps: createSweepService({ db, screening }), mailer, appUrl: env.APP_URL });
  registerAlertRoutes(ctx, alerts);
  /** Resolves once the alert workers are registered (index.ts and tests await it). */
  app.locals.alertsReady = alertJobs.attach({
    evaluate: (ids) => alertJobs.transaction(async (client, enqueue) => void (await alerts.evaluateReadings(client, enqueue, ids))),
    email: (id, final) => alerts.sendEmail(id, final),
    pollFeed: async () => void (await gauges.pollFeed()),
  });
  registerZoneRoutes(ctx, createZonesService({ db, mailer, screening, rivers, appUrl: env.APP_URL }));

  const openApi = buildOpenApiDocument(registry);
  router.get('/openapi.json', (_req, res) => {
    res.json(openApi);
  });
  router.use((req, _res, next) => next(new NotFoundError(`No API route ${req.method} ${API_BASE}${req.path}. See ${API_BASE}/openapi.json for the routes.`)));
  app.use(API_BASE, router);
  app.use('/api', (req, _res, next) => next(new NotFoundError(`No API route ${req.method} /api${req.path}. The API lives under ${API_BASE}.`)));

  const dist = path.resolve(import.meta.dirname, '../dist');
  if (env.SERVE_CLIENT && existsSync(path.join(dist, 'index.html'))) {
    app.use(express.static(dist, { index: false, maxAge: '1h' }));
    app.get('/{*splat}', (_req, res) => res.sendFile(path.join(dist, 'index.html')));
  }
  app.use(errorHandler);
  return app;
}
